namespace OpGrowth.Exact;

/// <summary>
/// Level statistics of a Hamiltonian (or of several disorder realisations): mean gap ratio &lt;r&gt; in
/// resolved symmetry sectors with its error bar, the reference values, and warnings about symmetries that
/// were declared or detected but not resolved.
/// </summary>
public sealed record LevelStatisticsResult
{
    public required int N { get; init; }

    /// <summary>True when the sector blocks are real symmetric (time-reversal invariant: GOE expected if chaotic); GUE otherwise.</summary>
    public required bool RealBlocks { get; init; }

    /// <summary>Supported symmetries that commute with H.</summary>
    public required IReadOnlyList<string> Detected { get; init; }

    /// <summary>Symmetries resolved into sectors.</summary>
    public required IReadOnlyList<string> Resolved { get; init; }

    /// <summary>Per sector (first realisation when several).</summary>
    public required IReadOnlyList<SectorStatistics> Sectors { get; init; }

    /// <summary>Pooled mean gap ratio over sectors (and realisations).</summary>
    public required double MeanRatio { get; init; }

    /// <summary>Error bar of <see cref="MeanRatio"/>.</summary>
    public required double StandardError { get; init; }

    /// <summary>How the error bar was computed.</summary>
    public required string ErrorKind { get; init; }

    /// <summary>Total number of gap ratios.</summary>
    public required int Gaps { get; init; }

    /// <summary>Number of realisations (disorder samples).</summary>
    public required int Realizations { get; init; }

    /// <summary>Mean ratio of each realisation.</summary>
    public required IReadOnlyList<double> RealizationMeans { get; init; }

    /// <summary>Poisson value 2 ln 2 - 1.</summary>
    public double Poisson => LevelStatistics.PoissonRatio;

    /// <summary>GOE value (large-N).</summary>
    public double Goe => LevelStatistics.GoeRatio;

    /// <summary>GUE value (large-N).</summary>
    public double Gue => LevelStatistics.GueRatio;

    /// <summary>Reference ensemble closest to the measured mean ratio ("Poisson", "GOE" or "GUE").</summary>
    public required string Closest { get; init; }

    /// <summary>Warnings: unresolved symmetries, exact degeneracies, small sectors.</summary>
    public required IReadOnlyList<string> Warnings { get; init; }

    /// <summary>Wall time.</summary>
    public required double WallSeconds { get; init; }
}
