using ScottPlot;
using ScottPlot.Plottables;

namespace OpGrowth.Reporting;

public static partial class Charts
{
    /// <summary>Lanczos coefficients b_n versus n with error bars from the budget spread and the fitted growth law.</summary>
    public static FigureImage Lanczos(LanczosSeries data, FigureSize? size = null,
        string name = "lanczos", string? title = null, string? caption = null)
    {
        ArgumentNullException.ThrowIfNull(data);
        RequireNonEmpty("B", data.B);
        double[] n = Enumerable.Range(1, data.B.Length).Select(i => (double)i).ToArray();
        Plot plot = PlotKit.NewPanel("Lanczos index n", "b_n (energy)");
        string windowText = "";
        if (data.Fit?.Rate?.Window is { } w)
        {
            PlotKit.XWindow(plot, w.Start, w.End, "fit window " + w);
            windowText = " on " + w;
        }
        var series = new LineSeries("b_n", n, data.B) { YError = data.Spread, Look = SeriesLook.Points };
        if (data.Spread is { } sp) RequireLength("Spread", sp, data.B.Length);
        AddSeries(plot, series, 0, false, "b_n");
        if (data.Fit is { } fit)
        {
            PlotKit.CheckSameLength("Growth curve B", fit.N.Length, fit.B.Length, nameof(data));
            string label = fit.Rate is { } rate ? fit.ClassName + ": " + rate.Definition + " = " + rate.FormatValue() : fit.ClassName;
            Scatter line = PlotKit.Line(plot, fit.N, fit.B, label, 1, width: 2.2f);
            line.LinePattern = LinePattern.Solid;
        }
        plot.Axes.SetLimitsY(0, Math.Max(1e-12, data.B.Where(double.IsFinite).DefaultIfEmpty(1).Max()) * 1.12);
        PlotKit.ShowLegendAuto(plot);
        return FigureRenderer.Render(name,
            title ?? "Lanczos coefficients b_n",
            caption ?? $"Recursion coefficients of the probe operator under L = [H, ·]; bars: spread across string budgets; line: fitted growth law{windowText}.",
            size ?? FigureSize.Report, new PanelSpec(plot));
    }

    /// <summary>Krylov complexity K(t) (top, optional log axis) and autocorrelation C(t) (bottom).</summary>
    public static FigureImage Krylov(KrylovSeries data, FigureSize? size = null,
        string name = "krylov", string? title = null, string? caption = null)
    {
        ArgumentNullException.ThrowIfNull(data);
        RequireNonEmpty("Times", data.Times);
        RequireLength("Complexity", data.Complexity, data.Times.Length);
        RequireLength("Autocorrelation", data.Autocorrelation, data.Times.Length);

        Plot top = PlotKit.NewPanel("", data.LogComplexity ? "K(t) (log scale)" : "K(t)");
        Plot bottom = PlotKit.NewPanel(data.TimeLabel, "C(t)");
        string contText = "";
        if (data.ContinuationTime is double tc && tc <= data.Times[^1])
        {
            // Before tc the curves rest on computed b_n only; from tc on, on the fitted continuation as well.
            string label = "from the fitted b_n" + (data.ContinuationStart is int n0 ? $" (n >= {n0})" : "");
            PlotKit.XWindow(top, tc, data.Times[^1], label).FillColor = ChartStyle.Fit.WithAlpha(0.12);
            PlotKit.XWindow(bottom, tc, data.Times[^1], null).FillColor = ChartStyle.Fit.WithAlpha(0.12);
            int cut = Array.FindIndex(data.Times, t => t >= tc);
            double[] t0 = data.Times[..(cut + 1)], t1 = data.Times[cut..];
            AddSeries(top, new LineSeries("K(t), computed b_n", t0, data.Complexity[..(cut + 1)]), 0, data.LogComplexity, "K(t)");
            AddSeries(top, new LineSeries("K(t), with the continuation", t1, data.Complexity[cut..]) { Look = SeriesLook.Line }, 0, data.LogComplexity, "K(t)");
            top.GetPlottables().OfType<Scatter>().Last().LinePattern = LinePattern.Dashed;
            AddSeries(bottom, new LineSeries("autocorrelation C(t)", t0, data.Autocorrelation[..(cut + 1)]), 2, false, "C(t)");
            AddSeries(bottom, new LineSeries("C(t), with the continuation", t1, data.Autocorrelation[cut..]), 2, false, "C(t)");
            bottom.GetPlottables().OfType<Scatter>().Last().LinePattern = LinePattern.Dashed;
            contText = $"; shaded and dashed from t = {NumberFormat.Number(tc, 3)}: the curves rest on the fitted continuation of b_n{(data.ContinuationStart is int n1 ? $" (n >= {n1})" : "")} (more than 0.1% of the weight beyond the computed coefficients)";
        }
        else
        {
            AddSeries(top, new LineSeries("Krylov complexity K(t)", data.Times, data.Complexity), 0, data.LogComplexity, "K(t)");
            AddSeries(bottom, new LineSeries("autocorrelation C(t)", data.Times, data.Autocorrelation), 2, false, "C(t)");
        }
        if (data.LogComplexity) PlotKit.LogY(top);
        PlotKit.ShowLegendAuto(top);

        HorizontalLine zero = bottom.Add.HorizontalLine(0, 1f, ChartStyle.Reference, LinePattern.Solid);
        zero.LegendText = "";
        PlotKit.ShowLegendAuto(bottom);
        LinkX(top, bottom, data.Times);

        return FigureRenderer.Render(name,
            title ?? "Krylov complexity and autocorrelation",
            caption ?? $"Top: K(t) = Σ n φ_n(t)², the mean position on the Krylov chain; bottom: C(t) = (O|O(t)); both computed from the b_n{contText}.",
            size ?? FigureSize.Report, new PanelSpec(top, 1.15), new PanelSpec(bottom, 1.0));
    }

    /// <summary>Gives stacked panels the same x range (the data range of <paramref name="xs"/>).</summary>
    internal static void LinkX(Plot a, Plot b, double[] xs)
    {
        double lo = xs.Where(double.IsFinite).DefaultIfEmpty(0).Min();
        double hi = xs.Where(double.IsFinite).DefaultIfEmpty(1).Max();
        if (hi <= lo) hi = lo + 1;
        double pad = 0.02 * (hi - lo);
        a.Axes.SetLimitsX(lo - pad, hi + pad);
        b.Axes.SetLimitsX(lo - pad, hi + pad);
    }
}
