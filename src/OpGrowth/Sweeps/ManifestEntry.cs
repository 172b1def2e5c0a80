namespace OpGrowth.Sweeps;

/// <summary>One point of a manifest.</summary>
public sealed record ManifestEntry(int Index, string Id, string Description, int N, long? Seed, string Group);
