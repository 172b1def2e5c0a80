namespace OpGrowth.Sweeps;

/// <summary>
/// One run of a sweep: a model file at one size N, one set of parameter values, one disorder seed,
/// one probe operator and the engine options. <see cref="Id"/> is its identity (see
/// <see cref="PointIdentity"/>); <see cref="Index"/> is its position in the plan's expansion (the
/// Slurm array index).
/// </summary>
public sealed record SweepPoint
{
    /// <summary>Position in the plan's expansion (0-based).</summary>
    public required int Index { get; init; }

    /// <summary>Identity: hex prefix of the SHA-256 of the canonical description.</summary>
    public required string Id { get; init; }

    /// <summary>Absolute path of the model file.</summary>
    public required string ModelFile { get; init; }

    /// <summary>Short label of the model (file name without extension).</summary>
    public required string ModelLabel { get; init; }

    /// <summary>SHA-256 (hex) of the model file's bytes.</summary>
    public required string ModelSha256 { get; init; }

    /// <summary>Number of qubits.</summary>
    public required int N { get; init; }

    /// <summary>Parameter overrides (besides N and the seed), sorted by name.</summary>
    public required IReadOnlyList<KeyValuePair<string, double>> Parameters { get; init; }

    /// <summary>Disorder seed, or null for a clean model.</summary>
    public long? Seed { get; init; }

    /// <summary>Model parameter that receives the seed.</summary>
    public string SeedParameter { get; init; } = "seed";

    /// <summary>Probe operator resolved at this N ("Z_0", "X_7"), or "model:K" for the model's K-th default probe.</summary>
    public required string Probe { get; init; }

    /// <summary>Probe as the plan writes it (before N is substituted); points of one series share it.</summary>
    public required string ProbeTemplate { get; init; }

    /// <summary>Engine options.</summary>
    public required EngineSettings Engine { get; init; }

    /// <summary>The engine this point runs on.</summary>
    public EngineChoice ResolvedEngine => Engine.Resolve(N);

    /// <summary>Parameter key of the point's group: everything except N and the seed (disorder averages and fits run over it).</summary>
    public string GroupKey => PointIdentity.GroupKey(this);

    /// <summary>Model overrides as the model loader takes them (N, parameters, seed).</summary>
    public IReadOnlyDictionary<string, string> Overrides()
    {
        var d = new Dictionary<string, string>(StringComparer.Ordinal) { ["N"] = N.ToString(System.Globalization.CultureInfo.InvariantCulture) };
        foreach (var kv in Parameters) d[kv.Key] = EngineSettings.F(kv.Value);
        if (Seed is long s) d[SeedParameter] = s.ToString(System.Globalization.CultureInfo.InvariantCulture);
        return d;
    }

    /// <summary>One-line description for logs.</summary>
    public override string ToString()
    {
        var parts = new List<string> { ModelLabel, $"N={N}" };
        parts.AddRange(Parameters.Select(kv => $"{kv.Key}={EngineSettings.F(kv.Value)}"));
        if (Seed is long s) parts.Add($"seed={s}");
        parts.Add(Probe);
        parts.Add(EngineSettings.Name(ResolvedEngine));
        return string.Join(' ', parts);
    }
}
