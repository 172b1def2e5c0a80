using Microsoft.Extensions.Logging;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>Options of <see cref="ScramblingTimeSearch"/>.</summary>
public sealed record ScramblingTimeSearchOptions
{
    /// <summary>The evolved operator W (a Pauli string, not the identity).</summary>
    public required PauliString Operator { get; init; }

    /// <summary>Count size in Majoranas (Jordan-Wigner strings of <see cref="OpGrowth.Models.JordanWigner"/>) instead of qubits.</summary>
    public bool MajoranaSize { get; init; }

    /// <summary>A first guess of t* (e.g. from a smaller member); null: start from the local time scale of W.</summary>
    public double? Guess { get; init; }

    /// <summary>Latest time evaluated; when the size is still below the target there, t* is reported as a lower bound.</summary>
    public double MaxTime { get; init; } = 50;

    /// <summary>Random states (each with its own random signs); their spread gives the sampling error.</summary>
    public int Samples { get; init; } = 1;

    /// <summary>
    /// Probe groups per random state: the probe strings are split into this many groups with independent random
    /// signs (cross terms only within a group; cost G + 1 backward propagations per evaluation).
    /// </summary>
    public int ProbeGroups { get; init; } = 1;

    /// <summary>
    /// Estimate the qubit mean size from site blocks (for every site j two states |r' e&gt;_j, e = 0, 1, with the trace
    /// over site j exact: X_j, Y_j and Z_j resolved without sign noise; 2N propagations per evaluation) instead of the
    /// random-sign probe. <see cref="ProbeGroups"/> is then ignored.
    /// </summary>
    public bool SiteBlocks { get; init; }

    /// <summary>Seed of the random states and signs.</summary>
    public int Seed { get; init; } = 1;

    /// <summary>Relative accuracy to which the crossing is located (interpolation error over t*).</summary>
    public double RelativeTolerance { get; init; } = 0.005;

    /// <summary>Error tolerance of each Chebyshev propagation.</summary>
    public double PropagationTolerance { get; init; } = 1e-8;

    /// <summary>Fraction of the saturation size that defines t* (0.5: n(t*) = 3N/8 for qubits).</summary>
    public double TargetFraction { get; init; } = 0.5;

    /// <summary>Most size evaluations before giving up refining (the best estimate so far is returned).</summary>
    public int MaxEvaluations { get; init; } = 24;

    /// <summary>Worker threads (0 = all cores).</summary>
    public int Threads { get; init; }

    /// <summary>
    /// Memory the search may use for state vectors (null: 60% of the available memory). When the forward checkpoints
    /// do not fit, every vector is regenerated from its seed and propagated from t = 0 at each evaluation (more work,
    /// same result).
    /// </summary>
    public long? MemoryBytes { get; init; }

    /// <summary>Spectral interval to use (null: a short Lanczos estimate).</summary>
    public SpectralBounds? Bounds { get; init; }

    public ILogger? Logger { get; init; }
}
