using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Jobs;
using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// One Lanczos step A_n = i[H, O_{n-1}] + b_{n-1} O_{n-2}, b_n = ||A_n||, O_n = A_n / b_n, for Z at the centre of
/// the mixed-field Ising chain (J = 1, g = 1.05, h = 0.5) on 64 open sites (the support never reaches the ends
/// at these depths). Step 21 reads about 8e4 strings and writes 1.3e5; step 25 reads 5.7e5 and writes 9.3e5.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RuntimeMoniker.Net10_0, launchCount: 1, warmupCount: 2, iterationCount: 6)]
public class KrylovBenchmarks
{
    private PlainBasisHolder _basis = null!;
    private PauliOperator<Pauli64> _cur = null!;
    private PauliOperator<Pauli64> _prev = null!;
    private double _b;

    /// <summary>Index n of the step measured.</summary>
    [Params(21, 25)]
    public int Step { get; set; }

    [Params(1, 2)]
    public int Threads { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var h = Workloads.MixedFieldIsing(64).Compile<Pauli64>();
        _basis = new PlainBasisHolder(h);
        PauliOperator<Pauli64>? last = null, before = null;
        var r = LanczosEngine.Run(new PlainBasis<Pauli64>(h), PauliOperator<Pauli64>.Single(PauliString.Single(64, 32, 'Z')),
            new LanczosOptions { Depth = Step - 1, Threads = 2 }, "bench", 64, (_, o) =>
            {
                before = last;
                last = o;
            }, stepOperators: true);
        _cur = last!;
        _prev = before!;
        _b = r.B[^1];
        Console.WriteLine($"// step {Step}: O_(n-1) has {_cur.Count} strings, O_(n-2) {_prev.Count}");
    }

    [Benchmark]
    public double LanczosStep()
    {
        var acc = PauliAccumulator<Pauli64>.For(64, (long)(_cur.Count * 1.7));
        LanczosEngine.Accumulate(_basis.Basis, _cur, _prev, _b, acc, Threads, _ => true);
        var a = acc.ToOperator();
        double bn = a.Norm();
        a.Scale(1 / bn);
        return bn;
    }

    /// <summary>Keeps the internal basis struct in a field of a reference type.</summary>
    private sealed class PlainBasisHolder(CompiledHamiltonian<Pauli64> h)
    {
        public readonly PlainBasis<Pauli64> Basis = new(h);
    }
}
