using ScottPlot;
using ScottPlot.Plottables;

namespace OpGrowth.Reporting;

public static partial class Charts
{
    /// <summary>
    /// OTOC light cone: position across, time up, colour = 1 - F (or rho_j); the fitted front drawn solid on its
    /// fit window and dashed where extrapolated.
    /// </summary>
    public static FigureImage LightCone(LightConeMap data, FigureSize? size = null,
        string name = "light-cone", string? title = null, string? caption = null)
    {
        ArgumentNullException.ThrowIfNull(data);
        RequireNonEmpty("Times", data.Times);
        RequireNonEmpty("Positions", data.Positions);
        if (data.Values.GetLength(0) != data.Positions.Length || data.Values.GetLength(1) != data.Times.Length)
            throw new ArgumentException($"The light-cone map is {data.Values.GetLength(0)} x {data.Values.GetLength(1)}; expected {data.Positions.Length} positions x {data.Times.Length} times.", nameof(data));

        // Heatmap rows are times (y), columns positions (x): transpose and resample the time axis as rows.
        int np = data.Positions.Length, nt = data.Times.Length;
        var byTime = new double[np, nt];
        double max = 0;
        for (int j = 0; j < np; j++)
            for (int i = 0; i < nt; i++)
            {
                byTime[j, i] = data.Values[j, i];
                if (double.IsFinite(data.Values[j, i])) max = Math.Max(max, data.Values[j, i]);
            }
        (double t0, double dt, double[,] evenT) = HeatmapKit.ResampleColumns(data.Times, byTime);
        int rows = evenT.GetLength(1);
        var grid = new double[rows, np];
        for (int r = 0; r < rows; r++)
            for (int j = 0; j < np; j++)
                grid[r, j] = evenT[j, r];
        double[] times = Enumerable.Range(0, rows).Select(r => t0 + r * dt).ToArray();

        Plot plot = PlotKit.NewPanel(data.PositionLabel, data.TimeLabel);
        // HeatmapKit resamples columns (x = positions, assumed even) and stacks rows on the even time grid.
        HeatmapKit.Add(plot, data.Positions, times, grid, 0.0, data.ScaleMax ?? (max > 0 ? max : 1.0), data.Quantity, false);

        string frontText = "";
        if (data.Front is { } f)
        {
            double v = f.Velocity.Value, c = f.Intercept;
            double pMin = data.Positions[0], pMax = data.Positions[^1];
            double tMin = data.Times[0], tMax = data.Times[^1];
            FitWindow w = f.Velocity.Window ?? new FitWindow(tMin, tMax);
            bool labelled = false;
            foreach (int side in new[] { +1, -1 })
            {
                // Extrapolated front over the whole time range (dashed, thin), then the fitted part (solid).
                (double[] xs, double[] ts) = FrontLine(data.Origin, side, v, c, tMin, tMax, pMin, pMax);
                if (xs.Length < 2) continue;
                Scatter ext = PlotKit.Line(plot, xs, ts, null, 1, width: 1.5f);
                ext.LinePattern = LinePattern.Dashed;
                (double[] wx, double[] wt) = FrontLine(data.Origin, side, v, c, w.Start, w.End, pMin, pMax);
                if (wx.Length < 2) continue;
                Scatter fit = PlotKit.Line(plot, wx, wt, labelled ? null : "v_B = " + f.Velocity.FormatValue() + ", fit on " + w, 1, width: 3f);
                fit.LinePattern = LinePattern.Solid;
                plot.Add.Markers(new[] { wx[0], wx[^1] }, new[] { wt[0], wt[^1] }, MarkerShape.FilledCircle, 7f, ChartStyle.Fit);
                labelled = true;
            }
            // The map fills the data area, so the front is described in the caption rather than a legend over the data.
            frontText = $"; amber: fitted front r = v_B t + c at threshold {NumberFormat.Number(f.Threshold)}, v_B = {f.Velocity.FormatValue()} (solid on the fit window {w}, dashed extrapolated)";
        }
        return FigureRenderer.Render(name,
            title ?? "OTOC light cone",
            caption ?? $"{data.Quantity} at each position and time for an operator started at {NumberFormat.Number(data.Origin)}{frontText}.",
            size ?? FigureSize.Report, new PanelSpec(plot));
    }

    /// <summary>Points of x = origin ± (v t + c) for t in [t0, t1], clipped to the position range.</summary>
    private static (double[] X, double[] T) FrontLine(double origin, int side, double v, double c, double t0, double t1, double pMin, double pMax)
    {
        const int n = 64;
        var xs = new List<double>(n);
        var ts = new List<double>(n);
        for (int i = 0; i < n; i++)
        {
            double t = t0 + (t1 - t0) * i / (n - 1);
            double r = v * t + c;
            if (r < 0) continue;
            double x = origin + side * r;
            if (x < pMin - 0.5 || x > pMax + 0.5) continue;
            xs.Add(x);
            ts.Add(t);
        }
        return (xs.ToArray(), ts.ToArray());
    }
}
