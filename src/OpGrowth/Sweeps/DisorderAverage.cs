namespace OpGrowth.Sweeps;

/// <summary>
/// The figures of one series at one N averaged over disorder seeds. The statistical error is the
/// bootstrap error over seeds (<see cref="Bootstrap"/>); the truncation and grid errors are the mean of
/// the per-seed ones (they are systematic, so they are not reduced by averaging) and are kept apart.
/// </summary>
public sealed record DisorderAverage
{
    /// <summary>Series key (everything but N and the seed).</summary>
    public required string Group { get; init; }

    /// <summary>Model label.</summary>
    public required string Model { get; init; }

    /// <summary>Parameter values of the series.</summary>
    public required SortedDictionary<string, double> Parameters { get; init; }

    /// <summary>Probe template.</summary>
    public required string Probe { get; init; }

    /// <summary>Engines that produced the points (usually one).</summary>
    public required string Engine { get; init; }

    /// <summary>Size.</summary>
    public required int N { get; init; }

    /// <summary>Number of seeds (points) at this N.</summary>
    public int Seeds { get; init; }

    /// <summary>Points whose t* was reached within the run time.</summary>
    public int Reached { get; init; }

    /// <summary>Mean t* over seeds; null unless every seed reached it.</summary>
    public double? TStar { get; init; }

    /// <summary>Bootstrap error of the mean over seeds (null for one seed).</summary>
    public double? TStarStatError { get; init; }

    /// <summary>Mean truncation error (null when any point lacks one).</summary>
    public double? TStarTruncationError { get; init; }

    /// <summary>Mean grid error.</summary>
    public double TStarGridError { get; init; }

    /// <summary>Seed-to-seed standard deviation of t* (null for one seed).</summary>
    public double? TStarSpread { get; init; }

    /// <summary>Error of the mean from the points' own sampling (typicality) errors, sqrt(sum sigma_i^2)/n; null when none has one.</summary>
    public double? TStarSamplingError { get; init; }

    /// <summary>Kind of the growth rate ("exponential" or "linear"); null when points disagree or have none.</summary>
    public string? GrowthKind { get; init; }

    /// <summary>Mean growth rate (null when any point lacks one).</summary>
    public double? GrowthRate { get; init; }

    /// <summary>Bootstrap error of the growth rate.</summary>
    public double? GrowthRateStatError { get; init; }

    /// <summary>Mean v_B (null when any point lacks one).</summary>
    public double? VB { get; init; }

    /// <summary>Bootstrap error of the mean v_B over seeds (null for one seed).</summary>
    public double? VBStatError { get; init; }

    /// <summary>
    /// Total uncertainty of the mean v_B: the bootstrap error over seeds and the points' own errors (front-fit error,
    /// threshold spread, truncation movement) propagated to the mean, sqrt(sum sigma_i^2) / n, in quadrature.
    /// </summary>
    public double? VBError { get; init; }

    /// <summary>Largest discarded weight among the points.</summary>
    public double MaxDiscardedWeight { get; init; }

    /// <summary>False when any point was flagged as not converged.</summary>
    public bool Converged { get; init; } = true;

    /// <summary>Total uncertainty of t* for fits: statistical, truncation, grid and sampling in quadrature.</summary>
    public double TStarTotalError
    {
        get
        {
            double s = TStarStatError ?? 0, t = TStarTruncationError ?? 0, g = TStarGridError, q = TStarSamplingError ?? 0;
            return Math.Sqrt(s * s + t * t + g * g + q * q);
        }
    }
}
