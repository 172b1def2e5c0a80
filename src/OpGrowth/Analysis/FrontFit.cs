namespace OpGrowth.Analysis;

/// <summary>
/// A butterfly-velocity fit at one threshold: the front r_f(t) = largest distance from the probe where
/// rho_j(t) &gt;= threshold, sampled where it steps (the time t_r at which it first reaches distance r,
/// interpolated linearly between recorded times), fitted as r = v_B t + c over the window
/// <see cref="MinDistance"/>..<see cref="MaxDistance"/> (before the front reaches the lattice's largest
/// distance from the probe).
/// </summary>
public sealed record FrontFit
{
    /// <summary>Threshold as a fraction of 3/4.</summary>
    public double ThresholdFraction { get; init; }

    /// <summary>Threshold on rho_j.</summary>
    public double Threshold { get; init; }

    /// <summary>v_B in sites per unit time (null when the window holds too few points).</summary>
    public double? Velocity { get; init; }

    /// <summary>Standard error of v_B from the least-squares residuals.</summary>
    public double? VelocityError { get; init; }

    /// <summary>Offset c of the fit r = v_B t + c.</summary>
    public double? Intercept { get; init; }

    /// <summary>Points in the fit.</summary>
    public int Points { get; init; }

    /// <summary>Smallest distance in the window.</summary>
    public int MinDistance { get; init; }

    /// <summary>Largest distance in the window.</summary>
    public int MaxDistance { get; init; }

    /// <summary>First time in the window.</summary>
    public double? WindowStart { get; init; }

    /// <summary>Last time in the window.</summary>
    public double? WindowEnd { get; init; }

    /// <summary>Arrival time t_r at each distance r = 0..max (NaN when not reached).</summary>
    public double[] ArrivalTimes { get; init; } = [];

    /// <summary>Why there is no value, if there is none.</summary>
    public string? Note { get; init; }
}
