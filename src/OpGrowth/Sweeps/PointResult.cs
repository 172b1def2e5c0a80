namespace OpGrowth.Sweeps;

/// <summary>
/// What one point produced. Uncertainties are kept apart by origin: the grid error comes from the
/// record spacing (how well the crossing time is located between recorded times), the truncation
/// error from the budget series (how far the figure moved between the two largest budgets);
/// statistical errors over disorder only appear after averaging over seeds (<see cref="SweepCollector"/>).
/// A null truncation error means it was not estimated (a single budget); 0 means the run was exact.
/// </summary>
public sealed record PointResult
{
    /// <summary>Scrambling time: first time the mean size reaches half its saturation, n(t*) = 3N/8; null when not reached by <see cref="FinalTime"/>.</summary>
    public double? TStar { get; init; }

    /// <summary>Uncertainty of t* from locating the crossing between recorded times.</summary>
    public double TStarGridError { get; init; }

    /// <summary>Uncertainty of t* from truncation (budget series); null when not estimated.</summary>
    public double? TStarTruncationError { get; init; }

    /// <summary>Statistical error of t* from the exact engine's random-state (typicality) traces; null for other engines.</summary>
    public double? TStarSamplingError { get; init; }

    /// <summary>
    /// Early growth rate of the mean size: exponential rate lambda of n(t) - n(0) ~ e^{lambda t} (per unit time)
    /// when <see cref="GrowthKind"/> is "exponential", slope dn/dt (sites per unit time) when "linear"
    /// (one-dimensional lattices); null when no window was found.
    /// </summary>
    public double? GrowthRate { get; init; }

    /// <summary>"exponential" or "linear" (see <see cref="GrowthRate"/>).</summary>
    public string? GrowthKind { get; init; }

    /// <summary>Fit error of the growth rate.</summary>
    public double? GrowthRateError { get; init; }

    /// <summary>Truncation uncertainty of the growth rate (budget series); null when not estimated.</summary>
    public double? GrowthRateTruncationError { get; init; }

    /// <summary>The fit window of the growth rate, "t0..t1".</summary>
    public string? GrowthWindow { get; init; }

    /// <summary>Butterfly velocity from the front of the site weights (sites per unit time); null where not defined (no distance, front never moved).</summary>
    public double? VB { get; init; }

    /// <summary>Fit error of v_B (threshold sensitivity included).</summary>
    public double? VBError { get; init; }

    /// <summary>Truncation uncertainty of v_B (budget series); null when not estimated.</summary>
    public double? VBTruncationError { get; init; }

    /// <summary>Total weight discarded by truncation (sum of c^2 dropped) in the run the figures come from.</summary>
    public double DiscardedWeight { get; init; }

    /// <summary>Mean size at the final time divided by its saturation value 3N/4.</summary>
    public double FinalSizeFraction { get; init; }

    /// <summary>Time the run reached.</summary>
    public double FinalTime { get; init; }

    /// <summary>Engine that produced the figures: "pauli", "exact" or "synthetic".</summary>
    public required string Engine { get; init; }

    /// <summary>The probe actually evolved (a "model:K" probe resolved to its string).</summary>
    public string? ProbeResolved { get; init; }

    /// <summary>True when every truncation uncertainty is within the engine's convergence tolerance (always true for exact runs).</summary>
    public bool Converged { get; init; } = true;

    /// <summary>Wall-clock seconds the point took.</summary>
    public double WallSeconds { get; init; }

    /// <summary>Peak memory the point declared or used (bytes).</summary>
    public long MemoryBytes { get; init; }

    /// <summary>Free-text remarks (e.g. "t* not reached: lower bound 20").</summary>
    public string? Note { get; init; }
}
