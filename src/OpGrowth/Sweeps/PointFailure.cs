namespace OpGrowth.Sweeps;

/// <summary>A point that failed (resource limit or error); it has no result file and is retried next time.</summary>
public sealed record PointFailure(int Index, string Id, string Point, string Kind, string Message);
