namespace OpGrowth.Reporting;

/// <summary>A labelled reference line across the chart: horizontal at y = Value, or vertical at x = Value.</summary>
public sealed record ReferenceLine(string Label, double Value, bool Vertical = false);
