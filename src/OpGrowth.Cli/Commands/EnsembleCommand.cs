using System.CommandLine;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.Ensembles;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pipeline;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth ensemble INPUT</c>: exact (up to sampling error) operator growth of a random circuit (circuit file) or
/// of the Brownian counterpart of a model file, at any N, with the figures and report of <c>opgrowth run</c>.
/// </summary>
internal static class EnsembleCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var input = new Argument<string>("INPUT") { Description = "A circuit file (.toml with a [circuit] table; shipped: circuits/), or a model file / shipped model name for its Brownian counterpart." };
        var set = CommonOptions.Set();
        var outDir = CommonOptions.Out("Report folder [default: ./opgrowth-report/<name>-circuit or -brownian].");
        var effort = new Option<string>("--effort") { Description = "quick (200 samples), standard (1000), thorough (4000).", DefaultValueFactory = _ => "standard" };
        effort.AcceptOnlyFromAmong("quick", "standard", "thorough");
        var samples = new Option<int?>("--samples") { Description = "Samples to average (overrides the effort's)." };
        var seed = new Option<long>("--seed") { Description = "Seed of the per-sample random streams (results do not depend on --threads).", DefaultValueFactory = _ => 1 };
        var threads = CommonOptions.Threads();
        var time = new Option<double?>("--time") { Description = "Brownian: final time [default: the effort's, as in opgrowth run]. Circuits run the file's layers." };
        var noise = new Option<double>("--noise-time") { Description = "Brownian: noise time tau, E[J(t)J(t')] = J^2 tau delta(t-t'); hopping rate 4 J^2 tau.", DefaultValueFactory = _ => 1.0 };
        var method = new Option<string>("--method") { Description = "Brownian: auto (size chain where it is exact, else trajectories), trajectories, size-chain.", DefaultValueFactory = _ => "auto" };
        method.AcceptOnlyFromAmong("auto", "trajectories", "size-chain");
        var sweep = new Option<string?>("--sweep") { Description = "Also t*(N) at these sizes, e.g. 16,64,256,1024, with t* = a + b ln N against t* = a + N/v." };
        var cmd = new Command("ensemble",
            "Random-circuit and Brownian (white-noise) counterparts, averaged exactly up to sampling error at any N: mean size and size distribution " +
            "against time, light cone, v_B, growth rate, t*, optionally t*(N) with both fits. A circuit file gives Haar-random circuits (sampled with " +
            "random Clifford gates, a unitary 2-design); a model file gives its Brownian counterpart. See docs/ensembles.md.")
        {
            input, set, outDir, effort, samples, seed, threads, time, noise, method, sweep,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(pr.GetValue(input)!, pr.GetValue(set) ?? [], pr.GetValue(outDir), pr.GetValue(effort)!, pr.GetValue(samples), pr.GetValue(seed),
            CommonOptions.ThreadsOrDefault(pr.GetValue(threads)), pr.GetValue(time), pr.GetValue(noise), pr.GetValue(method)!, pr.GetValue(sweep), null, ct)));
        return cmd;
    }

    /// <summary>Runs the ensemble and prints its lines (also used by <c>opgrowth run</c> for circuit files and --ensemble).</summary>
    internal static int Execute(string input, string[] sets, string? outDir, string effort, int? samples, long seed, int threads, double? time, double noiseTime, string method,
        string? sweep, StaticComparison? stat, CancellationToken ct)
    {
        string path = ShippedCircuits.TryResolve(input) ?? ShippedModels.Resolve(input);
        var overrides = ModelLoader.ParseOverrides(sets, path);
        if (samples is int s && s < 2) throw new InputException($"--samples {s}; expected at least 2");
        using var lf = CliHost.CreateLoggerFactory();
        var log = lf.CreateLogger("ensemble");
        var result = EnsembleRun.Execute(new EnsembleRunOptions
        {
            Input = path,
            Overrides = overrides,
            OutputFolder = outDir,
            Effort = effort switch { "quick" => RunEffort.Quick, "thorough" => RunEffort.Thorough, _ => RunEffort.Standard },
            Samples = samples,
            Seed = seed,
            Threads = threads,
            Time = time,
            NoiseTime = noiseTime,
            Method = method,
            SweepSizes = ParseSizes(sweep),
            Static = stat,
            Logger = log,
        }, ct);
        var o = CliHost.Out;
        o.WriteLine($"{result.Name} (N = {result.Series.N}), {result.Kind}, probe {result.Series.Probe}, {(result.Series.Samples > 0 ? $"{result.Series.Samples} samples" : "no sampling")}");
        foreach (var line in result.Lines) o.WriteLine("  " + line);
        o.WriteLine($"report: {Path.Combine(result.Folder, "report.html")}");
        return ExitCodes.Ok;
    }

    internal static List<int> ParseSizes(string? sweep)
    {
        var sizes = new List<int>();
        if (string.IsNullOrWhiteSpace(sweep)) return sizes;
        foreach (var part in sweep.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            if (!int.TryParse(part, NumberStyles.None, Inv, out int n) || n < 2) throw new InputException($"--sweep: found '{part}'; expected sizes such as 8,12,16");
            sizes.Add(n);
        }
        return sizes;
    }
}
