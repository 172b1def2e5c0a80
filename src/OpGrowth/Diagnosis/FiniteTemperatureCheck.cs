using System.Diagnostics;
using System.Numerics;
using Microsoft.Extensions.Logging;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Test 6: finite temperature on a smaller member of the family. At a few temperatures (beta epsilon from
/// the options) the regularised OTOC Tr(y W(t) y V y W(t) y V), y = rho^{1/4}, is computed against the three
/// letters V at a site next to the probe W, and the regularised autocorrelation Tr(rho^{1/2} W(t) rho^{1/2} W).
/// Reported: lambda / (2 pi T) where the squared commutator has an exponential regime, and the late-time
/// plateau of the connected autocorrelation (thermal &lt;W&gt;^2 removed, normalised to 1 at t = 0).
/// A plateau at or above 0.5 at the lowest temperature is glass-like freezing, unless long-range order of the
/// probe's spin component in a lattice pattern (uniform, or staggered on a bipartite lattice) accounts for
/// at least half of it: that is an ordered, symmetry-broken phase (a glass freezes in a random pattern). OTOC decay alone is never
/// read as chaos (Lin and Motrunich, PRB 97, 144304 (2018)), and 1D short-range chains need not show an
/// exponential regime at all (Khemani, Huse, Nahum, PRB 98, 144304 (2018)).
/// Source: Maldacena, Shenker, Stanford, JHEP 08 (2016) 106 (chaos bound lambda &lt;= 2 pi T, regularised OTOC).
/// </summary>
public static class FiniteTemperatureCheck
{
    /// <summary>Test name.</summary>
    public const string Name = "finite temperature";

    /// <summary>Runs the test on <paramref name="small"/>; <paramref name="extra"/> are further sizes for the plateau's N dependence.</summary>
    public static (TestVerdict Verdict, ThermalFindings? Findings) Run(Model small, IReadOnlyList<Model> extra, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(small);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        if (small.IsDriven) return (TestVerdict.NotRun(6, Name, "a driven model heats to infinite temperature: there is no finite-temperature state to probe"), null);
        if (small.N > PauliMask.MaxQubits) return (TestVerdict.NotRun(6, Name, $"N = {small.N} is above the state-vector limit"), null);
        var log = options.Logger;
        var w = small.Probes[0];
        int partner = PartnerSite(small, w);
        double eps = OperatorAlgebra.EnergyScale(small.Hamiltonian);
        double tMax = options.ThermalTime / eps;
        var times = Enumerable.Range(0, options.ThermalTimePoints).Select(i => tMax * i / (options.ThermalTimePoints - 1)).ToArray();
        var points = new List<ThermalPoint>();
        // Keep the test within its budget: the typicality cost is proportional to the number of random states.
        int samples = Math.Max(1, options.ThermalSamples);
        string? reduced = null;
        if (small.N > 8)
        {
            // x 2.4: the imaginary-time propagations and the thermal expectation value of W come on top of
            // the real-time blocks (measured on the SYK model at N = 10: 339 s against 140 s estimated).
            double perState = 2.4 * ExactCost.TypicalitySeconds(small.Hamiltonian, ExactCost.HalfWidth(small.Hamiltonian, options.EffectiveThreads), times, 1) * options.BetaEpsilon.Count;
            int fit = (int)Math.Floor(options.ThermalSeconds / Math.Max(perState, 1e-9));
            if (fit < samples && samples > 2)
            {
                int k = Math.Max(2, fit);
                reduced = FormattableString.Invariant($"{k} random states instead of {samples}: the estimated cost of {samples} was {perState * samples:0} s against the {options.ThermalSeconds:0} s budget (raise --effort for more)");
                log?.LogInformation("finite temperature: {Reason}", reduced);
                samples = k;
            }
        }
        var run = options with { ThermalSamples = samples };
        foreach (double be in options.BetaEpsilon.Order())
        {
            ct.ThrowIfCancellationRequested();
            points.Add(Measure(small, w, partner, be, eps, times, run, withOtoc: true, ct));
            var p = points[^1];
            log?.LogInformation("finite temperature: beta epsilon = {BE}: lambda/(2 pi T) = {Ratio} (R^2 {R2:F3}, {Pts} points), autocorrelation plateau {P:F3} +- {E:F3}",
                be, double.IsNaN(p.BoundRatio) ? "-" : p.BoundRatio.ToString("F3", System.Globalization.CultureInfo.InvariantCulture), p.Growth.RSquared, p.Growth.Points, p.Plateau, p.PlateauError);
        }
        double lowest = options.BetaEpsilon.Max();
        var bySize = new List<PlateauAtSize> { new(small.N, lowest, points[^1].Plateau, points[^1].PlateauError) };
        foreach (var m in extra)
        {
            ct.ThrowIfCancellationRequested();
            if (m.N > PauliMask.MaxQubits || m.N == small.N) continue;
            double e2 = OperatorAlgebra.EnergyScale(m.Hamiltonian);
            var t2 = Enumerable.Range(0, options.ThermalTimePoints).Select(i => options.ThermalTime / e2 * i / (options.ThermalTimePoints - 1)).ToArray();
            var p = Measure(m, m.Probes[0], PartnerSite(m, m.Probes[0]), lowest, e2, t2, run, withOtoc: false, ct);
            bySize.Add(new PlateauAtSize(m.N, lowest, p.Plateau, p.PlateauError));
            log?.LogInformation("finite temperature: N = {N}, beta epsilon = {BE}: plateau {P:F3} +- {E:F3}", m.N, lowest, p.Plateau, p.PlateauError);
        }
        var findings = new ThermalFindings
        {
            N = small.N,
            Operator = w.ToString(),
            PartnerSite = partner,
            Epsilon = eps,
            TimeMax = tMax,
            Method = reduced is null ? $"typicality, {samples} random states" : $"typicality, {reduced}",
            Points = points,
            PlateauBySize = bySize.OrderBy(b => b.N).ToArray(),
        };
        return (Judge(findings) with { Seconds = sw.Elapsed.TotalSeconds }, findings);
    }

    /// <summary>A site at graph distance 1 from the probe's first site (the nearest other site), for the partner V.</summary>
    internal static int PartnerSite(Model m, PauliString w)
    {
        var support = w.Support();
        int s0 = support.Length > 0 ? support[0] : 0;
        var dist = m.Lattice.DistancesFrom(s0);
        int best = -1;
        for (int j = 0; j < m.N; j++)
        {
            if (support.Contains(j)) continue;
            if (best < 0 || dist[j] < dist[best] || (dist[j] == dist[best] && Math.Abs(j - s0) < Math.Abs(best - s0))) best = j;
        }
        return best < 0 ? (s0 + 1) % m.N : best;
    }

    private static ThermalPoint Measure(Model m, PauliString w, int partner, double betaEps, double eps, double[] times, DiagnosisOptions options, bool withOtoc, CancellationToken ct)
    {
        double beta = betaEps / eps;
        var res = ExactOtoc.Run(m.Hamiltonian, new ExactOtocOptions
        {
            Operator = w,
            Times = times,
            Sites = withOtoc ? [partner] : [],
            Beta = beta,
            Method = m.N <= 8 ? OtocMethod.Dense : OtocMethod.Typicality,
            Samples = Math.Max(1, options.ThermalSamples),
            Seed = options.Seed,
            Threads = options.EffectiveThreads,
        }, ct);
        var (wMean, _) = ThermalExpectation(m.Hamiltonian, w, beta, Math.Max(2, options.ThermalSamples), options.Seed + 7919, options.EffectiveThreads);
        var a = res.Autocorrelation.Values;
        var ae = res.Autocorrelation.Errors;
        double den = a[0] - wMean * wMean;
        var conn = a.Select(v => (v - wMean * wMean) / den).ToArray();
        // The long-time value: mean over the second half of the window (oscillations at low T are slow).
        int from = times.Length / 2;
        var tail = conn.Skip(from).ToArray();
        double plateau = tail.Average();
        double spread = tail.Length > 1 ? Math.Sqrt(tail.Sum(v => (v - plateau) * (v - plateau)) / (tail.Length - 1)) : 0;
        double sampling = ae.Skip(from).Where(double.IsFinite).DefaultIfEmpty(0).Average() / Math.Abs(den);
        double err = Math.Sqrt(spread * spread / Math.Max(1, tail.Length) + sampling * sampling) + spread / 2;
        ExponentialRegime growth = ExponentialRegime.Fit([], []);
        double ratio = double.NaN, finalOtoc = double.NaN;
        if (withOtoc && res.Sites.Count > 0)
        {
            var f = res.Sites[0].Mean.Values;
            var c = f.Select(v => 1 - v / f[0]).ToArray();
            growth = ExponentialRegime.Fit(times, c);
            if (growth.IsExponential) ratio = growth.Rate * beta / (2 * Math.PI);
            finalOtoc = f[^1] / f[0];
        }
        var (order, pattern) = withOtoc ? PatternOrder(m, w, beta, Math.Max(2, options.ThermalSamples), options.Seed + 7919, options.EffectiveThreads) : (double.NaN, null);
        return new ThermalPoint(beta, betaEps, growth, ratio, wMean, plateau, err, finalOtoc) { Order = order, OrderPattern = pattern };
    }

    /// <summary>
    /// Long-range order of the single-site probe's letter a: with thermal correlations
    /// C_ij = &lt;a_i a_j&gt; - &lt;a_i&gt;&lt;a_j&gt; (typicality, the same random states as <see cref="ThermalExpectation"/>),
    /// the largest over patterns s (uniform; two-sublattice signs when the lattice is bipartite) of
    /// sum_{i != j} s_i s_j C_ij / (N (N-1)), divided by 1 - &lt;W&gt;^2. (NaN, null) for a multi-site probe.
    /// Long-range order with order parameter m gives about m^2; a paramagnet O(1/N); a glass, frozen in a
    /// random pattern, about 0 for lattice patterns.
    /// </summary>
    internal static (double Order, string? Pattern) PatternOrder(Model m, PauliString w, double beta, int samples, int seed, int threads)
    {
        var support = w.Support();
        if (support.Length != 1) return (double.NaN, null);
        char letter = w[support[0]];
        int n = m.N;
        var h = m.Hamiltonian;
        var patterns = new List<(string Name, int[] Sign)> { ("uniform", Enumerable.Repeat(1, n).ToArray()) };
        if (m.Lattice.Kind != "all-to-all" && TwoColouring(m.Lattice) is { } colour) patterns.Add(("staggered", colour));
        var app = new PauliHamiltonianApplier(h, threads);
        var prop = new KrylovPropagator(app, new KrylovOptions { Tolerance = 1e-10 });
        var rng = new Random(seed);
        int dim = 1 << n;
        var q = new Complex[dim];
        var single = new PauliMask[n];
        for (int i = 0; i < n; i++) single[i] = PauliMask.From(PauliString.Single(n, i, letter));
        var pair = new PauliMask[n, n];
        for (int i = 0; i < n; i++)
        {
            for (int j = i + 1; j < n; j++)
            {
                var b = new PauliString.Builder(n);
                b.Set(i, letter);
                b.Set(j, letter);
                pair[i, j] = PauliMask.From(b.Build());
            }
        }
        var mean = new double[n];
        var corr = new double[n, n];
        double total = 0;
        for (int s = 0; s < samples; s++)
        {
            StateVector.FillHaarRandom(q, rng);
            if (beta > 0) prop.EvolveImaginary(q, beta / 2);
            double norm = StateVector.NormSquared(q, threads);
            StateVector.Scale(q, 1 / Math.Sqrt(norm), threads);
            total += norm;
            for (int i = 0; i < n; i++) mean[i] += norm * StateVector.PauliMatrixElement(q, single[i], q).Real;
            for (int i = 0; i < n; i++) for (int j = i + 1; j < n; j++) corr[i, j] += norm * StateVector.PauliMatrixElement(q, pair[i, j], q).Real;
        }
        for (int i = 0; i < n; i++) mean[i] /= total;
        double wMean = mean[support[0]];
        double variance = 1 - wMean * wMean;
        if (!(variance > 1e-9) || n < 2) return (double.NaN, null);
        double best = double.NegativeInfinity;
        string? bestName = null;
        foreach (var (name, sign) in patterns)
        {
            double sum = 0;
            for (int i = 0; i < n; i++) for (int j = i + 1; j < n; j++) sum += 2 * sign[i] * sign[j] * (corr[i, j] / total - mean[i] * mean[j]);
            double o = sum / ((double)n * (n - 1)) / variance;
            if (o > best)
            {
                best = o;
                bestName = name;
            }
        }
        return (best, bestName);
    }

    /// <summary>Signs +-1 of a two-colouring of the lattice's bonds, or null when the lattice is not bipartite (or has no bonds).</summary>
    internal static int[]? TwoColouring(Lattice lattice)
    {
        int n = lattice.N;
        if (lattice.Edges.Count == 0) return null;
        var adj = new List<int>[n];
        for (int i = 0; i < n; i++) adj[i] = [];
        foreach (var (a, b) in lattice.Edges)
        {
            adj[a].Add(b);
            adj[b].Add(a);
        }
        var colour = new int[n];
        for (int start = 0; start < n; start++)
        {
            if (colour[start] != 0) continue;
            colour[start] = 1;
            var queue = new Queue<int>();
            queue.Enqueue(start);
            while (queue.Count > 0)
            {
                int v = queue.Dequeue();
                foreach (int u in adj[v])
                {
                    if (colour[u] == 0)
                    {
                        colour[u] = -colour[v];
                        queue.Enqueue(u);
                    }
                    else if (colour[u] == colour[v])
                    {
                        return null;
                    }
                }
            }
        }
        return colour;
    }

    /// <summary>
    /// &lt;W&gt;_beta = Tr(e^{-beta H} W) / Tr(e^{-beta H}) by typicality: for random states r, q = e^{-beta H/2} r,
    /// the estimate is sum &lt;q|W|q&gt; / sum &lt;q|q&gt;; the error is the standard error over states.
    /// Source: Bartsch and Gemmer, PRL 102, 110403 (2009).
    /// </summary>
    public static (double Mean, double Error) ThermalExpectation(Hamiltonian h, PauliString w, double beta, int samples, int seed, int threads)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(w);
        var app = new PauliHamiltonianApplier(h, threads);
        var prop = new KrylovPropagator(app, new KrylovOptions { Tolerance = 1e-10 });
        var mask = PauliMask.From(w);
        var rng = new Random(seed);
        var num = new double[samples];
        var den = new double[samples];
        int dim = 1 << h.N;
        var q = new Complex[dim];
        for (int s = 0; s < samples; s++)
        {
            StateVector.FillHaarRandom(q, rng);
            if (beta > 0) prop.EvolveImaginary(q, beta / 2);
            double norm = StateVector.NormSquared(q, threads);
            // Rescale to keep numbers in range at low temperature (the ratio is unchanged).
            StateVector.Scale(q, 1 / Math.Sqrt(norm), threads);
            num[s] = StateVector.PauliMatrixElement(q, mask, q).Real * norm;
            den[s] = norm;
        }
        double mean = num.Sum() / den.Sum();
        if (samples < 2) return (mean, double.NaN);
        // Ratio estimator: spread of per-state ratios weighted by their norms.
        double wsum = den.Sum();
        var ratios = num.Zip(den, (a, b) => a / b).ToArray();
        double var = 0;
        for (int s = 0; s < samples; s++) var += den[s] / wsum * (ratios[s] - mean) * (ratios[s] - mean);
        return (mean, Math.Sqrt(var / (samples - 1)));
    }

    /// <summary>The verdict from the finite-temperature figures (pure).</summary>
    public static TestVerdict Judge(ThermalFindings f)
    {
        ArgumentNullException.ThrowIfNull(f);
        var inv = System.Globalization.CultureInfo.InvariantCulture;
        string ratios = string.Join(", ", f.Points.Select(p => string.Create(inv, $"{(double.IsNaN(p.BoundRatio) ? "no exp. regime" : p.BoundRatio.ToString("0.00", inv))} (beta eps = {p.BetaEpsilon:0.##})")));
        var coldest = f.Points[^1];
        string figure = string.Create(inv, $"lambda/(2 pi T): {ratios}; low-T autocorrelation plateau {coldest.Plateau:0.00} +- {coldest.PlateauError:0.00} (N = {f.N}, {f.Operator})");
        string threshold = string.Create(inv,
            $"frozen if the connected plateau at the lowest T >= {DiagnosisThresholds.FrozenPlateau}; exponential regime: >= {DiagnosisThresholds.ExponentialMinPoints} points, R^2 >= {DiagnosisThresholds.ExponentialMinRSquared}, better than a power law; chaos bound lambda/(2 pi T) <= 1");
        const string source = "Maldacena, Shenker, Stanford, JHEP 08 (2016) 106 (bound); Khemani, Huse, Nahum, PRB 98, 144304 (2018) (1D need not be exponential); thresholds: common practice";
        var notes = new List<string>();
        foreach (var p in f.Points.Where(p => p.BoundRatio > 1))
            notes.Add(string.Create(inv, $"at beta eps = {p.BetaEpsilon:0.##} the fit gives lambda/(2 pi T) = {p.BoundRatio:0.00} > 1: the window catches the short-time onset, not a Lyapunov regime"));
        if (f.PlateauBySize.Count > 1)
            notes.Add("plateau by size: " + string.Join(", ", f.PlateauBySize.Select(b => string.Create(inv, $"N = {b.N}: {b.Plateau:0.000} +- {b.PlateauError:0.000}"))));
        notes.Add(string.Create(inv, $"small size N = {f.N}: finite-size effects are strong, and the lowest temperatures are reached only roughly"));
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => TestVerdict.Of(6, Name, figure, threshold, source, notes, o, reason, ev);
        // A frozen plateau matched by lattice-pattern order is a symmetry-broken phase, not a glass.
        static bool Frozen(ThermalPoint p) => p.Plateau - 2 * p.PlateauError >= DiagnosisThresholds.FrozenPlateau;
        static bool Ordered(ThermalPoint p) => double.IsFinite(p.Order) && p.Order >= DiagnosisThresholds.OrderShare * p.Plateau;
        foreach (var p in f.Points.Where(p => p.Plateau >= DiagnosisThresholds.FrozenPlateau && double.IsFinite(p.Order)))
            notes.Add(string.Create(inv, $"at beta eps = {p.BetaEpsilon:0.##}: {p.OrderPattern} order {p.Order:0.00} against the plateau {p.Plateau:0.00}"));
        string orderReason = string.Create(inv,
            $"the low-temperature plateau {coldest.Plateau:0.00} is matched by long-range {coldest.OrderPattern} order of the probe's spin component ({coldest.Order:0.00}, at least {DiagnosisThresholds.OrderShare} of the plateau): an ordered, symmetry-broken phase, not glass-like freezing");
        if (Frozen(coldest) && !Ordered(coldest))
        {
            bool allT = f.Points.All(p => p.Plateau >= DiagnosisThresholds.FrozenPlateau);
            return V(TestOutcome.Fails, string.Create(inv,
                $"the single-site autocorrelation freezes at {coldest.Plateau:0.00} at beta eps = {coldest.BetaEpsilon:0.##}{(allT ? " (and at every temperature tried)" : string.Empty)}{(double.IsFinite(coldest.Order) ? $" with no lattice order to explain it ({coldest.OrderPattern} order {coldest.Order:0.00})" : string.Empty)}: glass-like memory"),
                Mechanism.Frozen, Mechanism.Localized);
        }
        var good = f.Points.Where(p => p.Growth.IsExponential && p.BoundRatio is > 0 and <= 1 && !Frozen(p)).ToList();
        bool decays = f.Points.All(p => p.Plateau < DiagnosisThresholds.FrozenPlateau);
        bool decaysOrOrdered = f.Points.All(p => p.Plateau < DiagnosisThresholds.FrozenPlateau || Ordered(p));
        if (good.Count > 0 && decaysOrOrdered)
        {
            var best = good.MaxBy(p => p.BoundRatio)!;
            if (!decays) notes.Add(orderReason);
            return V(TestOutcome.Scrambles, string.Create(inv,
                $"the regularised OTOC grows exponentially, lambda/(2 pi T) = {best.BoundRatio:0.00} at beta eps = {best.BetaEpsilon:0.##}, and the autocorrelations decay{(decays ? string.Empty : " (or freeze only through long-range order)")}"), Mechanism.Scrambles);
        }
        if (Frozen(coldest)) return V(TestOutcome.Inconclusive, orderReason);
        return V(TestOutcome.Inconclusive, decays
            ? "autocorrelations decay at every temperature, but the OTOC shows no clean exponential regime at this size (not required in 1D short-range chains; OTOC decay alone is not chaos)"
            : string.Create(inv, $"the autocorrelation plateau {coldest.Plateau:0.00} +- {coldest.PlateauError:0.00} is near the freezing threshold"));
    }
}
