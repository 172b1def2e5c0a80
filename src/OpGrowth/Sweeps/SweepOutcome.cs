namespace OpGrowth.Sweeps;

/// <summary>What a sweep did.</summary>
public sealed record SweepOutcome(int Total, int Skipped, int Computed, IReadOnlyList<CorruptPoint> Corrupt, IReadOnlyList<PointFailure> Failed);
