namespace OpGrowth.Sweeps;

/// <summary>
/// The payload of a point file: the point's description (enough to tabulate it without the plan),
/// its canonical identity text and its result.
/// </summary>
public sealed record StoredPoint
{
    /// <summary>Point id (file name).</summary>
    public required string Id { get; init; }

    /// <summary>Canonical JSON the id hashes (<see cref="PointIdentity.CanonicalJson"/>); checked on reading.</summary>
    public required string Identity { get; init; }

    /// <summary>Model label (file name without extension).</summary>
    public required string Model { get; init; }

    /// <summary>Model file path when the point ran.</summary>
    public required string ModelFile { get; init; }

    /// <summary>Number of qubits.</summary>
    public required int N { get; init; }

    /// <summary>Parameter overrides besides N and the seed.</summary>
    public required SortedDictionary<string, double> Parameters { get; init; }

    /// <summary>Disorder seed, or null.</summary>
    public long? Seed { get; init; }

    /// <summary>Probe (resolved at N, or "model:K").</summary>
    public required string Probe { get; init; }

    /// <summary>Probe template of the plan (series key).</summary>
    public required string ProbeTemplate { get; init; }

    /// <summary>Series key: everything but N and the seed.</summary>
    public required string Group { get; init; }

    /// <summary>Result.</summary>
    public required PointResult Result { get; init; }

    /// <summary>Creates the payload of a finished point.</summary>
    public static StoredPoint From(SweepPoint p, PointResult r) => new()
    {
        Id = p.Id,
        Identity = PointIdentity.CanonicalJson(p.ModelSha256, p.N, p.Parameters, p.Seed, p.SeedParameter, p.Probe, p.Engine),
        Model = p.ModelLabel,
        ModelFile = p.ModelFile,
        N = p.N,
        Parameters = new SortedDictionary<string, double>(p.Parameters.ToDictionary(kv => kv.Key, kv => kv.Value), StringComparer.Ordinal),
        Seed = p.Seed,
        Probe = p.Probe,
        ProbeTemplate = p.ProbeTemplate,
        Group = p.GroupKey,
        Result = r,
    };
}
