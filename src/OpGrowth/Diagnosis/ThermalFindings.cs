namespace OpGrowth.Diagnosis;

/// <summary>Finite-temperature figures at one temperature (test 6).</summary>
/// <param name="Beta">Inverse temperature (in the model's units).</param>
/// <param name="BetaEpsilon">beta times the energy scale epsilon.</param>
/// <param name="Growth">Exponential-regime fit of the regularised squared commutator C = 1 - F/F(0) (letter average at the V site).</param>
/// <param name="BoundRatio">lambda / (2 pi T) = lambda beta / (2 pi); NaN when there is no fit.</param>
/// <param name="ThermalValue">&lt;W&gt;_beta (typicality), subtracted from the autocorrelation.</param>
/// <param name="Plateau">Late-time mean of the connected, normalised autocorrelation (1 at t = 0).</param>
/// <param name="PlateauError">Its uncertainty (sampling error and spread over the window).</param>
/// <param name="FinalOtoc">F(t)/F(0) at the last time (how far the OTOC decayed).</param>
public sealed record ThermalPoint(double Beta, double BetaEpsilon, ExponentialRegime Growth, double BoundRatio, double ThermalValue, double Plateau, double PlateauError, double FinalOtoc)
{
    /// <summary>
    /// Long-range order of the probe's letter at this temperature: the largest over lattice patterns s (uniform,
    /// and the two-sublattice sign on a bipartite lattice) of sum_{i != j} s_i s_j (&lt;W_i W_j&gt; - &lt;W_i&gt;&lt;W_j&gt;)
    /// / (N (N-1)), divided by the probe's connected variance 1 - &lt;W&gt;^2 so that it compares with
    /// <see cref="Plateau"/> (an ordered state with order parameter m gives about m^2 / (1 - &lt;W&gt;^2) for both).
    /// NaN when not measured (multi-site probe).
    /// </summary>
    public double Order { get; init; } = double.NaN;

    /// <summary>The pattern of <see cref="Order"/>: "uniform" or "staggered" (null when not measured).</summary>
    public string? OrderPattern { get; init; }
}

/// <summary>Low-temperature plateau at one system size (its N dependence).</summary>
/// <param name="N">System size.</param>
/// <param name="BetaEpsilon">beta epsilon of the lowest temperature.</param>
/// <param name="Plateau">Connected autocorrelation plateau.</param>
/// <param name="PlateauError">Its uncertainty.</param>
public sealed record PlateauAtSize(int N, double BetaEpsilon, double Plateau, double PlateauError);

/// <summary>What test 6 (finite temperature) measured.</summary>
public sealed record ThermalFindings
{
    /// <summary>Size of the smaller member used.</summary>
    public required int N { get; init; }

    /// <summary>The evolved operator W.</summary>
    public required string Operator { get; init; }

    /// <summary>Site of the partner operators V (X, Y, Z averaged).</summary>
    public required int PartnerSite { get; init; }

    /// <summary>Energy scale epsilon of the small member.</summary>
    public required double Epsilon { get; init; }

    /// <summary>Last time of the series.</summary>
    public required double TimeMax { get; init; }

    /// <summary>How the traces were taken.</summary>
    public required string Method { get; init; }

    /// <summary>One entry per temperature, hottest first.</summary>
    public required IReadOnlyList<ThermalPoint> Points { get; init; }

    /// <summary>Plateau at the lowest temperature for each size measured (the first is <see cref="N"/>).</summary>
    public required IReadOnlyList<PlateauAtSize> PlateauBySize { get; init; }
}
