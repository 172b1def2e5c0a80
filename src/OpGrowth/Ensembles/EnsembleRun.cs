using System.Diagnostics;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Pipeline;

namespace OpGrowth.Ensembles;

/// <summary>
/// The ensemble counterpart of <c>opgrowth run</c>: a random circuit (circuit file) or the Brownian counterpart of a
/// model file, averaged exactly up to sampling error at the file's N, with the same figures as a static run (mean
/// size and size distribution against time, light cone, v_B, growth rate, t*, optionally t*(N) with both fits) and a
/// report folder (report.html, report.md, figures, results.json, CSV).
/// </summary>
public static class EnsembleRun
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Runs the ensemble and writes the report.</summary>
    public static EnsembleRunResult Execute(EnsembleRunOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (options.Threads < 1) throw new InputException($"--threads {options.Threads}; expected at least 1");
        if (options.Time is double tt && !(tt > 0 && double.IsFinite(tt))) throw new InputException($"--time {tt}; expected a positive time");
        if (options.SweepSizes.Any(n => n < 2)) throw new InputException("--sweep: found a size below 2; expected sizes such as 16,64,256");
        if (options.Method is not ("auto" or "trajectories" or "size-chain")) throw new InputException($"--method {options.Method}; expected auto, trajectories or size-chain");
        var clock = Stopwatch.StartNew();
        string path = ShippedCircuits.TryResolve(options.Input) ?? ShippedModels.Resolve(options.Input);
        int samples = options.SamplesFor();
        var log = options.Logger;
        EnsembleSeries series;
        Func<int, EnsembleSeries>? atSize = null;
        string name, probe, kindWord;
        var summary = new List<KeyValuePair<string, string>>();
        if (CircuitLoader.IsCircuitFile(path))
        {
            var circuit = CircuitLoader.Load(path, options.Overrides);
            name = circuit.Name;
            probe = circuit.Probe.ToString();
            kindWord = "circuit";
            summary.Add(new("circuit", circuit.Summary));
            summary.Add(new("description", circuit.Description));
            int everyLayers = Math.Max(1, circuit.Layers / 200);
            var eo = new EnsembleOptions { Samples = samples, Seed = options.Seed, Threads = options.Threads, RecordEvery = everyLayers, Cancellation = ct };
            log?.LogInformation("{Name}: {Summary}; {Samples} samples", name, circuit.Summary, samples);
            series = CircuitSampler.Run(circuit, eo);
            if (options.SweepSizes.Count > 0)
            {
                bool oneD = circuit.Geometry.IsOneDimensional;
                atSize = n =>
                {
                    int layers = oneD ? (int)Math.Ceiling(circuit.Layers * Math.Max(1.0, (double)n / circuit.N))
                        : (int)Math.Ceiling(circuit.Layers * Math.Max(1.0, Math.Log(n) / Math.Log(circuit.N)));
                    var c = circuit.Resized(n, layers);
                    return CircuitSampler.Run(c, PauliString.Single(n, 0, 'Z'), eo with { RecordEvery = Math.Max(1, layers / 200) });
                };
                probe = "Z_0";
            }
        }
        else
        {
            var model = ModelLoader.Load(path, options.Overrides);
            name = model.Name;
            kindWord = "brownian";
            var first = model.Probes[0];
            probe = first.ToString();
            double time = options.Time ?? EffortPreset.For(options.Effort).Time;
            summary.Add(new("model", $"{model.Name}: {model.Description}"));
            summary.Add(new("counterpart", $"every coupling J_a becomes white noise with E[J_a(t) J_a(t')] = J_a^2 tau delta(t - t'), tau = {options.NoiseTime.ToString("g4", Inv)}; hopping rate 4 J_a^2 tau per anticommuting term"));
            series = Brownian(model, first, time, samples, options, ct, out string method);
            summary.Add(new("method", method));
            if (options.SweepSizes.Count > 0)
            {
                if (!model.Parameters.ContainsKey("N")) throw new InputException(path, 0, "found no parameter N; expected a model whose size is the parameter N for --sweep");
                bool oneD = model.Lattice.IsOneDimensional;
                atSize = n =>
                {
                    var m = ModelLoader.Load(path, new Dictionary<string, string>(options.Overrides) { ["N"] = n.ToString(Inv) });
                    double tn = oneD ? time * Math.Max(1.0, (double)n / model.N) : time * Math.Max(1.0, Math.Log(n) / Math.Log(model.N));
                    return Brownian(m, PauliString.Single(n, 0, 'Z'), tn, samples, options, ct, out _);
                };
                probe = "Z_0";
            }
        }
        var figures = EnsembleFigures.Of(series);
        EnsembleSweepResult? sweep = null;
        if (atSize is not null)
        {
            log?.LogInformation("t*(N) at N = {Sizes}", string.Join(",", options.SweepSizes));
            sweep = EnsembleSweep.Run(name, probe, options.SweepSizes, atSize, log is null ? null : new Progress<string>(s => log.LogInformation("t*(N): {Point}", s)));
        }
        string folder = Path.GetFullPath(options.OutputFolder ?? Path.Combine("opgrowth-report", ScramblingRun.Sanitize(name) + "-" + kindWord));
        var (lines, files) = EnsembleReport.Write(folder, series, figures, sweep, summary, options.Static, clock.Elapsed);
        return new EnsembleRunResult
        {
            Kind = series.Kind,
            Name = name,
            Folder = folder,
            Series = series,
            Figures = figures,
            Sweep = sweep,
            Lines = lines,
            Files = files,
            WallSeconds = clock.Elapsed.TotalSeconds,
        };
    }

    private static EnsembleSeries Brownian(Model model, PauliString probe, double time, int samples, EnsembleRunOptions options, CancellationToken ct, out string method)
    {
        var bm = BrownianModel.From(model, options.NoiseTime);
        double interval = time / 60;
        bool single = probe.Weight == 1;
        bool chain = options.Method switch
        {
            "size-chain" => bm.Chain is not null && single ? true : throw new InputException(model.SourceFile, 0, $"found --method size-chain for a model without an exact size chain ({bm.ChainNote ?? "the probe acts on several sites"}); expected --method trajectories or auto"),
            "trajectories" => false,
            _ => bm.Chain is not null && single,
        };
        if (chain)
        {
            method = "size chain solved directly (the model is permutation symmetric with letter-independent rates)";
            return SizeChain.Solve(bm.Chain!, time, interval, model.Name, probe.FirstSite, bm.Geometry);
        }
        method = $"{samples} continuous-time trajectories" + (bm.Chain is null ? $" (no exact size chain: {bm.ChainNote})" : "");
        return BrownianSampler.Run(bm, probe, new EnsembleOptions { Samples = samples, Seed = options.Seed, Threads = options.Threads, Time = time, RecordInterval = interval, NoiseTime = options.NoiseTime, Cancellation = ct });
    }
}
