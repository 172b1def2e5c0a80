namespace OpGrowth.Sweeps;

/// <summary>Resources of each array task.</summary>
public sealed record SlurmOptions
{
    /// <summary>Job name (letters, digits, '.', '_', '-').</summary>
    public string JobName { get; init; } = "opgrowth-sweep";

    /// <summary>CPUs per task (also the point's thread count).</summary>
    public int CpusPerTask { get; init; } = 1;

    /// <summary>Memory per task (null: the cluster's default).</summary>
    public long? MemoryPerTaskBytes { get; init; }

    /// <summary>Wall-time limit per task in Slurm's form, e.g. "02:00:00" (null: the partition's default).</summary>
    public string? TimeLimit { get; init; }

    /// <summary>Partition (null: the default).</summary>
    public string? Partition { get; init; }

    /// <summary>At most this many tasks at once (the %k suffix of --array), or null.</summary>
    public int? MaxConcurrent { get; init; }

    /// <summary>Further #SBATCH lines, verbatim (e.g. "--account=phys").</summary>
    public IReadOnlyList<string> ExtraDirectives { get; init; } = [];
}
