using System.CommandLine;
using Microsoft.Extensions.Logging;

namespace OpGrowth.Cli.Commands;

/// <summary><c>opgrowth collect DIR</c>: merges a sweep's point files into the table, disorder averages and t*(N) fits.</summary>
internal static class CollectCommand
{
    public static Command Create()
    {
        var dir = new Argument<string>("DIR") { Description = "Results folder of a sweep (local or filled by Slurm array tasks)." };
        var noFigures = new Option<bool>("--no-figures") { Description = "Do not draw the t*(N) figures (figures/tstar-*.png and .svg)." };
        var cmd = new Command("collect",
            "Merge a sweep's results: writes table.csv/json (one row per point), averages.csv (disorder averages with bootstrap errors,\n" +
            "truncation errors kept apart), fits.json and series.csv (t* = a + b ln N against t* = a + N/v, which the data prefer), and figures/tstar-*.png/svg.\n" +
            "Corrupt point files are reported, moved to DIR/corrupt and left out.\n\n" +
            "Example:\n  opgrowth collect results/demo-candidates")
        {
            dir,
            noFigures,
        };
        cmd.SetAction(pr => CliHost.Run(_ =>
        {
            using var lf = CliHost.CreateLoggerFactory(LogLevel.Information);
            return SweepCommand.Collect(Path.GetFullPath(pr.GetValue(dir)!), lf.CreateLogger("collect"), !pr.GetValue(noFigures));
        }));
        return cmd;
    }
}
