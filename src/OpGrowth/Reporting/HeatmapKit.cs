using ScottPlot;
using ScottPlot.Plottables;

namespace OpGrowth.Reporting;

/// <summary>Heatmaps on a regular cell grid, with the house colour scale and a labelled colour bar.</summary>
internal static class HeatmapKit
{
    /// <summary>
    /// Adds a heatmap where <paramref name="values"/>[r, c] sits at y = <paramref name="ys"/>[r],
    /// x = <paramref name="xs"/>[c]. Both coordinate arrays must be increasing; an uneven x grid is resampled by
    /// holding each sample until the next one (y is assumed even: sizes and sites).
    /// </summary>
    internal static Heatmap Add(Plot plot, double[] xs, double[] ys, double[,] values, double scaleMin, double scaleMax,
        string colorLabel, bool logColor)
    {
        (double x0, double dx, double[,] grid) = ResampleColumns(xs, values);
        int rows = grid.GetLength(0), cols = grid.GetLength(1);
        double dy = ys.Length > 1 ? (ys[^1] - ys[0]) / (ys.Length - 1) : 1.0;
        // With its default (centred) cell alignment the library treats the extent as the span of cell centres:
        // first column centred on Left, last on Right. A single row or column has no span, so it is doubled
        // into two half-size cells around its coordinate.
        double xFirst = x0, xLast = x0 + dx * (cols - 1), yFirst = ys[0], yLast = ys[0] + dy * (rows - 1);
        if (cols == 1) { xFirst -= dx / 4; xLast += dx / 4; }
        if (rows == 1) { yFirst -= dy / 4; yLast += dy / 4; }
        int outRows = Math.Max(rows, 2), outCols = Math.Max(cols, 2);
        // The plotting library draws row 0 at the top; put the lowest y at the bottom instead.
        var flipped = new double[outRows, outCols];
        for (int r = 0; r < outRows; r++)
            for (int c = 0; c < outCols; c++)
                flipped[outRows - 1 - r, c] = grid[Math.Min(r, rows - 1), Math.Min(c, cols - 1)];
        Heatmap map = plot.Add.Heatmap(flipped);
        map.Colormap = new HeatScale();
        map.Smooth = false;
        map.NaNCellColor = ChartStyle.MissingCell;
        map.ManualRange = new ScottPlot.Range(scaleMin, scaleMax > scaleMin ? scaleMax : scaleMin + 1);
        map.CellAlignment = Alignment.MiddleCenter;
        map.Extent = new CoordinateRect(xFirst, xLast, yFirst, yLast);
        var wanted = new CoordinateRect(x0 - dx / 2, x0 + dx * (cols - 0.5), ys[0] - dy / 2, ys[0] + dy * (rows - 0.5));
        ScottPlot.Panels.ColorBar bar = plot.Add.ColorBar(map, Edge.Right);
        bar.Label = colorLabel;
        bar.LabelStyle.FontName = ReportFonts.Family;
        bar.LabelStyle.FontSize = ChartStyle.AxisLabelSize;
        bar.LabelStyle.Bold = false;
        bar.LabelStyle.ForeColor = ChartStyle.Ink;
        bar.Axis.TickLabelStyle.FontName = ReportFonts.Family;
        bar.Axis.TickLabelStyle.FontSize = ChartStyle.TickLabelSize;
        bar.Axis.TickLabelStyle.ForeColor = ChartStyle.Ink;
        bar.Axis.FrameLineStyle.Color = ChartStyle.Frame;
        bar.Axis.TickGenerator = logColor ? new Log10Ticks() : new ScottPlot.TickGenerators.NumericAutomatic { TargetTickCount = 6 };
        plot.Axes.SetLimits(wanted.Left, wanted.Right, wanted.Bottom, wanted.Top);
        plot.Grid.IsVisible = false;
        return map;
    }

    /// <summary>
    /// Returns a grid with evenly spaced columns. An (almost) even input is used as is; otherwise each output
    /// column takes the last input sample at or before its centre.
    /// </summary>
    internal static (double X0, double Dx, double[,] Grid) ResampleColumns(double[] xs, double[,] values)
    {
        int rows = values.GetLength(0), cols = xs.Length;
        if (values.GetLength(1) != cols)
            throw new ArgumentException($"The map has {values.GetLength(1)} columns; expected {cols} (one per coordinate).");
        if (cols == 1) return (xs[0], 1.0, values);
        double span = xs[^1] - xs[0];
        double even = span / (cols - 1);
        double minStep = double.PositiveInfinity;
        bool isEven = true;
        for (int i = 1; i < cols; i++)
        {
            double step = xs[i] - xs[i - 1];
            if (!(step > 0)) throw new ArgumentException($"Coordinates must increase; found {xs[i]} after {xs[i - 1]} at index {i}.");
            minStep = Math.Min(minStep, step);
            if (Math.Abs(step - even) > 0.01 * even) isEven = false;
        }
        if (isEven) return (xs[0], even, values);
        int outCols = (int)Math.Clamp(Math.Ceiling(span / minStep) + 1, cols, 800);
        double dx = span / (outCols - 1);
        var grid = new double[rows, outCols];
        int src = 0;
        for (int c = 0; c < outCols; c++)
        {
            double x = xs[0] + c * dx;
            while (src + 1 < cols && xs[src + 1] <= x + 1e-12 * span) src++;
            for (int r = 0; r < rows; r++) grid[r, c] = values[r, src];
        }
        return (xs[0], dx, grid);
    }
}
