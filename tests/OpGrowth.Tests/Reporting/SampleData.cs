using OpGrowth.Reporting;

namespace OpGrowth.Tests.Reporting;

/// <summary>
/// Synthetic, smooth inputs for the chart tests (shapes only; no physics is checked here). Small arrays keep
/// rendering fast.
/// </summary>
internal static class SampleData
{
    internal const int N = 8;
    internal static readonly double[] Times = Enumerable.Range(0, 41).Select(i => i * 0.15).ToArray();

    internal static double[] MeanSize() => Times.Select(t => 1 + (0.75 * N - 1) / (1 + Math.Exp(-1.8 * (t - 2.5)))).ToArray();

    internal static SizeDistributionSeries Size()
    {
        double[] n = MeanSize();
        var p = new double[N + 1, Times.Length];
        for (int i = 0; i < Times.Length; i++)
        {
            double s = 0;
            for (int k = 1; k <= N; k++) { p[k, i] = Math.Exp(-Math.Pow(k - n[i], 2) / (1 + 0.3 * n[i])); s += p[k, i]; }
            for (int k = 1; k <= N; k++) p[k, i] /= s;
        }
        return new SizeDistributionSeries(Times, p) { MeanSize = n };
    }

    internal static MeanSizeSeries Mean()
    {
        double[] n = MeanSize();
        return new MeanSizeSeries(Times, n, 0.75 * N)
        {
            ScramblingTime = new Measured(2.6, 0.1, "first time n(t) = 3N/8"),
            Budget = 100_000,
            Uncertainty = n.Select(x => 0.02 * x).ToArray(),
            Budgets = [new BudgetCurve(10_000, Times, n.Select((x, i) => x * (1 - 0.02 * Times[i])).ToArray())],
        };
    }

    internal static LightConeMap Cone()
    {
        const int l = 13;
        const double j0 = 6, v = 1.5;
        double[] pos = Enumerable.Range(0, l).Select(j => (double)j).ToArray();
        var values = new double[l, Times.Length];
        for (int j = 0; j < l; j++)
            for (int i = 0; i < Times.Length; i++)
                values[j, i] = 1 / (1 + Math.Exp((Math.Abs(j - j0) - v * Times[i]) / 0.7));
        return new LightConeMap(Times, pos, values)
        {
            Origin = j0,
            Front = new FrontFit(new Measured(1.49, 0.05, "front speed", new FitWindow(0.5, 3)), 0.1, 0.5),
        };
    }

    internal static LanczosSeries Lanczos()
    {
        double[] b = Enumerable.Range(1, 20).Select(k => 0.8 * k + 0.4 + 0.1 * Math.Sin(k)).ToArray();
        double[] fn = [1, 20];
        return new LanczosSeries(b)
        {
            Spread = b.Select((_, i) => 0.02 * i).ToArray(),
            Fit = new GrowthCurve("linear (chaotic)", fn, fn.Select(x => 0.8 * x + 0.4).ToArray())
            {
                Rate = new Measured(0.80, 0.01, "slope α", new FitWindow(4, 18, "n")),
            },
        };
    }

    internal static KrylovSeries Krylov() => new(Times,
        Times.Select(t => Math.Pow(Math.Sinh(0.8 * t), 2)).ToArray(),
        Times.Select(t => 1 / Math.Cosh(0.8 * t)).ToArray()) { LogComplexity = true };

    internal static OverlaySeries Overlay()
    {
        double[] exact = Times.Select(t => Math.Exp(-0.3 * t) * Math.Cos(t)).ToArray();
        return new OverlaySeries(Times, exact.Select((x, i) => x + 1e-4 * Math.Sin(5 * Times[i])).ToArray(), exact, "OTOC F(t)") { Tolerance = 1e-3 };
    }

    internal static ScramblingTimeSeries Scaling()
    {
        double[] ns = [6, 8, 10, 12, 14];
        return new ScramblingTimeSeries(ns, ns.Select(x => 0.4 + Math.Log(x)).ToArray(), ns.Select(_ => 0.08).ToArray())
        {
            Logarithmic = new ScalingFit(ScalingForm.Logarithmic, 0.4, 0.05, 1.0, 0.04) { ReducedChiSquare = 0.9 },
            Ballistic = new ScalingFit(ScalingForm.Ballistic, 1.5, 0.1, 6.0, 0.5) { ReducedChiSquare = 3.1 },
        };
    }

    internal static LineChartSpec Lines() => new("discarded", "Discarded weight", "Weight dropped per step for two budgets.",
        "time t (1/energy)", "discarded weight",
        [
            new LineSeries("budget 1e4", Times, Times.Select(t => 1e-6 * Math.Exp(t)).ToArray()),
            new LineSeries("budget 1e5", Times, Times.Select(t => 1e-8 * Math.Exp(t)).ToArray())
            {
                YError = Times.Select(t => 3e-9 * Math.Exp(t)).ToArray(),
                Look = SeriesLook.LineAndPoints,
            },
        ])
    { LogY = true, ReferenceLines = [new ReferenceLine("tolerance 1e-5", 1e-5)], Windows = [new FitWindow(1, 3)] };
}
