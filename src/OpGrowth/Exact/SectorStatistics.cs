namespace OpGrowth.Exact;

/// <summary>Gap-ratio statistics of one symmetry sector.</summary>
/// <param name="Label">Sector label (magnetisation, parities).</param>
/// <param name="Dimension">Sector dimension.</param>
/// <param name="Gaps">Number of gap ratios used (central part of the spectrum).</param>
/// <param name="MeanRatio">Mean gap ratio.</param>
/// <param name="StandardError">Standard error of the mean over the gap ratios (neighbouring ratios are weakly correlated; common practice).</param>
/// <param name="Degeneracies">Exactly degenerate neighbouring gaps skipped (0/0 ratios).</param>
public sealed record SectorStatistics(string Label, int Dimension, int Gaps, double MeanRatio, double StandardError, int Degeneracies);
