namespace OpGrowth.Evolution;

/// <summary>Everything one evolution run (one budget of the budget series) produced.</summary>
public sealed class EvolutionSeries
{
    /// <summary>Budget used.</summary>
    public required SeriesBudget Budget { get; init; }

    /// <summary>Recorded observables in time order.</summary>
    public List<EvolutionRecord> Records { get; init; } = [];

    /// <summary>Per-step discarded weight and string count.</summary>
    public List<StepLog> Steps { get; init; } = [];

    /// <summary>True when the run reached its final time.</summary>
    public bool Completed { get; set; }

    /// <summary>Why the run stopped early, if it did.</summary>
    public string? StopReason { get; set; }

    /// <summary>Largest string count held after a pass.</summary>
    public long PeakStrings { get; set; }

    /// <summary>Largest number of bytes held by the engine's arrays (operators, accumulator, buffers).</summary>
    public long PeakTrackedBytes { get; set; }

    /// <summary>Largest managed-heap size seen at a pass boundary (live arrays plus garbage not yet collected).</summary>
    public long PeakHeapBytes { get; set; }

    /// <summary>Peak working set of the whole process so far (runtime included).</summary>
    public long PeakWorkingSetBytes { get; set; }

    /// <summary>Passes redone with stronger branch pruning because the image did not fit the memory budget.</summary>
    public long PassRetries { get; set; }

    /// <summary>Map passes over the operator.</summary>
    public long Passes { get; set; }

    /// <summary>Wall-clock seconds spent evolving (summed over resumed sessions).</summary>
    public double ElapsedSeconds { get; set; }

    /// <summary>Steps taken in this session (excludes steps restored from a checkpoint).</summary>
    public long StepsThisSession { get; set; }

    /// <summary>Wall-clock seconds of this session.</summary>
    public double SessionSeconds { get; set; }
}
