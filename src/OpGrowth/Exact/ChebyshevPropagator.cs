using System.Numerics;

namespace OpGrowth.Exact;

/// <summary>
/// Applies e^{-iHt} to a state vector by a Chebyshev expansion: the method of choice for long real-time
/// propagations (about rho t + O(log 1/tol) applications of H for spectral half width rho, with one
/// fused memory pass per term and three work vectors).
/// </summary>
/// <remarks>
/// Source: Tal-Ezer and Kosloff, J. Chem. Phys. 81, 3967 (1984):
/// e^{-iHt} = e^{-ict} [J_0(rho t) + 2 sum_{k&gt;=1} (-i)^k J_k(rho t) T_k((H - c)/rho)], with c and rho the
/// centre and half width of an interval containing the spectrum. The series is cut at the first K whose
/// tail bound 2 sum_{k&gt;K} |J_k| is below the tolerance (|T_k| &lt;= 1 on the spectrum). A spectrum that
/// leaks outside the interval makes T_k grow, which shows as a norm change: the step is then redone
/// with a wider interval. Bessel values by Miller's backward recurrence.
/// Not thread-safe (owns its work vectors); each call is parallel over amplitude chunks.
/// </remarks>
public sealed class ChebyshevPropagator
{
    private readonly PauliHamiltonianApplier _h;
    private readonly double _tolerance;
    private Complex[]? _a;
    private Complex[]? _b;
    private Complex[]? _save;

    /// <summary>Creates a propagator; bounds default to a Lanczos estimate of the spectrum.</summary>
    public ChebyshevPropagator(PauliHamiltonianApplier h, double tolerance = 1e-10, SpectralBounds? bounds = null)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (!(tolerance > 0 && tolerance < 1)) throw new ArgumentOutOfRangeException(nameof(tolerance), tolerance, "Tolerance must lie in (0, 1).");
        _h = h;
        _tolerance = tolerance;
        Bounds = bounds ?? SpectralBounds.Estimate(h);
    }

    /// <summary>The interval assumed to contain the spectrum (widened automatically if a leak is detected).</summary>
    public SpectralBounds Bounds { get; private set; }

    /// <summary>Applications of H so far.</summary>
    public long MatrixVectorProducts { get; private set; }

    /// <summary>Sum over calls of the truncation bound of the series (relative to the input norm).</summary>
    public double EstimatedError { get; private set; }

    /// <summary>Times the interval had to be widened.</summary>
    public int Widenings { get; private set; }

    /// <summary>psi &lt;- e^{-iHt} psi.</summary>
    public void Evolve(Complex[] psi, double t)
    {
        ArgumentNullException.ThrowIfNull(psi);
        if (psi.Length != _h.Dimension) throw new ArgumentException($"Expected {_h.Dimension} amplitudes, got {psi.Length}.", nameof(psi));
        if (!double.IsFinite(t)) throw new ArgumentOutOfRangeException(nameof(t), t, "Time must be finite.");
        if (t == 0) return;
        int threads = _h.Threads;
        _a ??= new Complex[psi.Length];
        _b ??= new Complex[psi.Length];
        _save ??= new Complex[psi.Length];
        double n0 = StateVector.NormSquared(psi, threads);
        if (n0 == 0) return;
        StateVector.ScaledCopy(psi, 1.0, _save, threads);
        for (int attempt = 0; ; attempt++)
        {
            double rho = Bounds.HalfWidth, c = Bounds.Center;
            double x = rho * Math.Abs(t);
            var (coeffs, tail) = Coefficients(x, Math.Sign(t), _tolerance);
            int k = coeffs.Length - 1;
            // v0 = psi (kept in _a); acc = psi scaled by a_0.
            StateVector.ScaledCopy(_save, 1.0, _a, threads);
            StateVector.ScaledCopy(_save, coeffs[0], psi, threads);
            Complex[] v = _a, other = _b;
            if (k >= 1)
            {
                // v1 = (H - c) v0 / rho
                _h.ChebyshevStep(v, other, psi, 1.0 / rho, -c / rho, 0, coeffs[1]);
                MatrixVectorProducts++;
                (v, other) = (other, v);
                for (int j = 2; j <= k; j++)
                {
                    // v_j = 2 (H - c)/rho v_{j-1} - v_{j-2}, written over v_{j-2}
                    _h.ChebyshevStep(v, other, psi, 2.0 / rho, -2.0 * c / rho, -1.0, coeffs[j]);
                    MatrixVectorProducts++;
                    (v, other) = (other, v);
                }
            }
            StateVector.Scale(psi, Complex.Exp(new Complex(0, -c * t)), threads);
            double n1 = StateVector.NormSquared(psi, threads);
            double drift = Math.Abs(Math.Sqrt(n1 / n0) - 1);
            if (drift <= Math.Max(100 * _tolerance, 1e-9) || attempt >= 6)
            {
                if (drift > Math.Max(100 * _tolerance, 1e-9))
                {
                    throw new ArithmeticException($"Chebyshev propagation is not unitary (norm drift {drift:E2}); the spectral interval is wrong.");
                }
                EstimatedError += tail;
                return;
            }
            // The spectrum leaks out of the interval: double its width (never beyond the rigorous bound) and redo.
            var rig = SpectralBounds.Rigorous(_h);
            double w = 0.5 * Bounds.HalfWidth;
            Bounds = new SpectralBounds(Math.Max(Bounds.Min - w, rig.Min), Math.Min(Bounds.Max + w, rig.Max));
            if (attempt == 5) Bounds = rig;
            Widenings++;
        }
    }

    /// <summary>Series coefficients a_k = (2 - delta_k0) (-i s)^k J_k(x) and the truncation bound of the tail.</summary>
    internal static (Complex[] Coefficients, double Tail) Coefficients(double x, int sign, double tolerance)
    {
        int kmax = (int)Math.Ceiling(x + 20 + 8 * Math.Cbrt(Math.Max(x, 1)));
        double[] j = BesselJSequence(x, kmax);
        // smallest K with 2 sum_{k>K} |J_k| < tol
        double tail = 0;
        int cut = kmax;
        for (int k = kmax; k >= 1; k--)
        {
            double next = tail + 2 * Math.Abs(j[k]);
            if (next >= tolerance)
            {
                cut = k;
                break;
            }
            tail = next;
            cut = k - 1;
        }
        var a = new Complex[cut + 1];
        Complex ph = Complex.One, step = new Complex(0, -sign);
        for (int k = 0; k <= cut; k++)
        {
            a[k] = (k == 0 ? 1.0 : 2.0) * ph * j[k];
            ph *= step;
        }
        return (a, tail);
    }

    /// <summary>J_0(x) .. J_kmax(x) for x &gt;= 0 by Miller's backward recurrence, normalised with J_0 + 2 sum J_2k = 1.</summary>
    internal static double[] BesselJSequence(double x, int kmax)
    {
        var r = new double[kmax + 1];
        if (x == 0)
        {
            r[0] = 1;
            return r;
        }
        int start = Math.Max(kmax, (int)x) + 30 + (int)Math.Sqrt(40.0 * Math.Max(kmax, x));
        if ((start & 1) == 1) start++;
        double jp1 = 0, jk = 1e-300;
        double sumEven = 0;
        double[] tmp = new double[start + 1];
        tmp[start] = jk;
        for (int k = start; k >= 1; k--)
        {
            double jm1 = 2.0 * k / x * jk - jp1;
            jp1 = jk;
            jk = jm1;
            tmp[k - 1] = jm1;
            if (Math.Abs(jm1) > 1e250)
            {
                for (int i = k - 1; i <= start; i++) tmp[i] *= 1e-250;
                jk *= 1e-250;
                jp1 *= 1e-250;
            }
        }
        for (int k = 2; k <= start; k += 2) sumEven += tmp[k];
        double norm = tmp[0] + 2 * sumEven;
        for (int k = 0; k <= kmax; k++) r[k] = tmp[k] / norm;
        return r;
    }
}
