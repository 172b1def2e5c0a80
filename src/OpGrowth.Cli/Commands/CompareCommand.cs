using System.CommandLine;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pipeline;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth compare MODEL</c>: the Pauli engine (no truncation) against the exact state-vector engine at a
/// small N of the model's family, on the same times: largest |Delta F| over times, sites and X/Y/Z, the
/// autocorrelation difference, pass/fail against a tolerance, and the overlay data.
/// </summary>
internal static class CompareCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var model = new Argument<string>("MODEL") { Description = "Model file (.toml) or shipped model name; its size must be set by a parameter N." };
        var set = new Option<string[]>("--set") { Description = "Override a model parameter: NAME=VALUE. Repeat for several.", Arity = ArgumentArity.ZeroOrMore, AllowMultipleArgumentsPerToken = false };
        var size = new Option<int>("--size") { Description = "N at which both engines run (dense exact engine: at most 10).", DefaultValueFactory = _ => 8 };
        var time = new Option<double>("--time") { Description = "Final time.", DefaultValueFactory = _ => 3.0 };
        var tol = new Option<double>("--tolerance") { Description = "Largest accepted |Delta F| and |Delta C|.", DefaultValueFactory = _ => 1e-6 };
        var threads = new Option<int>("--threads") { Description = "Worker threads.", DefaultValueFactory = _ => Environment.ProcessorCount };
        var outDir = new Option<string?>("--out") { Description = "Folder for compare.json and compare.csv (overlay data); default: print only." };
        var cmd = new Command("compare",
            "Check the Pauli engine against the exact engine on the same model, operator and times at small N: OTOCs against X, Y, Z on every site " +
            "and the autocorrelation of the model's first probe. Exit code 4 when the difference exceeds the tolerance.\n\n" +
            "Examples:\n  opgrowth compare mixed-field-ising\n  opgrowth compare kicked-ising --size 8 --time 10 --out runs/compare")
        {
            model, set, size, time, tol, threads, outDir,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(pr.GetValue(model)!, pr.GetValue(set) ?? [], pr.GetValue(size), pr.GetValue(time),
            pr.GetValue(tol), pr.GetValue(threads), pr.GetValue(outDir), ct)));
        return cmd;
    }

    private static int Execute(string modelArg, string[] sets, int size, double time, double tolerance, int threads, string? outDir, CancellationToken ct)
    {
        if (size is < 1 or > 10) throw new InputException($"--size: found {size}; expected 1..10 (the dense exact engine)");
        if (!(time > 0) || !double.IsFinite(time)) throw new InputException($"--time: found {time.ToString(Inv)}; expected a positive number");
        if (!(tolerance > 0)) throw new InputException($"--tolerance: found {tolerance.ToString(Inv)}; expected a positive number");
        string path = ShippedModels.Resolve(modelArg);
        var overrides = ModelLoader.ParseOverrides(sets, path);
        var model = ModelLoader.Load(path, overrides);
        if (!model.Parameters.ContainsKey("N"))
            throw new InputException(path, 0, $"the model's size is not set by a parameter N (lattice '{model.Lattice.Kind}'); expected a model with an N parameter");
        using var lf = CliHost.CreateLoggerFactory(LogLevel.Information);
        var log = lf.CreateLogger("compare");
        var r = ScramblingRun.CompareEngines(path, overrides, size, time, tolerance, threads, log, ct);
        if (!r.Ran) throw new InputException(path, 0, r.SkipReason ?? "the comparison did not run");
        bool pass = r.MaxOtocDifference <= tolerance && r.MaxAutocorrelationDifference <= tolerance;
        if (outDir is not null)
        {
            AtomicFile.WriteJson(Path.Combine(outDir, "compare.json"), new
            {
                model = model.Name,
                r.N,
                r.Probe,
                r.Times,
                r.PauliAutocorrelation,
                r.ExactAutocorrelation,
                r.MaxOtocDifference,
                r.MaxAutocorrelationDifference,
                r.Tolerance,
                r.ExactMethod,
                passed = pass,
            });
            var csv = new StringBuilder("time,autocorrelation_pauli,autocorrelation_exact\n");
            for (int i = 0; i < r.Times.Length; i++)
                csv.Append(Inv, $"{r.Times[i]:R},{r.PauliAutocorrelation[i]:R},{r.ExactAutocorrelation[i]:R}\n");
            AtomicFile.WriteAllText(Path.Combine(outDir, "compare.csv"), csv.ToString());
        }
        var o = CliHost.Out;
        o.WriteLine($"{model.Name} at N = {r.N}, probe {r.Probe}, {r.Times.Length} times up to t = {r.Times[^1].ToString("0.###", Inv)} (exact: {r.ExactMethod})");
        o.WriteLine($"  max |Delta F| over times, sites, X/Y/Z: {r.MaxOtocDifference.ToString("0.0e+00", Inv)}");
        o.WriteLine($"  max |Delta C| (autocorrelation):       {r.MaxAutocorrelationDifference.ToString("0.0e+00", Inv)}");
        o.WriteLine($"  tolerance {tolerance.ToString("0.0e+00", Inv)}: {(pass ? "passed" : "FAILED")}");
        return pass ? ExitCodes.Ok : ExitCodes.CheckFailed;
    }
}
