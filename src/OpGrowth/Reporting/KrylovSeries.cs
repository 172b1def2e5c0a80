namespace OpGrowth.Reporting;

/// <summary>Krylov complexity K(t) and autocorrelation C(t) = (O|O(t)) on one time grid.</summary>
public sealed record KrylovSeries(double[] Times, double[] Complexity, double[] Autocorrelation)
{
    /// <summary>Draw K(t) on a log10 axis (exponential growth shows as a straight line).</summary>
    public bool LogComplexity { get; init; }

    public string TimeLabel { get; init; } = AxisText.Time;

    /// <summary>
    /// Time from which C(t) and K(t) rest on the fitted continuation of b_n (the wave has reached the coefficients
    /// that were not computed); drawn as a shaded band and a dashed curve. Null: never within the times.
    /// </summary>
    public double? ContinuationTime { get; init; }

    /// <summary>First n taken from the fitted continuation (for the label).</summary>
    public int? ContinuationStart { get; init; }
}
