using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using OpGrowth.Evolution;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// The Trotter pass at a filled budget of 10^6 strings: one trotter2 step (three grouped passes, each with its
/// compaction) of the mixed-field Ising chain (J = 1, g = 1.05, h = 0.5, 128 sites, dt = 0.05, probe Z_64).
/// The filled operator is read from a state file (written on first use by growing the operator until it fills
/// the budget; directory from OPGROWTH_PASS_STATE_DIR, default the temporary folder), so every job starts from
/// the same operator as the `trotter-pass` hand timer. Strings per second per thread = 3 x 10^6 / mean / threads.
/// Run: dotnet run --project bench/OpGrowth.Benchmarks -c Release -- --filter '*TrotterPassBenchmarks*'
/// </summary>
[SimpleJob(RunStrategy.Monitoring, launchCount: 1, warmupCount: 1, iterationCount: 5)]
[MemoryDiagnoser]
public class TrotterPassBenchmarks
{
    private EvolutionEngine<Pauli128> _engine = null!;

    [Params(1_000_000)]
    public long Budget { get; set; }

    [Params(1, 2)]
    public int Threads { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var problem = Workloads.MixedFieldIsingProblem128();
        var options = new EvolutionOptions
        {
            Method = IntegrationMethod.Trotter2,
            Dt = 0.05,
            Time = 100,
            Threads = Threads,
            Truncation = new TruncationPolicy { MaxStrings = Budget, MemoryBytes = 20L << 30 },
        };
        var budget = OperatorEvolution.ResolveBudgets(problem, options, out _)[0];
        _engine = new EvolutionEngine<Pauli128>(problem, options, budget, 0, null);
        string dir = Environment.GetEnvironmentVariable("OPGROWTH_PASS_STATE_DIR") ?? Path.GetTempPath();
        string path = Path.Combine(dir, $"opgrowth-pass-state-{Budget}.bin");
        if (File.Exists(path))
        {
            _engine.LoadState(path);
            return;
        }
        _engine.Start();
        int kept = 0;
        for (int s = 0; s < 200 && kept < Budget * 0.99; s++) kept = _engine.Step(1);
        _engine.SaveState(path);
    }

    /// <summary>One trotter2 step at the filled budget; returns the strings kept.</summary>
    [Benchmark]
    public int TrotterStep() => _engine.Step(1);
}
