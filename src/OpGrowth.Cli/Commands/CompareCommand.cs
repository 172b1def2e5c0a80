using System.CommandLine;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pipeline;
using OpGrowth.Reporting;

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
        var set = CommonOptions.Set();
        var probe = CommonOptions.Probe();
        var size = new Option<int>("--size") { Description = "N at which both engines run (dense exact engine: at most 10).", DefaultValueFactory = _ => 8 };
        var time = new Option<double>("--time") { Description = "Final time; for a periodic drive, the number of periods.", DefaultValueFactory = _ => 3.0 };
        var tol = new Option<double>("--tolerance") { Description = "Largest accepted |Delta F| and |Delta C|.", DefaultValueFactory = _ => 1e-6 };
        var threads = CommonOptions.Threads();
        var outDir = CommonOptions.Out("Folder for compare.json and compare.csv (both engines' C(t) and F_j(t)) [default: print only].");
        var cmd = new Command("compare",
            "Check the Pauli engine against the exact engine on the same model, operator and times at small N: OTOCs against X, Y, Z on every site " +
            "and the autocorrelation of the probe. Exit code 4 when the difference exceeds the tolerance.")
        {
            model, set, probe, size, time, tol, threads, outDir,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(pr.GetValue(model)!, pr.GetValue(set) ?? [], pr.GetValue(probe), pr.GetValue(size), pr.GetValue(time),
            pr.GetValue(tol), CommonOptions.ThreadsOrDefault(pr.GetValue(threads)), pr.GetValue(outDir), ct)));
        return cmd;
    }

    private static int Execute(string modelArg, string[] sets, string? probe, int size, double time, double tolerance, int threads, string? outDir, CancellationToken ct)
    {
        if (size is < 1 or > 10) throw new InputException($"--size: found {size}; expected 1..10 (the dense exact engine)");
        if (!(time > 0) || !double.IsFinite(time) || time > 1e4) throw new InputException($"--time: found {time.ToString(Inv)}; expected a positive time up to 1e4 (for a drive: periods)");
        if (!(tolerance > 0) || !double.IsFinite(tolerance)) throw new InputException($"--tolerance: found {tolerance.ToString(Inv)}; expected a positive number");
        var (path, overrides, model) = CommonOptions.LoadModel(modelArg, sets);
        if (!model.Parameters.ContainsKey("N"))
            throw new InputException(path, 0, $"found no parameter N (lattice '{model.Lattice.Kind}'); expected a model whose size is set by N");
        using var lf = CliHost.CreateLoggerFactory();
        var log = lf.CreateLogger("compare");
        var r = ScramblingRun.CompareEngines(path, overrides, size, time, tolerance, threads, log, ct, probe);
        if (!r.Ran) throw new InputException(path, 0, r.SkipReason ?? "the comparison did not run");
        bool pass = r.MaxOtocDifference <= tolerance && r.MaxAutocorrelationDifference <= tolerance;
        if (outDir is not null)
        {
            string dir = Path.GetFullPath(outDir);
            AtomicFile.WriteJson(Path.Combine(dir, "compare.json"), new
            {
                model = model.Name,
                n = r.N,
                probe = r.Probe,
                times = r.Times,
                maxOtocDifference = r.MaxOtocDifference,
                maxAutocorrelationDifference = r.MaxAutocorrelationDifference,
                tolerance = r.Tolerance,
                exactMethod = r.ExactMethod,
                passed = pass,
                files = new[] { "compare.csv" },
            });
            DataFiles.WriteComparison(dir, r);
        }
        var o = CliHost.Out;
        o.WriteLine($"{model.Name} at N = {r.N}, probe {r.Probe}, {r.Times.Length} times up to t = {NumberFormat.Number(r.Times[^1], 3)} (exact: {r.ExactMethod})");
        o.WriteLine($"  max |Delta F| over times, sites, X/Y/Z: {NumberFormat.Number(r.MaxOtocDifference, 2)}");
        o.WriteLine($"  max |Delta C| (autocorrelation):       {NumberFormat.Number(r.MaxAutocorrelationDifference, 2)}");
        o.WriteLine($"  tolerance {NumberFormat.Number(tolerance, 2)}: {(pass ? "passed" : "FAILED")}");
        return pass ? ExitCodes.Ok : ExitCodes.CheckFailed;
    }
}
