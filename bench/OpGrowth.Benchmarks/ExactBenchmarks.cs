using System.Numerics;
using BenchmarkDotNet.Attributes;
using OpGrowth.Exact;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// H|psi&gt; on the mixed-field Ising chain (N - 1 ZZ bonds, N X and N Z fields: one diagonal group and
/// N X-type groups). Amplitude updates per second = <see cref="PauliHamiltonianApplier.AmplitudeUpdatesPerApply"/>
/// (printed in the setup) divided by the mean time; the term-by-term path is the naive baseline.
/// Run: dotnet run --project bench/OpGrowth.Benchmarks -c Release -- --filter '*ExactBenchmarks*'
/// </summary>
[MemoryDiagnoser]
public class ExactBenchmarks
{
    private PauliHamiltonianApplier _app = null!;
    private Complex[] _psi = [];
    private Complex[] _out = [];

    [Params(20, 22)]
    public int N { get; set; }

    [Params(1, 2)]
    public int Threads { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var t = new List<PauliTerm>();
        for (int i = 0; i + 1 < N; i++) t.Add(new(PauliString.Parse($"Z_{i} Z_{i + 1}", N), 1.0));
        for (int i = 0; i < N; i++) t.Add(new(PauliString.Parse($"X_{i}", N), 1.05));
        for (int i = 0; i < N; i++) t.Add(new(PauliString.Parse($"Z_{i}", N), 0.5));
        _app = new PauliHamiltonianApplier(new Hamiltonian(N, t), Threads);
        _psi = StateVector.Create(N);
        StateVector.FillHaarRandom(_psi, new Random(1));
        _out = new Complex[_psi.Length];
        Console.WriteLine($"// N = {N}: {_app.AmplitudeUpdatesPerApply} amplitude updates per application of H");
    }

    [Benchmark(Description = "H psi (grouped, fused)")]
    public Complex Apply()
    {
        _app.Apply(_psi, _out);
        return _out[1];
    }

    [Benchmark(Baseline = true, Description = "H psi (term by term)")]
    public Complex TermByTerm()
    {
        _app.ApplyTermByTerm(_psi, _out);
        return _out[1];
    }
}
