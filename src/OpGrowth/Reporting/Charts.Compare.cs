using ScottPlot;
using ScottPlot.Plottables;

namespace OpGrowth.Reporting;

public static partial class Charts
{
    /// <summary>Pauli engine against exact evolution: both curves (top) and their difference with the tolerance (bottom).</summary>
    public static FigureImage PauliVersusExact(OverlaySeries data, FigureSize? size = null,
        string name = "pauli-vs-exact", string? title = null, string? caption = null)
    {
        ArgumentNullException.ThrowIfNull(data);
        RequireNonEmpty("Times", data.Times);
        RequireLength("Pauli", data.Pauli, data.Times.Length);
        RequireLength("Exact", data.Exact, data.Times.Length);
        foreach (var c in data.Curves)
        {
            RequireLength($"Curve '{c.Label}' (Pauli)", c.Pauli, data.Times.Length);
            RequireLength($"Curve '{c.Label}' (exact)", c.Exact, data.Times.Length);
        }
        if (data.Difference is { } given) RequireLength("Difference", given, data.Times.Length);

        bool several = data.Curves.Count > 0;
        Plot top = PlotKit.NewPanel("", several ? "value" : data.Quantity);
        // Lines: the exact engine; open circles: the Pauli engine (thinned to about 40 so the line stays visible).
        int stride = Math.Max(1, data.Times.Length / 40);
        void Overlay(string label, double[] pauli, double[] exact, int slot)
        {
            PlotKit.Line(top, data.Times, exact, several ? label + ", exact" : data.ExactLabel, slot, width: 2f).LinePattern = LinePattern.Solid;
            double[] mt = data.Times.Where((_, i) => i % stride == 0).ToArray();
            double[] mp = pauli.Where((_, i) => i % stride == 0).ToArray();
            (double[] cx, double[] cy, _) = Clean(mt, mp, null, false);
            Scatter pts = PlotKit.Points(top, cx, cy, several ? null : data.PauliLabel, slot, size: 6.5f);
            pts.MarkerShape = MarkerShape.OpenCircle;
            pts.MarkerLineWidth = 1.6f;
        }
        Overlay(data.Quantity, data.Pauli, data.Exact, 2);
        for (int c = 0; c < data.Curves.Count; c++) Overlay(data.Curves[c].Label, data.Curves[c].Pauli, data.Curves[c].Exact, c == 0 ? 0 : c + 2);
        PlotKit.ShowLegendAuto(top);

        var diff = new double[data.Times.Length];
        for (int i = 0; i < diff.Length; i++) diff[i] = data.Difference?[i] ?? data.Pauli[i] - data.Exact[i];
        Plot bottom;
        if (data.LogDifference)
        {
            bottom = PlotKit.NewPanel(data.TimeLabel, "|difference| (log)");
            double[] abs = diff.Select(Math.Abs).ToArray();
            AddSeries(bottom, new LineSeries(data.Difference is null ? "|Pauli - exact|" : data.DifferenceLabel, data.Times, abs), 0, true, "difference");
            if (data.Tolerance is { } tol && tol > 0) PlotKit.HLine(bottom, Math.Log10(tol), "tolerance " + NumberFormat.Number(tol));
            PlotKit.LogY(bottom);
        }
        else
        {
            bottom = PlotKit.NewPanel(data.TimeLabel, "Pauli - exact");
            AddSeries(bottom, new LineSeries("difference", data.Times, diff), 0, false, "difference");
            if (data.Tolerance is { } tol && tol > 0)
            {
                PlotKit.HLine(bottom, tol, "tolerance ±" + NumberFormat.Number(tol));
                PlotKit.HLine(bottom, -tol, null);
            }
            else
            {
                bottom.Add.HorizontalLine(0, 1f, ChartStyle.Reference, LinePattern.Solid).LegendText = "";
            }
        }
        PlotKit.ShowLegendAuto(bottom);
        LinkX(top, bottom, data.Times);

        return FigureRenderer.Render(name,
            title ?? "Pauli engine versus exact evolution",
            caption ?? $"Top: {(several ? data.Quantity + " and " + string.Join(", ", data.Curves.Select(c => c.Label)) : data.Quantity)} from both engines on the same model (lines: exact state vector, circles: Pauli engine); bottom: {(data.Difference is null ? "their difference" : data.DifferenceLabel)}"
                     + (data.Tolerance is { } t ? $" and the agreement tolerance {NumberFormat.Number(t)}." : "."),
            size ?? FigureSize.Report, new PanelSpec(top, 1.3), new PanelSpec(bottom, 1.0));
    }

    /// <summary>Scrambling time t*(N) with error bars and the two fits a + b ln N and a + N/v.</summary>
    public static FigureImage ScramblingTime(ScramblingTimeSeries data, FigureSize? size = null,
        string name = "tstar-scaling", string? title = null, string? caption = null)
    {
        ArgumentNullException.ThrowIfNull(data);
        RequireNonEmpty("Sizes", data.Sizes);
        if (data.ScramblingTimes.Length != data.Sizes.Length || data.Uncertainties.Length != data.Sizes.Length)
            throw new ArgumentException($"t*(N) needs one time and one uncertainty per size; found {data.ScramblingTimes.Length} and {data.Uncertainties.Length} for {data.Sizes.Length} sizes.", nameof(data));
        Plot plot = PlotKit.NewPanel(data.SizeLabel, data.TimeLabel);
        double nMin = data.Sizes.Min(), nMax = data.Sizes.Max();
        double lo = Math.Max(nMin - 0.08 * (nMax - nMin + 1), nMin * 0.5), hi = nMax + 0.08 * (nMax - nMin + 1);
        double[] grid = Enumerable.Range(0, 100).Select(i => lo + (hi - lo) * i / 99).ToArray();
        if (data.Logarithmic is { } lf)
        {
            Scatter s = PlotKit.Line(plot, grid, grid.Select(lf.Evaluate).ToArray(), FitLabel(lf), 1, width: 2f);
            s.LinePattern = LinePattern.Dashed;
        }
        if (data.Ballistic is { } bf)
        {
            Scatter s = PlotKit.Line(plot, grid, grid.Select(bf.Evaluate).ToArray(), FitLabel(bf), 0, width: 2f);
            s.LinePattern = LinePattern.Solid;
        }
        AddSeries(plot, new LineSeries("t* measured", data.Sizes, data.ScramblingTimes) { YError = data.Uncertainties, Look = SeriesLook.Points }, 2, false, "t*");
        PlotKit.ShowLegendAuto(plot);
        return FigureRenderer.Render(name,
            title ?? "Scrambling time versus system size",
            caption ?? "t* at each N with its uncertainty; dashed: t* = a + b ln N (fast scrambling), solid: t* = a + N/v (ballistic).",
            size ?? FigureSize.Report, new PanelSpec(plot));
    }

    private static string FitLabel(ScalingFit f)
    {
        string chi = f.ReducedChiSquare is { } c ? ", χ²/dof = " + NumberFormat.Number(c, 3) : "";
        return f.Form == ScalingForm.Logarithmic
            ? "a + b ln N: b = " + NumberFormat.ValueWithUncertainty(f.B, f.BUncertainty) + chi
            : "a + N/v: v = " + NumberFormat.ValueWithUncertainty(f.B, f.BUncertainty) + chi;
    }
}
