namespace OpGrowth.Analysis;

/// <summary>Early growth of the operator and its late-time plateau.</summary>
public sealed record GrowthRates
{
    /// <summary>Exponential fit of the mean size: ln(n(t) - n(0)) vs t.</summary>
    public required GrowthFit SizeExponential { get; init; }

    /// <summary>Linear fit of the mean size on the same window: n(t) vs t.</summary>
    public required GrowthFit SizeLinear { get; init; }

    /// <summary>Exponential fit of the averaged squared commutator away from the probe: ln C(t) vs t.</summary>
    public required GrowthFit OtocExponential { get; init; }

    /// <summary>"linear" or "exponential": which description the data supports (1D lattices: linear, see Khemani, Huse, Nahum, PRB 98, 144304 (2018)).</summary>
    public required string Regime { get; init; }

    /// <summary>Why the regime was chosen.</summary>
    public required string RegimeReason { get; init; }

    /// <summary>Late-time mean size (mean over the last quarter of the records), null if t* was not reached before that window.</summary>
    public double? Saturation { get; init; }

    /// <summary>Standard deviation of n(t) over the saturation window.</summary>
    public double? SaturationSpread { get; init; }

    /// <summary>Random-operator value (3N/4) 4^N / (4^N - 1).</summary>
    public double SaturationExpected { get; init; }

    /// <summary>Saturation / expected.</summary>
    public double? SaturationRatio { get; init; }

    /// <summary>Window of the saturation average.</summary>
    public double? SaturationWindowStart { get; init; }
}
