using OpGrowth.Analysis;

namespace OpGrowth.Tests.Analysis;

/// <summary>Derived figures on synthetic series with known answers.</summary>
public class ScramblingAnalysisTests
{
    [Fact]
    public void LinearFit_AgreesWithMathNetAndTextbookErrors()
    {
        // Reference: MathNet Fit.Line for slope and intercept; standard errors from the textbook formulas
        // se(b) = sqrt(RSS/(n-2)/Sxx), computed here by hand for a 4-point set. Tolerance 1e-12 (rounding).
        double[] x = [0, 1, 2, 3];
        double[] y = [1, 3, 2, 5];
        var f = LinearFit.Fit(x, y);
        var (a, b) = MathNet.Numerics.Fit.Line(x, y);
        Assert.Equal(b, f.Slope, 12);
        Assert.Equal(a, f.Intercept, 12);
        // Sxx = 5, residuals: y - (1.1 + 1.1 x) = -0.1, 0.8, -1.3, 0.6 -> RSS = 2.7, s^2 = 1.35, se = sqrt(0.27).
        Assert.Equal(Math.Sqrt(0.27), f.SlopeError, 12);
    }

    private static ScramblingInput Front(double v, int n, int j0, double width, double dt, int records, bool oneD = true)
    {
        var times = Enumerable.Range(0, records).Select(i => i * dt).ToArray();
        var rho = times.Select(t => Enumerable.Range(0, n).Select(j =>
        {
            double d = Math.Abs(j - j0);
            return 0.75 / (1 + Math.Exp((d - v * t) / width));
        }).ToArray()).ToArray();
        var mean = rho.Select(r => r.Sum()).ToArray();
        return new ScramblingInput
        {
            N = n,
            Times = times,
            MeanSize = mean,
            SiteWeights = rho,
            ProbeSites = [j0],
            Geometry = oneD ? LatticeGeometry.Chain(n) : new LatticeGeometry(n, (a, b) => Math.Abs(a - b), false, "test"),
        };
    }

    [Fact]
    public void ButterflyVelocity_SyntheticBallisticFront_RecoversVelocity()
    {
        // rho_j(t) = (3/4) / (1 + exp((|j - j0| - v t) / w)): the half-height front moves at exactly v; the
        // 0.25 and 0.75 fronts move at v too, shifted. Tolerance 1% (interpolation between records at dt = 0.1).
        var input = Front(1.7, 81, 40, 1.5, 0.1, 300);
        var f = ScramblingAnalysis.Analyze(input);
        Assert.NotNull(f.Butterfly);
        var p = f.Butterfly!.Primary;
        Assert.Equal(0.375, p.Threshold, 12);
        Assert.True(Math.Abs(p.Velocity!.Value - 1.7) < 0.017, $"v = {p.Velocity}");
        Assert.True(p.MaxDistance <= 39, "window ends before the boundary");
        Assert.All(f.Butterfly.Sensitivity, s => Assert.True(Math.Abs(s.Velocity!.Value - 1.7) < 0.03, $"{s.ThresholdFraction}: {s.Velocity}"));
        Assert.True(f.Butterfly.ThresholdSpread < 0.05);
        Assert.Equal("linear", f.Growth.Regime);
    }

    [Fact]
    public void ButterflyVelocity_AllToAll_IsNotApplicable()
    {
        var input = Front(1.0, 10, 3, 1, 0.1, 50) with { Geometry = LatticeGeometry.AllToAll(10) };
        var f = ScramblingAnalysis.Analyze(input);
        Assert.Null(f.Butterfly);
        Assert.Contains("no front", f.ButterflyNote);
    }

    [Fact]
    public void GrowthRate_ExponentialSize_RecoversRateOffOneDimension()
    {
        // n(t) = 1 + 0.05 (e^{2t} - 1): n - n(0) = 0.05 (e^{2t} - 1), whose logarithm bends by ln(1 - e^{-2t}) at the
        // start of the window (excess >= 0.5, i.e. e^{2t} >= 11): the fitted rate is 2 to within 3% (bias of the
        // ln(n - n(0)) estimator itself), and the regime must be exponential.
        int n = 200;
        var times = Enumerable.Range(0, 60).Select(i => i * 0.05).ToArray();
        var mean = times.Select(t => 1 + 0.05 * (Math.Exp(2 * t) - 1)).ToArray();
        var rho = times.Select(_ => new double[n]).ToArray();
        var input = new ScramblingInput { N = n, Times = times, MeanSize = mean, SiteWeights = rho, ProbeSites = [0], Geometry = LatticeGeometry.AllToAll(n) };
        var g = ScramblingAnalysis.Analyze(input).Growth;
        Assert.Equal("exponential", g.Regime);
        Assert.True(Math.Abs(g.SizeExponential.Rate!.Value - 2) < 0.06, $"rate {g.SizeExponential.Rate}");
        Assert.True(g.SizeExponential.WindowStart >= 1.0 && g.SizeExponential.Points >= 4);
    }

    [Fact]
    public void ScramblingTime_LinearGrowth_InterpolatesExactly()
    {
        // n(t) = 1 + 2t on a 20-qubit system: 3N/8 = 7.5 is reached at t* = 3.25 exactly; the quadratic
        // check agrees (zero grid uncertainty for a straight line).
        var t = Enumerable.Range(0, 11).Select(i => 0.5 * i).ToArray();
        var n = t.Select(x => 1 + 2 * x).ToArray();
        var ts = ScramblingAnalysis.ScramblingTimeOf(t, n, 7.5, "test");
        Assert.Equal(3.25, ts.Value!.Value, 12);
        Assert.Equal(0, ts.GridUncertainty!.Value, 10);
        Assert.Equal(3.0, ts.BracketLow);
        Assert.Equal(3.5, ts.BracketHigh);
        var curved = ScramblingAnalysis.ScramblingTimeOf(t, t.Select(x => 1 + x * x).ToArray(), 7.5, "test");
        // Exact crossing sqrt(6.5) = 2.5495; linear interpolation between 2.5 and 3.0 errs by ~0.004.
        Assert.True(Math.Abs(curved.Value!.Value - Math.Sqrt(6.5)) < 0.01);
        Assert.True(curved.GridUncertainty > 1e-4 && Math.Abs(curved.Value.Value - Math.Sqrt(6.5)) <= 1.5 * curved.GridUncertainty!.Value);
    }

    [Fact]
    public void LadderConvergence_FlagsMovingFigures()
    {
        ScramblingFigures Fig(double v, double ts) => new()
        {
            Butterfly = new ButterflyVelocity { Primary = new FrontFit { Velocity = v } },
            Growth = new GrowthRates
            {
                SizeExponential = new GrowthFit { Quantity = "e", Window = "w" },
                SizeLinear = new GrowthFit { Quantity = "l", Window = "w" },
                OtocExponential = new GrowthFit { Quantity = "o", Window = "w" },
                Regime = "linear",
                RegimeReason = "r",
            },
            ScramblingTime = new ScramblingTime { Value = ts, Definition = "d" },
        };
        var list = BudgetConvergence.Compare([Fig(1.50, 10), Fig(1.49, 8), Fig(1.40, 6)], 0.05);
        var vb = list.Single(c => c.Figure == "butterflyVelocity");
        Assert.True(vb.Converged);
        Assert.Equal(0.01, vb.Movement!.Value, 12);
        Assert.Equal(0.09, vb.PreviousMovement!.Value, 12);
        var t = list.Single(c => c.Figure == "scramblingTime");
        Assert.False(t.Converged);
        Assert.Contains("not converged", t.Note);
    }
}
