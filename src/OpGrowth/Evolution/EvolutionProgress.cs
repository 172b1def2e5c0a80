namespace OpGrowth.Evolution;

/// <summary>A progress report, sent after every step.</summary>
/// <param name="Run">Run of the budget series in progress (0-based, in the order they run: smallest budget first).</param>
/// <param name="Runs">Number of budgets in the series.</param>
/// <param name="Step">Steps (periods) done.</param>
/// <param name="TotalSteps">Steps (periods) to do.</param>
/// <param name="Time">Physical time reached.</param>
/// <param name="Strings">Strings held.</param>
/// <param name="DiscardedTotal">Weight discarded so far.</param>
/// <param name="Elapsed">Wall time of this run in this session.</param>
/// <param name="Remaining">Estimated wall time left in this run (from this session's rate), or null.</param>
public readonly record struct EvolutionProgress(int Run, int Runs, long Step, long TotalSteps, double Time, int Strings,
    double DiscardedTotal, TimeSpan Elapsed, TimeSpan? Remaining);
