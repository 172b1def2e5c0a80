using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Jobs;
using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// End to end, the exact recursion as `opgrowth lanczos mixed-field-ising --mode infinite-chain` runs it: Z at
/// the centre of the mixed-field Ising chain (J = 1, g = 1.05, h = 0.5) on the light-cone chain for depth 29
/// (31 sites, 8-byte keys). <see cref="Step"/> is one whole step of the unmanaged route (table, commutator,
/// scaled O_{n-2}, in-place compaction, norm, scaling and support), <see cref="ManagedStep"/> the same step on
/// the managed route (accumulator, copy into a new operator), <see cref="Run"/> the whole recursion to b_24 (O_24 has 5.7e5 strings).
/// Step 27 reads O_26 (1.5e6 strings) and O_25 and writes O_27 (2.4e6 strings).
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RuntimeMoniker.Net10_0, launchCount: 1, warmupCount: 1, iterationCount: 5)]
public class LanczosStepBenchmarks
{
    private const int Sites = 31;
    private CompiledHamiltonian<ChainKey32> _h = null!;
    private SlotVector<ChainKey32> _cur = null!;
    private SlotVector<ChainKey32> _prev = null!;
    private PauliOperator<ChainKey32> _curOp = null!;
    private PauliOperator<ChainKey32> _prevOp = null!;
    private double _b;
    private long _predicted;
    private readonly StepDriver<ChainKey32> _driver = new();

    /// <summary>Index n of the step measured.</summary>
    [Params(27)]
    public int StepIndex { get; set; }

    [Params(1, 2)]
    public int Threads { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var cell = new TranslationCell([new CellTerm("ZZ", 1.0), new CellTerm("X", 1.05), new CellTerm("Z", 0.5)]);
        var hm = cell.OpenChain(Sites);
        _h = hm.Compile<ChainKey32>();
        PauliOperator<ChainKey32>? last = null, before = null;
        var r = LanczosEngine.Run(new PlainBasis<ChainKey32>(_h), PauliOperator<ChainKey32>.Single(PauliString.Single(Sites, Sites / 2, 'Z')),
            new LanczosOptions { Depth = StepIndex - 1, Threads = 2 }, "bench", Sites, (_, o) =>
            {
                before = last;
                last = o;
            }, stepOperators: true);
        _curOp = last!;
        _prevOp = before!;
        _cur = SlotVector<ChainKey32>.From(_curOp);
        _prev = SlotVector<ChainKey32>.From(_prevOp);
        _b = r.B[^1];
        var s = r.Steps;
        _predicted = (long)Math.Ceiling(_cur.Count * Math.Max(1.0, (double)s[^1].Strings / s[^2].Strings) * 1.1);
        Console.WriteLine($"// step {StepIndex}: O_(n-1) has {_cur.Count} strings, O_(n-2) {_prev.Count}");
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _cur.Dispose();
        _prev.Dispose();
        _driver.Dispose();
    }

    [Benchmark]
    public double Step()
    {
        var basis = new PlainBasis<ChainKey32>(_h);
        using var a = LanczosEngine.ExactStep(_driver, basis, _cur, _prev, _b, _predicted, Threads);
        double bn = Math.Sqrt(LanczosEngine.NormSquared(a, basis));
        LanczosEngine.ScaleAndExtent(a, 1 / bn, Threads);
        return bn;
    }

    [Benchmark]
    public double ManagedStep()
    {
        var acc = PauliAccumulator<ChainKey32>.For(Sites, _predicted);
        LanczosEngine.Accumulate(new PlainBasis<ChainKey32>(_h), _curOp, _prevOp, _b, acc, Threads, _ => true);
        var a = acc.ToOperator(Threads);
        double bn = a.Norm();
        a.Scale(1 / bn);
        return bn;
    }

    [Benchmark]
    public double Run()
    {
        var cell = new TranslationCell([new CellTerm("ZZ", 1.0), new CellTerm("X", 1.05), new CellTerm("Z", 0.5)]);
        var r = InfiniteChainLanczos.Run(cell, "Z", new LanczosOptions { Depth = 24, Threads = Threads, MemoryBudgetBytes = 4L << 30 });
        return r.B[^1];
    }
}
