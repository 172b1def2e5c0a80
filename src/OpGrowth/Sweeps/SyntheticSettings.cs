using System.Globalization;

namespace OpGrowth.Sweeps;

/// <summary>
/// The closed-form stand-in used by <see cref="SyntheticPointRunner"/> (plan table [synthetic]):
/// t*(N) = a + b N ("linear") or a + b ln N ("log"), plus seed-dependent Gaussian scatter of relative
/// size <see cref="Noise"/>. It exercises scheduling, resumption, collection, fits and clusters without
/// physics, and lets tests know the true law.
/// </summary>
public sealed record SyntheticSettings
{
    /// <summary>"linear" or "log".</summary>
    public string Law { get; init; } = "linear";

    /// <summary>Intercept a.</summary>
    public double A { get; init; } = 1.0;

    /// <summary>Slope b (per site, or per e-fold of N).</summary>
    public double B { get; init; } = 0.25;

    /// <summary>Relative seed-to-seed scatter of t* (standard deviation / t*); 0 for none.</summary>
    public double Noise { get; init; }

    /// <summary>Reported truncation uncertainty as a fraction of t*.</summary>
    public double TruncationFraction { get; init; } = 0.01;

    /// <summary>Seconds each point pretends to compute (sleeps, cancellable).</summary>
    public double Delay { get; init; }

    /// <summary>Memory each point declares (bytes), for the scheduler.</summary>
    public long MemoryBytes { get; init; } = 64L << 20;

    internal SortedDictionary<string, string> Canonical() => new(StringComparer.Ordinal)
    {
        ["law"] = Law,
        ["a"] = EngineSettings.F(A),
        ["b"] = EngineSettings.F(B),
        ["noise"] = EngineSettings.F(Noise),
        ["truncation_fraction"] = EngineSettings.F(TruncationFraction),
        ["delay"] = EngineSettings.F(Delay),
        ["memory"] = MemoryBytes.ToString(CultureInfo.InvariantCulture),
    };
}
