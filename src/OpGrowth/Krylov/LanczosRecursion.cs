using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Lanczos coefficients b_n of an operator at infinite temperature (the recursion method), on the system
/// exactly as given (open or periodic, finite N). Exact when <see cref="LanczosOptions.MaxStrings"/> is 0,
/// otherwise each Krylov vector keeps its top-M strings. Conventions: L = [H, .], O_0 = O/||O||,
/// real-coefficient form A_n = i[H, O_{n-1}] + b_{n-1} O_{n-2}, b_n = ||A_n||, O_n = A_n/b_n, b_1^2 = mu_2.
/// </summary>
/// <remarks>
/// Source: Viswanath and Mueller, The Recursion Method (Springer, 1994); Parker, Cao, Avdoshkin, Scaffidi,
/// Altman, PRX 9, 041017 (2019). For infinite-chain values use InfiniteChainLanczos; for an
/// extensive (translation-summed) operator use ExtensiveLanczos.
/// </remarks>
public static class LanczosRecursion
{
    /// <summary>Runs the recursion for a probe given as a Pauli sum (normalised internally).</summary>
    public static LanczosResult Run(Hamiltonian h, IReadOnlyList<PauliTerm> probe, LanczosOptions options)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(probe);
        ArgumentNullException.ThrowIfNull(options);
        foreach (var t in probe)
        {
            if (t.String.N != h.N) throw new ArgumentException($"Probe term {t} acts on {t.String.N} qubits; the Hamiltonian on {h.N}.", nameof(probe));
        }
        return ChainWidth.Dispatch<LanczosResult, PlainRun>(h.N, new PlainRun(h, probe, options));
    }

    /// <summary>Runs the recursion for a single Pauli string.</summary>
    public static LanczosResult Run(Hamiltonian h, PauliString probe, LanczosOptions options)
        => Run(h, [new PauliTerm(probe, 1.0)], options);

    /// <summary>Width-specific entry for callers that already hold compiled forms.</summary>
    public static LanczosResult Run<T>(CompiledHamiltonian<T> h, PauliOperator<T> probe, LanczosOptions options)
        where T : unmanaged, IPauliKey<T>
        => LanczosEngine.Run(new PlainBasis<T>(h), probe, options, "plain (finite system as given)", h.N);

    private readonly struct PlainRun(Hamiltonian h, IReadOnlyList<PauliTerm> probe, LanczosOptions options) : IWidthFunc<LanczosResult>
    {
        public LanczosResult Invoke<T>() where T : unmanaged, IPauliKey<T>
            => Run(h.Compile<T>(), PauliOperator<T>.FromTerms(h.N, probe), options);
    }
}
