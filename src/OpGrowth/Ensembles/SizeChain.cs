using OpGrowth.Analysis;

namespace OpGrowth.Ensembles;

/// <summary>
/// Solves the master equation of a <see cref="SizeChainRates"/> birth-death chain directly (no sampling): states
/// (o, k) with k = 0..N the size and o whether the probe's own site is occupied, so that the site weights are
/// exact too (rho of the probe site = P(o = 1); every other site (n - P(o = 1)) / (N - 1) by symmetry).
/// Integrated with TR-BDF2 (L-stable, second order) on the banded generator; the step is halved once and the
/// difference of the two solutions is reported as the integration error of the mean size.
/// Source: R. E. Bank et al., IEEE Trans. CAD 4, 436 (1985) (TR-BDF2); M. E. Hosea, L. F. Shampine,
/// Appl. Numer. Math. 20, 21 (1996) (its error analysis).
/// </summary>
public static class SizeChain
{
    /// <summary>Solves the chain from a single-site probe to <paramref name="time"/>, recording every <paramref name="interval"/>.</summary>
    public static EnsembleSeries Solve(SizeChainRates rates, double time, double interval, string name, int probeSite = 0, LatticeGeometry? geometry = null)
    {
        ArgumentNullException.ThrowIfNull(rates);
        if (!(time > 0 && interval > 0 && interval <= time)) throw new IO.InputException($"time {time}, interval {interval}; expected 0 < interval <= time");
        int n = rates.N;
        int records = (int)Math.Floor(time / interval + 1e-9) + 1;
        // Step: a tenth of the inverse per-site rate (the fastest rate per occupied site is about (b + d) N).
        double perSite = Math.Max(1e-12, (rates.Birth + rates.Death) * n);
        int sub = Math.Max(1, (int)Math.Ceiling(interval * perSite / 0.1));
        var coarse = Integrate(rates, records, interval, sub);
        var fine = Integrate(rates, records, interval, 2 * sub);
        var mean = new double[records];
        var err = new double[records];
        var dist = new double[records][];
        var rho = new double[records][];
        for (int r = 0; r < records; r++)
        {
            var p = fine[r];
            double m = 0, mc = 0, occ = 0;
            dist[r] = new double[n + 1];
            for (int k = 0; k <= n; k++)
            {
                double pk = p[2 * k] + p[2 * k + 1];
                dist[r][k] = pk;
                m += k * pk;
                mc += k * (coarse[r][2 * k] + coarse[r][2 * k + 1]);
                occ += p[2 * k + 1];
            }
            mean[r] = m;
            err[r] = Math.Abs(m - mc);
            rho[r] = new double[n];
            double other = n > 1 ? (m - occ) / (n - 1) : 0;
            for (int j = 0; j < n; j++) rho[r][j] = j == probeSite ? occ : other;
        }
        return new EnsembleSeries
        {
            Kind = "Brownian (size chain)",
            Engine = "brownian",
            Name = name,
            Method = $"master equation on sizes 0..N solved directly ({rates.Origin}; b = {rates.Birth:g4}, d = {rates.Death:g4}; TR-BDF2, {2 * sub} steps per record, error from halving the step)",
            N = n,
            Samples = 0,
            Times = Enumerable.Range(0, records).Select(r => r * interval).ToArray(),
            TimeUnit = "time",
            MeanSize = mean,
            MeanSizeError = err,
            SizeDistribution = dist,
            SiteWeights = rho,
            ProbeSites = [probeSite],
            Probe = $"Z_{probeSite}",
            Geometry = geometry ?? LatticeGeometry.AllToAll(n),
        };
    }

    /// <summary>Probability vectors over states 2k + o at each record.</summary>
    private static double[][] Integrate(SizeChainRates rates, int records, double interval, int sub)
    {
        int n = rates.N;
        int states = 2 * (n + 1);
        double h = interval / sub;
        const double Gamma = 2 - 1.4142135623730951; // 2 - sqrt(2)
        var a1 = Factor(rates, Gamma * h / 2);
        var a2 = Factor(rates, (1 - Gamma) / (2 - Gamma) * h);
        double c1 = 1 / (Gamma * (2 - Gamma)), c2 = (1 - Gamma) * (1 - Gamma) / (Gamma * (2 - Gamma));
        var p = new double[states];
        p[2 * 1 + 1] = 1; // size 1, probe site occupied
        var star = new double[states];
        var ap = new double[states];
        var result = new double[records][];
        result[0] = (double[])p.Clone();
        for (int r = 1; r < records; r++)
        {
            for (int s = 0; s < sub; s++)
            {
                // Stage 1, trapezoid to t + gamma h: (I - gamma h/2 A) p* = (I + gamma h/2 A) p.
                Apply(rates, p, ap);
                for (int i = 0; i < states; i++) star[i] = p[i] + Gamma * h / 2 * ap[i];
                a1.Solve(star);
                // Stage 2, BDF2: (I - (1-gamma)/(2-gamma) h A) p' = c1 p* - c2 p.
                for (int i = 0; i < states; i++) p[i] = c1 * star[i] - c2 * p[i];
                a2.Solve(p);
            }
            result[r] = (double[])p.Clone();
        }
        return result;
    }

    private static (double Occupy, double Other, double Empty, double OtherDown) Out(SizeChainRates r, int o, int k)
    {
        int n = r.N;
        // Into the probe's site (only when it is empty), into other empty sites, emptying the probe's site, emptying others.
        double occupyProbe = o == 0 ? r.Birth * k : 0;
        double occupyOther = r.Birth * k * (n - k - (1 - o));
        double emptyProbe = o == 1 ? r.Death * (k - 1) : 0;
        double emptyOther = r.Death * k * (k - 1) - emptyProbe;
        return (occupyProbe, Math.Max(0, occupyOther), emptyProbe, Math.Max(0, emptyOther));
    }

    /// <summary>y = A p for the generator A (column j: the rates out of state j).</summary>
    private static void Apply(SizeChainRates rates, double[] p, double[] y)
    {
        Array.Clear(y);
        int n = rates.N;
        for (int k = 0; k <= n; k++)
        {
            for (int o = 0; o < 2; o++)
            {
                double v = p[2 * k + o];
                if (v == 0 || !Valid(n, o, k)) continue;
                var (a, b, c, d) = Out(rates, o, k);
                y[2 * k + o] -= (a + b + c + d) * v;
                if (a > 0) y[2 * (k + 1) + 1] += a * v;
                if (b > 0) y[2 * (k + 1) + o] += b * v;
                if (c > 0) y[2 * (k - 1)] += c * v;
                if (d > 0) y[2 * (k - 1) + o] += d * v;
            }
        }
    }

    private static bool Valid(int n, int o, int k) => o == 1 ? k >= 1 : k <= n - 1;

    /// <summary>LU factors (no pivoting: I - cA is column diagonally dominant) of the band matrix I - cA, half-bandwidth 3.</summary>
    private static Banded Factor(SizeChainRates rates, double c)
    {
        int n = rates.N;
        int states = 2 * (n + 1);
        var m = new Banded(states, 3);
        for (int i = 0; i < states; i++) m[i, i] = 1;
        for (int k = 0; k <= n; k++)
        {
            for (int o = 0; o < 2; o++)
            {
                if (!Valid(n, o, k)) continue;
                int j = 2 * k + o;
                var (a, b, cc, d) = Out(rates, o, k);
                m[j, j] += c * (a + b + cc + d);
                if (a > 0) m[2 * (k + 1) + 1, j] -= c * a;
                if (b > 0) m[2 * (k + 1) + o, j] -= c * b;
                if (cc > 0) m[2 * (k - 1), j] -= c * cc;
                if (d > 0) m[2 * (k - 1) + o, j] -= c * d;
            }
        }
        m.Decompose();
        return m;
    }

    private sealed class Banded
    {
        private readonly int _n, _w;
        private readonly double[] _a; // row i, column j at i * (2w + 1) + (j - i + w)

        public Banded(int n, int w)
        {
            _n = n;
            _w = w;
            _a = new double[n * (2 * w + 1)];
        }

        public double this[int i, int j]
        {
            get => _a[i * (2 * _w + 1) + j - i + _w];
            set => _a[i * (2 * _w + 1) + j - i + _w] = value;
        }

        public void Decompose()
        {
            for (int k = 0; k < _n; k++)
            {
                double pivot = this[k, k];
                for (int i = k + 1; i <= Math.Min(_n - 1, k + _w); i++)
                {
                    double f = this[i, k] / pivot;
                    this[i, k] = f;
                    for (int j = k + 1; j <= Math.Min(_n - 1, k + _w); j++) this[i, j] -= f * this[k, j];
                }
            }
        }

        public void Solve(double[] b)
        {
            for (int i = 0; i < _n; i++)
                for (int k = Math.Max(0, i - _w); k < i; k++) b[i] -= this[i, k] * b[k];
            for (int i = _n - 1; i >= 0; i--)
            {
                double s = b[i];
                for (int j = i + 1; j <= Math.Min(_n - 1, i + _w); j++) s -= this[i, j] * b[j];
                b[i] = s / this[i, i];
            }
        }
    }
}
