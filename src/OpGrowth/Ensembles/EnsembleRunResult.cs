namespace OpGrowth.Ensembles;

/// <summary>What <see cref="EnsembleRun.Execute"/> produced.</summary>
public sealed record EnsembleRunResult
{
    /// <summary>"random circuit" or the Brownian kind.</summary>
    public required string Kind { get; init; }
    public required string Name { get; init; }
    public required string Folder { get; init; }
    public required EnsembleSeries Series { get; init; }
    public required EnsembleFigures Figures { get; init; }
    public EnsembleSweepResult? Sweep { get; init; }
    /// <summary>Headline lines as printed (name: value).</summary>
    public IReadOnlyList<string> Lines { get; init; } = [];
    public IReadOnlyList<string> Files { get; init; } = [];
    public double WallSeconds { get; init; }
}
