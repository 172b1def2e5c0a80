using ScottPlot;

namespace OpGrowth.Reporting;

/// <summary>One plot panel of a figure and its share of the figure height.</summary>
internal sealed record PanelSpec(Plot Plot, double Weight = 1.0);
