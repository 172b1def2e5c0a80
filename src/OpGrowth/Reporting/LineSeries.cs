namespace OpGrowth.Reporting;

/// <summary>One series of a line chart. <see cref="YError"/>, when given, draws symmetric error bars.</summary>
public sealed record LineSeries(string Label, double[] X, double[] Y)
{
    public double[]? YError { get; init; }

    public SeriesLook Look { get; init; } = SeriesLook.Line;

    /// <summary>Palette slot (colour and pattern); by default the series' position in the chart.</summary>
    public int? Slot { get; init; }
}
