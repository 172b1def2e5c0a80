using ScottPlot;
using ScottPlot.Plottables;

namespace OpGrowth.Reporting;

/// <summary>Shared building blocks for chart panels: the house style, series, error bars, log axes, legends.</summary>
internal static class PlotKit
{
    /// <summary>A new panel in the house style with the given axis labels.</summary>
    internal static Plot NewPanel(string xLabel, string yLabel)
    {
        ReportFonts.EnsureRegistered();
        var plot = new Plot();
        plot.Font.Set(ReportFonts.Family);
        plot.FigureBackground.Color = ChartStyle.Background;
        plot.DataBackground.Color = ChartStyle.Background;
        plot.Axes.Color(ChartStyle.Frame);
        plot.Axes.FrameColor(ChartStyle.Frame);
        foreach (IAxis axis in plot.Axes.GetAxes())
        {
            axis.TickLabelStyle.ForeColor = ChartStyle.Ink;
            axis.TickLabelStyle.FontSize = ChartStyle.TickLabelSize;
            axis.TickLabelStyle.FontName = ReportFonts.Family;
            axis.Label.ForeColor = ChartStyle.Ink;
            axis.Label.FontSize = ChartStyle.AxisLabelSize;
            axis.Label.FontName = ReportFonts.Family;
            axis.Label.Bold = false;
        }
        plot.Axes.Bottom.TickGenerator = Ticks();
        plot.Axes.Left.TickGenerator = Ticks();
        plot.Grid.MajorLineColor = ChartStyle.Grid;
        plot.Grid.MinorLineColor = Colors.Transparent;
        plot.XLabel(xLabel, ChartStyle.AxisLabelSize);
        plot.YLabel(yLabel, ChartStyle.AxisLabelSize);
        plot.Axes.Bottom.Label.Bold = false;
        plot.Axes.Left.Label.Bold = false;
        plot.Legend.SetBestFontOnEachRender = false;
        plot.Legend.FontName = ReportFonts.Family;
        plot.Legend.FontSize = ChartStyle.LegendSize;
        plot.Legend.FontColor = ChartStyle.Ink;
        plot.Legend.OutlineColor = Color.FromHex("#BBBBBB");
        plot.Legend.BackgroundColor = Colors.White.WithAlpha(0.92);
        plot.Legend.ShadowColor = Colors.Transparent;
        plot.Legend.SymbolWidth = 30;
        plot.Legend.IsVisible = false;
        return plot;
    }

    /// <summary>Numeric ticks, a little sparser than the library default (easier to read in print).</summary>
    internal static ScottPlot.TickGenerators.NumericAutomatic Ticks() => new() { TickDensity = 0.6 };

    /// <summary>A connected line series in palette slot <paramref name="slot"/> (colour and pattern).</summary>
    internal static Scatter Line(Plot plot, double[] xs, double[] ys, string? label, int slot, float width = 2f, bool markers = false)
    {
        Scatter s = plot.Add.ScatterLine(xs, ys, ChartStyle.Series(slot));
        s.LineWidth = width;
        s.LinePattern = ChartStyle.Pattern(slot);
        s.MarkerShape = markers ? ChartStyle.Marker(slot) : MarkerShape.None;
        s.MarkerSize = markers ? 6f : 0f;
        if (!string.IsNullOrEmpty(label)) s.LegendText = label;
        return s;
    }

    /// <summary>Points only (markers), in palette slot <paramref name="slot"/>.</summary>
    internal static Scatter Points(Plot plot, double[] xs, double[] ys, string? label, int slot, float size = 7f)
    {
        Scatter s = plot.Add.ScatterPoints(xs, ys, ChartStyle.Series(slot));
        s.MarkerShape = ChartStyle.Marker(slot);
        s.MarkerSize = size;
        if (!string.IsNullOrEmpty(label)) s.LegendText = label;
        return s;
    }

    /// <summary>Vertical error bars (symmetric) in the colour of palette slot <paramref name="slot"/>.</summary>
    internal static ErrorBar ErrorBars(Plot plot, double[] xs, double[] ys, double[] errors, int slot)
    {
        ErrorBar e = plot.Add.ErrorBar(xs, ys, errors);
        e.Color = ChartStyle.Series(slot);
        e.LineWidth = 1.3f;
        e.CapSize = 4f;
        return e;
    }

    /// <summary>A grey dashed horizontal reference line with a legend entry.</summary>
    internal static HorizontalLine HLine(Plot plot, double y, string? label)
    {
        HorizontalLine line = plot.Add.HorizontalLine(y, 1.5f, ChartStyle.Reference, LinePattern.Dashed);
        if (!string.IsNullOrEmpty(label)) line.LegendText = label;
        return line;
    }

    /// <summary>A vertical marker line (fit colour) with a legend entry.</summary>
    internal static VerticalLine VLine(Plot plot, double x, string? label, Color? color = null, LinePattern? pattern = null)
    {
        VerticalLine line = plot.Add.VerticalLine(x, 1.6f, color ?? ChartStyle.Fit, pattern ?? LinePattern.DenselyDashed);
        if (!string.IsNullOrEmpty(label)) line.LegendText = label;
        return line;
    }

    /// <summary>A lightly shaded band over an x range (a fit window).</summary>
    internal static HorizontalSpan XWindow(Plot plot, double x0, double x1, string? label)
    {
        HorizontalSpan span = plot.Add.HorizontalSpan(Math.Min(x0, x1), Math.Max(x0, x1), ChartStyle.WindowFill);
        span.LineColor = Colors.Transparent;
        if (!string.IsNullOrEmpty(label)) span.LegendText = label;
        return span;
    }

    /// <summary>Makes the left axis show log10 of the data with <c>1eN</c> labels.</summary>
    internal static void LogY(Plot plot) => plot.Axes.Left.TickGenerator = new Log10Ticks();

    /// <summary>log10 of each value; values at or below zero (or not finite) become NaN (gaps in the line).</summary>
    internal static double[] Log10(ReadOnlySpan<double> values)
    {
        var r = new double[values.Length];
        for (int i = 0; i < values.Length; i++)
            r[i] = values[i] > 0 && double.IsFinite(values[i]) ? Math.Log10(values[i]) : double.NaN;
        return r;
    }

    /// <summary>Shows the legend inside the data area.</summary>
    internal static void ShowLegend(Plot plot, Alignment where = Alignment.LowerRight)
    {
        plot.Legend.IsVisible = true;
        plot.Legend.Alignment = where;
    }

    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<Plot, object> s_autoLegend = new();

    /// <summary>
    /// Shows the legend in the corner of the data area that covers the fewest data points; the corner is chosen
    /// when the figure is laid out (<see cref="PlaceLegend"/>), once the panel's pixel size is known.
    /// </summary>
    internal static void ShowLegendAuto(Plot plot)
    {
        plot.Legend.IsVisible = true;
        plot.Legend.Alignment = Alignment.UpperLeft;
        s_autoLegend.AddOrUpdate(plot, s_autoLegend);
    }

    /// <summary>
    /// Places an auto-placed legend for a panel of the given pixel size (no-op for fixed legends): in the corner
    /// that covers the fewest data points, and when every corner would cover data, in headroom made for it by
    /// raising the top of the y axis, so that the legend never hides a point, a line or a reference line.
    /// </summary>
    internal static void PlaceLegend(Plot plot, float panelWidth, float panelHeight)
    {
        if (!s_autoLegend.TryGetValue(plot, out _)) return;
        var place = FindLegendPlace(plot, panelWidth, panelHeight);
        plot.Legend.Alignment = place.Corner;
        if (place.Score <= 0 || !(place.Height < 0.8)) return;
        // Raise the top so the legend's band (its height plus a margin) lies above every data point.
        double band = place.Height + 0.04;
        double top = place.Y1 + (place.Y1 - place.Y0) * band / (1 - band);
        plot.Axes.SetLimitsY(place.Y0, top);
        plot.Legend.Alignment = place.Corner is Alignment.UpperRight or Alignment.LowerRight ? Alignment.UpperRight : Alignment.UpperLeft;
    }

    /// <summary>The corner whose legend-sized box covers the fewest data points (see <see cref="FindLegendPlace"/>).</summary>
    internal static Alignment BestLegendCorner(Plot plot, float panelWidth, float panelHeight) => FindLegendPlace(plot, panelWidth, panelHeight).Corner;

    /// <summary>
    /// The corner whose legend-sized box covers the fewest data points (lines are sampled along their segments,
    /// reference lines count heavily), that corner's score, the legend's height as a fraction of the data area and
    /// the y range of the data. The legend size is estimated from its entries and the font size.
    /// </summary>
    internal static (Alignment Corner, double Score, double Height, double Y0, double Y1) FindLegendPlace(Plot plot, float panelWidth, float panelHeight)
    {
        var pts = new List<(double X, double Y)>();
        var hLines = new List<double>();
        var vLines = new List<double>();
        foreach (IPlottable item in plot.GetPlottables())
        {
            switch (item)
            {
                case Scatter s:
                    IReadOnlyList<Coordinates> c = s.Data.GetScatterPoints();
                    bool connected = s.LineWidth > 0 && s.LineStyle.IsVisible;
                    for (int i = 0; i < c.Count; i++)
                    {
                        pts.Add((c[i].X, c[i].Y));
                        if (!connected || i == 0) continue;
                        for (int k = 1; k < 8; k++)   // points along the segment, so a steep line still counts
                            pts.Add((c[i - 1].X + (c[i].X - c[i - 1].X) * k / 8.0, c[i - 1].Y + (c[i].Y - c[i - 1].Y) * k / 8.0));
                    }
                    break;
                case ErrorBar e:
                    for (int i = 0; i < e.Xs.Count; i++)
                    {
                        pts.Add((e.Xs[i], e.Ys[i]));
                        if (e.YErrorPositive is { } up && i < up.Count) pts.Add((e.Xs[i], e.Ys[i] + up[i]));
                    }
                    break;
                case HorizontalLine h: hLines.Add(h.Y); break;
                case VerticalLine v: vLines.Add(v.X); break;
            }
        }
        pts.RemoveAll(p => !double.IsFinite(p.X) || !double.IsFinite(p.Y));
        if (pts.Count == 0) return (Alignment.UpperRight, 0, 0, 0, 1);
        double x0 = pts.Min(p => p.X), x1 = pts.Max(p => p.X), y0 = pts.Min(p => p.Y), y1 = pts.Max(p => p.Y);
        foreach (double h in hLines) { y0 = Math.Min(y0, h); y1 = Math.Max(y1, h); }
        double dataTop = y1;
        if (plot.Axes.LimitsHaveBeenSet)
        {
            AxisLimits l = plot.Axes.GetLimits();
            if (double.IsFinite(l.Left) && double.IsFinite(l.Right) && l.Right > l.Left) { x0 = l.Left; x1 = l.Right; }
            if (double.IsFinite(l.Bottom) && double.IsFinite(l.Top) && l.Top > l.Bottom) { y0 = l.Bottom; y1 = l.Top; }
        }
        else
        {
            // The library pads the data range by about 10% on each side; judge the corners on that view.
            double pad = 0.1 * (y1 - y0);
            y0 -= pad;
            y1 += pad;
        }
        if (x1 <= x0) x1 = x0 + 1;
        if (y1 <= y0) y1 = y0 + 1;

        LegendItem[] items = plot.Legend.GetItems();
        int longest = items.Select(i => (i.LabelText ?? "").Length).DefaultIfEmpty(8).Max();
        // Data area: the panel less typical axis paddings; legend: symbol + text width, one row per entry.
        double areaW = Math.Max(50, panelWidth - 90), areaH = Math.Max(40, panelHeight - 60);
        double legendW = 52 + 0.62 * ChartStyle.LegendSize * longest, legendH = 14 + 1.75 * ChartStyle.LegendSize * items.Length;
        double fw = Math.Min(0.95, (legendW + 10) / areaW), fh = Math.Min(0.95, (legendH + 10) / areaH);

        Alignment best = Alignment.UpperLeft;
        double bestScore = double.PositiveInfinity;
        foreach (Alignment a in (Alignment[])[Alignment.UpperLeft, Alignment.LowerRight, Alignment.UpperRight, Alignment.LowerLeft])
        {
            bool right = a is Alignment.UpperRight or Alignment.LowerRight, upper = a is Alignment.UpperLeft or Alignment.UpperRight;
            double bx0 = right ? 1 - fw : 0, bx1 = right ? 1 : fw, by0 = upper ? 1 - fh : 0, by1 = upper ? 1 : fh;
            double score = 0;
            foreach ((double x, double y) in pts)
            {
                double u = (x - x0) / (x1 - x0), v = (y - y0) / (y1 - y0);
                if (u >= bx0 && u <= bx1 && v >= by0 && v <= by1) score += 1;
            }
            foreach (double h in hLines) { double v = (h - y0) / (y1 - y0); if (v >= by0 && v <= by1) score += 20; }
            foreach (double xv in vLines) { double u = (xv - x0) / (x1 - x0); if (u >= bx0 && u <= bx1) score += 20; }
            if (score < bestScore - 1e-9) { bestScore = score; best = a; }
        }
        return (best, bestScore, fh, y0, Math.Max(dataTop, y0 + 1e-12));
    }

    internal static void CheckSameLength(string what, int expected, int actual, string paramName)
    {
        if (expected != actual)
            throw new ArgumentException($"{what} has {actual} values; expected {expected} (one per point).", paramName);
    }
}
