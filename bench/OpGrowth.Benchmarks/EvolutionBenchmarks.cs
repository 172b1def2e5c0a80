using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using OpGrowth.Evolution;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// One second-order Trotter step of the mixed-field Ising chain (J = 1, g = 1.05, h = 0.5, 128 sites,
/// dt = 0.05, probe Z_64) with a top-M budget, started from an operator that already fills the budget
/// (evolved to t = 1.5 in the setup). Reports the time per step; steps per second = 1 / mean.
/// Run: dotnet run --project bench/OpGrowth.Benchmarks -c Release -- --filter '*EvolutionBenchmarks*'
/// </summary>
[SimpleJob(RunStrategy.Monitoring, launchCount: 1, warmupCount: 1, iterationCount: 5)]
[MemoryDiagnoser]
public class EvolutionBenchmarks
{
    private EvolutionEngine<Pauli128> _engine = null!;

    [Params(1_000_000, 10_000_000)]
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
        _engine.Start();
        for (int s = 0; s < 30; s++) _engine.Step(1);
    }

    /// <summary>One Trotter2 step (two grouped passes plus compaction); returns the strings kept.</summary>
    [Benchmark]
    public int TrotterStep() => _engine.Step(1);
}
