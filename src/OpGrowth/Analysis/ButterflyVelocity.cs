namespace OpGrowth.Analysis;

/// <summary>v_B at the stated threshold, its fit error and its sensitivity to the threshold.</summary>
public sealed record ButterflyVelocity
{
    /// <summary>The fit at the default threshold.</summary>
    public required FrontFit Primary { get; init; }

    /// <summary>Fits at the sensitivity thresholds.</summary>
    public IReadOnlyList<FrontFit> Sensitivity { get; init; } = [];

    /// <summary>Largest minus smallest v_B over the sensitivity thresholds (null if fewer than two fits).</summary>
    public double? ThresholdSpread { get; init; }

    /// <summary>Front position r_f(t) at the default threshold, one per recorded time.</summary>
    public int[] Front { get; init; } = [];

    /// <summary>Largest distance from the probe on this lattice (the front stops there).</summary>
    public int MaxDistance { get; init; }
}
