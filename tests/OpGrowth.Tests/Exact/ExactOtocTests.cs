using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Exact;

public class ExactOtocTests
{
    private static readonly double[] Grid = [0, 0.3, 0.8, 1.5, 2.5];

    /// <summary>Independent dense route: Tr(W(t) V W(t) V)/D with W(t) from Dense.Heisenberg.</summary>
    private static double DenseOtoc(Matrix<Complex> wt, PauliString v)
    {
        var dv = Dense.Of(v);
        return (wt * dv * wt * dv).Trace().Real / wt.RowCount;
    }

    [Fact]
    public void DenseSiteResolved_N6_MatchesKroneckerTraces()
    {
        // Source: Dense.Heisenberg + Dense.Of (MathNet eigendecomposition, Kronecker products).
        // Tolerance 1e-10: both routes are exact up to rounding of 64 x 64 products.
        const int n = 6;
        var h = TestModels.RandomLocal(n, 3); // complex H (Y terms)
        var w = PauliString.Parse("Z_1", n);
        var r = ExactOtoc.Run(h, new ExactOtocOptions { Operator = w, Times = Grid, Method = OtocMethod.Dense, Probes = [PauliString.Parse("X_2 Y_4", n)] });
        var dh = Dense.Of(n, h.Terms);
        for (int k = 0; k < Grid.Length; k++)
        {
            var wt = Dense.Heisenberg(dh, Dense.Of(w), Grid[k]);
            foreach (var site in r.Sites)
            {
                Assert.Equal(DenseOtoc(wt, PauliString.Single(n, site.Site, 'X')), site.X.Values[k], 10);
                Assert.Equal(DenseOtoc(wt, PauliString.Single(n, site.Site, 'Y')), site.Y.Values[k], 10);
                Assert.Equal(DenseOtoc(wt, PauliString.Single(n, site.Site, 'Z')), site.Z.Values[k], 10);
            }
            Assert.Equal(DenseOtoc(wt, PauliString.Parse("X_2 Y_4", n)), r.Probes[0].Values[k], 10);
            Assert.Equal(Dense.Inner(Dense.Of(w), wt).Real, r.Autocorrelation.Values[k], 10);
        }
    }

    [Fact]
    public void MeanSize_N5_EqualsPauliWeightSizeFromDecomposition()
    {
        // Source: OTOC-size identity n(t) = (3/4) sum_x (1 - Fbar_x) (check-values.md), checked against
        // sum_S |S| c_S^2 from the dense Pauli decomposition of W(t) (Dense.Decompose). Tolerance 1e-9.
        const int n = 5;
        var h = TestModels.MixedFieldIsing(n);
        var w = PauliString.Parse("Z_0", n);
        var times = new[] { 0.0, 0.7, 2.0 };
        var r = ExactOtoc.Run(h, new ExactOtocOptions { Operator = w, Times = times, Method = OtocMethod.Dense });
        Assert.NotNull(r.MeanSize);
        var dh = Dense.Of(n, h.Terms);
        for (int k = 0; k < times.Length; k++)
        {
            var dec = Dense.Decompose(n, Dense.Heisenberg(dh, Dense.Of(w), times[k]));
            double size = dec.Sum(kv => kv.Key.Count(c => c != 'I') * kv.Value.Magnitude * kv.Value.Magnitude);
            Assert.Equal(size, r.MeanSize!.Values[k], 9);
        }
        Assert.Equal(1.0, r.MeanSize!.Values[0], 12);
    }

    [Fact]
    public void Typicality_N8_AgreesWithDenseWithinStatisticalError()
    {
        // Source: quantum typicality, Bartsch and Gemmer, PRL 102, 110403 (2009): error of one estimate
        // ~ d^{-1/2} with d = 2^{N-1} = 128 (site blocks) or 2^N (probes). Fixed seed; the bound is five
        // reported standard errors plus a floor of 2^{-N/2}/sqrt(S) x 1 (guards a small reported SE).
        const int n = 8;
        var h = TestModels.MixedFieldIsing(n);
        var w = PauliString.Parse("Z_0", n);
        var times = new[] { 0.0, 1.0, 2.0, 3.5 };
        var probe = PauliString.Parse("Z_3 Z_4", n);
        var sites = new[] { 0, 2, 5 };
        var exact = ExactOtoc.Run(h, new ExactOtocOptions { Operator = w, Times = times, Sites = sites, Probes = [probe], Method = OtocMethod.Dense });
        const int samples = 8;
        var typ = ExactOtoc.Run(h, new ExactOtocOptions { Operator = w, Times = times, Sites = sites, Probes = [probe], Method = OtocMethod.Typicality, Samples = samples, Seed = 5, Threads = 1 });
        double floor = Math.Pow(2, -n / 2.0) / Math.Sqrt(samples);
        int checks = 0;
        for (int si = 0; si < sites.Length; si++)
        {
            foreach (var (e, t) in new[] { (exact.Sites[si].X, typ.Sites[si].X), (exact.Sites[si].Y, typ.Sites[si].Y), (exact.Sites[si].Z, typ.Sites[si].Z) })
            {
                for (int k = 0; k < times.Length; k++)
                {
                    double bound = 5 * t.Errors[k] + floor;
                    Assert.True(Math.Abs(e.Values[k] - t.Values[k]) <= bound, $"{t.Probe} t={times[k]}: exact {e.Values[k]:F4}, typical {t.Values[k]:F4} +- {t.Errors[k]:F4}");
                    checks++;
                }
            }
        }
        for (int k = 0; k < times.Length; k++)
        {
            Assert.True(Math.Abs(exact.Probes[0].Values[k] - typ.Probes[0].Values[k]) <= 5 * typ.Probes[0].Errors[k] + floor);
            Assert.True(Math.Abs(exact.Autocorrelation.Values[k] - typ.Autocorrelation.Values[k]) <= 5 * typ.Autocorrelation.Errors[k] + floor);
        }
        Assert.Equal(36, checks);
        // At t = 0 the site-block estimator is exact for sites away from W (F = 1, no noise: W V W V = 1).
        Assert.Equal(1.0, typ.Sites[1].X.Values[0], 10);
    }

    [Fact]
    public void FiniteTemperatureDense_N6_MatchesRegularisedTraceFromKroneckerRoute()
    {
        // Source: Tr(y W(t) y V y W(t) y V), y = rho^{1/4} (conventions.md; Maldacena, Shenker, Stanford 2016),
        // with rho^{1/4} from MathNet's eigendecomposition of Dense.Of(H). Tolerance 1e-10.
        const int n = 6;
        const double beta = 0.8;
        var h = TestModels.MixedFieldIsing(n);
        var w = PauliString.Parse("X_0", n);
        var r = ExactOtoc.Run(h, new ExactOtocOptions { Operator = w, Times = Grid, Method = OtocMethod.Dense, Beta = beta, Sites = [3] });
        var dh = Dense.Of(n, h.Terms);
        var evd = dh.Evd(Symmetricity.Hermitian);
        double z = evd.EigenValues.Sum(e => Math.Exp(-beta * e.Real));
        var y = evd.EigenVectors * Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => (Complex)(Math.Exp(-beta * e.Real / 4) / Math.Pow(z, 0.25))).ToArray()) * evd.EigenVectors.ConjugateTranspose();
        var v = Dense.Of(PauliString.Single(n, 3, 'Y'));
        for (int k = 0; k < Grid.Length; k++)
        {
            var wt = Dense.Heisenberg(dh, Dense.Of(w), Grid[k]);
            double want = (y * wt * y * v * y * wt * y * v).Trace().Real;
            Assert.Equal(want, r.Sites[0].Y.Values[k], 10);
        }
    }

    [Fact]
    public void FiniteTemperature_BetaToZero_EqualsInfiniteTemperature()
    {
        // Issue requirement: at beta = 0 the regularised OTOC equals the infinite-temperature one. The
        // imaginary-time path is exercised with beta = 1e-9 (first order in beta: difference ~ 1e-8)
        // against beta = 0 with the same random states; dense route likewise.
        const int n = 8;
        var h = TestModels.MixedFieldIsing(n);
        var w = PauliString.Parse("Z_0", n);
        var times = new[] { 0.0, 1.0, 2.5 };
        var common = new ExactOtocOptions { Operator = w, Times = times, Sites = [4], Method = OtocMethod.Typicality, Samples = 2, Seed = 3, Tolerance = 1e-12 };
        var inf = ExactOtoc.Run(h, common);
        var fin = ExactOtoc.Run(h, common with { Beta = 1e-9 });
        for (int k = 0; k < times.Length; k++)
        {
            Assert.Equal(inf.Sites[0].Z.Values[k], fin.Sites[0].Z.Values[k], 6);
            Assert.Equal(inf.Sites[0].Mean.Values[k], fin.Sites[0].Mean.Values[k], 6);
        }
        var dInf = ExactOtoc.Run(h, common with { Method = OtocMethod.Dense });
        var dFin = ExactOtoc.Run(h, common with { Method = OtocMethod.Dense, Beta = 1e-9 });
        for (int k = 0; k < times.Length; k++) Assert.Equal(dInf.Sites[0].X.Values[k], dFin.Sites[0].X.Values[k], 7);
    }

    [Fact]
    public void FiniteTemperatureTypicality_N8_AgreesWithDense()
    {
        // Typicality with imaginary-time propagation against dense traces at beta = 0.5; the effective
        // dimension shrinks with beta, so the bound is five standard errors plus 2^{-N/2}.
        const int n = 8;
        var h = TestModels.MixedFieldIsing(n);
        var w = PauliString.Parse("Z_0", n);
        var times = new[] { 0.0, 1.0, 2.0 };
        var o = new ExactOtocOptions { Operator = w, Times = times, Sites = [1], Beta = 0.5, Samples = 8, Seed = 2, Threads = 1 };
        var exact = ExactOtoc.Run(h, o with { Method = OtocMethod.Dense });
        var typ = ExactOtoc.Run(h, o with { Method = OtocMethod.Typicality });
        for (int k = 0; k < times.Length; k++)
        {
            double bound = 5 * typ.Sites[0].Z.Errors[k] + Math.Pow(2, -n / 2.0);
            Assert.True(Math.Abs(exact.Sites[0].Z.Values[k] - typ.Sites[0].Z.Values[k]) <= bound, $"t={times[k]}: {exact.Sites[0].Z.Values[k]:F4} vs {typ.Sites[0].Z.Values[k]:F4}");
        }
    }

    [Fact]
    public void XXChain_ZZOtoc_MatchesFreeFermionClosedForm()
    {
        // Source: check-values.md, free chains: XX chain H = Jp sum (XX + YY) + sum h_i Z_i, single-particle
        // h_{i,i+1} = 2 Jp, h_ii = 2 h_i, U = e^{-iht}; Z-Z OTOC F = 1 - 4|U_jr|^2 (1 - |U_jr|^2) on any open
        // chain, also with random fields. Dense traces at N = 8; tolerance 1e-9.
        const int n = 8;
        var rng = new Random(4);
        var fields = Enumerable.Range(0, n).Select(_ => rng.NextDouble() - 0.5).ToArray();
        var h = TestModels.XX(n, 1.0, fields);
        int j = 2;
        var times = new[] { 0.0, 0.4, 1.1, 2.0 };
        var r = ExactOtoc.Run(h, new ExactOtocOptions { Operator = PauliString.Single(n, j, 'Z'), Times = times, Method = OtocMethod.Dense });
        var hs = Matrix<double>.Build.Dense(n, n);
        for (int i = 0; i + 1 < n; i++)
        {
            hs[i, i + 1] = 2;
            hs[i + 1, i] = 2;
        }
        for (int i = 0; i < n; i++) hs[i, i] = 2 * fields[i];
        var evd = hs.Evd(Symmetricity.Symmetric);
        for (int k = 0; k < times.Length; k++)
        {
            var u = evd.EigenVectors.ToComplex() * Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(new Complex(0, -e.Real * times[k]))).ToArray()) * evd.EigenVectors.ToComplex().ConjugateTranspose();
            for (int site = 0; site < n; site++)
            {
                double p = u[j, site].Magnitude * u[j, site].Magnitude;
                Assert.Equal(1 - 4 * p * (1 - p), r.Sites[site].Z.Values[k], 9);
            }
        }
    }

    [Fact]
    public void XXChain_ZZOtocTypicalityN12_MatchesFreeFermionClosedForm()
    {
        // As above at N = 12 by typicality (closed form is exact for any N); bound five standard errors
        // plus 2^{-N/2}.
        const int n = 12;
        var h = TestModels.XX(n, 1.0);
        int j = 5;
        var times = new[] { 0.0, 0.6, 1.3 };
        var r = ExactOtoc.Run(h, new ExactOtocOptions { Operator = PauliString.Single(n, j, 'Z'), Times = times, Sites = [5, 7], Samples = 3, Seed = 8, Method = OtocMethod.Typicality });
        var hs = Matrix<double>.Build.Dense(n, n);
        for (int i = 0; i + 1 < n; i++)
        {
            hs[i, i + 1] = 2;
            hs[i + 1, i] = 2;
        }
        var evd = hs.Evd(Symmetricity.Symmetric);
        for (int k = 0; k < times.Length; k++)
        {
            var u = evd.EigenVectors.ToComplex() * Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(new Complex(0, -e.Real * times[k]))).ToArray()) * evd.EigenVectors.ToComplex().ConjugateTranspose();
            foreach (var s in r.Sites)
            {
                double p = u[j, s.Site].Magnitude * u[j, s.Site].Magnitude;
                double want = 1 - 4 * p * (1 - p);
                Assert.True(Math.Abs(want - s.Z.Values[k]) <= 5 * s.Z.Errors[k] + Math.Pow(2, -n / 2.0), $"site {s.Site} t={times[k]}: {want:F4} vs {s.Z.Values[k]:F4}");
            }
        }
    }

    [Fact]
    public void GrowthRate_SyntheticExponential_RecoversRateAndWindow()
    {
        // F(0) = 1 and C(t) = 1e-4 e^{2t} for t > 0 below saturation: slope 2 exactly; window [1e-3, 0.3] -> t in [ln(10)/2, ln(3000)/2] = [1.15, 4.0].
        var times = Enumerable.Range(0, 50).Select(i => 0.1 * i).ToArray();
        var f = times.Select(t => t == 0 ? 1.0 : 1 - Math.Min(1e-4 * Math.Exp(2 * t), 1.0)).ToArray();
        var fit = GrowthRate.Fit("test", times, f, beta: 1.0, low: 1e-3, high: 0.3);
        Assert.Equal(2.0, fit.Lambda, 10);
        Assert.InRange(fit.WindowStart, 1.15, 1.25);
        Assert.InRange(fit.WindowEnd, 3.95, 4.05);
        Assert.Equal(2.0 / (2 * Math.PI), fit.BoundRatio, 10);
    }
}

public class MeanSizeProbeTests
{
    [Fact]
    public void RandomSignProbe_N8_AgreesWithExactMeanSize()
    {
        // Source: OTOC-size identity n(t) = (3/4) sum_x (1 - Fbar_x) (check-values.md) evaluated exactly by
        // dense traces, against the random-sign (Hutchinson 1989) typicality estimate with 10 samples; the
        // bound is five reported standard errors plus 0.05 (a floor for a small sample SE).
        const int n = 8;
        var h = TestModels.MixedFieldIsing(n);
        var w = PauliString.Parse("Z_0", n);
        var times = new[] { 0.0, 0.8, 1.6, 3.0 };
        var exact = ExactOtoc.Run(h, new ExactOtocOptions { Operator = w, Times = times, Method = OtocMethod.Dense });
        var est = ExactOtoc.Run(h, new ExactOtocOptions { Operator = w, Times = times, Sites = [], EstimateMeanSize = true, Method = OtocMethod.Typicality, Samples = 10, Seed = 9 });
        Assert.Equal("random-sign probe", est.MeanSizeMethod);
        for (int k = 0; k < times.Length; k++)
        {
            double bound = 5 * est.MeanSize!.Errors[k] + 0.05;
            Assert.True(Math.Abs(exact.MeanSize!.Values[k] - est.MeanSize.Values[k]) <= bound,
                $"t={times[k]}: exact {exact.MeanSize.Values[k]:F4}, estimate {est.MeanSize.Values[k]:F4} +- {est.MeanSize.Errors[k]:F4}");
        }
    }
}

/// <summary>
/// The typicality engine runs the two branches of every time point on separate threads when it has two
/// threads and the state is large (N >= 15). Both schedules compute the same vectors with the same
/// series, so they must agree to rounding (tolerance 1e-10: sums of 2^15 amplitudes in a different
/// order and Chebyshev series summed on one thread instead of two).
/// </summary>
public class ExactOtocBranchParallelTests
{
    [Fact]
    public void Typicality_N15_TwoThreadBranchesEqualOneThread()
    {
        int n = 15;
        var h = TestModels.MixedFieldIsing(n);
        ExactOtocResult Run(int threads) => ExactOtoc.Run(h, new ExactOtocOptions
        {
            Operator = PauliString.Parse("Z_0", n),
            Times = [0.5, 1.0, 1.5],
            Sites = [7],
            Probes = [PauliString.Parse("X_3", n)],
            EstimateMeanSize = true,
            Samples = 1,
            Method = OtocMethod.Typicality,
            Threads = threads,
        });
        var a = Run(1);
        var b = Run(2);
        for (int k = 0; k < 3; k++)
        {
            Assert.Equal(a.Sites[0].Z.Values[k], b.Sites[0].Z.Values[k], 1e-10);
            Assert.Equal(a.Sites[0].X.Values[k], b.Sites[0].X.Values[k], 1e-10);
        }
        Assert.Equal(a.Cost.RealTimePropagations, b.Cost.RealTimePropagations);
    }
}
