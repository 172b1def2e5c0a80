using OpGrowth.Krylov;

namespace OpGrowth.Tests.Krylov;

/// <summary>Growth classification on synthetic sequences of known form (Parker et al., PRX 9, 041017 (2019) classes).</summary>
public class LanczosGrowthTests
{
    private static double[] Seq(Func<int, double> f, int count) => Enumerable.Range(1, count).Select(f).ToArray();

    [Fact]
    public void Fit_LinearWithNoise_PicksLinearAndRecoversSlope()
    {
        var rng = new Random(5);
        var b = Seq(n => 0.4 * n + 1.2 + 1e-3 * (rng.NextDouble() - 0.5), 34);
        var g = LanczosGrowth.Fit(b);
        Assert.Equal(GrowthClass.Linear, g.Best.Class);
        Assert.Equal(0.4, g.Alpha, 3);
        Assert.Equal(0.8, g.LyapunovBound, 2);
        Assert.Equal(12, g.WindowStart); // ceil(34/3)
    }

    [Fact]
    public void Fit_NOverLogN_PicksLinearOverLog()
    {
        var b = Seq(n => 2.0 * n / Math.Log(n + 1) + 0.3, 40); // not exactly the basis: n+1 inside the log
        var g = LanczosGrowth.Fit(b, 10, 40);
        Assert.Equal(GrowthClass.LinearOverLog, g.Best.Class);
    }

    [Fact]
    public void Fit_SqrtAndConstant_PickTheirClasses()
    {
        Assert.Equal(GrowthClass.SquareRoot, LanczosGrowth.Fit(Seq(n => 1.3 * Math.Sqrt(n), 20)).Best.Class);
        Assert.Equal(GrowthClass.Bounded, LanczosGrowth.Fit(Seq(n => 2 + 0.5 * Math.Pow(-1, n) / n, 30)).Best.Class);
    }
}
