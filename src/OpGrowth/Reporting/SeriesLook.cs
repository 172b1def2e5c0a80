namespace OpGrowth.Reporting;

/// <summary>How a series is drawn.</summary>
public enum SeriesLook
{
    Line,
    Points,
    LineAndPoints,
}
