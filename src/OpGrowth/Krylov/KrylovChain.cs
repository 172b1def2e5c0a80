namespace OpGrowth.Krylov;

/// <summary>
/// Integrates the Krylov chain d phi_n/dt = b_n phi_{n-1} - b_{n+1} phi_{n+1}, phi_n(0) = delta_{n0}, to
/// machine precision: phi(t) = exp(t M) e_0 with M real antisymmetric tridiagonal, applied by a Chebyshev
/// expansion. The chain is semi-infinite: it is extended as the wave function spreads (a degree-D
/// polynomial moves it at most D sites), so nothing is truncated except series terms below 1e-17.
/// </summary>
/// <remarks>
/// Source: Chebyshev propagator, Tal-Ezer and Kosloff, J. Chem. Phys. 81, 3967 (1984). With x = -iM/rho
/// (spectrum in [-1, 1] for rho &gt;= the spectral radius of M), exp(tM) = J_0(rho t) + 2 sum_k J_k(rho t) w_k
/// with w_0 = 1, w_1 = M/rho, w_{k+1} = 2 (M/rho) w_k + w_{k-1}: all real (i^k T_k(x) absorbed).
/// </remarks>
public static class KrylovChain
{
    /// <summary>Largest rho*dt per Chebyshev step (about 40 terms per step).</summary>
    private const double MaxPhase = 20;

    /// <summary>Components below this magnitude are dropped from the active chain (weight under 1e-40 each; far below rounding of the kept ones).</summary>
    private const double Negligible = 1e-20;

    /// <summary>
    /// Evolves with b(n) (n &gt;= 1) and returns C(t), K(t) at the given non-negative, ascending times. If the
    /// chain would exceed <paramref name="maxChain"/> sites or the work (chain sites times Chebyshev terms,
    /// summed over steps) would exceed <paramref name="maxWork"/>, it stops and returns the times completed,
    /// with <see cref="KrylovChainResult.Limit"/> saying why. <paramref name="tailFrom"/>: also record the weight
    /// sum_{n &gt;= tailFrom} phi_n^2 at each time (the part of the wave that only couplings b_n, n &gt;= tailFrom, let through).
    /// </summary>
    public static KrylovChainResult Evolve(Func<int, double> b, IReadOnlyList<double> times, int maxChain = 2_000_000, long maxWork = 20_000_000_000, int? tailFrom = null)
    {
        ArgumentNullException.ThrowIfNull(b);
        ArgumentNullException.ThrowIfNull(times);
        for (int i = 0; i < times.Count; i++)
        {
            if (!(times[i] >= 0) || (i > 0 && times[i] < times[i - 1]))
                throw new ArgumentException($"times must be non-negative and ascending; found {times[i]} at index {i}", nameof(times));
        }
        var bArr = new double[64]; // bArr[n] = b_n, bArr[0] = 0
        int known = 1;
        double B(int n)
        {
            if (n >= bArr.Length) Array.Resize(ref bArr, Math.Max(n + 1, 2 * bArr.Length));
            while (known <= n)
            {
                double v = b(known);
                if (!double.IsFinite(v) || v < 0) throw new ArgumentException($"b_{known} = {v} is not a finite non-negative number.", nameof(b));
                bArr[known++] = v;
            }
            return bArr[n];
        }
        var phi = new double[64];
        phi[0] = 1;
        int len = 1;
        double t = 0;
        var c = new double[times.Count];
        var k = new double[times.Count];
        var tail = new double[times.Count];
        double normErr = 0;
        int maxLen = 1;
        double[] w0 = [], w1 = [], acc = [];
        var bess = new double[256];
        long work = 0;
        string? limit = null;
        int done = 0;
        for (int i = 0; i < times.Count && limit is null; i++)
        {
            double remaining = times[i] - t;
            while (remaining > 0 && limit is null)
            {
                // Choose a step and an extent E consistent with each other.
                int extra = 32;
                double dt = 0, rho = 1;
                int degree = 0, extent;
                while (true)
                {
                    extent = len + extra;
                    if (extent > maxChain) break;
                    rho = 0;
                    for (int n = 0; n < extent; n++) rho = Math.Max(rho, B(n) + B(n + 1));
                    rho = rho * 1.01 + 1e-300;
                    dt = Math.Min(remaining, MaxPhase / rho);
                    double z = rho * dt;
                    int kmax = (int)(z + 30 + 4 * Math.Cbrt(z));
                    if (bess.Length < kmax + 1) bess = new double[2 * kmax + 2];
                    BesselSeries.Fill(z, bess.AsSpan(0, kmax + 1));
                    degree = kmax;
                    while (degree > 1 && 2 * Math.Abs(bess[degree]) < 1e-18) degree--;
                    if (len + degree + 1 <= extent) break;
                    extra = degree + 33;
                }
                if (extent > maxChain)
                {
                    limit = $"the Krylov chain would exceed {maxChain} sites after t = {t:G4}";
                    break;
                }
                work += (long)extent * degree;
                if (work > maxWork)
                {
                    limit = $"the integration work limit ({maxWork:G2} site-terms) was reached after t = {t:G4}";
                    break;
                }
                if (w0.Length < extent + 1)
                {
                    int cap = Math.Max(extent + 1, 2 * w0.Length);
                    Array.Resize(ref phi, cap);
                    w0 = new double[cap];
                    w1 = new double[cap];
                    acc = new double[cap];
                }
                // w0 = phi, w1 = (M/rho) phi, acc = J0 w0 + 2 J1 w1, then the recurrence.
                B(extent + 1);
                Array.Copy(phi, w0, extent);
                Apply(bArr, w0, w1, extent, 1 / rho, null, 1);
                for (int n = 0; n < extent; n++) acc[n] = bess[0] * w0[n] + 2 * bess[1] * w1[n];
                for (int d = 2; d <= degree; d++)
                {
                    // w2 = 2 (M/rho) w1 + w0, written into w0.
                    Apply(bArr, w1, w0, extent, 2 / rho, w0, 1);
                    double coef = 2 * bess[d];
                    for (int n = 0; n < extent; n++) acc[n] += coef * w0[n];
                    (w0, w1) = (w1, w0);
                }
                Array.Copy(acc, phi, extent);
                len = extent;
                while (len > 1 && Math.Abs(phi[len - 1]) < Negligible) len--;
                Array.Clear(phi, len, extent - len);
                maxLen = Math.Max(maxLen, len);
                remaining -= dt;
                t += dt;
                if (remaining < 1e-14 * Math.Max(1, Math.Abs(times[i]))) remaining = 0;
            }
            if (limit is not null) break;
            t = times[i];
            double norm = 0, kc = 0, tw = 0;
            for (int n = 0; n < len; n++)
            {
                double p2 = phi[n] * phi[n];
                norm += p2;
                kc += n * p2;
                if (n >= tailFrom) tw += p2;
            }
            tail[i] = tw;
            c[i] = phi[0];
            k[i] = kc;
            normErr = Math.Max(normErr, Math.Abs(norm - 1));
            done = i + 1;
        }
        return new KrylovChainResult
        {
            Times = times.Take(done).ToArray(),
            Autocorrelation = c.Take(done).ToArray(),
            Complexity = k.Take(done).ToArray(),
            TailWeight = tailFrom is null ? null : tail.Take(done).ToArray(),
            ChainLength = maxLen,
            NormError = normErr,
            Limit = limit,
        };
    }

    /// <summary>dst = scale * M src (+ add * prev when prev is given), on indices 0..extent-1 (src zero beyond).</summary>
    private static void Apply(double[] b, double[] src, double[] dst, int extent, double scale, double[]? prev, double add)
    {
        for (int n = 0; n < extent; n++)
        {
            double left = n > 0 ? b[n] * src[n - 1] : 0;
            double right = n + 1 < extent ? b[n + 1] * src[n + 1] : 0;
            double v = scale * (left - right);
            dst[n] = prev is null ? v : v + add * prev[n];
        }
    }
}
