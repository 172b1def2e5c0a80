namespace OpGrowth.Krylov;

/// <summary>Physics derived from Lanczos coefficients: growth class, dynamics on the Krylov chain, spectral function.</summary>
public sealed record KrylovAnalysis
{
    /// <summary>Number of leading coefficients used (trusted: verified and with finite uncertainty).</summary>
    public required int TrustedDepth { get; init; }

    /// <summary>Growth fits (null when too few coefficients).</summary>
    public GrowthAnalysis? Growth { get; init; }

    /// <summary>C(t), K(t) with continuation and its sensitivity (null when not computed).</summary>
    public KrylovDynamicsResult? Dynamics { get; init; }

    /// <summary>C(t), K(t) of a closed (finite) Krylov space: exact, no continuation (null otherwise).</summary>
    public KrylovChainResult? ClosedDynamics { get; init; }

    /// <summary>Frequencies of the spectral function.</summary>
    public IReadOnlyList<double> Omegas { get; init; } = [];

    /// <summary>Spectral function Phi(omega) (same length as <see cref="Omegas"/>).</summary>
    public IReadOnlyList<double> Spectrum { get; init; } = [];

    /// <summary>Broadening used for the spectral function.</summary>
    public double SpectrumBroadening { get; init; }

    /// <summary>Notes on what was skipped and why.</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>The autocorrelation and complexity actually reported (continued or closed).</summary>
    public KrylovChainResult? Chain => Dynamics?.Main ?? ClosedDynamics;
}
