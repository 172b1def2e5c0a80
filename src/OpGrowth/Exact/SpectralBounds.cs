using System.Numerics;

namespace OpGrowth.Exact;

/// <summary>An interval that contains the spectrum of a Hamiltonian (used to scale Chebyshev expansions).</summary>
public readonly record struct SpectralBounds(double Min, double Max)
{
    /// <summary>Centre of the interval.</summary>
    public double Center => 0.5 * (Min + Max);

    /// <summary>Half width of the interval.</summary>
    public double HalfWidth => 0.5 * (Max - Min);

    /// <summary>The rigorous but loose bound [-sum |h_t|, +sum |h_t|] (triangle inequality).</summary>
    public static SpectralBounds Rigorous(PauliHamiltonianApplier h)
    {
        ArgumentNullException.ThrowIfNull(h);
        return new SpectralBounds(-h.NormBound, h.NormBound);
    }

    /// <summary>
    /// Estimates the extreme eigenvalues with <paramref name="steps"/> Lanczos steps from a random
    /// vector and widens the interval by <paramref name="margin"/> of its width on each side (extreme
    /// Ritz values converge first and always lie inside the spectrum; the margin covers what is left),
    /// clipped to the rigorous bound.
    /// </summary>
    /// <remarks>Source: Lanczos extreme-eigenvalue convergence (Kaniel-Paige-Saad theory), e.g. Golub and Van Loan, Matrix Computations, sec. 10.1.</remarks>
    public static SpectralBounds Estimate(PauliHamiltonianApplier h, int steps = 60, double margin = 0.04, int seed = 12345)
    {
        ArgumentNullException.ThrowIfNull(h);
        int m = Math.Min(steps, h.Dimension);
        var v = StateVector.Create(h.N);
        StateVector.FillHaarRandom(v, new Random(seed));
        var w = new Complex[v.Length];
        Complex[]? prev = null;
        var alpha = new double[m];
        var beta = new double[m];
        int used = 0;
        for (int j = 0; j < m; j++)
        {
            alpha[j] = h.ApplyAndExpect(v, w);
            double b = Math.Sqrt(StateVector.LanczosUpdate(w, alpha[j], v, j > 0 ? beta[j - 1] : 0, prev, h.Threads));
            beta[j] = b;
            used = j + 1;
            if (b < 1e-12 * (Math.Abs(alpha[j]) + 1)) break;
            StateVector.Scale(w, 1.0 / b, h.Threads);
            // rotate v -> prev, w -> v, reuse the old prev as the next w
            var old = prev ?? new Complex[v.Length];
            prev = v;
            v = w;
            w = old;
        }
        var d = alpha.AsSpan(0, used).ToArray();
        var e = new double[used];
        for (int i = 0; i + 1 < used; i++) e[i] = beta[i];
        SymmetricEigen.Tridiagonal(d, e);
        double lo = d[0], hi = d[^1];
        double pad = margin * (hi - lo) + 1e-9 * (Math.Abs(lo) + Math.Abs(hi) + 1);
        lo = Math.Max(lo - pad, -h.NormBound - 1e-12);
        hi = Math.Min(hi + pad, h.NormBound + 1e-12);
        return new SpectralBounds(lo, hi);
    }
}
