namespace OpGrowth.Reporting;

/// <summary>
/// The same quantity from the Pauli engine and from the exact state-vector engine on one time grid, with the
/// tolerance their difference must stay within.
/// </summary>
public sealed record OverlaySeries(double[] Times, double[] Pauli, double[] Exact, string Quantity)
{
    public double? Tolerance { get; init; }

    public string PauliLabel { get; init; } = "Pauli engine";

    public string ExactLabel { get; init; } = "exact state vector";

    /// <summary>Show log10 |Pauli - exact| instead of the signed difference.</summary>
    public bool LogDifference { get; init; }

    public string TimeLabel { get; init; } = AxisText.Time;
}
