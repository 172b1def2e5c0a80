namespace OpGrowth.Evolution;

/// <summary>A progress report, sent after every step.</summary>
/// <param name="Rung">Ladder rung being run (0-based, in the order they run).</param>
/// <param name="Rungs">Number of rungs.</param>
/// <param name="Step">Steps (periods) done.</param>
/// <param name="TotalSteps">Steps (periods) to do.</param>
/// <param name="Time">Physical time reached.</param>
/// <param name="Strings">Strings held.</param>
/// <param name="DiscardedTotal">Weight discarded so far.</param>
/// <param name="Elapsed">Wall time of this rung in this session.</param>
/// <param name="Remaining">Estimated wall time left in this rung (from this session's rate), or null.</param>
public readonly record struct EvolutionProgress(int Rung, int Rungs, long Step, long TotalSteps, double Time, int Strings,
    double DiscardedTotal, TimeSpan Elapsed, TimeSpan? Remaining);
