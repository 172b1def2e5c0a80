using System.Numerics;

namespace OpGrowth.Exact;

/// <summary>
/// Applies e^{-iHt} (real time) and e^{-tau H} (imaginary time) to a state vector with the
/// short-iterative Lanczos method and adaptive step size: no matrix exponential of H is formed.
/// </summary>
/// <remarks>
/// Source: short-iterative Lanczos propagation, Park and Light, J. Chem. Phys. 85, 5870 (1986);
/// convergence and error analysis, Hochbruck and Lubich, SIAM J. Numer. Anal. 34, 1911 (1997);
/// a-posteriori error estimate err(h) ~ ||psi|| beta_m |[exp(h T_m)]_{m,1}|, Saad, SIAM J. Numer. Anal.
/// 29, 209 (1992). Each step builds a Lanczos basis v_1..v_m of the Krylov space of psi (three-term
/// recurrence, no re-orthogonalisation: common practice for short steps, whose small exponentials are
/// insensitive to the loss of orthogonality that accompanies converged Ritz values), diagonalises the
/// tridiagonal T_m and takes psi &lt;- ||psi|| V_m exp(h T_m) e_1. The step h is the whole remaining
/// time when the estimate allows, otherwise the largest h whose estimate fits the step's share of the
/// error budget (tolerance x h / total). An invariant subspace (beta_m = 0) makes the step exact.
/// Not thread-safe: one propagator per thread of work (it owns its basis vectors); the work inside a
/// call is parallel over amplitude chunks.
/// </remarks>
public sealed class KrylovPropagator
{
    private readonly PauliHamiltonianApplier _h;
    private readonly KrylovOptions _options;
    private readonly Complex[][] _basis;
    private readonly double[] _alpha;
    private readonly double[] _beta;

    /// <summary>Creates a propagator for the Hamiltonian applied by <paramref name="h"/>.</summary>
    public KrylovPropagator(PauliHamiltonianApplier h, KrylovOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(h);
        _h = h;
        _options = options ?? new KrylovOptions();
        _options.Validate();
        _basis = new Complex[_options.MaxDimension + 1][];
        _alpha = new double[_options.MaxDimension + 1];
        _beta = new double[_options.MaxDimension + 1];
    }

    /// <summary>The Hamiltonian applier.</summary>
    public PauliHamiltonianApplier Hamiltonian => _h;

    /// <summary>The settings in use.</summary>
    public KrylovOptions Options => _options;

    /// <summary>Applications of H so far (all calls).</summary>
    public long MatrixVectorProducts { get; private set; }

    /// <summary>Internal Lanczos steps so far (all calls).</summary>
    public long Steps { get; private set; }

    /// <summary>Sum of the error estimates of all steps so far, each relative to the norm of its input.</summary>
    public double EstimatedError { get; private set; }

    /// <summary>Bytes held by the Krylov basis vectors allocated so far.</summary>
    public long BasisBytes => _basis.Where(b => b is not null).Sum(b => (long)b.Length * 16);

    /// <summary>psi &lt;- e^{-iHt} psi (any sign of t).</summary>
    public void Evolve(Complex[] psi, double t) => Run(psi, t, imaginary: false);

    /// <summary>psi &lt;- e^{-tau H} psi (not normalised; any sign of tau).</summary>
    public void EvolveImaginary(Complex[] psi, double tau) => Run(psi, tau, imaginary: true);

    private void Run(Complex[] psi, double time, bool imaginary)
    {
        ArgumentNullException.ThrowIfNull(psi);
        if (psi.Length != _h.Dimension) throw new ArgumentException($"Expected {_h.Dimension} amplitudes, got {psi.Length}.", nameof(psi));
        if (!double.IsFinite(time)) throw new ArgumentOutOfRangeException(nameof(time), time, "Time must be finite.");
        if (time == 0) return;
        double total = Math.Abs(time);
        // exp(h * dir * lambda) for each eigenvalue lambda of T: dir = -i sign(t) or -sign(tau).
        Complex dir = imaginary ? new Complex(-Math.Sign(time), 0) : new Complex(0, -Math.Sign(time));
        int threads = _h.Threads;
        int mMax = _options.MaxDimension;
        double remaining = total;
        var coef = new Complex[mMax + 1];
        while (remaining > 0)
        {
            double nu = Math.Sqrt(StateVector.NormSquared(psi, threads));
            if (nu == 0) return;
            _basis[0] ??= new Complex[psi.Length];
            StateVector.ScaledCopy(psi, 1.0 / nu, _basis[0], threads);
            int m = 0;
            bool done = false;
            double h = remaining;
            double[]? evals = null, evecs = null;
            double err = 0;
            for (int j = 0; j < mMax; j++)
            {
                _basis[j + 1] ??= new Complex[psi.Length];
                var w = _basis[j + 1];
                _alpha[j] = _h.ApplyAndExpect(_basis[j], w);
                MatrixVectorProducts++;
                double b2 = StateVector.LanczosUpdate(w, _alpha[j], _basis[j], j > 0 ? _beta[j - 1] : 0, j > 0 ? _basis[j - 1] : null, threads);
                double b = Math.Sqrt(b2);
                _beta[j] = b;
                m = j + 1;
                (evals, evecs) = Diagonalize(m);
                // Invariant subspace: the step is exact for any h.
                double scale = Math.Abs(_alpha[j]) + (j > 0 ? _beta[j - 1] : 0) + 1e-300;
                if (b <= 1e-13 * scale)
                {
                    done = true;
                    err = 0;
                    break;
                }
                err = Estimate(remaining, dir, evals, evecs, m, b);
                if (err <= Allowed(remaining, total))
                {
                    done = true;
                    break;
                }
                StateVector.Scale(w, 1.0 / b, threads);
            }
            if (!done)
            {
                // Largest h with err(h) <= tol * h / total, by bisection (err grows like h^m for small h).
                double lo = 0, hi = remaining;
                for (int it = 0; it < 60; it++)
                {
                    double mid = 0.5 * (lo + hi);
                    if (Estimate(mid, dir, evals!, evecs!, m, _beta[m - 1]) <= Allowed(mid, total)) lo = mid;
                    else hi = mid;
                }
                h = lo;
                if (h <= 0) throw new ArithmeticException("Krylov step collapsed to zero; raise the maximum dimension or the tolerance.");
                err = Estimate(h, dir, evals!, evecs!, m, _beta[m - 1]);
            }
            // coef = exp(h dir T) e_1 = Q exp(h dir Lambda) Q^T e_1
            for (int r = 0; r < m; r++)
            {
                Complex s = 0;
                for (int k = 0; k < m; k++) s += evecs![r * m + k] * Complex.Exp(h * dir * evals![k]) * evecs[k];
                coef[r] = nu * s;
            }
            StateVector.Combine(_basis, coef, m, psi, threads);
            EstimatedError += err;
            Steps++;
            remaining -= h;
            if (remaining < 1e-15 * total) remaining = 0;
        }
    }

    private double Allowed(double h, double total) => _options.Tolerance * h / total;

    // Saad's estimate, relative to ||psi||: beta_m |[exp(h dir T_m)]_{m,1}|.
    private static double Estimate(double h, Complex dir, double[] evals, double[] evecs, int m, double betaM)
    {
        Complex s = 0;
        for (int k = 0; k < m; k++) s += evecs[(m - 1) * m + k] * Complex.Exp(h * dir * evals[k]) * evecs[k];
        return betaM * s.Magnitude;
    }

    private (double[] Values, double[] Vectors) Diagonalize(int m)
    {
        var d = new double[m];
        var e = new double[m];
        var z = new double[m * m];
        for (int i = 0; i < m; i++)
        {
            d[i] = _alpha[i];
            e[i] = i < m - 1 ? _beta[i] : 0;
            z[i * m + i] = 1;
        }
        SymmetricEigen.Tridiagonal(d, e, z);
        return (d, z);
    }
}
