using MathNet.Numerics;
using OpGrowth.Krylov;

namespace OpGrowth.Tests.Krylov;

/// <summary>The Krylov-chain integrator against closed forms (check-values.md table; Parker et al., PRX 9, 041017 (2019)).</summary>
public class KrylovChainTests
{
    // The integrator is exact up to Chebyshev terms below 1e-17 and rounding over a few hundred terms: 1e-12.
    private const double Tol = 1e-12;

    [Fact]
    public void Evolve_SechFamilyEta1Alpha1_MatchesPublishedValuesAtT1()
    {
        // Source: check-values.md [V]: b_n = alpha sqrt(n(n-1+eta)), eta = 1, alpha = 1: C(1) = 0.6480542737, K(1) = 1.38109785.
        var r = KrylovChain.Evolve(n => n, [0, 1]);
        Assert.Equal(0.6480542737, r.Autocorrelation[1], 10);
        Assert.Equal(1.38109785, r.Complexity[1], 8);
    }

    [Theory]
    [InlineData(1.0, 1.0, 3.0)]
    [InlineData(0.7, 2.0, 3.0)]
    [InlineData(1.3, 0.5, 2.0)]
    public void Evolve_SechFamily_MatchesClosedForm(double alpha, double eta, double tMax)
    {
        // Source: Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019): b_n = alpha sqrt(n(n-1+eta)) gives
        // C = sech(alpha t)^eta and K = eta sinh(alpha t)^2.
        // tMax keeps alpha t <= 3: the wave function then spans about 10^4 chain sites (geometric tail tanh(alpha t)^2n).
        var times = KrylovDynamics.Grid(tMax, 31);
        var r = KrylovChain.Evolve(n => alpha * Math.Sqrt(n * (n - 1 + eta)), times);
        for (int i = 0; i < times.Length; i++)
        {
            double t = times[i];
            Assert.Equal(Math.Pow(1 / Math.Cosh(alpha * t), eta), r.Autocorrelation[i], 11);
            double k = eta * Math.Pow(Math.Sinh(alpha * t), 2);
            Assert.True(Math.Abs(r.Complexity[i] - k) <= Tol * Math.Max(1, k) * 10, $"K({t}) = {r.Complexity[i]} vs {k}");
        }
        Assert.True(r.NormError < 1e-12);
    }

    [Fact]
    public void Evolve_SqrtN_IsGaussian()
    {
        // Source: check-values.md: b_n = omega sqrt(n) gives C = exp(-omega^2 t^2 / 2), K = omega^2 t^2.
        const double w = 1.7;
        var times = KrylovDynamics.Grid(4, 41);
        var r = KrylovChain.Evolve(n => w * Math.Sqrt(n), times);
        for (int i = 0; i < times.Length; i++)
        {
            double t = times[i];
            Assert.Equal(Math.Exp(-w * w * t * t / 2), r.Autocorrelation[i], 12);
            Assert.Equal(w * w * t * t, r.Complexity[i], 9);
        }
    }

    [Fact]
    public void Evolve_ConstantB_IsJ1Ratio()
    {
        // Source: check-values.md: b_n = b for all n gives C = J_1(2bt)/(bt). MathNet's BesselJ is accurate to 3e-15 (dependencies.md).
        const double b = 0.9;
        var times = KrylovDynamics.Grid(10, 51);
        var r = KrylovChain.Evolve(_ => b, times);
        for (int i = 1; i < times.Length; i++)
        {
            double t = times[i];
            Assert.Equal(SpecialFunctions.BesselJ(1, 2 * b * t) / (b * t), r.Autocorrelation[i], 12);
        }
    }

    [Fact]
    public void Evolve_FirstSqrt2ThenConstant_IsJ0()
    {
        // Source: check-values.md: b_1 = sqrt(2) b, then b: C = J_0(2bt).
        const double b = 1.1;
        var times = KrylovDynamics.Grid(10, 51);
        var r = KrylovChain.Evolve(n => n == 1 ? Math.Sqrt(2) * b : b, times);
        for (int i = 0; i < times.Length; i++) Assert.Equal(SpecialFunctions.BesselJ(0, 2 * b * times[i]), r.Autocorrelation[i], 12);
    }

    [Fact]
    public void BesselSeries_MatchesMathNet()
    {
        // Miller recurrence against MathNet's BesselJ (independent implementation, 3e-15 per dependencies.md).
        foreach (double z in new[] { 0.01, 0.5, 3.0, 19.7, 60.0 })
        {
            var j = new double[(int)z + 40];
            BesselSeries.Fill(z, j);
            for (int k = 0; k < j.Length; k++)
            {
                double refv = SpecialFunctions.BesselJ(k, z);
                Assert.True(Math.Abs(j[k] - refv) < 1e-13, $"J_{k}({z}) = {j[k]} vs {refv}");
            }
        }
    }

    [Fact]
    public void SpectralFunction_ConstantB_IsSemicircleAndNormalised()
    {
        // Source: b_n = b for all n: C = J_1(2bt)/(bt), whose Fourier transform is Phi(w) = sqrt(4b^2 - w^2)/b^2 for |w| < 2b
        // (semicircle); the integral of Phi dw/(2 pi) equals C(0) = 1. Broadening 0.02 smooths the cut fraction: 2% tolerance away from the edges.
        const double b = 1.0;
        var omegas = Enumerable.Range(0, 4001).Select(i => -4 + 8.0 * i / 4000).ToArray();
        var phi = KrylovSpectrum.SpectralFunction(_ => b, 4000, omegas, 0.02);
        double integral = 0;
        for (int i = 1; i < omegas.Length; i++) integral += 0.5 * (phi[i] + phi[i - 1]) * (omegas[i] - omegas[i - 1]);
        Assert.Equal(1.0, integral / (2 * Math.PI), 2);
        int mid = 2000; // omega = 0
        Assert.Equal(2.0, phi[mid], 1);
    }
}
