namespace OpGrowth.Reporting;

/// <summary>
/// A general line chart: several series, optional error bars, a log10 y axis, reference lines and shaded windows.
/// With <see cref="LogY"/> the y values (and error bars) must be positive; non-positive points are left out.
/// </summary>
public sealed record LineChartSpec(string Name, string Title, string Caption, string XLabel, string YLabel, IReadOnlyList<LineSeries> Series)
{
    public bool LogY { get; init; }

    public IReadOnlyList<ReferenceLine> ReferenceLines { get; init; } = [];

    /// <summary>Shaded x ranges (e.g. fit windows), labelled in the legend by their <see cref="FitWindow.ToString"/>.</summary>
    public IReadOnlyList<FitWindow> Windows { get; init; } = [];

    public LegendPlace Legend { get; init; } = LegendPlace.Auto;
}
