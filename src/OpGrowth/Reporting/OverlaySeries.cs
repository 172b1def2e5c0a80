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

    /// <summary>Further quantities from both engines on the same times (e.g. OTOCs F_j(t) at chosen sites), drawn in the top panel.</summary>
    public IReadOnlyList<OverlayCurve> Curves { get; init; } = [];

    /// <summary>
    /// The difference to show in the bottom panel when it should cover more than <see cref="Pauli"/> - <see cref="Exact"/>
    /// (e.g. the largest |Delta F| over every site and X/Y/Z at each time); with <see cref="LogDifference"/>.
    /// </summary>
    public double[]? Difference { get; init; }

    /// <summary>Legend text of <see cref="Difference"/>.</summary>
    public string DifferenceLabel { get; init; } = "|Pauli - exact|";
}
