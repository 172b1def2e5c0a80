using System.CommandLine;
using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Models;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth check MODEL</c>: validates a model file and prints its summary (text or JSON). A circuit file (a
/// model-file header with a [circuit] table, see docs/ensembles.md) is validated by the circuit loader instead.
/// </summary>
internal static class CheckCommand
{
    public static Command Create()
    {
        var model = CommonOptions.Model();
        var set = CommonOptions.Set();
        var json = new Option<bool>("--json") { Description = "Write the summary as JSON on stdout." };
        var cmd = new Command("check", "Validate a model file and print its summary: qubits, terms, locality, norm of H per site, symmetries, random seeds, lattice, probes, drive. A circuit file (docs/ensembles.md) is validated as well: layout, qubits, layers, lattice, probes.")
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
        if (OpGrowth.Ensembles.ShippedCircuits.TryResolve(modelArg) is { } circuitPath && OpGrowth.Ensembles.CircuitLoader.IsCircuitFile(circuitPath))
            return CheckCircuit(circuitPath, sets, asJson);
        var (_, _, model) = CommonOptions.LoadModel(modelArg, sets);
        using (var lf = CliHost.CreateLoggerFactory())
        {
            lf.CreateLogger("check").LogInformation("built {Name}: {Terms} terms on {N} qubits in {Ms} ms", model.Name, model.Hamiltonian.Terms.Count, model.N, sw.ElapsedMilliseconds);
        }
        var summary = ModelSummary.Of(model);
        CliHost.Out.Write(asJson ? summary.ToJson() + Environment.NewLine : summary.ToText());
        return ExitCodes.Ok;
    }

    private static int CheckCircuit(string path, string[] sets, bool asJson)
    {
        var c = OpGrowth.Ensembles.CircuitLoader.Load(path, ModelLoader.ParseOverrides(sets, path));
        var probes = c.Probes.Select(p => p.ToString()).ToArray();
        if (asJson)
        {
            CliHost.Out.WriteLine(System.Text.Json.JsonSerializer.Serialize(new
            {
                name = c.Name, description = c.Description, kind = "circuit", n = c.N, layout = c.LayoutName, layers = c.Layers,
                singleQubitLayers = c.SingleQubitLayers, lattice = c.Topology, probes, parameters = c.Parameters,
            }));
        }
        else
        {
            var o = CliHost.Out;
            o.WriteLine($"name         {c.Name}");
            o.WriteLine($"description  {c.Description}");
            o.WriteLine($"circuit      {c.Summary}");
            o.WriteLine($"qubits       {c.N}");
            o.WriteLine($"probes       {string.Join(", ", probes)}");
            o.WriteLine("run it with  opgrowth ensemble " + path);
        }
        return ExitCodes.Ok;
    }
}
