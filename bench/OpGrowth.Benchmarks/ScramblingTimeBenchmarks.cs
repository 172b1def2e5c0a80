using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using OpGrowth.Exact;
using OpGrowth.Models;

namespace OpGrowth.Benchmarks;

/// <summary>
/// The exact engine's t* search on the random all-to-all Heisenberg cluster (heisenberg-all-to-all.toml, seed 7, probe
/// Z_0): one disorder seed, one random state, one random-sign probe group per site, t* located to 0.5% (interpolation),
/// 2 threads. One measured run per size (each takes seconds to tens of minutes): BenchmarkDotNet's monitoring strategy
/// without warm-up, so the figure is a single wall time, as a user would see it.
/// The targets on 2 cores: N = 16 within 20 s, 18 within 2 min, 20 within 10 min, 22 within 50 min.
/// Baseline (the code before this change, uniform grid of 31 times, same model and size):
/// <c>opgrowth exact heisenberg-all-to-all --set N=16 --sites none --mean-size --samples 1 --times 0:3:31</c>.
/// Run: dotnet run --project bench/OpGrowth.Benchmarks -c Release -- --filter '*ScramblingTimeBenchmarks*'
/// </summary>
[SimpleJob(RunStrategy.Monitoring, launchCount: 1, warmupCount: 0, iterationCount: 1)]
public class ScramblingTimeBenchmarks
{
    private Model _model = null!;

    [Params(16, 18, 20, 22)]
    public int N { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _model = ModelLoader.Load(ShippedModels.Resolve("heisenberg-all-to-all"), new Dictionary<string, string> { ["N"] = N.ToString(System.Globalization.CultureInfo.InvariantCulture), ["seed"] = "7" });
    }

    [Benchmark(Description = "t* search (random-sign probe, one group per site, 2 threads)")]
    public double Search()
    {
        var r = ScramblingTimeSearch.Run(_model.Hamiltonian, new ScramblingTimeSearchOptions
        {
            Operator = _model.Probes[0],
            Samples = 1,
            ProbeGroups = N,
            Threads = 2,
        });
        Console.WriteLine($"// N = {N}: t* = {r.TStar:0.#####} (location {r.LocationError:G2}), {r.Evaluations.Count - 1} evaluations, {r.MatrixVectorProducts} applications of H, {r.WallSeconds:0.0} s, {r.VectorBytes / 1048576.0:0} MiB of vectors");
        return r.TStar ?? double.NaN;
    }
}
