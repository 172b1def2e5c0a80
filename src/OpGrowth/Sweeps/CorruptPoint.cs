namespace OpGrowth.Sweeps;

/// <summary>A point file found corrupt: its id, where it was, where it was moved and why.</summary>
public sealed record CorruptPoint(string Id, string Path, string MovedTo, string Problem);
