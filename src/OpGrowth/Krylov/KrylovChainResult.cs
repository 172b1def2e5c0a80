namespace OpGrowth.Krylov;

/// <summary>Dynamics on the Krylov chain: autocorrelation and Krylov complexity at the requested times.</summary>
public sealed record KrylovChainResult
{
    /// <summary>Times.</summary>
    public required IReadOnlyList<double> Times { get; init; }

    /// <summary>C(t) = phi_0(t) = (O|O(t)) for a normalised O.</summary>
    public required IReadOnlyList<double> Autocorrelation { get; init; }

    /// <summary>Krylov complexity K(t) = sum_n n phi_n(t)^2.</summary>
    public required IReadOnlyList<double> Complexity { get; init; }

    /// <summary>Weight sum_{n &gt;= tailFrom} phi_n(t)^2 at each time, when asked for (see <see cref="KrylovChain.Evolve"/>).</summary>
    public IReadOnlyList<double>? TailWeight { get; init; }

    /// <summary>Largest chain index the wave function reached (beyond it every phi_n is below 1e-20).</summary>
    public required int ChainLength { get; init; }

    /// <summary>Largest |sum_n phi_n^2 - 1| over the times: conservation check of the integrator.</summary>
    public required double NormError { get; init; }

    /// <summary>Why the evolution stopped before the last requested time (null when all times were reached).</summary>
    public string? Limit { get; init; }
}
