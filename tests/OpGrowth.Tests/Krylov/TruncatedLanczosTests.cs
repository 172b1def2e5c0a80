using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Krylov;

/// <summary>Truncated recursion, budgets, re-orthogonalization and the memory budget.</summary>
public class TruncatedLanczosTests
{
    private static readonly TranslationCell Mfim = KrylovTestModels.MixedIsing(1, 1.05, 0.5);

    [Fact]
    public void Run_BudgetAboveStringCount_EqualsExactBitForBit()
    {
        // A budget that never binds must not change a single bit (truncation is skipped, same arithmetic).
        var exact = InfiniteChainLanczos.Run(Mfim, "Z", KrylovTestModels.Options(12));
        var big = InfiniteChainLanczos.Run(Mfim, "Z", KrylovTestModels.Options(12, maxStrings: 1_000_000));
        Assert.Equal(exact.B, big.B);
        Assert.True(big.IsExact);
    }

    [Fact]
    public void Run_TwoBudgets_SpreadBoundsTheErrorAndDiscardedWeightIsRecorded()
    {
        // Exact string counts reach about 2e5 at n = 22; budgets 1000..16000 cut from n = 12 on.
        const int depth = 22;
        var exact = InfiniteChainLanczos.Run(Mfim, "Z", KrylovTestModels.Options(depth));
        var est = TruncatedLanczos.Run(m => InfiniteChainLanczos.Run(Mfim, "Z", KrylovTestModels.Options(depth, m)), [16000, 1000, 4000]);
        Assert.Equal([1000L, 4000L, 16000L], est.Budgets);
        Assert.Equal(depth, est.B.Count);
        var small = est.Runs[0];
        Assert.Contains(small.Steps, s => s.DiscardedWeight > 0);
        Assert.All(small.Steps, s => Assert.True(s.Strings <= 1000));
        // Exact while nothing was dropped.
        int firstCut = small.Steps.First(s => s.DiscardedWeight > 0).N;
        for (int n = 1; n < firstCut; n++) Assert.Equal(0, est.Uncertainty[n - 1]);
        // The larger budget is closer to exact than the spread claims, at every n (a property of this
        // well-converging example, not a theorem: the spread is an estimate).
        double worst = 0;
        for (int n = 1; n <= depth; n++)
        {
            double err = Math.Abs(est.B[n - 1] - exact.B[n - 1]);
            worst = Math.Max(worst, err);
            Assert.True(err <= est.Uncertainty[n - 1] + 1e-12, $"b_{n}: error {err} > spread {est.Uncertainty[n - 1]}");
        }
        Assert.True(worst > 0);
    }

    [Theory]
    [InlineData(Reorthogonalization.Full)]
    [InlineData(Reorthogonalization.Partial)]
    public void Run_Reorthogonalized_MatchesPlainRecursionEarlyAndReportsMemory(Reorthogonalization kind)
    {
        // Exact (no truncation) with re-orthogonalization on a small random system: must equal the plain recursion
        // early on (the subtracted overlaps are rounding-sized), and the kept vectors cost memory that is reported.
        var h = KrylovTestModels.Random2Local(5, 3);
        var p = PauliString.Parse("Z_2", 5);
        var plain = LanczosRecursion.Run(h, p, KrylovTestModels.Options(12));
        var re = LanczosRecursion.Run(h, p, KrylovTestModels.Options(12) with { Reorthogonalize = kind, ReorthogonalizationWindow = 4 });
        for (int n = 0; n < 12; n++) Assert.True(Math.Abs(plain.B[n] - re.B[n]) < 1e-10, $"b_{n + 1}: {plain.B[n]} vs {re.B[n]}");
        Assert.True(re.ReorthogonalizationBytes > 0);
        Assert.All(re.Steps, s => Assert.True(s.OrthogonalityLoss < 1e-10));
    }

    [Fact]
    public void Run_FullReorthogonalization_ClosesKrylovSpaceOfSmallSystemAtItsDimension()
    {
        // Z_0 under H = X_0 + Z_0 Z_1 on 2 qubits: the operator space reachable from Z_0 is finite; with full
        // re-orthogonalization the recursion ends exactly (b_n -> 0) instead of cycling on rounding errors.
        var h = new Hamiltonian(2, [new PauliTerm(PauliString.Parse("X_0", 2), 0.7), new PauliTerm(PauliString.Parse("Z_0 Z_1", 2), 1.3)]);
        var r = LanczosRecursion.Run(h, PauliString.Parse("Z_0", 2), KrylovTestModels.Options(30) with { Reorthogonalize = Reorthogonalization.Full });
        Assert.Equal(LanczosStopReason.KrylovSpaceClosed, r.StopReason);
        Assert.True(r.B.Count < 16); // at most 15 non-identity strings on 2 qubits
    }

    [Fact]
    public void Run_SmallMemoryBudget_StopsCleanlyWithCoefficientsSoFar()
    {
        var opt = KrylovTestModels.Options(40) with { MemoryBudgetBytes = 8L << 20, Threads = 1 };
        var r = InfiniteChainLanczos.Run(Mfim, "Z", opt);
        Assert.Equal(LanczosStopReason.MemoryBudget, r.StopReason);
        Assert.Contains("memory budget", r.StopMessage);
        Assert.InRange(r.B.Count, 5, 39);
        // Same chain (positions fix the summation order) and thread count independence (PauliMapper): bit for bit.
        var exact = InfiniteChainLanczos.Run(Mfim, "Z", KrylovTestModels.Options(r.B.Count), sites: r.Sites);
        Assert.Equal(exact.B, r.B);
    }
}
