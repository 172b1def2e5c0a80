using MathNet.Numerics;
using OpGrowth.Krylov;

namespace OpGrowth.Tests.Krylov;

/// <summary>Lanczos coefficients and autocorrelations of free chains against published closed forms (check-values.md).</summary>
public class ClosedFormLanczosTests
{
    /// <summary>
    /// Moments of C(t) = J_0(2t)^2 from its Taylor series: J_0(2t) = sum_m (-1)^m t^{2m} / (m!)^2, squared by a
    /// Cauchy product; C(t) = sum_k (-1)^k mu_{2k} t^{2k} / (2k)!, so mu_{2k} = (2k)! |[t^{2k}] C|.
    /// </summary>
    private static double Moment(int k)
    {
        double s = 0;
        for (int m = 0; m <= k; m++) s += 1 / (Sq(SpecialFunctions.Factorial(m)) * Sq(SpecialFunctions.Factorial(k - m)));
        return SpecialFunctions.Factorial(2 * k) * s;
    }

    private static double Sq(double x) => x * x;

    [Fact]
    public void XXChain_ZProbe_FirstCoefficientsMatchMomentsOfBesselSquared()
    {
        // Source: <Z_j(t) Z_j> = J_0(4 Jp t)^2 in the bulk of the XX chain (Brandt and Jacoby, Z. Phys. B 25, 37 (1976));
        // Jp = 1/2 gives J_0(2t)^2. mu_2 = b_1^2, mu_4 = b_1^2 (b_1^2 + b_2^2) (conventions.md).
        double mu2 = Moment(1), mu4 = Moment(2);
        double b1 = Math.Sqrt(mu2), b2 = Math.Sqrt(mu4 / mu2 - mu2);
        Assert.Equal(2.0, b1, 14);          // derivation check: the published b_1 = 4 Jp = 2
        Assert.Equal(Math.Sqrt(5), b2, 14); // and b_2 = sqrt(20) Jp = sqrt 5
        var r = InfiniteChainLanczos.Run(KrylovTestModels.XX(0.5), "Z", KrylovTestModels.Options(2));
        // Exact recursion on a few strings: only rounding separates the numbers.
        Assert.Equal(b1, r.B[0], 13);
        Assert.Equal(b2, r.B[1], 13);
    }

    [Fact]
    public void XXChain_ZProbe_AutocorrelationFromCoefficientsMatchesBesselSquaredToT4()
    {
        // Source: Brandt and Jacoby, Z. Phys. B 25, 37 (1976): C(t) = J_0(2t)^2 for H = (1/2) sum (XX + YY).
        const int depth = 60;
        var r = InfiniteChainLanczos.Run(KrylovTestModels.XX(0.5), "Z", KrylovTestModels.Options(depth));
        Assert.Equal(depth, r.B.Count);
        Assert.Equal(depth, r.VerifiedDepth);
        var fit = LanczosGrowth.Fit(r.B).Fits.First(f => f.Class == GrowthClass.Bounded);
        var times = KrylovDynamics.Grid(4, 81);
        var dyn = KrylovDynamics.Compute(r.B, fit, times);
        for (int i = 0; i < times.Length; i++)
        {
            double exact = Sq(SpecialFunctions.BesselJ(0, 2 * times[i]));
            // By t = 4 the Krylov wave has not reached n = 60 (phi_60 ~ (bt)^60/60! ~ 1e-28): the continuation
            // cannot matter; 1e-10 leaves room for rounding in 60 recursion steps and the Bessel reference (3e-15).
            Assert.True(Math.Abs(dyn.Main.Autocorrelation[i] - exact) < 1e-10, $"t={times[i]}: {dyn.Main.Autocorrelation[i]} vs {exact}");
        }
        Assert.True(dyn.MaxAutocorrelationChange < 1e-10);
    }

    [Fact]
    public void XXChain_XProbe_CoefficientsAreJpSqrt8n()
    {
        // Source: check-values.md [V; Brandt and Jacoby 1976, Capel and Perk 1977]: b_n(X_j) = Jp sqrt(8 n), Gaussian C(t).
        const double jp = 0.5;
        var r = InfiniteChainLanczos.Run(KrylovTestModels.XX(jp), "X", KrylovTestModels.Options(12));
        for (int n = 1; n <= 12; n++) Assert.Equal(jp * Math.Sqrt(8 * n), r.B[n - 1], 11);
    }

    [Fact]
    public void TransverseIsing_SelfDual_ZProbe_CoefficientsAre2JSqrtN()
    {
        // Source: check-values.md [V]: at h = J, b_n(Z_j) = 2 J sqrt(n) exactly, H = -J sum ZZ - h sum X.
        const double j = 0.8;
        var r = InfiniteChainLanczos.Run(KrylovTestModels.Tfim(j, j), "Z", KrylovTestModels.Options(16));
        Assert.Equal(16, r.VerifiedDepth);
        for (int n = 1; n <= 16; n++) Assert.Equal(2 * j * Math.Sqrt(n), r.B[n - 1], 11);
        var g = LanczosGrowth.Fit(r.B);
        Assert.Equal(GrowthClass.SquareRoot, g.Best.Class);
    }
}
