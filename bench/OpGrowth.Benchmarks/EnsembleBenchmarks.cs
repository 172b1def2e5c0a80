using BenchmarkDotNet.Attributes;
using OpGrowth.Ensembles;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// The ensemble engines at the sizes the docs quote (docs/ensembles.md):
/// <list type="bullet">
/// <item>Haar-averaged mean size of a brickwork chain of 10^4 qubits over 1000 layers (probe at the centre, records
/// every 10 layers), with enough samples for a 1% relative sampling error of the final mean size (printed);</item>
/// <item>the all-to-all random-circuit t*(N) sweep, N = 16, 64, ..., 16384, 200 samples per size, with both fits.</item>
/// </list>
/// Run: dotnet run --project bench/OpGrowth.Benchmarks -c Release -- --filter '*EnsembleBenchmarks*' --job short
/// </summary>
[MemoryDiagnoser]
public class EnsembleBenchmarks
{
    [Params(2)]
    public int Threads { get; set; }

    [Benchmark]
    public double BrickworkChain10k()
    {
        const int n = 10_000;
        var c = new Circuit { Name = "brickwork-10k", N = n, Lattice = Lattice.Chain(n), Layout = CircuitLayout.Brickwork, Layers = 1000 };
        var s = CircuitSampler.Run(c, PauliString.Single(n, n / 2, 'Z'), new EnsembleOptions { Samples = 64, Seed = 1, Threads = Threads, RecordEvery = 10 });
        Console.WriteLine($"// brickwork 10^4 x 1000 layers, {s.Samples} samples: final mean size {s.MeanSize[^1]:0.0} +- {s.MeanSizeError[^1]:0.0} ({100 * s.MeanSizeError[^1] / s.MeanSize[^1]:0.00}%)");
        return s.MeanSize[^1];
    }

    [Benchmark]
    public double AllToAllTStarSweep()
    {
        int[] sizes = [16, 64, 256, 1024, 4096, 16384];
        var r = EnsembleSweep.Run("pairs", "Z_0", sizes, n =>
            CircuitSampler.Run(new Circuit { Name = "pairs", N = n, Layout = CircuitLayout.RandomPairs, Layers = 24 }, PauliString.Single(n, 0, 'Z'),
                new EnsembleOptions { Samples = 200, Seed = 1, Threads = Threads }));
        Console.WriteLine($"// all-to-all t*(N): {r.Fit?.Comparison?.Verdict}");
        return r.Fit?.Comparison?.DeltaAic ?? double.NaN;
    }
}
