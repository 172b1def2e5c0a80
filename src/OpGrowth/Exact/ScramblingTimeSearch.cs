using System.Diagnostics;
using System.Numerics;
using Microsoft.Extensions.Logging;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// Locates the scrambling time t* (the first time the mean size reaches half its saturation value) with the
/// exact state-vector engine, evaluating the mean size only at times chosen around the crossing instead of on a
/// uniform grid.
/// </summary>
/// <remarks>
/// <para>Mean size from one random-sign probe (Source: Hutchinson, Commun. Stat. Simul. Comput. 18, 1059 (1989),
/// random-sign trace estimator; typicality: Bartsch and Gemmer, PRL 102, 110403 (2009)): with random signs xi_k and
/// the probe A = sum_k xi_k P_k over the single-site Paulis (or the Majoranas), E_xi Tr(W(t) A W(t) A)/D =
/// sum_k F_k, and the mean size is affine in that sum: n = 3N/4 - (1/4) sum_k F_k for qubits (OTOC-size identity,
/// check-values.md), n = (M - (-1)^p sum_a F_a)/2 for M Majoranas and an operator of Majorana parity p
/// (chi_a Gamma chi_a = (-1)^{|Gamma| - [a in Gamma]} Gamma). For a random state r, Tr(W(t) A W(t) A)/D ~
/// &lt;g0|A|g1&gt; with g0 = W(t) r and g1 = W(t) A r, W(t) = U^dagger W U: two forward propagations (carried from
/// the last time below the crossing) and two backward ones of length t per evaluation, on two threads.</para>
/// <para>Times: a first time from the local time scale of W (or a guess), then extrapolation towards the target
/// (linear and exponential through the last two values, the later of the two, so that the crossing is bracketed),
/// then inverse interpolation inside the bracket until the quadratic and the linear crossing agree to half the
/// tolerance. Typically 4-6 evaluations instead of a grid of dozens.</para>
/// </remarks>
public static class ScramblingTimeSearch
{
    /// <summary>Runs the search.</summary>
    public static ScramblingTimeSearchResult Run(Hamiltonian h, ScramblingTimeSearchOptions o, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(o);
        Validate(h, o);
        var sw = Stopwatch.StartNew();
        var probe = new SizeProbe(h, o, sw);
        double target = probe.Target;
        var evals = probe.Evaluations;
        double tNext = Math.Min(o.MaxTime, o.Guess is double gu && gu > 0 ? 0.9 * gu : FirstTime(h, o.Operator));
        bool reached = false;
        while (evals.Count - 1 < o.MaxEvaluations)
        {
            var e = probe.Evaluate(tNext, ct);
            if (e.MeanSize >= target)
            {
                reached = true;
                break;
            }
            if (tNext >= o.MaxTime) break;
            tNext = Math.Min(o.MaxTime, ProposeBelow(evals, target));
        }
        Crossing? cross = null;
        if (reached)
        {
            while (true)
            {
                cross = Cross(evals, target);
                if (cross.Error <= 0.5 * o.RelativeTolerance * cross.Time || evals.Count - 1 >= o.MaxEvaluations) break;
                double width = cross.High.Time - cross.Low.Time;
                double t = Math.Clamp(cross.Time, cross.Low.Time + 0.02 * width, cross.High.Time - 0.02 * width);
                probe.Evaluate(t, ct);
            }
        }
        double? slope = null;
        double sampling = double.NaN;
        if (cross is not null)
        {
            slope = (cross.High.MeanSize - cross.Low.MeanSize) / (cross.High.Time - cross.Low.Time);
            double wHi = (cross.Time - cross.Low.Time) / (cross.High.Time - cross.Low.Time);
            double sn = (1 - wHi) * cross.Low.Error + wHi * cross.High.Error;
            sampling = slope > 0 ? sn / slope.Value : double.NaN;
        }
        return probe.Result(cross?.Time, cross?.Error ?? double.NaN, sampling, slope, reached ? null : evals[^1].Time);
    }

    /// <summary>
    /// The random-sign mean-size estimate at given (ascending) times, with the same states, signs and error rule
    /// as the search (for checks against other routes and for plotting n(t)).
    /// </summary>
    public static ScramblingTimeSearchResult MeanSizes(Hamiltonian h, ScramblingTimeSearchOptions o, IReadOnlyList<double> times, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(o);
        ArgumentNullException.ThrowIfNull(times);
        Validate(h, o);
        var probe = new SizeProbe(h, o, Stopwatch.StartNew());
        double prev = 0;
        foreach (double t in times)
        {
            if (!(t >= prev) || !double.IsFinite(t)) throw new ArgumentException("Times must be finite, non-negative and ascending.", nameof(times));
            if (t > 0) probe.Evaluate(t, ct);
            prev = t;
        }
        return probe.Result(null, double.NaN, double.NaN, null, null);
    }

    // Random states, probes and propagators of one search; evaluates the mean size at a time.
    private sealed class SizeProbe
    {
        private readonly ScramblingTimeSearchOptions _o;
        private readonly Stopwatch _clock;
        private readonly SizeMap _map;
        private readonly int _n, _threads, _samples, _groups;
        private readonly bool _blocks;
        private readonly bool _split;
        private readonly ChebyshevPropagator[] _props = new ChebyshevPropagator[2];
        private readonly PauliHamiltonianApplier[][] _probe;
        private Complex[][][] _f;    // forward vectors at _tc (checkpoints)
        private Complex[][][] _tf;   // the same, carried to the time being evaluated
        private readonly Complex[][]? _fresh;
        private readonly bool _checkpoints;
        private readonly int _dim;
        private readonly Complex[] _g0;
        private readonly Complex[][] _scratch;
        private readonly Complex[][] _y;
        private readonly Complex[][] _tmp;
        private readonly PauliMask _w;
        private readonly long _boundSteps;
        private readonly double _aPriori;
        private double _tc;

        public SpectralBounds Bounds { get; }

        public string EstimatorName => _blocks ? "site blocks (exact trace over each site)" : $"random signs in {_groups} probe group(s)";

        public double Target { get; }

        public long VectorBytes { get; }

        public List<SizeEvaluation> Evaluations { get; }

        public SizeProbe(Hamiltonian h, ScramblingTimeSearchOptions o, Stopwatch clock)
        {
            _o = o;
            _clock = clock;
            _n = h.N;
            int dim = StateVector.Dimension(_n);
            _threads = o.Threads > 0 ? o.Threads : Environment.ProcessorCount;
            _map = SizeMap.For(_n, o.Operator, o.MajoranaSize);
            Target = o.TargetFraction * _map.Saturation;
            _split = _threads >= 2 && dim >= StateVector.ParallelThreshold;
            if (_split)
            {
                Bounds = o.Bounds ?? SpectralBounds.Estimate(new PauliHamiltonianApplier(h, _threads));
                for (int e = 0; e < 2; e++) _props[e] = new ChebyshevPropagator(new PauliHamiltonianApplier(h, 1), o.PropagationTolerance, Bounds);
            }
            else
            {
                var main = new PauliHamiltonianApplier(h, _threads);
                Bounds = o.Bounds ?? SpectralBounds.Estimate(main);
                _props[0] = _props[1] = new ChebyshevPropagator(main, o.PropagationTolerance, Bounds);
            }
            _boundSteps = o.Bounds is null ? Math.Min(60, dim) : 0;
            // Probe groups: the probe strings are split into G groups, each with its own random signs, so that
            // cross terms only arise within a group (G + 1 backward propagations per evaluation).
            _blocks = o.SiteBlocks;
            if (_blocks && o.MajoranaSize) throw new ArgumentException("Site blocks resolve qubit sites; the Majorana size needs the random-sign probe.", nameof(o));
            int[][] groups = _blocks ? [] : ProbeGroups(_map.Probes.Length, _n, o.ProbeGroups, _map.Name == "qubits");
            _groups = _blocks ? 2 * _n - 1 : groups.Length;   // vectors per state minus one
            _samples = o.Samples;
            _dim = dim;
            _probe = new PauliHamiltonianApplier[_samples][];
            for (int k = 0; k < _samples; k++)
            {
                if (_blocks) continue;
                var rng = new Random(SampleSeed(k));
                _probe[k] = new PauliHamiltonianApplier[_groups];
                for (int gi = 0; gi < _groups; gi++)
                {
                    var terms = new List<PauliTerm>(groups[gi].Length);
                    foreach (int pi in groups[gi]) terms.Add(new PauliTerm(_map.Probes[pi], rng.Next(2) == 0 ? 1.0 : -1.0));
                    _probe[k][gi] = new PauliHamiltonianApplier(new Hamiltonian(_n, terms), _split ? 1 : _threads);
                }
            }
            int vecs = _groups + 1;
            long work = WorkBytes(_n, _blocks, vecs, _samples, _split);
            long full = 2L * vecs * _samples * dim * 16 + work;
            long budget = o.MemoryBytes ?? (long)(0.6 * GC.GetGCMemoryInfo().TotalAvailableMemoryBytes);
            // Checkpoints (the forward vectors at the last time below the crossing) save the forward propagation from
            // t = 0 at every evaluation; without them every vector is regenerated from its seed and propagated from 0.
            _checkpoints = full <= budget;
            VectorBytes = _checkpoints ? full : work + 2L * dim * 16;
            if (_checkpoints)
            {
                _f = new Complex[_samples][][];
                _tf = new Complex[_samples][][];
                for (int k = 0; k < _samples; k++)
                {
                    _f[k] = new Complex[vecs][];
                    _tf[k] = new Complex[vecs][];
                    for (int v = 0; v < vecs; v++)
                    {
                        _f[k][v] = new Complex[dim];
                        _tf[k][v] = new Complex[dim];
                    }
                    Initial(k, _f[k]);
                }
            }
            else
            {
                _f = [];
                _tf = [];
                _fresh = [new Complex[dim], new Complex[dim]];
            }
            _g0 = new Complex[dim];
            _scratch = [new Complex[dim], new Complex[dim]];
            _y = [new Complex[dim], new Complex[dim]];
            _tmp = [new Complex[dim], new Complex[dim]];
            _w = PauliMask.From(o.Operator);
            _aPriori = _blocks ? 0.75 * Math.Sqrt(_n / (dim / 2.0 + 1)) : Math.Abs(_map.Beta) * _map.Probes.Length / Math.Sqrt(dim);
            Evaluations = [new(0, _map.Initial, 0, Enumerable.Repeat(_map.Initial, _samples).ToArray())];
            o.Logger?.LogInformation("t* search: N = {N}, W = {W}, size in {Measure}, target {Target:0.###}, {Samples} random state(s), {Estimator}, spectrum in [{Lo:0.###}, {Hi:0.###}], {Mb:0.#} MiB of vectors",
                _n, o.Operator, _map.Name, Target, _samples, EstimatorName, Bounds.Min, Bounds.Max, VectorBytes / 1048576.0);
        }

        private int SampleSeed(int k) => unchecked(_o.Seed * 1_000_003 + k * 7919 + 424_243);

        // Every initial vector of state k: site blocks |r'_j e>_j (index 2j + e), or r and A_g r (index 0, 1 + g).
        private void Initial(int k, Complex[][] dst)
        {
            for (int v = 0; v < dst.Length; v++) InitialOne(k, v, dst[v]);
        }

        // One initial vector, regenerated from its seed (deterministic whatever the order).
        private void InitialOne(int k, int v, Complex[] dst)
        {
            if (_blocks)
            {
                int j = v / 2, e = v % 2;
                var rest = new Complex[_dim / 2];
                StateVector.FillHaarRandom(rest, new Random(unchecked(SampleSeed(k) * 31 + j * 7_919 + 17)));
                StateVector.EmbedWithSite(rest, _n, j, e, dst);
                return;
            }
            var r = v == 0 ? dst : new Complex[_dim];
            StateVector.FillHaarRandom(r, new Random(unchecked(SampleSeed(k) * 31 + 5)));
            if (v > 0) _probe[k][v - 1].Apply(r, dst);
        }

        // Vector v of state k carried to time t: from the checkpoint, or regenerated and propagated from 0.
        private Complex[] Forward(int k, int v, double t, int e, int bt)
        {
            Complex[] fwd;
            if (_checkpoints)
            {
                fwd = _tf[k][v];
                StateVector.ScaledCopy(_f[k][v], 1, fwd, bt);
                if (t > _tc) _props[e].Evolve(fwd, t - _tc);
            }
            else
            {
                fwd = _fresh![e];
                InitialOne(k, v, fwd);
                _props[e].Evolve(fwd, t);
            }
            return fwd;
        }

        public SizeEvaluation Evaluate(double t, CancellationToken ct)
        {
            ct.ThrowIfCancellationRequested();
            var values = new double[_samples];
            int bt = _split ? 1 : _threads;
            for (int k = 0; k < _samples; k++)
            {
                int kk = k;
                if (_blocks)
                {
                    // Site j: both branches e = 0, 1 at once, then the site's three letters from their 2 x 2 Gram tensor.
                    double size = 0;
                    for (int j = 0; j < _n; j++)
                    {
                        void Block(int e)
                        {
                            ct.ThrowIfCancellationRequested();
                            var fwd = Forward(kk, 2 * j + e, t, e, bt);
                            StateVector.ApplyPauli(_w, fwd, _scratch[e]);
                            _props[e].Evolve(_scratch[e], -t);
                        }
                        if (_split) Parallel.Invoke(() => Block(0), () => Block(1));
                        else
                        {
                            Block(0);
                            Block(1);
                        }
                        var letters = ExactOtoc.SiteLetters(_scratch[0], _scratch[1], _n, j, _threads);
                        size += 0.75 * (1 - (letters[0] + letters[1] + letters[2]) / 6.0);
                    }
                    values[k] = size;
                    continue;
                }
                var probes = _probe[k];
                // Vector v: forward from tc to t, then U(t)^dagger W U(t) (...). g0 = W(t) r is kept; every probe
                // vector is folded into the branch's sum Y_e = sum_g A_g W(t) A_g r at once, so that memory does not
                // grow with the number of groups. The value is <g0 | Y_0 + Y_1>.
                void Branch(int e)
                {
                    Array.Clear(_y[e]);
                    for (int v = e; v <= _groups; v += 2)
                    {
                        ct.ThrowIfCancellationRequested();
                        var gv = v == 0 ? _g0 : _scratch[e];
                        var fwd = Forward(kk, v, t, e, bt);
                        StateVector.ApplyPauli(_w, fwd, gv);
                        _props[e].Evolve(gv, -t);
                        if (v == 0) continue;
                        probes[v - 1].Apply(gv, _tmp[e]);
                        StateVector.Axpy(1, _tmp[e], _y[e], bt);
                    }
                }
                if (_split) Parallel.Invoke(() => Branch(0), () => Branch(1));
                else
                {
                    Branch(0);
                    Branch(1);
                }
                double sum = StateVector.Inner(_g0, _y[0], _threads).Real + StateVector.Inner(_g0, _y[1], _threads).Real;
                values[k] = _map.Alpha + _map.Beta * sum;
            }
            double mean = values.Average();
            double err = _samples > 1 ? Math.Sqrt(values.Sum(v => (v - mean) * (v - mean)) / (_samples - 1) / _samples) : _aPriori;
            if (_checkpoints && mean < Target && t > _tc)
            {
                // Below the crossing: later evaluations start from here.
                (_f, _tf) = (_tf, _f);
                _tc = t;
            }
            var ev = new SizeEvaluation(t, mean, err, values);
            int at = Evaluations.FindIndex(x => x.Time > t);
            Evaluations.Insert(at < 0 ? Evaluations.Count : at, ev);
            _o.Logger?.LogInformation("t* search: n({T:0.#####}) = {Size:0.####} +- {Err:0.####} (target {Target:0.###}; {Elapsed:0.0} s)", t, mean, err, Target, _clock.Elapsed.TotalSeconds);
            return ev;
        }

        public ScramblingTimeSearchResult Result(double? tStar, double location, double sampling, double? slope, double? lowerBound)
        {
            var proc = Process.GetCurrentProcess();
            proc.Refresh();
            var props = _props.Distinct().ToArray();
            return new ScramblingTimeSearchResult
            {
                N = _n,
                Operator = _o.Operator.ToString(),
                SizeMeasure = _map.Name,
                Saturation = _map.Saturation,
                Target = Target,
                TStar = tStar,
                LocationError = location,
                SamplingError = sampling,
                SamplingErrorKind = _samples > 1 ? $"standard error over {_samples} random states"
                    : _blocks ? $"a-priori estimate (3/4) sqrt(N / (2^(N-1) + 1)) = {_aPriori:G3} of the size for one random state (independent Haar errors of the N site blocks)"
                    : $"a-priori estimate |beta| K / sqrt(2^N) = {_aPriori:G3} of the size for one random state (K = {_map.Probes.Length} probe strings; sign cross terms not included)",
                LowerBound = lowerBound,
                Slope = slope,
                Evaluations = Evaluations,
                Samples = _samples,
                ProbeGroups = _blocks ? 0 : _groups,
                Estimator = EstimatorName,
                MatrixVectorProducts = _boundSteps + props.Sum(p => p.MatrixVectorProducts),
                PropagationError = props.Sum(p => p.EstimatedError),
                Bounds = Bounds,
                WallSeconds = _clock.Elapsed.TotalSeconds,
                VectorBytes = VectorBytes,
                PeakWorkingSetBytes = proc.PeakWorkingSet64,
            };
        }
    }

    /// <summary>The crossing of the target located from the evaluations around it.</summary>
    /// <param name="Time">Best estimate (quadratic through three evaluations, linear when only two exist).</param>
    /// <param name="Error">|quadratic - linear| (half the bracket when no quadratic exists).</param>
    /// <param name="Low">Last evaluation below the target.</param>
    /// <param name="High">First evaluation at or above it.</param>
    public sealed record Crossing(double Time, double Error, SizeEvaluation Low, SizeEvaluation High);

    /// <summary>First crossing of <paramref name="target"/> in time-ordered evaluations (null when none reaches it).</summary>
    public static Crossing Cross(IReadOnlyList<SizeEvaluation> evals, double target)
    {
        int i = -1;
        for (int k = 1; k < evals.Count; k++)
        {
            if (evals[k].MeanSize >= target)
            {
                i = k;
                break;
            }
        }
        if (i < 0) throw new InvalidOperationException("no evaluation reaches the target");
        var lo = evals[i - 1];
        var hi = evals[i];
        double tl = lo.Time + (target - lo.MeanSize) * (hi.Time - lo.Time) / (hi.MeanSize - lo.MeanSize);
        // Third point: the neighbour closer in time to the bracket.
        SizeEvaluation? third = null;
        if (i - 2 >= 0 && i + 1 < evals.Count) third = lo.Time - evals[i - 2].Time <= evals[i + 1].Time - hi.Time ? evals[i - 2] : evals[i + 1];
        else if (i - 2 >= 0) third = evals[i - 2];
        else if (i + 1 < evals.Count) third = evals[i + 1];
        if (third is null) return new Crossing(tl, 0.5 * (hi.Time - lo.Time), lo, hi);
        double? tq = QuadraticCrossing(lo, hi, third, target);
        return tq is double q ? new Crossing(q, Math.Abs(q - tl), lo, hi) : new Crossing(tl, 0.5 * (hi.Time - lo.Time), lo, hi);
    }

    // Lagrange quadratic through three evaluations, solved for n(t) = target inside [lo, hi].
    private static double? QuadraticCrossing(SizeEvaluation lo, SizeEvaluation hi, SizeEvaluation c, double target)
    {
        double x0 = lo.Time, x1 = hi.Time, x2 = c.Time;
        double y0 = lo.MeanSize - target, y1 = hi.MeanSize - target, y2 = c.MeanSize - target;
        // n(t) - target = a t^2 + b t + d
        double d01 = (y1 - y0) / (x1 - x0), d12 = (y2 - y1) / (x2 - x1);
        double a = (d12 - d01) / (x2 - x0);
        double b = d01 - a * (x0 + x1);
        double d = y0 - a * x0 * x0 - b * x0;
        if (Math.Abs(a) < 1e-14 * (Math.Abs(b) + 1e-300)) return -d / b;
        double disc = b * b - 4 * a * d;
        if (disc < 0) return null;
        double sq = Math.Sqrt(disc);
        double r1 = (-b + sq) / (2 * a), r2 = (-b - sq) / (2 * a);
        double eps = 1e-12 * (x1 - x0);
        bool in1 = r1 >= x0 - eps && r1 <= x1 + eps, in2 = r2 >= x0 - eps && r2 <= x1 + eps;
        if (in1 && in2) return Math.Min(r1, r2);
        if (in1) return r1;
        if (in2) return r2;
        return null;
    }

    // Next time while every evaluation is below the target: extrapolate to the target from the last two values
    // (linear, and exponential in n - n(0)), take the later estimate so that the crossing tends to be bracketed,
    // and stay within [1.1, 2.5] times the last time.
    private static double ProposeBelow(List<SizeEvaluation> evals, double target)
    {
        var last = evals[^1];
        var prev = evals[^2];
        double n0 = evals[0].MeanSize;
        double t2 = last.Time, t1 = prev.Time;
        double lo = 1.1 * t2, hi = 2.5 * t2;
        if (last.MeanSize <= n0 + 1e-9) return hi;
        double best;
        if (evals.Count == 2)
        {
            // Only t = 0 before: the short-time law n - n0 ~ t^2.
            best = t2 * Math.Sqrt((target - n0) / (last.MeanSize - n0));
        }
        else
        {
            double tl = last.MeanSize > prev.MeanSize ? t2 + (target - last.MeanSize) * (t2 - t1) / (last.MeanSize - prev.MeanSize) : hi;
            double te = double.NaN;
            if (prev.MeanSize - n0 > 1e-9 && last.MeanSize > prev.MeanSize)
            {
                double lambda = Math.Log((last.MeanSize - n0) / (prev.MeanSize - n0)) / (t2 - t1);
                te = t2 + Math.Log((target - n0) / (last.MeanSize - n0)) / lambda;
            }
            best = double.IsFinite(te) ? Math.Max(tl, te) : tl;
        }
        return Math.Clamp(1.02 * best, lo, hi);
    }

    /// <summary>
    /// Probe groups to use by default: one group per site when the lattice's diameter is at most 2 (all-to-all
    /// couplings), one group otherwise. Measured on the random Heisenberg cluster at N = 10, t = 0.7 (16 states): the
    /// spread of one state's mean size is 0.49 with one group (cross terms between sites dominate) and 0.039 with one
    /// group per site; on the tilted-field chain (N = 10, t = 2.5) 0.39 and 0.29 (state noise dominates, which
    /// shrinks like 2^(-N/2)), so short-range models keep one group (N + 1 times cheaper).
    /// </summary>
    public static int DefaultProbeGroups(int n, int diameter) => diameter <= 2 ? n : 1;

    /// <summary>
    /// True when the default estimator is site blocks: qubit size on lattices with a distance (diameter above 2). Measured
    /// on the tilted-field chain at N = 12 (8 states): the standard error of t* is 0.097 with one random-sign group, 0.054
    /// with one group per site, 0.0028 with every site and letter resolved: the remaining noise is cross terms between
    /// the letters of one site, which site blocks remove exactly at 2N propagations per evaluation. On the all-to-all
    /// Heisenberg cluster those cross terms vanish (U(1) symmetry about z maps X_j to Y_j), so one group per site does as
    /// well at about half the cost.
    /// </summary>
    public static bool DefaultSiteBlocks(int diameter, bool majoranaSize) => !majoranaSize && diameter > 2;

    /// <summary>The default options for a model of <paramref name="n"/> sites: site blocks on lattices with a distance, else one probe group per site.</summary>
    public static (bool SiteBlocks, int ProbeGroups) DefaultEstimator(int n, int diameter, bool majoranaSize)
        => DefaultSiteBlocks(diameter, majoranaSize) ? (true, 0) : (false, n);

    /// <summary>Vectors propagated per random state and evaluation: 2N with site blocks, G + 1 with G probe groups.</summary>
    public static int VectorsPerState(int n, bool siteBlocks, int probeGroups) => siteBlocks ? 2 * n : Math.Max(1, probeGroups) + 1;

    /// <summary>
    /// Bytes of vectors a search holds with checkpoints (the usual case): a forward and a carried copy of every vector
    /// of every state, the propagation work vectors, and each probe group's diagonal (two doubles per amplitude).
    /// The sweep planner and <see cref="ScramblingTimeCost"/> use the same figure.
    /// </summary>
    public static long PlannedVectorBytes(int n, bool siteBlocks, int vectorsPerState, int samples, int threads)
    {
        long dim = StateVector.Dimension(n);
        bool split = threads >= 2 && dim >= StateVector.ParallelThreshold;
        return 2L * vectorsPerState * samples * dim * 16 + WorkBytes(n, siteBlocks, vectorsPerState, samples, split);
    }

    private static long WorkBytes(int n, bool siteBlocks, int vectorsPerState, int samples, bool split)
    {
        long dim = StateVector.Dimension(n);
        return (7L + (split ? 6 : 3)) * dim * 16 + 2L * (siteBlocks ? 0 : vectorsPerState - 1) * samples * dim * 8;
    }

    /// <summary>
    /// First time evaluated without a guess: the inverse of the local energy scale of W,
    /// sqrt(sum of h_t^2 over the terms that anticommute with W) (the rate at which W starts to change).
    /// </summary>
    public static double FirstTime(Hamiltonian h, PauliString w)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(w);
        double s = 0;
        foreach (var t in h.Terms)
        {
            if (!t.String.CommutesWith(w)) s += t.Coefficient * t.Coefficient;
        }
        return s > 0 ? 1.0 / Math.Sqrt(s) : double.PositiveInfinity;
    }

    // Partition of the probe strings: 1 group (all), 3 groups by letter (qubit size: X, Y, Z on every site), or
    // G groups of whole sites dealt round-robin.
    private static int[][] ProbeGroups(int count, int n, int groups, bool qubits)
    {
        if (groups <= 1) return [Enumerable.Range(0, count).ToArray()];
        if (groups == 3 && qubits) return [.. Enumerable.Range(0, 3).Select(a => Enumerable.Range(0, n).Select(j => 3 * j + a).ToArray())];
        if (groups >= count) return [.. Enumerable.Range(0, count).Select(k => new[] { k })];
        int per = count / n;
        return [.. Enumerable.Range(0, groups).Select(gi => Enumerable.Range(0, count).Where(k => (k / per) % groups == gi).ToArray()).Where(x => x.Length > 0)];
    }

    private static void Validate(Hamiltonian h, ScramblingTimeSearchOptions o)
    {
        if (o.Operator.N != h.N) throw new ArgumentException($"Operator acts on {o.Operator.N} qubits; the Hamiltonian on {h.N}.", nameof(o));
        if (h.N > PauliMask.MaxQubits) throw new ArgumentOutOfRangeException(nameof(h), h.N, $"State vectors hold at most {PauliMask.MaxQubits} qubits.");
        if (o.Operator.IsIdentity) throw new ArgumentException("The operator W must not be the identity.", nameof(o));
        if (o.Samples < 1) throw new ArgumentOutOfRangeException(nameof(o), o.Samples, "At least one random state is needed.");
        if (!(o.MaxTime > 0) || !double.IsFinite(o.MaxTime)) throw new ArgumentOutOfRangeException(nameof(o), o.MaxTime, "The latest time must be positive and finite.");
        if (!(o.RelativeTolerance > 0 && o.RelativeTolerance < 0.5)) throw new ArgumentOutOfRangeException(nameof(o), o.RelativeTolerance, "The relative tolerance must lie in (0, 0.5).");
        if (!(o.TargetFraction > 0 && o.TargetFraction < 1)) throw new ArgumentOutOfRangeException(nameof(o), o.TargetFraction, "The target fraction must lie in (0, 1).");
        if (o.MaxEvaluations < 2) throw new ArgumentOutOfRangeException(nameof(o), o.MaxEvaluations, "At least two evaluations are needed.");
    }

    /// <summary>Size as an affine function of the summed OTOCs against the probe strings: n = Alpha + Beta sum_k F_k.</summary>
    private sealed record SizeMap(string Name, PauliString[] Probes, double Alpha, double Beta, double Saturation, double Initial)
    {
        public static SizeMap For(int n, PauliString w, bool majoranas)
        {
            if (!majoranas)
            {
                var probes = new PauliString[3 * n];
                for (int k = 0; k < 3 * n; k++) probes[k] = PauliString.Single(n, k / 3, "XYZ"[k % 3]);
                return new SizeMap("qubits", probes, 0.75 * n, -0.25, 0.75 * n, w.Weight);
            }
            int m = 2 * n;
            var chis = new PauliString[m];
            for (int a = 0; a < m; a++) chis[a] = JordanWigner.Majorana(n, a).String;
            int size = JordanWigner.MajoranaWeight(w);
            double parity = (size & 1) == 0 ? 1 : -1;
            return new SizeMap("majoranas", chis, 0.5 * m, -0.5 * parity, 0.5 * m, size);
        }
    }
}
