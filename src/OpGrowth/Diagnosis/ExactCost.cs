using OpGrowth.Exact;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Rough wall-time estimates of the exact engine's two routes, used to pick the cheaper one and to keep a
/// test within its budget. Per-unit costs were measured on the 2-core test machine (AMD EPYC, both
/// threads): 1.3 ns per term and amplitude in an application of H (mixed-field Ising chain, N = 10, 25
/// time points to t = 18 by typicality: 2.5 s), and 3.5 s per time point for dense traces at N = 10
/// (two products of 1024 x 1024 complex matrices; 87 s for the same 25 points).
/// </summary>
internal static class ExactCost
{
    /// <summary>Seconds per term and amplitude in one application of H.</summary>
    public const double SecondsPerTermUpdate = 1.3e-9;

    /// <summary>Seconds per d^3 complex multiply-add in the dense route (d = 2^N).</summary>
    public const double SecondsPerDenseMultiplyAdd = 0.2e-9;

    /// <summary>Half the spectral width of H (Lanczos estimate), the rate of Chebyshev steps per unit time.</summary>
    public static double HalfWidth(Hamiltonian h, int threads)
        => SpectralBounds.Estimate(new PauliHamiltonianApplier(h, threads)).HalfWidth;

    /// <summary>
    /// Typicality: each block (one site's letters for one random state) carries two branches forward and
    /// back to every time, about 2 sum_k (w t_k + 10) Chebyshev steps of one application of H.
    /// </summary>
    public static double TypicalitySeconds(Hamiltonian h, double halfWidth, IReadOnlyList<double> times, double blocks)
        => 2.0 * blocks * times.Sum(t => halfWidth * Math.Abs(t) + 10) * h.Terms.Count * Math.Pow(2, h.N) * SecondsPerTermUpdate;

    /// <summary>Dense traces: two d x d complex products per time point (about 16 d^3 multiply-adds), plus the diagonalisation.</summary>
    public static double DenseSeconds(int n, int points)
    {
        double d = Math.Pow(2, n);
        return (16.0 * points + 10) * d * d * d * SecondsPerDenseMultiplyAdd;
    }
}
