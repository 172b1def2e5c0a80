namespace OpGrowth.Reporting;

/// <summary>
/// OTOC light cone: <see cref="Values"/>[j, i] is the quantity (1 - F, or the site weight rho_j) at position
/// <see cref="Positions"/>[j] and time <see cref="Times"/>[i]. <see cref="Origin"/> is where the operator started;
/// a fitted front is drawn at Origin ± (v t + c) on both sides that lie inside the positions.
/// </summary>
public sealed record LightConeMap(double[] Times, double[] Positions, double[,] Values)
{
    /// <summary>Name of the quantity, e.g. "1 - F" or "ρ_j(t)".</summary>
    public string Quantity { get; init; } = "1 - F";

    public double Origin { get; init; }

    public FrontFit? Front { get; init; }

    public string PositionLabel { get; init; } = "site j";

    public string TimeLabel { get; init; } = AxisText.Time;

    /// <summary>Top of the colour scale; default the largest value (1 - F saturates at 1, rho_j at 3/4).</summary>
    public double? ScaleMax { get; init; }
}
