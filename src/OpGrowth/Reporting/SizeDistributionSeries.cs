namespace OpGrowth.Reporting;

/// <summary>
/// Operator size distribution P_k(t): <see cref="Weights"/>[k, i] is the weight of strings of size k at
/// <see cref="Times"/>[i] (k = 0..K). Times should be (close to) evenly spaced; uneven grids are shown by holding
/// each sample until the next one.
/// </summary>
public sealed record SizeDistributionSeries(double[] Times, double[,] Weights)
{
    /// <summary>What a unit of size counts: "qubits" or "Majoranas".</summary>
    public string SizeUnit { get; init; } = "qubits";

    public string TimeLabel { get; init; } = AxisText.Time;

    /// <summary>Colour by log10 P_k (down to <see cref="LogFloor"/>) to show small tails.</summary>
    public bool LogScale { get; init; }

    public double LogFloor { get; init; } = 1e-6;

    /// <summary>Optional mean size n(t) on the same time grid, drawn over the map.</summary>
    public double[]? MeanSize { get; init; }
}
