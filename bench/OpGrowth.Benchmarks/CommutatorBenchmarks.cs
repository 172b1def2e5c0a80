using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Jobs;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// Commutator throughput: H = mixed-field Ising chain (J = 1, g = 1.05, h = 0.5) on 64 open sites,
/// O = the operator after <see cref="Steps"/> repeated normalised commutators from Z_32.
/// Accumulated products per second = <see cref="Products"/> / mean time (printed in setup).
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RuntimeMoniker.Net10_0, launchCount: 1, warmupCount: 2, iterationCount: 6)]
public class CommutatorBenchmarks
{
    private CompiledHamiltonian<Pauli64> _h = null!;
    private PauliOperator<Pauli64> _o = null!;

    [Params(22, 25)]
    public int Steps { get; set; }

    [Params(1, 2)]
    public int Threads { get; set; }

    /// <summary>Anticommuting (term, string) pairs: the products one commutator accumulates.</summary>
    public long Products { get; private set; }

    [GlobalSetup]
    public void Setup()
    {
        (_h, _o) = Workloads.GrownMixedFieldIsing(64, Steps);
        Products = Workloads.CountProducts(_h, _o);
        Console.WriteLine($"// strings in = {_o.Count}, products = {Products}");
    }

    [Benchmark]
    public int Commutator() => Liouvillian.Commutator(_h, _o, Threads).Count;
}
