using OpGrowth.Sweeps;

namespace OpGrowth.Tests.Sweeps;

/// <summary>
/// Weighted least squares against the textbook closed form for a straight line, model preference on
/// data drawn from each law, and the bootstrap error against its analytic limit.
/// </summary>
public class ScalingFitTests
{
    [Fact]
    public void Fit_ExactLogData_RecoversParameters()
    {
        double[] n = [8, 12, 16, 24, 32];
        var y = n.Select(x => 0.7 + 1.3 * Math.Log(x)).ToArray();
        var f = ScalingFit.Fit("log", n, y, [0.01, 0.01, 0.01, 0.01, 0.01]);
        // Tolerance 1e-10: a 5x2 QR solve on O(1) numbers, rounding only.
        Assert.Equal(0.7, f.A, 1e-10);
        Assert.Equal(1.3, f.Slope, 1e-10);
        Assert.True(f.ChiSquared < 1e-16);
    }

    [Fact]
    public void Fit_Weighted_MatchesClosedFormStraightLine()
    {
        // Source: W. H. Press et al., Numerical Recipes, 3rd ed., Cambridge 2007, section 15.2 (fitting a straight line):
        // S = sum w, Sx = sum w x, Sy, Sxx, Sxy with w = 1/sigma^2; D = S Sxx - Sx^2;
        // a = (Sxx Sy - Sx Sxy)/D, b = (S Sxy - Sx Sy)/D, var a = Sxx/D, var b = S/D.
        double[] n = [8, 10, 12, 16, 20, 24];
        double[] y = [2.1, 2.6, 3.05, 4.1, 5.2, 5.9];
        double[] s = [0.05, 0.1, 0.08, 0.2, 0.15, 0.3];
        double S = 0, Sx = 0, Sy = 0, Sxx = 0, Sxy = 0;
        for (int i = 0; i < n.Length; i++)
        {
            double w = 1 / (s[i] * s[i]);
            S += w;
            Sx += w * n[i];
            Sy += w * y[i];
            Sxx += w * n[i] * n[i];
            Sxy += w * n[i] * y[i];
        }
        double d = S * Sxx - Sx * Sx;
        double a = (Sxx * Sy - Sx * Sxy) / d, b = (S * Sxy - Sx * Sy) / d;
        var f = ScalingFit.Fit("linear", n, y, s);
        double chi2 = n.Select((x, i) => Math.Pow((y[i] - a - b * x) / s[i], 2)).Sum();
        double scale = Math.Max(1, chi2 / (n.Length - 2));
        // Tolerance 1e-10 relative: the two routes differ only by rounding.
        Assert.Equal(a, f.A, 1e-10);
        Assert.Equal(b, f.Slope, 1e-10);
        Assert.Equal(chi2, f.ChiSquared, 1e-8);
        Assert.Equal(Math.Sqrt(Sxx / d * scale), f.AError, 1e-10);
        Assert.Equal(Math.Sqrt(S / d * scale), f.SlopeError, 1e-10);
        Assert.Equal(1 / b, f.V!.Value, 1e-9);
        Assert.Equal(f.SlopeError / (b * b), f.VError!.Value, 1e-9);
        Assert.Equal(chi2 + 4, f.Aic, 1e-8);
        Assert.Equal(chi2 + 2 * Math.Log(6), f.Bic, 1e-8);
    }

    [Theory]
    [InlineData("linear")]
    [InlineData("log")]
    public void Compare_DataFromOneLaw_PrefersThatLaw(string law)
    {
        double[] n = [8, 12, 16, 24, 32, 48, 64];
        var rng = new Random(11);
        double sigma = 0.02;
        var y = n.Select(x => (law == "log" ? 1 + 2 * Math.Log(x) : 1 + 0.25 * x) + sigma * Gauss(rng)).ToArray();
        var c = FitComparison.Compare(n, y, n.Select(_ => sigma).ToArray());
        Assert.Equal(law, c.Preferred);
        Assert.Equal("very strong", c.Strength);
        Assert.True((law == "log" ? c.LogWeight : c.LinearWeight) > 0.99);
        Assert.Equal(c.DeltaAic, c.DeltaBic, 1e-9);    // two parameters each: the penalties cancel
    }

    [Fact]
    public void Compare_TwoCloseLaws_FewPoints_SaysNotDistinguishable()
    {
        // Over N = 8..12 with large errors ln N and N are both straight enough.
        double[] n = [8, 10, 12];
        double[] y = [1.0, 1.2, 1.4];
        var c = FitComparison.Compare(n, y, [0.3, 0.3, 0.3]);
        Assert.Equal("neither", c.Preferred);
        Assert.Equal("not distinguishable", c.Strength);
    }

    [Fact]
    public void Compare_ThreeSizesNeitherLawFits_ClaimsNoEvidence()
    {
        // Three sizes, one realisation, errors far smaller than the scatter: both fits have chi2/dof >> 1 (the case
        // that once printed "very strong evidence, Akaike weight 1.000"). A lower AIC between two laws that both
        // fail the chi^2 test at the 1% level is not evidence (Eadie et al. 1971; common practice).
        double[] n = [8, 10, 12];
        double[] y = [2.0, 3.1, 3.3];
        var c = FitComparison.Compare(n, y, [0.05, 0.05, 0.05]);
        Assert.True(c.Log.ReducedChiSquared > 10 && c.Linear.ReducedChiSquared > 10, $"{c.Log.ReducedChiSquared} {c.Linear.ReducedChiSquared}");
        Assert.Equal("neither", c.Preferred);
        Assert.Equal("none", c.Strength);
        Assert.Contains("neither law describes the data", c.Verdict);
        Assert.DoesNotContain("strong", c.Verdict);
        Assert.DoesNotContain("1.000", c.Verdict);
    }

    [Fact]
    public void Compare_FewSizesOrNoErrors_AtMostWeak()
    {
        // Good fits on three sizes: one degree of freedom per law, so at most weak evidence however large Delta AIC is.
        double[] n = [8, 16, 32];
        var y = n.Select(x => 1 + 0.25 * x).ToArray();
        var three = FitComparison.Compare(n, y, [0.01, 0.01, 0.01]);
        Assert.Equal("linear", three.Preferred);
        Assert.Equal("weak", three.Strength);
        Assert.Contains("only 3 sizes", three.Verdict);
        // Seven sizes without error estimates: nothing to test the fits against.
        double[] n7 = [8, 12, 16, 24, 32, 48, 64];
        var unweighted = FitComparison.Compare(n7, n7.Select(x => 1 + 0.25 * x + 0.01 * Math.Sin(x)).ToArray(), n7.Select(_ => 0.0).ToArray());
        Assert.Equal("linear", unweighted.Preferred);
        Assert.Equal("weak", unweighted.Strength);
        Assert.Contains("no error estimates", unweighted.Verdict);
    }

    [Fact]
    public void Bootstrap_StandardError_ApproachesAnalyticLimit()
    {
        // For the mean, the bootstrap error tends to sqrt(sum (x - mean)^2) / n (Efron 1979).
        var rng = new Random(5);
        var x = Enumerable.Range(0, 40).Select(_ => 3 + Gauss(rng)).ToArray();
        double m = x.Average();
        double analytic = Math.Sqrt(x.Sum(v => (v - m) * (v - m))) / x.Length;
        double? boot = Bootstrap.StandardError(x);
        // Monte Carlo error of a standard deviation from B = 2000 resamples is about 1/sqrt(2B) = 1.6%: allow 5% (3 sigma).
        Assert.InRange(boot!.Value / analytic, 0.95, 1.05);
        Assert.Equal(boot, Bootstrap.StandardError(x));     // fixed stream: reproducible
        Assert.Null(Bootstrap.StandardError([1.0]));
        Assert.Equal(0, Bootstrap.StandardError([2.0, 2.0, 2.0]));
    }

    [Fact]
    public void Collect_SyntheticLinearLaw_AveragesAndFitsRecoverTheLaw()
    {
        using var kit = new SweepTestKit();
        var plan = kit.LoadPlan(SweepTestKit.SyntheticPlan(sizes: "[8, 12, 16, 24, 32]", seeds: "{ from = 1, count = 6 }", law: "linear", noise: 0.02));
        var points = plan.Expand();
        string dir = kit.Path("out");
        var store = new PointStore(dir);
        SweepManifest.From(plan, points).Save(store.ManifestPath);
        new SweepExecutor(store, new SyntheticPointRunner()).Run(points, new SweepExecution(2, 1L << 40), default);
        var c = SweepCollector.Collect(dir);
        var s = Assert.Single(c.Series);
        Assert.Equal(5, s.Data.Count);
        Assert.All(s.Data, a => Assert.Equal(6, a.Seeds));
        Assert.All(s.Data, a => Assert.True(a.TStarStatError > 0));
        // Truncation error is kept apart: 1% of t* (synthetic), not mixed into the statistical one.
        Assert.All(s.Data, a => Assert.Equal(0.01 * a.TStar!.Value, a.TStarTruncationError!.Value, 1e-12));
        var cmp = s.Comparison!;
        Assert.Equal("linear", cmp.Preferred);
        // True slope 1/v = 0.25: within 3 sigma of the fit (2% scatter on t* over 6 seeds).
        Assert.InRange(cmp.Linear.Slope, 0.25 - 3 * cmp.Linear.SlopeError, 0.25 + 3 * cmp.Linear.SlopeError);
        var files = c.Write(dir);
        Assert.Equal(6, files.Count);
        Assert.Equal(points.Count + 1, File.ReadAllLines(Path.Combine(dir, "table.csv")).Length);
        Assert.Contains("fit-linear", File.ReadAllText(Path.Combine(dir, "series.csv")), StringComparison.Ordinal);
    }

    private static double Gauss(Random r) => Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());
}
