using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Krylov;

/// <summary>Translation-class storage (Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019), methods) against plain storage.</summary>
public class ExtensiveLanczosTests
{
    private static List<PauliTerm> SumOverRing(string letters, int l)
        => Enumerable.Range(0, l).Select(j => new PauliTerm(TranslationCell.Place(letters, j, l, true), 1.0)).ToList();

    [Theory]
    [InlineData("Z", 8)]
    [InlineData("XZ", 7)]
    [InlineData("Y", 6)]
    public void RunRing_SmallPeriodicChain_AgreesWithPlainMode(string probe, int l)
    {
        // Plain mode stores every string of sum_j T^j O on the ring; the class mode one representative per
        // rotation class (with class-size weights). Same b_n up to rounding; the depth reaches the point where
        // strings wrap around the ring, and includes strings with period < L (e.g. Z on every site).
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        int depth = 14;
        var plain = LanczosRecursion.Run(cell.Ring(l), SumOverRing(probe, l), KrylovTestModels.Options(depth));
        var classes = ExtensiveLanczos.RunRing(cell, l, probe, KrylovTestModels.Options(depth));
        Assert.Equal(plain.B.Count, classes.B.Count);
        for (int n = 0; n < plain.B.Count; n++)
            Assert.True(Math.Abs(plain.B[n] - classes.B[n]) <= 1e-11 * plain.B[n], $"b_{n + 1}: plain {plain.B[n]} vs classes {classes.B[n]}");
        // Memory: the class mode holds about L times fewer strings.
        Assert.True(classes.Steps[^1].Strings * (l - 1) <= plain.Steps[^1].Strings * 1.0 + l, $"{classes.Steps[^1].Strings} vs {plain.Steps[^1].Strings}");
    }

    [Fact]
    public void RunLine_MatchesPlainRingWhileStringsFitAroundRing()
    {
        // On a ring of L sites the extensive operator evolves as on the infinite line while every string (span s)
        // together with the terms touching it (s + 2r) fits without wrapping: s + 2r <= L.
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        const int l = 14;
        const int depth = 18;
        var line = ExtensiveLanczos.RunLine(cell, "Z", KrylovTestModels.Options(depth));
        var plain = LanczosRecursion.Run(cell.Ring(l), SumOverRing("Z", l), KrylovTestModels.Options(depth));
        int checkedSteps = 0;
        for (int n = 1; n <= depth; n++)
        {
            // b_n uses O_{n-1}: valid while O_{n-1}'s span + 2r fits in L (O_0 spans 1).
            int span = n == 1 ? 1 : line.Steps[n - 2].MaxSpan;
            if (span + 2 * cell.Range > l) break;
            Assert.True(Math.Abs(line.B[n - 1] - plain.B[n - 1]) <= 1e-11 * plain.B[n - 1], $"b_{n}: line {line.B[n - 1]} vs ring {plain.B[n - 1]}");
            checkedSteps++;
        }
        Assert.True(checkedSteps >= 12, $"only {checkedSteps} steps compared");
    }

    [Fact]
    public void RunLine_XXChainTotalZ_IsConserved()
    {
        // sum_j Z_j commutes with the XX chain: the Krylov space closes at once (b_1 = 0). Conservation law check.
        var r = ExtensiveLanczos.RunLine(KrylovTestModels.XX(0.5), "Z", KrylovTestModels.Options(4));
        Assert.Empty(r.B);
        Assert.Equal(LanczosStopReason.KrylovSpaceClosed, r.StopReason);
    }
}
