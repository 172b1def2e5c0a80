using System.CommandLine;
using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Models;

namespace OpGrowth.Cli.Commands;

/// <summary><c>opgrowth check MODEL</c>: validates a model file and prints its summary (text or JSON).</summary>
internal static class CheckCommand
{
    public static Command Create()
    {
        var model = CommonOptions.Model();
        var set = CommonOptions.Set();
        var json = new Option<bool>("--json") { Description = "Write the summary as JSON on stdout." };
        var cmd = new Command("check", "Validate a model file and print its summary: qubits, terms, locality, norm of H per site, symmetries, random seeds, lattice, probes, drive.")
        {
            model,
            set,
            json,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(pr.GetValue(model)!, pr.GetValue(set) ?? [], pr.GetValue(json))));
        return cmd;
    }

    private static int Execute(string modelArg, string[] sets, bool asJson)
    {
        var sw = Stopwatch.StartNew();
        var (_, _, model) = CommonOptions.LoadModel(modelArg, sets);
        using (var lf = CliHost.CreateLoggerFactory())
        {
            lf.CreateLogger("check").LogInformation("built {Name}: {Terms} terms on {N} qubits in {Ms} ms", model.Name, model.Hamiltonian.Terms.Count, model.N, sw.ElapsedMilliseconds);
        }
        var summary = ModelSummary.Of(model);
        CliHost.Out.Write(asJson ? summary.ToJson() + Environment.NewLine : summary.ToText());
        return ExitCodes.Ok;
    }
}
