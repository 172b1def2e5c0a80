namespace OpGrowth.Reporting;

/// <summary>Krylov complexity K(t) and autocorrelation C(t) = (O|O(t)) on one time grid.</summary>
public sealed record KrylovSeries(double[] Times, double[] Complexity, double[] Autocorrelation)
{
    /// <summary>Draw K(t) on a log10 axis (exponential growth shows as a straight line).</summary>
    public bool LogComplexity { get; init; }

    public string TimeLabel { get; init; } = AxisText.Time;
}
