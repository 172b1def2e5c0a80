using System.CommandLine;
using OpGrowth.IO;

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
            "truncation errors kept apart), fits.json and series.csv (t* = a + b ln N against t* = a + N/v, and how strongly the data prefer one), and figures/tstar-*.png/svg.\n" +
            "Corrupt point files are reported, moved to DIR/corrupt and left out.")
        {
            dir,
            noFigures,
        };
        cmd.SetAction(pr => CliHost.Run(_ =>
        {
            string folder = Path.GetFullPath(pr.GetValue(dir)!);
            if (!Directory.Exists(folder)) throw new InputException($"found no folder {folder}; expected the results folder of a sweep");
            if (!File.Exists(Path.Combine(folder, Sweeps.PointStore.ManifestFileName)))
                throw new InputException($"{folder}: found no {Sweeps.PointStore.ManifestFileName}; expected the results folder of a sweep (the folder 'opgrowth sweep' wrote, e.g. results/<plan name>)");
            using var lf = CliHost.CreateLoggerFactory();
            return SweepCommand.Collect(folder, lf.CreateLogger("collect"), !pr.GetValue(noFigures));
        }));
        return cmd;
    }
}
