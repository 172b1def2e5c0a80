using System.Globalization;

namespace OpGrowth.Sweeps;

/// <summary>
/// The numerical options every point of a sweep runs with (the plan's [engine] table). All of them
/// go into the point identity (<see cref="PointIdentity"/>), so changing any of them gives new points
/// instead of reusing stale results. Scheduling choices (parallel jobs, total memory, threads) are not
/// here: they do not change a result.
/// </summary>
public sealed record EngineSettings
{
    /// <summary>Which engine runs a point.</summary>
    public EngineChoice Engine { get; init; } = EngineChoice.Auto;

    /// <summary>With <see cref="EngineChoice.Auto"/>: points with N at or below this use the exact engine, larger N the Pauli engine.</summary>
    public int ExactMaxN { get; init; } = 12;

    /// <summary>Final time of every run, in drive periods for a periodic drive (the scrambling time must be reached before it, or the point reports a lower bound).</summary>
    public double Time { get; init; } = 20;

    /// <summary>Time step of the Pauli engine's integrator, and the record spacing of the exact engine.</summary>
    public double Dt { get; init; } = 0.05;

    /// <summary>Record observables every this many steps.</summary>
    public int RecordEvery { get; init; } = 2;

    /// <summary>Integrator of the Pauli engine: "trotter2", "trotter4" or "rk4".</summary>
    public string Method { get; init; } = "trotter2";

    /// <summary>String budget of the Pauli engine (largest |c| kept); the budget series reruns at half and a quarter.</summary>
    public long MaxStrings { get; init; } = 200_000;

    /// <summary>Coefficient threshold of the Pauli engine (0: off).</summary>
    public double Threshold { get; init; }

    /// <summary>Budgets in the budget series (1: only the given one; 2 or 3). The truncation uncertainty of t* is the move between the two largest budgets.</summary>
    public int Budgets { get; init; } = 2;

    /// <summary>Random states per point for the exact engine's typicality traces.</summary>
    public int Samples { get; init; } = 4;

    /// <summary>
    /// How the exact engine measures a point: "tstar" locates t* with the random-sign mean-size probe at times
    /// refined around 3N/8 (t* only; fast), "sites" resolves every site's OTOC on a uniform grid (t*, growth rate
    /// and v_B; cost grows with N).
    /// </summary>
    public string ExactMode { get; init; } = "tstar";

    /// <summary>
    /// Mean-size estimator of the "tstar" mode: "site-blocks" (exact trace over each site, 2N propagations per
    /// evaluation), "random-signs" (<see cref="ProbeGroups"/> groups of single-site probes with random signs, G + 1
    /// propagations), or "auto": site blocks on lattices with a distance, one random-sign group per site on all-to-all
    /// lattices and for Majorana sizes (<see cref="OpGrowth.Exact.ScramblingTimeSearch.DefaultEstimator"/>).
    /// </summary>
    public string SizeEstimator { get; init; } = "auto";

    /// <summary>Probe groups of the "random-signs" estimator (0: one per site).</summary>
    public int ProbeGroups { get; init; }

    /// <summary>Seed of the exact engine's random states.</summary>
    public long SampleSeed { get; init; } = 1;

    /// <summary>Front threshold for v_B as a fraction of the scrambled site weight 3/4.</summary>
    public double FrontFraction { get; init; } = 0.5;

    /// <summary>Synthetic law (engine = synthetic only).</summary>
    public SyntheticSettings Synthetic { get; init; } = new();

    /// <summary>The engine a point of size <paramref name="n"/> runs on.</summary>
    public EngineChoice Resolve(int n) => Engine == EngineChoice.Auto ? (n <= ExactMaxN ? EngineChoice.Exact : EngineChoice.Pauli) : Engine;

    /// <summary>Every option as text, sorted by name (the identity's engine part).</summary>
    public SortedDictionary<string, string> Canonical(int n)
    {
        var e = Resolve(n);
        var d = new SortedDictionary<string, string>(StringComparer.Ordinal)
        {
            ["engine"] = Name(e),
            ["time"] = F(Time),
            ["dt"] = F(Dt),
            ["record_every"] = RecordEvery.ToString(CultureInfo.InvariantCulture),
            ["front_fraction"] = F(FrontFraction),
        };
        switch (e)
        {
            case EngineChoice.Pauli:
                d["method"] = Method;
                d["max_strings"] = MaxStrings.ToString(CultureInfo.InvariantCulture);
                d["threshold"] = F(Threshold);
                d["budgets"] = Budgets.ToString(CultureInfo.InvariantCulture);
                break;
            case EngineChoice.Exact:
                d["samples"] = Samples.ToString(CultureInfo.InvariantCulture);
                d["sample_seed"] = SampleSeed.ToString(CultureInfo.InvariantCulture);
                d["exact_mode"] = ExactMode;
                if (ExactMode == "tstar")
                {
                    d["size_estimator"] = SizeEstimator;
                    d["probe_groups"] = ProbeGroups.ToString(CultureInfo.InvariantCulture);
                }
                break;
            case EngineChoice.Synthetic:
                foreach (var kv in Synthetic.Canonical()) d["synthetic." + kv.Key] = kv.Value;
                break;
        }
        return d;
    }

    /// <summary>Every option regardless of the engine a size resolves to (groups points into series).</summary>
    public SortedDictionary<string, string> CanonicalAll()
    {
        var d = Canonical(ExactMaxN + 1);
        foreach (var kv in Canonical(Math.Max(1, ExactMaxN))) d[kv.Key] = kv.Value;
        foreach (var kv in Synthetic.Canonical()) d["synthetic." + kv.Key] = kv.Value;
        d["engine"] = Name(Engine);
        d["exact_max_n"] = ExactMaxN.ToString(CultureInfo.InvariantCulture);
        return d;
    }

    /// <summary>
    /// <see cref="CanonicalAll"/> with the keys as JSON writes them (camelCase: "record_every" becomes
    /// "recordEvery"); the plan files keep the TOML spelling.
    /// </summary>
    public SortedDictionary<string, string> CanonicalAllJson()
    {
        var d = new SortedDictionary<string, string>(StringComparer.Ordinal);
        foreach (var kv in CanonicalAll())
        {
            var parts = kv.Key.Split('_');
            d[parts[0] + string.Concat(parts.Skip(1).Select(p => p.Length == 0 ? p : char.ToUpperInvariant(p[0]) + p[1..]))] = kv.Value;
        }
        return d;
    }

    /// <summary>Lower-case engine name as written in plans and results.</summary>
    public static string Name(EngineChoice e) => e switch
    {
        EngineChoice.Auto => "auto",
        EngineChoice.Pauli => "pauli",
        EngineChoice.Exact => "exact",
        _ => "synthetic",
    };

    internal static string F(double v) => v.ToString("R", CultureInfo.InvariantCulture);
}
