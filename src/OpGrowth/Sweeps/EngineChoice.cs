namespace OpGrowth.Sweeps;

/// <summary>Which engine runs the points of a sweep.</summary>
public enum EngineChoice
{
    /// <summary>Exact engine up to <see cref="EngineSettings.ExactMaxN"/>, Pauli engine beyond.</summary>
    Auto,

    /// <summary>Truncated Heisenberg evolution in the Pauli-string basis.</summary>
    Pauli,

    /// <summary>State-vector engine (small N).</summary>
    Exact,

    /// <summary>A closed-form stand-in law (for testing the sweep machinery: scheduling, resumption, clusters).</summary>
    Synthetic,
}
