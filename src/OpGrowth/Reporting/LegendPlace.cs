namespace OpGrowth.Reporting;

/// <summary>Corner of the data area that holds the legend.</summary>
public enum LegendPlace
{
    /// <summary>The corner that covers the fewest data points.</summary>
    Auto,
    LowerRight,
    LowerLeft,
    UpperRight,
    UpperLeft,
    Hidden,
}
