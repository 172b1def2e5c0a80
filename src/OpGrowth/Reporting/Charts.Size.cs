using ScottPlot;
using ScottPlot.Plottables;

namespace OpGrowth.Reporting;

public static partial class Charts
{
    /// <summary>Size distribution P_k(t) as a heatmap: time across, size k up, colour = weight.</summary>
    public static FigureImage SizeDistribution(SizeDistributionSeries data, FigureSize? size = null,
        string name = "size-distribution", string? title = null, string? caption = null)
    {
        ArgumentNullException.ThrowIfNull(data);
        RequireNonEmpty("Times", data.Times);
        int kCount = data.Weights.GetLength(0);
        if (kCount == 0) throw new ArgumentException("The size distribution has no size rows; expected K+1 rows (k = 0..K).", nameof(data));
        if (data.Weights.GetLength(1) != data.Times.Length)
            throw new ArgumentException($"The size distribution has {data.Weights.GetLength(1)} time columns; expected {data.Times.Length} (one per time).", nameof(data));

        var values = new double[kCount, data.Times.Length];
        double max = 0;
        for (int k = 0; k < kCount; k++)
            for (int i = 0; i < data.Times.Length; i++)
            {
                double p = data.Weights[k, i];
                if (data.LogScale) p = p > data.LogFloor ? Math.Log10(p) : Math.Log10(data.LogFloor);
                values[k, i] = p;
                if (double.IsFinite(p)) max = Math.Max(max, p);
            }
        double lo = data.LogScale ? Math.Log10(data.LogFloor) : 0.0;
        double hi = data.LogScale ? 0.0 : (max > 0 ? max : 1.0);
        double[] ks = Enumerable.Range(0, kCount).Select(k => (double)k).ToArray();

        Plot plot = PlotKit.NewPanel(data.TimeLabel, AxisText.Size(data.SizeUnit));
        HeatmapKit.Add(plot, data.Times, ks, values, lo, hi, data.LogScale ? "P_k(t), log scale" : "P_k(t)", data.LogScale);
        if (data.MeanSize is { } mean)
        {
            RequireLength("MeanSize", mean, data.Times.Length);
            Scatter line = PlotKit.Line(plot, data.Times, mean, null, 1, width: 2.2f);
            line.LinePattern = LinePattern.Solid;
        }
        string scale = data.LogScale
            ? $"colour is log10 P_k from {NumberFormat.Number(data.LogFloor)} (white) to 1 (dark)"
            : "white = no weight, dark = most weight";
        return FigureRenderer.Render(name,
            title ?? "Operator size distribution P_k(t)",
            caption ?? $"Share of the operator's weight on Pauli strings of size k ({data.SizeUnit}) at each time; {scale}{(data.MeanSize is null ? "" : "; line: mean size n(t)")}.",
            size ?? FigureSize.Report, new PanelSpec(plot));
    }

    /// <summary>Mean size n(t) with the saturation line, t* (with its band) and optional curves at smaller budgets.</summary>
    public static FigureImage MeanSize(MeanSizeSeries data, FigureSize? size = null,
        string name = "mean-size", string? title = null, string? caption = null)
    {
        ArgumentNullException.ThrowIfNull(data);
        RequireNonEmpty("Times", data.Times);
        RequireLength("MeanSize", data.MeanSize, data.Times.Length);
        Plot plot = PlotKit.NewPanel(data.TimeLabel, "mean size n(t) (" + data.SizeUnit + ")");

        if (data.Uncertainty is { } u)
        {
            RequireLength("Uncertainty", u, data.Times.Length);
            double[] lo = data.MeanSize.Select((m, i) => m - u[i]).ToArray();
            double[] hi = data.MeanSize.Select((m, i) => m + u[i]).ToArray();
            FillY band = plot.Add.FillY(data.Times, lo, hi);
            band.FillColor = ChartStyle.Series(0).WithAlpha(0.18);
            band.LineWidth = 0;
            band.LegendText = "uncertainty band";
        }
        for (int r = 0; r < data.Budgets.Count; r++)
        {
            BudgetCurve c = data.Budgets[r];
            PlotKit.CheckSameLength($"Budget curve {r} values", c.Times.Length, c.Values.Length, nameof(data));
            Scatter s = PlotKit.Line(plot, c.Times, c.Values, "budget " + NumberFormat.Count(c.Budget), 3 + r, width: 1.4f);
            s.LinePattern = r % 2 == 0 ? LinePattern.Dashed : LinePattern.Dotted;
        }
        if (data.PartTime is double pt && double.IsFinite(pt)) PlotKit.VLine(plot, pt, "budgets part (t = " + NumberFormat.Number(pt, 3) + ")", ChartStyle.Reference, LinePattern.DenselyDashed);
        string mainLabel = data.Budget is { } b ? "n(t), budget " + NumberFormat.Count(b) : "n(t)";
        PlotKit.Line(plot, data.Times, data.MeanSize, mainLabel, 0, width: 2.4f).LinePattern = LinePattern.Solid;
        PlotKit.HLine(plot, data.Saturation, data.SaturationLabel + " = " + NumberFormat.Number(data.Saturation));

        if (data.ScramblingLevel is not null || data.ScramblingTime is not null)
        {
            double level = data.ScramblingLevel ?? data.Saturation / 2;
            HorizontalLine half = PlotKit.HLine(plot, level, data.ScramblingLevelLabel + " = " + NumberFormat.Number(level) + " (defines t*)");
            half.LinePattern = LinePattern.Dotted;
        }
        if (data.ScramblingTime is { } ts)
        {
            if (double.IsFinite(ts.Uncertainty) && ts.Uncertainty > 0)
            {
                HorizontalSpan span = PlotKit.XWindow(plot, ts.Value - ts.Uncertainty, ts.Value + ts.Uncertainty, null);
                span.FillColor = ChartStyle.Fit.WithAlpha(0.16);
            }
            if (double.IsFinite(ts.Value)) PlotKit.VLine(plot, ts.Value, "t* = " + ts.FormatValue());
        }
        double yMax = Math.Max(data.Saturation * 1.08, data.MeanSize.Where(double.IsFinite).DefaultIfEmpty(0).Max() * 1.05);
        plot.Axes.SetLimitsY(0, yMax);
        PlotKit.ShowLegendAuto(plot);
        return FigureRenderer.Render(name,
            title ?? "Mean operator size n(t)",
            caption ?? "Mean number of non-identity sites of the evolved operator; dashed: value for a random operator; dotted: the level that defines t* (its first crossing)"
                     + (data.ScramblingTime is null ? ", not reached in this run" : "") + (data.Budgets.Count > 0 ? "; thin lines: the same run at smaller string budgets." : "."),
            size ?? FigureSize.Report, new PanelSpec(plot));
    }
}
