using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Diagnosis;
using OpGrowth.Evolution;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Sweeps;

namespace OpGrowth.Pipeline;

/// <summary>The front the run measured for the t* statement (chains: the matrix-product front engine).</summary>
public sealed record FrontStage(FrontEvolutionResult Result, double[] BondDimensions);

/// <summary>
/// The run's scrambling-time statement at the model's own N, by the best route available within the effort:
/// <list type="number">
/// <item>measured with the exact engine (<see cref="ScramblingTimeSearch"/>) when its estimated cost fits the
/// effort's budget, or always with --exact-tstar or the thorough effort (the estimate is logged first);</item>
/// <item>measured from the Pauli evolution when its t* is converged across the budget series;</item>
/// <item>predicted from exact t* at smaller members of the family: short-range models through the front (matrix-product
/// front engine on chains, the Pauli evolution's front on other lattices), all-to-all models through the two scaling
/// laws (<see cref="ScramblingTimePrediction"/>);</item>
/// <item>a lower bound from the converged part of the evolution.</item>
/// </list>
/// </summary>
public static class ScramblingTimeStage
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Exact-engine seconds a run spends on t* without being asked (quick, standard).</summary>
    public static double ExactBudgetSeconds(RunEffort e) => e switch
    {
        RunEffort.Quick => 5,
        RunEffort.Standard => 15,
        _ => double.PositiveInfinity,
    };

    /// <summary>
    /// Member sizes for the predicted route: even N below the model's N, from 8 (all-to-all) or 10 (short-range: the
    /// front route extrapolates the offset from the largest three, and on the tilted-field chain the offset behind the
    /// half-volume front changes regime between N = 14 and 16, so 16 is the smallest useful top) up to the effort's largest.
    /// </summary>
    public static int[] MemberSizes(RunEffort e, int n, bool allToAll)
    {
        int top = e switch
        {
            RunEffort.Quick => 12,
            RunEffort.Thorough => 18,
            _ => allToAll ? 14 : 16,
        };
        int bottom = allToAll ? 8 : 10;
        return Enumerable.Range(bottom / 2, 20).Select(k => 2 * k).Where(k => k <= top && k < n).ToArray();
    }

    /// <summary>Disorder seeds averaged per member size (disordered models).</summary>
    public static int MemberSeeds(RunEffort e) => e switch { RunEffort.Quick => 2, RunEffort.Thorough => 10, _ => 4 };

    /// <summary>
    /// Random states per member for clean models: two up to N = 12 (so that the error is measured, not assumed), one
    /// above (site blocks and one group per site leave a per-state error of about 0.5% of t* at N = 14 and below
    /// 0.1% at N = 16, measured on the tilted-field chain and the Heisenberg cluster).
    /// </summary>
    public static int MemberSamples(int n) => n <= 12 ? 2 : 1;

    /// <summary>Bond dimensions of the front engine's budget series.</summary>
    public static int[] FrontBonds(RunEffort e) => e switch { RunEffort.Quick => [4, 8, 16], RunEffort.Thorough => [16, 32, 64], _ => [8, 16, 32] };

    /// <summary>Builds the statement. <paramref name="front"/> receives the front engine's result when it ran.</summary>
    public static ScramblingTimeStatement Run(string path, Model model, ScramblingRunOptions options, EffortPreset preset, EvolutionResult? evo,
        ILogger? log, CancellationToken ct, out FrontStage? front)
    {
        front = null;
        int n = model.N;
        var probe = ProbeChoice.Resolve(model, options.Probe);
        bool majorana = model.SizeMeasure == SizeMeasure.Majoranas;
        bool hamiltonian = model.Drive is null;
        var also = new List<string>();
        var bound = Bound(evo, majorana);
        if (bound is not null) also.Add(bound.Text());
        double maxTime = Math.Max(4 * preset.Time, 40);

        // Converged Pauli budget series: a measurement (kept unless the exact engine measures t* itself).
        ScramblingTimeStatement? pauli = null;
        if (evo is not null && evo.Figures.Count > 0)
        {
            var fig = evo.Figures[0];
            var ts = majorana ? fig.MajoranaScramblingTime ?? fig.ScramblingTime : fig.ScramblingTime;
            var conv = evo.Convergence.FirstOrDefault(c => c.Figure == (majorana && fig.MajoranaScramblingTime is not null ? "majoranaScramblingTime" : "scramblingTime"));
            if (ts.Value is double tv && conv is { Converged: true })
            {
                double u = Math.Sqrt(Math.Pow(ts.GridUncertainty ?? 0, 2) + Math.Pow(conv.Movement ?? 0, 2));
                pauli = ScramblingTimeStatement.Banded("measured", n, tv, u, "Pauli engine, converged budget series",
                    FormattableString.Invariant($"{ts.Definition}; moved {conv.Movement:0.####} ({conv.RelativeMovement:P1}) between the two largest string budgets (tolerance 5%)"));
            }
        }

        // Exact engine at the model's N: cost first.
        bool forced = options.ExactScramblingTime || options.Effort == RunEffort.Thorough;
        ScramblingTimeEstimate? est = null;
        var (blocks, groups) = ScramblingTimeSearch.DefaultEstimator(n, model.Lattice.Diameter, majorana);
        int samples = MemberSamples(n);
        int vectors = ScramblingTimeSearch.VectorsPerState(n, blocks, groups);
        Model? small = null, timing = null;
        if (hamiltonian && n <= 26)
        {
            small = n > 12 && model.Parameters.ContainsKey("N") ? FamilyMembers.FromFile(path, options.Overrides, model)(12, 0) : null;
            timing = n > ScramblingTimeCost.TimedLimit && model.Parameters.ContainsKey("N") ? FamilyMembers.FromFile(path, options.Overrides, model)(ScramblingTimeCost.TimedLimit, 0) : null;
            double guess = pauli?.Value ?? GuessTStar(evo, majorana) ?? preset.Time;
            est = ScramblingTimeCost.Estimate(model.Hamiltonian, small?.N < n ? small.Hamiltonian : null, guess, samples, vectors, options.Threads, siteBlocks: blocks, timing: timing?.N < n ? timing.Hamiltonian : null);
        }
        bool cheap = est is not null && est.Seconds <= (options.ExactScramblingTimeBudget ?? ExactBudgetSeconds(options.Effort));

        // Predicted from smaller members (also the t* the exact engine's estimate and search start from).
        ScramblingTimeStatement? predicted = null;
        if (hamiltonian && !cheap && pauli is null && model.Parameters.ContainsKey("N"))
        {
            try
            {
                predicted = Predict(path, model, probe, options, evo, maxTime, log, ct, out front);
            }
            catch (Exception ex) when (ex is ArgumentException or InvalidOperationException or IO.InputException)
            {
                also.Add("prediction from smaller members failed: " + ex.Message);
            }
        }

        if (est is not null && (forced || cheap))
        {
            if (predicted?.Value is double pv) est = ScramblingTimeCost.Estimate(model.Hamiltonian, small?.N < n ? small.Hamiltonian : null, pv, samples, vectors, options.Threads, siteBlocks: blocks, timing: timing?.N < n ? timing.Hamiltonian : null);
            long avail = options.MemoryBytes ?? (long)(0.8 * GC.GetGCMemoryInfo().TotalAvailableMemoryBytes);
            string cost = FormattableString.Invariant($"exact t* at N = {n}: estimated {Duration(est.Seconds)} and {est.Bytes / 1073741824.0:0.##} GiB on {options.Threads} thread(s) ({est.Basis}; t* assumed {est.TStar:0.##})");
            if (est.Bytes > avail)
            {
                also.Add(cost + ": does not fit the memory budget, not run");
            }
            else
            {
                log?.LogInformation("{Cost}; running", cost);
                options.Progress?.Report(new RunProgress("t* (exact)", 0, cost));
                var r = ScramblingTimeSearch.Run(model.Hamiltonian, new ScramblingTimeSearchOptions
                {
                    Operator = probe,
                    MajoranaSize = majorana,
                    Guess = predicted?.Value ?? pauli?.Value ?? GuessTStar(evo, majorana),
                    MaxTime = maxTime,
                    Samples = samples,
                    SiteBlocks = blocks,
                    ProbeGroups = groups,
                    Threads = options.Threads,
                    MemoryBytes = options.MemoryBytes,
                    Logger = log,
                }, ct);
                string spent = FormattableString.Invariant($"{cost}; took {Duration(r.WallSeconds)}, {r.Evaluations.Count - 1} evaluations, {r.MatrixVectorProducts} applications of H");
                if (predicted is not null) also.Add("prediction without the exact engine: " + predicted.Text());
                if (pauli is not null) also.Add("Pauli engine: " + pauli.Text());
                if (r.TStar is double ts)
                {
                    double sampling = double.IsFinite(r.SamplingError) ? r.SamplingError : 0;
                    double u = Math.Sqrt(sampling * sampling + r.LocationError * r.LocationError);
                    return ScramblingTimeStatement.Banded("measured", n, ts, u, $"exact engine, mean size from {r.Estimator}, {r.Samples} random state(s)",
                        FormattableString.Invariant($"n(t) = {r.Target:0.###} located from {r.Evaluations.Count - 1} evaluations (interpolation error {r.LocationError:0.####}, sampling error {sampling:0.####}: {r.SamplingErrorKind})"))
                        with { Members = predicted?.Members ?? [], Also = also, Cost = spent };
                }
                string why = FormattableString.Invariant($"exact engine: the mean size stays below {r.Target:0.###} up to t = {r.LowerBound:0.##}");
                return new ScramblingTimeStatement
                {
                    Route = "bound",
                    N = n,
                    Low = r.LowerBound,
                    Method = why,
                    Basis = why,
                    Also = also,
                    Cost = spent,
                };
            }
        }
        else if (est is not null)
        {
            also.Add(FormattableString.Invariant($"exact t* at N = {n} would take about {Duration(est.Seconds)} and {est.Bytes / 1073741824.0:0.##} GiB ({est.Basis}): not run at this effort; use --exact-tstar or --effort thorough"));
        }
        if (pauli is not null) return pauli with { Also = also };
        if (predicted is not null) return predicted with { Also = also.Concat(predicted.Also).ToList() };
        if (bound is not null) return bound with { Also = also.Skip(1).ToList() };
        return new ScramblingTimeStatement
        {
            Route = "bound",
            N = n,
            Method = "no route available",
            Basis = also.Count > 0 ? string.Join("; ", also) : "no evolution data, no family of smaller members, no exact engine for this model",
            Also = also,
        };
    }

    // The predicted route.
    private static ScramblingTimeStatement? Predict(string path, Model model, PauliString probe, ScramblingRunOptions options, EvolutionResult? evo,
        double maxTime, ILogger? log, CancellationToken ct, out FrontStage? front)
    {
        front = null;
        int n = model.N;
        bool allToAll = model.Lattice.Diameter <= 2;
        bool majorana = model.SizeMeasure == SizeMeasure.Majoranas;
        var family = FamilyMembers.FromFile(path, options.Overrides, model);
        var sizes = MemberSizes(options.Effort, n, allToAll);
        int seeds = model.IsDisordered ? MemberSeeds(options.Effort) : 1;
        var members = MeasureMembers(family, sizes, seeds, majorana, allToAll, maxTime, options.Threads, log, ct, options.Probe);
        if (members.Count < (allToAll ? 3 : 2)) return null;
        if (allToAll) return ScramblingTimePrediction.FromScaling(n, members);

        // Short-range: the front on the model's own lattice.
        var geometry = ScramblingRun.GeometryOf(model);
        var sites = probe.Support();
        double target = ScramblingTimePrediction.HalfDistance(ScramblingAnalysis.DistancesFromProbe(geometry, sites));
        double[] arrival, unc;
        int converged;
        double vB, vBErr;
        string source;
        double vGuess = evo?.Figures.Count > 0 && evo.Figures[0].Butterfly?.Primary.Velocity is double v0 && v0 > 0 ? v0 : 1.0;
        if (FrontEvolution.Supports(model.Hamiltonian, out _))
        {
            var bonds = FrontBonds(options.Effort);
            double time = Math.Min(maxTime, Math.Ceiling((target + 2) / vGuess * 1.25 + 1));
            var fr = FrontEvolution.Run(model.Hamiltonian, probe, new FrontEvolutionOptions
            {
                Time = time,
                Dt = Math.Min(0.1, options.Effort == RunEffort.Thorough ? 0.05 : 0.1),
                BondDimensions = bonds,
                Threads = options.Threads,
                Logger = log,
            }, ct);
            front = new FrontStage(fr, bonds.Select(b => (double)b).ToArray());
            arrival = fr.Arrival;
            unc = fr.ArrivalUncertainty;
            converged = fr.ConvergedDistance;
            var bf = fr.Runs[^1].Figures.Butterfly?.Primary;
            vB = bf?.Velocity ?? vGuess;
            var vc = fr.Convergence.FirstOrDefault(c => c.Figure == "butterflyVelocity");
            vBErr = Math.Sqrt(Math.Pow(bf?.VelocityError ?? 0, 2) + Math.Pow(vc?.Movement ?? 0, 2));
            source = $"matrix-product front engine, bond dimensions {string.Join("/", bonds)}, agreeing to distance {converged}";
        }
        else if (evo is not null && evo.Figures.Count > 0 && evo.Figures[0].Butterfly?.Primary is { } bp)
        {
            arrival = bp.ArrivalTimes;
            var recs = evo.Main.Records;
            double spacing = recs.Count > 1 ? recs[1].Time - recs[0].Time : 0.1;
            var next = evo.Figures.Count > 1 ? evo.Figures[1].Butterfly?.Primary.ArrivalTimes : null;
            unc = arrival.Select((a, d) => next is not null && d < next.Length ? Math.Abs(a - next[d]) : double.NaN).ToArray();
            converged = 0;
            for (int d = 1; d < arrival.Length; d++)
            {
                if (double.IsNaN(arrival[d]) || double.IsNaN(unc[d]) || unc[d] > Math.Max(0.02 * arrival[d], 1.5 * spacing)) break;
                converged = d;
            }
            vB = bp.Velocity ?? vGuess;
            var vc = evo.Convergence.FirstOrDefault(c => c.Figure == "butterflyVelocity");
            vBErr = Math.Sqrt(Math.Pow(bp.VelocityError ?? 0, 2) + Math.Pow(vc?.Movement ?? 0, 2));
            source = $"Pauli evolution's front, string budgets agreeing to distance {converged}";
        }
        else
        {
            return null;
        }
        var at = ScramblingTimePrediction.ArrivalAt(target, arrival, unc, converged, vB, vBErr);
        var withFront = members.Select(m => m.HalfDistance is double hd
            ? m with { FrontArrival = ScramblingTimePrediction.ArrivalAt(hd, arrival, unc, converged, vB, vBErr).Time }
            : m).ToList();
        return ScramblingTimePrediction.FromFront(n, target, at, withFront, vB, source);
    }

    /// <summary>
    /// Exact t* at smaller members of a family (<paramref name="family"/>(n, realisation)), averaged over
    /// <paramref name="seeds"/> realisations each; sizes whose members fail to load or do not reach t* are left out.
    /// Errors: bootstrap over seeds plus the members' own location and sampling errors.
    /// </summary>
    public static List<ScramblingTimeMember> MeasureMembers(SmallerMember family, IReadOnlyList<int> sizes, int seeds, bool majorana, bool allToAll, double maxTime,
        int threads, ILogger? log, CancellationToken ct, string? probeText = null)
    {
        ArgumentNullException.ThrowIfNull(family);
        ArgumentNullException.ThrowIfNull(sizes);
        var members = new List<ScramblingTimeMember>();
        foreach (int size in sizes)
        {
            ct.ThrowIfCancellationRequested();
            var values = new List<double>();
            var errors = new List<double>();
            double? half = null;
            for (int r = 0; r < seeds; r++)
            {
                var m = family(size, r);
                if (m is null || m.N != size || m.Drive is not null) break;
                // the probe the run evolves, placed on the member (its first probe when it does not exist there)
                PauliString p;
                try { p = ProbeChoice.Resolve(m, probeText); }
                catch (OpGrowth.IO.InputException) { p = m.Probes[0]; }
                int samples = seeds > 1 ? 1 : MemberSamples(size);
                var (mb, mg) = ScramblingTimeSearch.DefaultEstimator(size, m.Lattice.Diameter, majorana);
                var res = ScramblingTimeSearch.Run(m.Hamiltonian, new ScramblingTimeSearchOptions
                {
                    Operator = p,
                    MajoranaSize = majorana,
                    MaxTime = maxTime,
                    Samples = samples,
                    Seed = 1 + r,
                    SiteBlocks = mb,
                    ProbeGroups = mg,
                    Threads = threads,
                }, ct);
                if (res.TStar is not double ts) break;
                values.Add(ts);
                double se = double.IsFinite(res.SamplingError) ? res.SamplingError : 0;
                errors.Add(Math.Sqrt(se * se + res.LocationError * res.LocationError));
                half ??= allToAll ? null : ScramblingTimePrediction.HalfDistance(ScramblingAnalysis.DistancesFromProbe(ScramblingRun.GeometryOf(m), p.Support()));
            }
            if (values.Count == 0 || values.Count < seeds) continue;
            double mean = values.Average();
            double inner = Math.Sqrt(errors.Average(e => e * e) / values.Count);
            double? spread = values.Count > 1 ? Math.Sqrt(values.Sum(v => (v - mean) * (v - mean)) / (values.Count - 1)) : null;
            double err = values.Count > 1 ? Math.Sqrt(Math.Pow(Bootstrap.StandardError(values) ?? 0, 2) + inner * inner) : inner;
            members.Add(new ScramblingTimeMember(size, mean, Math.Max(err, 1e-6 * mean), spread, values.Count, half));
            log?.LogInformation("t* member N = {N}: {T:0.####} +- {E:0.####} ({S} seed(s))", size, mean, err, values.Count);
        }
        return members;
    }

    /// <summary>
    /// Lower bound from the evolution: the last recorded time up to which the budget series' mean sizes agree within the
    /// convergence tolerance, if the size there is still below half its saturation value.
    /// </summary>
    public static ScramblingTimeStatement? Bound(EvolutionResult? evo, bool majorana)
    {
        if (evo is null || evo.Runs.Count == 0 || evo.Main.Records.Count < 2) return null;
        var main = evo.Main.Records;
        double target = majorana && main[0].MeanMajoranaSize is not null ? evo.N / 2.0 : 3.0 * evo.N / 8;
        double Size(EvolutionRecord r) => majorana && r.MeanMajoranaSize is double m ? m : r.MeanSize;
        int agree = BudgetPartIndex(evo, Size);
        int last = -1;
        for (int i = 0; i < agree && Size(main[i]) < target; i++) last = i;
        if (last <= 0) return null;
        double t = main[last].Time;
        string why = evo.Runs.Count < 2
            ? FormattableString.Invariant($"the mean size is {Size(main[last]):0.##} < {target:0.##} at t = {t:0.##} (no budget series: not checked for convergence)")
            : FormattableString.Invariant($"the converged mean size (string budgets agreeing within 5%) is still {Size(main[last]):0.##} < {target:0.##} at t = {t:0.##}");
        return new ScramblingTimeStatement
        {
            Route = "bound",
            N = evo.N,
            Low = t,
            Method = why,
            Basis = why,
        };
    }

    // Index of the first record where the two largest budgets' sizes differ by more than 5% (the record count when
    // they agree throughout or there is one budget).
    private static int BudgetPartIndex(EvolutionResult evo, Func<EvolutionRecord, double> size)
    {
        var a = evo.Runs[0].Records;
        if (evo.Runs.Count < 2) return a.Count;
        var b = evo.Runs[1].Records;
        int n = Math.Min(a.Count, b.Count);
        for (int i = 0; i < n; i++)
        {
            if (Math.Abs(size(a[i]) - size(b[i])) > 0.05 * Math.Abs(size(a[i]))) return i;
        }
        return n;
    }

    /// <summary>
    /// First recorded time at which the mean sizes of the two largest budgets differ by more than 5% (the budget series'
    /// convergence tolerance); null when they agree throughout or there is no second budget.
    /// </summary>
    public static double? BudgetPartTime(EvolutionResult evo)
    {
        ArgumentNullException.ThrowIfNull(evo);
        if (evo.Runs.Count < 2) return null;
        int i = BudgetPartIndex(evo, r => r.MeanSize);
        return i < Math.Min(evo.Runs[0].Records.Count, evo.Runs[1].Records.Count) ? evo.Runs[0].Records[i].Time : null;
    }

    private static double? GuessTStar(EvolutionResult? evo, bool majorana)
    {
        if (evo is null || evo.Figures.Count == 0) return null;
        var f = evo.Figures[0];
        return (majorana ? f.MajoranaScramblingTime?.Value : null) ?? f.ScramblingTime.Value;
    }

    private static string Duration(double s) => s < 120 ? $"{s.ToString("0", Inv)} s" : s < 7200 ? $"{(s / 60).ToString("0", Inv)} min" : $"{(s / 3600).ToString("0.#", Inv)} h";
}
