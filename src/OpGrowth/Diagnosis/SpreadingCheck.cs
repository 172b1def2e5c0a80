using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Tests 3 and 4 from Heisenberg evolutions of the probes in the Pauli-string basis (top-M truncation,
/// second-order Trotter steps or the exact period map of a drive).
/// Test 3, operator size: the late-time mean size against the random-operator value 3N/4 (conventions.md),
/// and the late-time autocorrelation against the Mazur bound of test 5.
/// Test 4, front: the largest distance r_f(t) at which the site weight rho_j reaches a threshold, with its
/// arrival times fitted by r = v_B t + c (ballistic) and by r = a + b ln t (logarithmic light cone of
/// localized systems). The disordered XX chain is Anderson localized and has v_B = 0 (check-values.md).
/// </summary>
public static class SpreadingCheck
{
    /// <summary>Name of test 3.</summary>
    public const string SizeName = "operator size";

    /// <summary>Name of test 4.</summary>
    public const string FrontName = "front";

    /// <summary>
    /// Runs the full-size Pauli evolution of the main probe (front and autocorrelation) and exact evolutions
    /// of the probes at the smaller size <paramref name="small"/> (unbiased operator size and autocorrelation),
    /// then both tests. <paramref name="mazurFull"/> and <paramref name="mazurSmall"/> give the Mazur bound
    /// of a probe at each size.
    /// </summary>
    public static (TestVerdict Size, TestVerdict Front, SpreadingFindings? Findings) Run(Model model, Model? small, Func<string, double> mazurFull, Func<string, double> mazurSmall, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(mazurFull);
        ArgumentNullException.ThrowIfNull(mazurSmall);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        var log = options.Logger;
        var sizes = new List<SizeFigures>();
        var main = model.Probes[0];
        ProbeEvolution? exactMain = null;
        if (small is not null && small.N <= Exact.PauliMask.MaxQubits)
        {
            foreach (var p in LanczosGrowthCheck.ProbesOf(small))
            {
                ct.ThrowIfCancellationRequested();
                var (f, exactRun) = ExactRun(small, p, mazurSmall(p.ToString()), options, ct);
                if (small.N == model.N && p.Equals(main)) exactMain = exactRun;
                sizes.Add(f);
                log?.LogInformation("operator size: {Probe} at N = {N} (exact): size {S:0.00} = {F:0.00} x 3N/4, autocorrelation {A:0.000} (Mazur {M:0.000})",
                    f.Probe, f.N, f.LateSize, f.Fraction, f.LateAutocorrelation, f.Mazur);
            }
        }
        ProbeEvolution? run;
        string? budgetNote = null;
        if (exactMain is not null)
        {
            // The model is as small as the exact member: its exact evolution already is the full-size one,
            // and a truncated Pauli run could only be worse.
            run = exactMain;
            log?.LogInformation("operator size: {Probe} at N = {N}: the exact evolution is the full-size one (no truncated run needed)", run.Probe, model.N);
        }
        else
        {
            try
            {
                run = Evolve(model, main, options.EvolutionMaxStrings, options.EvolutionSeconds, options, ct);
            }
            catch (OperationCanceledException) when (!ct.IsCancellationRequested)
            {
                // the work limit ran out before the first record (e.g. grouping hundreds of thousands of terms)
                run = null;
                budgetNote = FormattableString.Invariant($"not run: budget - the full-size evolution ({model.Hamiltonian.Terms.Count} terms) did not reach its first record within {options.EvolutionSeconds:0} s on {options.EffectiveThreads} threads (processor time)");
                log?.LogInformation("operator size: {Note}", budgetNote);
            }
            if (run is not null && run.Times.Length > 0)
            {
                log?.LogInformation("operator size: {Probe} at N = {N} evolved to t = {T:0.##} ({Recs} records, peak {Peak} strings, discarded {D:G3}, {S:F1} s{Stop})",
                    run.Probe, model.N, run.Times[^1], run.Times.Length, run.PeakStrings, run.Discarded[^1], run.Seconds, run.Completed ? string.Empty : $", stopped: {run.StopReason}");
                sizes.Add(SizeOf(model, run, mazurFull(run.Probe)));
            }
            else run = null;
        }
        if (run is null)
        {
            budgetNote ??= "not run: budget - the full-size evolution produced no record";
            var sizeOnly = sizes.Count > 0 ? JudgeSize(sizes) with { Notes = [.. JudgeSize(sizes).Notes, budgetNote], Seconds = sw.Elapsed.TotalSeconds } : TestVerdict.NotRun(3, SizeName, budgetNote, sw.Elapsed.TotalSeconds);
            return (sizeOnly, TestVerdict.NotRun(4, FrontName, budgetNote), new SpreadingFindings([], sizes, null));
        }
        var front = FrontOf(model, run, options);
        var findings = new SpreadingFindings([run], sizes, front);
        var sizeVerdict = JudgeSize(sizes) with { Seconds = sw.Elapsed.TotalSeconds };
        var frontVerdict = JudgeFront(front, model);
        return (sizeVerdict, frontVerdict, findings);
    }

    /// <summary>
    /// Exact mean size and autocorrelation of <paramref name="probe"/> on the (small) model, by quantum
    /// typicality: n(t) = (3/4) sum_x (1 - Fbar_x(t)) (the OTOC-size identity of conventions.md).
    /// </summary>
    public static SizeFigures ExactSize(Model model, PauliString probe, double mazur, DiagnosisOptions o, CancellationToken ct)
        => ExactRun(model, probe, mazur, o, ct).Size;

    private static (SizeFigures Size, ProbeEvolution Run) ExactRun(Model model, PauliString probe, double mazur, DiagnosisOptions o, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(probe);
        ArgumentNullException.ThrowIfNull(o);
        double eps = OperatorAlgebra.MotionScale(model.Hamiltonian);
        bool driven = model.Drive is not null;
        int points = Math.Max(8, o.SizeTimePoints);
        double tMax = driven ? Math.Ceiling(o.EvolutionTime) : o.EvolutionTime / eps;
        var times = Enumerable.Range(0, points).Select(i => driven ? Math.Round(tMax * i / (points - 1)) : tMax * i / (points - 1)).Distinct().ToArray();
        var opt = new Exact.ExactOtocOptions
        {
            Operator = probe,
            Times = times,
            Sites = null,
            Method = driven ? (model.N <= 8 ? Exact.OtocMethod.Dense : Exact.OtocMethod.Typicality) : ChooseSizeMethod(model.Hamiltonian, times, o),
            Samples = 1,
            Seed = o.Seed,
            Threads = o.EffectiveThreads,
        };
        var res = driven ? Exact.ExactOtoc.Run(model.Drive!, model.N, opt, ct) : Exact.ExactOtoc.Run(model.Hamiltonian, opt, ct);
        var run = new ProbeEvolution
        {
            Probe = probe.ToString(),
            ProbeSite = probe.Support().FirstOrDefault(),
            Times = times.Select(t => driven ? t * model.Drive!.Period : t).ToArray(),
            MeanSize = res.MeanSize!.Values,
            Autocorrelation = res.Autocorrelation.Values,
            SiteWeights = res.Sites.Count == model.N ? Enumerable.Range(0, times.Length).Select(k => res.Sites.OrderBy(s => s.Site).Select(s => s.Weight.Values[k]).ToArray()).ToArray() : [],
            Discarded = new double[times.Length],
            MaxStrings = 0,
            Completed = true,
            Seconds = res.Cost.WallSeconds,
        };
        // Qubit size from the exact engine also for Majorana models: a random operator has 3N/4 in either reading.
        var f = SizeOf(model, run, mazur, qubitSize: true);
        return (f with { Engine = $"exact ({res.Method}), N = {model.N}", SizeTrusted = true }, run);
    }

    /// <summary>
    /// Dense traces or typicality for the exact size of an N-qubit Hamiltonian, whichever is estimated to
    /// be cheaper (<see cref="ExactCost"/>): dense traces cost the same at every time and for any number of
    /// terms, and are allowed up to <see cref="Exact.DenseSpectrum.DefaultMaxQubits"/> qubits; typicality
    /// costs one block per site, growing with the number of terms and the time. The SYK model's thousands
    /// of terms and long times make typicality the slow route there (557 s measured against about 90 s
    /// dense at N = 10).
    /// </summary>
    public static Exact.OtocMethod ChooseSizeMethod(Hamiltonian h, IReadOnlyList<double> times, DiagnosisOptions o)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(times);
        ArgumentNullException.ThrowIfNull(o);
        int n = h.N;
        if (n <= 8) return Exact.OtocMethod.Dense;
        if (n > Exact.DenseSpectrum.DefaultMaxQubits) return Exact.OtocMethod.Typicality;
        double typicalitySeconds = ExactCost.TypicalitySeconds(h, ExactCost.HalfWidth(h, o.EffectiveThreads), times, n);
        double denseSeconds = ExactCost.DenseSeconds(n, times.Count);
        var method = typicalitySeconds <= denseSeconds ? Exact.OtocMethod.Typicality : Exact.OtocMethod.Dense;
        o.Logger?.LogInformation("operator size at N = {N}: estimated {Typ:F0} s by typicality, {Dense:F0} s by dense traces; using {Method}", n, typicalitySeconds, denseSeconds, method);
        return method;
    }

    /// <summary>One evolution of <paramref name="probe"/> to the battery's final time (or the time limit).</summary>
    public static ProbeEvolution Evolve(Model model, PauliString probe, long maxStrings, double seconds, DiagnosisOptions o, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(probe);
        ArgumentNullException.ThrowIfNull(o);
        var sw = Stopwatch.StartNew();
        double eps = OperatorAlgebra.MotionScale(model.Hamiltonian);
        bool driven = model.Drive is not null;
        double time = driven ? Math.Ceiling(o.EvolutionTime) * model.Drive!.Period : o.EvolutionTime / eps;
        double dt = o.EvolutionStep / eps;
        long steps = driven ? (long)Math.Round(time / model.Drive!.Period) : (long)Math.Ceiling(time / dt - 1e-9);
        var problem = new EvolutionProblem
        {
            N = model.N,
            Name = model.Name,
            Hamiltonian = driven ? null : model.Hamiltonian,
            Drive = model.Drive is { } d
                ? new PeriodicDrive(d.Layers.Select(l => (IReadOnlyList<DriveRotation>)l.Select(r => new DriveRotation(r.Generator, r.Angle)).ToArray()).ToArray(), d.Period)
                : null,
            Initial = EvolutionProblem.Probe(probe),
            CountMajoranas = model.SizeMeasure == SizeMeasure.Majoranas,
        };
        var options = new EvolutionOptions
        {
            Method = IntegrationMethod.Trotter2,
            Dt = dt,
            Time = time,
            RecordEvery = (int)Math.Max(1, steps / 120),
            Threads = o.EffectiveThreads,
            LadderRungs = 1,
            Truncation = new TruncationPolicy { MaxStrings = maxStrings },
        };
        using var limit = new WorkBudget(seconds, o.EffectiveThreads, ct);
        var progress = o.Logger is null ? null : new ProgressLog(o.Logger, probe.ToString());
        var result = OperatorEvolution.Run(problem, options, geometry: null, logger: null, progress: progress, ct: limit.Token);
        ct.ThrowIfCancellationRequested();
        var s = result.Main;
        var recs = s.Records;
        bool maj = model.SizeMeasure == SizeMeasure.Majoranas;
        return new ProbeEvolution
        {
            Probe = probe.ToString(),
            ProbeSite = probe.Support().FirstOrDefault(),
            Times = recs.Select(r => r.Time).ToArray(),
            MeanSize = recs.Select(r => maj ? r.MeanMajoranaSize ?? double.NaN : r.MeanSize).ToArray(),
            Autocorrelation = recs.Select(r => r.Autocorrelation).ToArray(),
            SiteWeights = recs.Select(r => r.SiteWeights).ToArray(),
            Discarded = recs.Select(r => r.DiscardedTotal).ToArray(),
            MaxStrings = maxStrings,
            PeakStrings = s.PeakStrings,
            Completed = s.Completed,
            StopReason = limit.Spent ? limit.Describe(seconds, o.EffectiveThreads) : s.StopReason,
            Seconds = sw.Elapsed.TotalSeconds,
        };
    }

    /// <summary>Size and autocorrelation figures of one run.</summary>
    public static SizeFigures SizeOf(Model model, ProbeEvolution run, double mazur, bool qubitSize = false)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(run);
        bool maj = model.SizeMeasure == SizeMeasure.Majoranas && !qubitSize;
        int n = model.N;
        // Random-operator values (conventions.md): 3N/4 qubits (traceless: times 4^N/(4^N-1)); half of 2N Majoranas.
        double sat = maj ? n : 0.75 * n * (n < 30 ? Math.Pow(4, n) / (Math.Pow(4, n) - 1) : 1);
        var t = run.Times;
        var size = run.MeanSize;
        int k = t.Length;
        int lastFifth = Math.Max(0, k - Math.Max(1, k / 5));
        int lastQuarter = Math.Max(0, k - 1 - Math.Max(1, k / 4));
        double late = size.Skip(lastFifth).Average();
        double growth = (size[^1] - size[lastQuarter]) / sat;
        double half = double.NaN;
        for (int i = 0; i < k; i++)
        {
            if (size[i] >= sat / 2) { half = i == 0 ? t[0] : Interp(t[i - 1], t[i], size[i - 1], size[i], sat / 2); break; }
        }
        var excess = size.Select(v => (v - size[0]) / (sat - size[0])).ToArray();
        var early = ExponentialRegime.Fit(t, excess, 0.02, 0.3);
        bool truncated = run.Discarded.Length > 0 && run.Discarded[^1] > 1e-6;
        return new SizeFigures
        {
            Probe = run.Probe,
            N = n,
            Engine = string.Create(System.Globalization.CultureInfo.InvariantCulture, $"Pauli strings, N = {n}, top-M truncation (M = {run.MaxStrings})"),
            SizeTrusted = !truncated,
            Saturation = sat,
            Measure = maj ? "Majoranas" : "qubits",
            LateSize = late,
            LateGrowth = growth,
            HalfTime = half,
            EarlyGrowth = early,
            LateAutocorrelation = run.Autocorrelation.Skip(lastFifth).Average(),
            Mazur = mazur,
            Discarded = run.Discarded[^1],
            TimeReached = t[^1],
        };
    }

    private static double Interp(double t0, double t1, double y0, double y1, double y) => y1 == y0 ? t1 : t0 + (t1 - t0) * (y - y0) / (y1 - y0);

    /// <summary>Front of one run (null-free: "not applicable" on lattices whose largest distance from the probe is below 3).</summary>
    public static FrontFigures FrontOf(Model model, ProbeEvolution run, DiagnosisOptions o)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(run);
        ArgumentNullException.ThrowIfNull(o);
        double theta = DiagnosisThresholds.FrontFraction * 0.75;
        var dist = model.Lattice.DistancesFrom(run.ProbeSite);
        int rmax = dist.Max();
        double eps = OperatorAlgebra.MotionScale(model.Hamiltonian);
        var t = run.Times;
        var arrival = Enumerable.Repeat(double.NaN, rmax + 1).ToArray();
        int reached = 0;
        for (int r = 0; r <= rmax; r++)
        {
            var sites = Enumerable.Range(0, model.N).Where(j => dist[j] == r).ToArray();
            double prev = double.NaN;
            for (int i = 0; i < t.Length; i++)
            {
                double m = sites.Max(j => run.SiteWeights[i][j]);
                if (m >= theta)
                {
                    arrival[r] = i == 0 || double.IsNaN(prev) ? t[i] : Interp(t[i - 1], t[i], prev, m, theta);
                    reached = Math.Max(reached, r);
                    break;
                }
                prev = m;
            }
        }
        double tUnits = t[^1] * eps;
        FrontFigures F(string kind, LineFit? lin = null, LineFit? lg = null) => new()
        {
            Probe = run.Probe,
            Threshold = theta,
            MaxDistance = rmax,
            Reached = reached,
            ArrivalTimes = arrival,
            Linear = lin,
            Logarithmic = lg,
            Kind = kind,
            TimeReached = t[^1],
            TimeInLocalUnits = tUnits,
            Discarded = run.Discarded[^1],
        };
        if (rmax < 3) return F("not applicable");
        if (reached <= DiagnosisThresholds.StalledFrontDistance && run.Discarded[^1] <= DiagnosisThresholds.FrontMaxDiscarded) return F("none");
        // A front that has not crossed and made no progress during the second half of the run has stopped,
        // unless truncation removed much weight: a top-M budget also stops fronts (a budget effect).
        bool stalled = reached < rmax - 1 && arrival[reached] < 0.5 * t[^1];
        if (stalled && run.Discarded[^1] > DiagnosisThresholds.FrontMaxDiscarded) return F("undetermined");
        var rs = new List<double>();
        var ts = new List<double>();
        // Skip distance 1 (the onset) when enough later arrivals exist, as the v_B fit of conventions.md does.
        int first = Enumerable.Range(2, Math.Max(0, Math.Min(reached, rmax - 1) - 1)).Count(r => !double.IsNaN(arrival[r])) >= 4 ? 2 : 1;
        for (int r = first; r <= Math.Min(reached, rmax - 1); r++)
        {
            if (double.IsNaN(arrival[r]) || arrival[r] <= 0) continue;
            rs.Add(r);
            ts.Add(arrival[r]);
        }
        if (rs.Count < 3) return F(stalled ? "stalled" : "undetermined");
        var lin = LineFit.Of(ts, rs);
        var lg = LineFit.Of(ts.Select(x => Math.Log(x)).ToArray(), rs);
        bool significant = lin.Slope > DiagnosisThresholds.VelocitySigmas * lin.SlopeError;
        bool crossed = reached >= rmax - 1;
        if (stalled) return F("stalled", lin, lg);
        if (significant && (crossed || lin.Rss <= lg.Rss)) return F("ballistic", lin, lg);
        if (!crossed && lg.Rss < lin.Rss) return F("logarithmic", lin, lg);
        return F("undetermined", lin, lg);
    }

    /// <summary>
    /// Verdict of test 3 (pure). The size verdict uses the unbiased entries (exact or untruncated runs; the
    /// truncated full-size run only when there is no other); an autocorrelation plateau counts from any
    /// entry; conservation laws count only at the full size (at small N the Mazur bound 1/N of a total is large).
    /// </summary>
    public static TestVerdict JudgeSize(IReadOnlyList<SizeFigures> sizes)
    {
        ArgumentNullException.ThrowIfNull(sizes);
        var inv = System.Globalization.CultureInfo.InvariantCulture;
        var trusted = sizes.Where(s => s.SizeTrusted).ToList();
        var sizeBasis = trusted.Count > 0 ? trusted : sizes.ToList();
        int fullN = sizes.Max(s => s.N);
        var main = sizeBasis[0];
        string figure = string.Join("; ", sizes.Select(s => string.Create(inv,
            $"{s.Probe} (N = {s.N}{(s.SizeTrusted ? string.Empty : ", truncated")}): size {s.LateSize:0.0} = {s.Fraction:0.00} x {(s.Measure == "qubits" ? "3N/4" : "saturation")}, autocorrelation {s.LateAutocorrelation:0.000} (Mazur {s.Mazur:0.000})")));
        string threshold = string.Create(inv,
            $"saturated >= {DiagnosisThresholds.SaturatedFraction} x 3N/4, far below <= {DiagnosisThresholds.FarBelowFraction} x 3N/4 with growth stalled (< {DiagnosisThresholds.StalledGrowthFraction} over the last quarter); late-time autocorrelation within {DiagnosisThresholds.DecayTolerance} of the Mazur bound (decayed) or above it by >= {DiagnosisThresholds.PlateauExcess} (plateau)");
        const string source = "random-operator size 3N/4 (conventions.md); Mazur, Physica 43, 533 (1969); fractions: common practice";
        var notes = new List<string>();
        foreach (var s in sizes)
        {
            notes.Add(string.Create(inv, $"{s.Probe}, N = {s.N}: {s.Engine}, run to t = {s.TimeReached:0.##}{(double.IsFinite(s.HalfTime) ? $", t* (half of saturation) = {s.HalfTime:0.##}" : string.Empty)}"));
            if (!s.SizeTrusted) notes.Add(string.Create(inv, $"{s.Probe}, N = {s.N}: truncation discarded {s.Discarded:0.###} of the weight; its late-time size is biased low and is not used for the size verdict{(trusted.Count == 0 ? " (used anyway: no exact run)" : string.Empty)}"));
            if (s.EarlyGrowth.IsExponential) notes.Add(string.Create(inv, $"{s.Probe}, N = {s.N}: size grows exponentially at early times, rate {s.EarlyGrowth.Rate:0.###} +- {s.EarlyGrowth.RateError:0.###} (t = {s.EarlyGrowth.WindowStart:0.##}..{s.EarlyGrowth.WindowEnd:0.##})"));
        }
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => TestVerdict.Of(3, SizeName, figure, threshold, source, notes, o, reason, ev);
        var plateau = sizes.Where(s => s.LateAutocorrelation - s.Mazur >= DiagnosisThresholds.PlateauExcess).MaxBy(s => s.LateAutocorrelation - s.Mazur);
        if (plateau is not null)
        {
            return V(TestOutcome.Fails, string.Create(inv,
                $"the autocorrelation of {plateau.Probe} (N = {plateau.N}) stays at {plateau.LateAutocorrelation:0.00}, {plateau.LateAutocorrelation - plateau.Mazur:0.00} above what conservation laws explain (Mazur {plateau.Mazur:0.000}): the operator keeps a memory of its start"),
                Mechanism.Frozen, Mechanism.Localized);
        }
        var conserved = sizes.FirstOrDefault(s => s.N == fullN && s.Mazur >= DiagnosisThresholds.MazurSignificant);
        var below = sizeBasis.Where(s => s.Fraction <= DiagnosisThresholds.FarBelowFraction && Math.Abs(s.LateGrowth) < DiagnosisThresholds.StalledGrowthFraction).MinBy(s => s.Fraction);
        if (below is not null)
        {
            return V(TestOutcome.Fails, string.Create(inv,
                $"the size of {below.Probe} (N = {below.N}) plateaus at {below.LateSize:0.0} = {below.Fraction:0.00} x 3N/4, far below a random operator, while its autocorrelation decays: the operator spreads into a restricted space"),
                Mechanism.FreeFermions, Mechanism.InteractingIntegrable, Mechanism.Localized);
        }
        if (conserved is not null)
        {
            return V(TestOutcome.Fails, string.Create(inv,
                $"the autocorrelation of {conserved.Probe} stops at {conserved.LateAutocorrelation:0.00}, held up by the Mazur bound {conserved.Mazur:0.00} of its conserved part"), Mechanism.ConservationLaws);
        }
        bool decays = sizes.All(s => s.LateAutocorrelation - s.Mazur <= DiagnosisThresholds.DecayTolerance);
        bool saturated = sizeBasis.All(s => s.Fraction >= DiagnosisThresholds.SaturatedFraction);
        if (saturated && decays)
        {
            return V(TestOutcome.Scrambles, string.Create(inv,
                $"the size of every probe saturates (at least {sizeBasis.Min(s => s.Fraction):0.00} x 3N/4, N = {main.N}) and the autocorrelations decay to the Mazur bound: operators fill the system like random operators"), Mechanism.Scrambles);
        }
        if (saturated)
        {
            return V(TestOutcome.Inconclusive, string.Create(inv,
                $"the size saturates (at least {sizeBasis.Min(s => s.Fraction):0.00} x 3N/4) but an autocorrelation decays only slowly toward the Mazur bound"));
        }
        var low = sizeBasis.MinBy(s => s.Fraction)!;
        return V(TestOutcome.Inconclusive, string.Create(inv,
            $"the size of {low.Probe} (N = {low.N}) reaches {low.Fraction:0.00} x 3N/4{(low.LateGrowth >= DiagnosisThresholds.StalledGrowthFraction ? " and is still growing at the end of the run" : ", between saturation and a clear plateau")}"));
    }

    /// <summary>Verdict of test 4 from the front figures (pure).</summary>
    public static TestVerdict JudgeFront(FrontFigures? f, Model model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var inv = System.Globalization.CultureInfo.InvariantCulture;
        if (f is null || f.Kind == "not applicable")
        {
            return TestVerdict.NotRun(4, FrontName, $"no front to follow: with {model.Lattice.Kind} couplings every site is within distance {(f?.MaxDistance ?? model.Lattice.Diameter)} of the probe") with
            {
                Figure = "not applicable",
            };
        }
        string v = f.Linear is { } l && double.IsFinite(l.Slope) ? string.Create(inv, $"v_B = {l.Slope:0.###} +- {l.SlopeError:0.###} sites per unit time") : "no v_B";
        string figure = string.Create(inv, $"front reached distance {f.Reached} of {f.MaxDistance} by t = {f.TimeReached:0.#} ({f.TimeInLocalUnits:0} / motion scale); {v}{(f.Logarithmic is { } g && double.IsFinite(g.Slope) ? $"; log fit r = {g.Intercept:0.##} + {g.Slope:0.##} ln t (rss {g.Rss:G2} vs linear {f.Linear!.Rss:G2})" : string.Empty)}");
        string threshold = string.Create(inv,
            $"front at rho_j >= {f.Threshold:0.###} ({DiagnosisThresholds.FrontFraction} x 3/4); ballistic when v_B > {DiagnosisThresholds.VelocitySigmas:0} standard errors and r = v t + c fits at least as well as r = a + b ln t (or the front crossed the system); stalled when it has not crossed and did not advance in the second half of the run; no front when it never passes distance {DiagnosisThresholds.StalledFrontDistance}; a logarithmic, stalled or absent front counts only with discarded weight <= {DiagnosisThresholds.FrontMaxDiscarded}");
        const string source = "conventions.md (front and v_B fit); v_B = 0 for the disordered XX chain (check-values.md); thresholds: common practice";
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => TestVerdict.Of(4, FrontName, figure, threshold, source, null, o, reason, ev);
        // A top-M string budget also stops fronts: a localization reading (logarithmic, stalled or no front)
        // counts only when truncation kept the weight, as for the other branches.
        if (f.Kind is "logarithmic" or "stalled" or "none" && f.Discarded > DiagnosisThresholds.FrontMaxDiscarded)
        {
            string shape = f.Kind switch
            {
                "logarithmic" => "creeps like a + b ln t",
                "stalled" => "stops",
                _ => "does not leave the probe",
            };
            return V(TestOutcome.Inconclusive, string.Create(inv,
                $"the front {shape} (distance {f.Reached} of {f.MaxDistance}), but truncation discarded {f.Discarded:0.###} of the weight (more than {DiagnosisThresholds.FrontMaxDiscarded}): a string-budget effect cannot be told from localization (raise --effort)"));
        }
        return f.Kind switch
        {
            "ballistic" => V(TestOutcome.Scrambles, string.Create(inv, $"the front moves ballistically ({v}) and crosses {f.Reached} of {f.MaxDistance} sites: no localization"),
                Mechanism.Scrambles, Mechanism.FreeFermions, Mechanism.InteractingIntegrable),
            "logarithmic" => V(TestOutcome.Fails, "the front creeps like a + b ln t: a logarithmic light cone, the mark of many-body localization", Mechanism.Localized),
            "none" => V(TestOutcome.Fails, string.Create(inv, $"the front never passes distance {f.Reached} in {f.TimeInLocalUnits:0} local time units: v_B = 0, the operator is localized"), Mechanism.Localized, Mechanism.Frozen),
            "stalled" => V(TestOutcome.Fails, string.Create(inv, $"the front stops at distance {f.Reached} of {f.MaxDistance}: it made no progress in the second half of the run (t = {f.ArrivalTimes[f.Reached]:0.#} to {f.TimeReached:0.#}), so v_B = 0 at long times: localization"), Mechanism.Localized),
            _ => V(TestOutcome.Inconclusive, f.Reached < f.MaxDistance - 1 && f.Discarded > DiagnosisThresholds.FrontMaxDiscarded
                ? string.Create(inv, $"the front stops at distance {f.Reached}, but truncation discarded {f.Discarded:0.##} of the weight there: a string-budget effect cannot be told from localization (raise --effort)")
                : "the front neither moves at a clear constant speed nor follows a logarithm over the run"),
        };
    }

    private sealed class ProgressLog(ILogger log, string probe) : IProgress<EvolutionProgress>
    {
        private DateTime _last = DateTime.UtcNow;

        public void Report(EvolutionProgress p)
        {
            var now = DateTime.UtcNow;
            if ((now - _last).TotalSeconds < 15) return;
            _last = now;
            log.LogInformation("operator size: {Probe} step {Step}/{Total}, t = {Time:0.##}, {Strings} strings, discarded {Disc:G3}", probe, p.Step, p.TotalSteps, p.Time, p.Strings, p.DiscardedTotal);
        }
    }
}
