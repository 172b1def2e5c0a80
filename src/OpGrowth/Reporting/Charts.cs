using ScottPlot;
using ScottPlot.Plottables;

namespace OpGrowth.Reporting;

/// <summary>
/// One function per figure kind. Each takes plain data records, draws the figure in the house style
/// (<see cref="ChartStyle"/>, shipped font) with a title and a one-line caption, and returns the PNG and the SVG.
/// Rendering costs a few hundred milliseconds per figure at report size.
/// </summary>
public static partial class Charts
{
    /// <summary>A general line chart (several series, error bars, optional log10 y axis).</summary>
    public static FigureImage Lines(LineChartSpec spec, FigureSize? size = null)
    {
        ArgumentNullException.ThrowIfNull(spec);
        if (spec.Series.Count == 0) throw new ArgumentException("A line chart needs at least one series.", nameof(spec));
        Plot plot = PlotKit.NewPanel(spec.XLabel, spec.YLabel);
        foreach (FitWindow w in spec.Windows) PlotKit.XWindow(plot, w.Start, w.End, w.ToString());
        for (int i = 0; i < spec.Series.Count; i++)
        {
            LineSeries s = spec.Series[i];
            AddSeries(plot, s, s.Slot ?? i, spec.LogY, "Series '" + s.Label + "'");
        }
        foreach (ReferenceLine r in spec.ReferenceLines)
        {
            double v = spec.LogY && !r.Vertical ? Math.Log10(r.Value) : r.Value;
            if (!double.IsFinite(v)) continue;
            if (r.Vertical) PlotKit.VLine(plot, v, r.Label, ChartStyle.Reference, LinePattern.Dashed);
            else PlotKit.HLine(plot, v, r.Label);
        }
        if (spec.LogY) PlotKit.LogY(plot);
        if (spec.Legend == LegendPlace.Auto) PlotKit.ShowLegendAuto(plot);
        else if (spec.Legend != LegendPlace.Hidden) PlotKit.ShowLegend(plot, ToAlignment(spec.Legend));
        return FigureRenderer.Render(spec.Name, spec.Title, spec.Caption, size ?? FigureSize.Report, new PanelSpec(plot));
    }

    internal static void AddSeries(Plot plot, LineSeries s, int slot, bool logY, string what)
    {
        PlotKit.CheckSameLength(what + " Y", s.X.Length, s.Y.Length, nameof(s));
        if (s.YError is { } e0) PlotKit.CheckSameLength(what + " YError", s.X.Length, e0.Length, nameof(s));
        (double[] x, double[] y, double[]? e) = Clean(s.X, s.Y, s.YError, logY);
        if (x.Length == 0) return;
        double[] yPlot = logY ? PlotKit.Log10(y) : y;
        if (e is not null)
        {
            if (logY)
            {
                var up = new double[x.Length];
                var down = new double[x.Length];
                for (int i = 0; i < x.Length; i++)
                {
                    up[i] = Math.Log10(y[i] + e[i]) - yPlot[i];
                    // A bar reaching zero or below has no lower end on a log axis: draw it to one decade below.
                    down[i] = y[i] - e[i] > 0 ? yPlot[i] - Math.Log10(y[i] - e[i]) : 1.0;
                }
                var bars = new ErrorBar(x, yPlot, null, null, up, down) { Color = ChartStyle.Series(slot), LineWidth = 1.3f, CapSize = 4f };
                plot.Add.Plottable(bars);
            }
            else
            {
                PlotKit.ErrorBars(plot, x, yPlot, e, slot);
            }
        }
        switch (s.Look)
        {
            case SeriesLook.Points: PlotKit.Points(plot, x, yPlot, s.Label, slot); break;
            case SeriesLook.LineAndPoints: PlotKit.Line(plot, x, yPlot, s.Label, slot, markers: true); break;
            default: PlotKit.Line(plot, x, yPlot, s.Label, slot); break;
        }
    }

    /// <summary>Drops points with a non-finite coordinate (and, on a log axis, non-positive y).</summary>
    internal static (double[] X, double[] Y, double[]? E) Clean(double[] xs, double[] ys, double[]? es, bool positiveY)
    {
        var x = new List<double>(xs.Length);
        var y = new List<double>(xs.Length);
        List<double>? e = es is null ? null : new List<double>(xs.Length);
        for (int i = 0; i < xs.Length; i++)
        {
            if (!double.IsFinite(xs[i]) || !double.IsFinite(ys[i])) continue;
            if (positiveY && ys[i] <= 0) continue;
            x.Add(xs[i]);
            y.Add(ys[i]);
            if (e is not null) e.Add(double.IsFinite(es![i]) ? Math.Abs(es[i]) : 0.0);
        }
        return (x.ToArray(), y.ToArray(), e?.ToArray());
    }

    internal static Alignment ToAlignment(LegendPlace place) => place switch
    {
        LegendPlace.LowerLeft => Alignment.LowerLeft,
        LegendPlace.UpperRight => Alignment.UpperRight,
        LegendPlace.UpperLeft => Alignment.UpperLeft,
        _ => Alignment.LowerRight,
    };

    internal static void RequireLength(string what, double[] values, int expected)
    {
        if (values.Length != expected)
            throw new ArgumentException($"{what} has {values.Length} values; expected {expected} (one per time point).");
    }

    internal static void RequireNonEmpty(string what, double[] values)
    {
        if (values.Length == 0) throw new ArgumentException($"{what} is empty; expected at least one point.");
    }
}
