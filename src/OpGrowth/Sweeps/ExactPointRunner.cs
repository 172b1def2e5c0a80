#if OPGROWTH_EXACT && OPGROWTH_EVOLUTION
using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Exact;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Sweeps;

/// <summary>
/// Runs a point on the exact state-vector engine. Mode "tstar" (default): <see cref="ScramblingTimeSearch"/> locates
/// t* with the random-sign mean-size probe at times refined around 3N/8 (or half the Majorana count), t* only.
/// Mode "sites" (<see cref="ExactOtoc"/>): site-resolved OTOCs of the probe against X_j, Y_j, Z_j on every site give
/// the site weights rho_j(t) = (3/4)(1 - Fbar_j(t)) and the mean size n(t) = sum_j rho_j(t); t*, the growth rate
/// and v_B then come from the same analysis as the Pauli engine's (<see cref="ScramblingAnalysis"/>). Nothing is
/// truncated (truncation error 0); random-state traces carry a statistical error, propagated to t* as
/// sigma_n(t*) / |dn/dt|.
/// </summary>
public sealed class ExactPointRunner : IPointRunner
{
    private readonly int _threads;
    private readonly ILogger? _logger;

    public ExactPointRunner(int threads, ILogger? logger = null)
    {
        _threads = Math.Max(1, threads);
        _logger = logger;
    }

    /// <summary>
    /// Mode "tstar": the search's vectors ((probe groups + 1) x samples forward pairs and work vectors). Mode "sites":
    /// dense matrices up to N = 8 (a few 2^N x 2^N complex matrices), else about 24 state vectors per thread.
    /// </summary>
    public long EstimateMemoryBytes(SweepPoint point)
    {
        long dim = 1L << point.N;
        if (point.Engine.ExactMode == "tstar")
        {
            var (blocks, perState) = VectorsOf(point);
            bool split = _threads >= 2 && dim >= 1 << 15;
            return (128L << 20) + ScramblingTimeSearch.PlannedVectorBytes(point.N, blocks, perState, point.Engine.Samples, _threads) + (split ? 3 : 1) * dim * 8;
        }
        long vectors = point.N <= 8 ? 8 * dim * dim * 16 : 24L * _threads * dim * 16;
        return (128L << 20) + vectors;
    }

    /// <summary>
    /// Mode "tstar": <see cref="ScramblingTimeCost"/> (H timed at N itself up to 22 qubits, spectral width from the
    /// member at min(N, 12)) and a t* extrapolated from quick searches at N = 10 and 12 (at most linear growth),
    /// capped by the point's final time. Null for the "sites" mode (not modelled).
    /// </summary>
    public double? EstimateSeconds(SweepPoint point)
    {
        if (point.Engine.ExactMode != "tstar") return null;
        return Estimate(point).Seconds;
    }

    private readonly System.Collections.Concurrent.ConcurrentDictionary<string, ScramblingTimeEstimate> _estimates = new();

    /// <summary>The full estimate of a "tstar" point (see <see cref="EstimateSeconds"/>); points that differ only in the seed share one.</summary>
    public ScramblingTimeEstimate Estimate(SweepPoint point)
    {
        ArgumentNullException.ThrowIfNull(point);
        string key = point.ModelSha256 + "|" + point.GroupKey + "|" + point.N.ToString(System.Globalization.CultureInfo.InvariantCulture);
        return _estimates.GetOrAdd(key, _ => EstimateCore(point));
    }

    private ScramblingTimeEstimate EstimateCore(SweepPoint point)
    {
        var e = point.Engine;
        var pm = PointModel.Load(point);
        int ns = Math.Min(point.N, 12);
        double? Pilot(int np)
        {
            var pilot = np == point.N ? pm : PointModel.Load(Resized(point, np));
            return ScramblingTimeSearch.Run(pilot.Model.Hamiltonian, new ScramblingTimeSearchOptions
            {
                Operator = pilot.Probe,
                MajoranaSize = pilot.Model.SizeMeasure == SizeMeasure.Majoranas,
                MaxTime = e.Time,
                Samples = 1,
                ProbeGroups = 1,
                Threads = _threads,
                RelativeTolerance = 0.02,
            }).TStar;
        }
        // t*: above N = 12 the quick searches at N = 10 and 12 are extrapolated with their slope, kept between no
        // growth and linear growth from N = 12 (linear scaling alone overestimated the all-to-all cluster's t* at
        // N = 22 by 1.8x); at N <= 12 the search at min(N, 10) scaled linearly.
        double ts;
        if (point.N > 12 && Pilot(10) is double t10 && Pilot(12) is double t12)
            ts = Math.Clamp(t12 + (point.N - 12) * (t12 - t10) / 2, t12, t12 * point.N / 12.0);
        else
            ts = Pilot(Math.Min(point.N, 10)) is double t0 ? t0 * point.N / Math.Min(point.N, 10) : e.Time;
        ts = Math.Min(e.Time, ts);
        var small = ns == point.N ? null : PointModel.Load(Resized(point, ns)).Model.Hamiltonian;
        var timing = point.N <= ScramblingTimeCost.TimedLimit ? null : PointModel.Load(Resized(point, ScramblingTimeCost.TimedLimit)).Model.Hamiltonian;
        var (blocks, groups) = Estimator(e, pm.Model);
        return ScramblingTimeCost.Estimate(pm.Model.Hamiltonian, small, ts, e.Samples, ScramblingTimeSearch.VectorsPerState(point.N, blocks, groups), _threads, siteBlocks: blocks, timing: timing);
    }

    private static SweepPoint Resized(SweepPoint point, int n)
    {
        string probe = point.Probe;
        if (!ProbeTemplate.IsModelProbe(point.ProbeTemplate, out _) && ProbeTemplate.TryResolve(point.ProbeTemplate, n, out var resolved, out _)) probe = resolved;
        return point with { N = n, Probe = probe };
    }

    // Estimator kind and vectors per random state of a "tstar" point (site blocks, 2N when the model cannot be loaded here).
    private static (bool SiteBlocks, int Vectors) VectorsOf(SweepPoint point)
    {
        try
        {
            var (blocks, groups) = Estimator(point.Engine, PointModel.Load(point).Model);
            return (blocks, ScramblingTimeSearch.VectorsPerState(point.N, blocks, groups));
        }
        catch (InputException)
        {
            return (true, 2 * point.N);
        }
    }

    /// <summary>The mean-size estimator a "tstar" point uses: (site blocks, probe groups).</summary>
    public static (bool SiteBlocks, int ProbeGroups) Estimator(EngineSettings e, Model model)
    {
        ArgumentNullException.ThrowIfNull(e);
        ArgumentNullException.ThrowIfNull(model);
        bool majorana = model.SizeMeasure == SizeMeasure.Majoranas;
        return e.SizeEstimator switch
        {
            "site-blocks" when !majorana => (true, 0),
            "random-signs" or "site-blocks" => (false, e.ProbeGroups > 0 ? e.ProbeGroups : model.N),
            _ => e.ProbeGroups > 0 && !ScramblingTimeSearch.DefaultSiteBlocks(model.Lattice.Diameter, majorana)
                ? (false, e.ProbeGroups)
                : ScramblingTimeSearch.DefaultEstimator(model.N, model.Lattice.Diameter, majorana),
        };
    }

    public PointResult Run(SweepPoint point, CancellationToken cancellationToken)
    {
        var sw = Stopwatch.StartNew();
        var pm = PointModel.Load(point);
        var model = pm.Model;
        var e = point.Engine;
        // The t* search evolves under a Hamiltonian; a drive is followed on its period grid below.
        if (e.ExactMode == "tstar" && model.Drive is null) return RunSearch(point, pm, sw, cancellationToken);
        double step = e.Dt * e.RecordEvery;
        // a drive is followed period by period (the exact engine applies the one-period unitary)
        if (model.Drive is { } drive) step = drive.Period * Math.Max(1, Math.Round(step / drive.Period));
        int count = (int)Math.Floor(e.Time / step + 1e-9) + 1;
        var times = Enumerable.Range(0, count).Select(i => i * step).ToArray();
        var exactOptions = new ExactOtocOptions
        {
            Operator = pm.Probe,
            Times = times,
            Samples = e.Samples,
            Seed = unchecked((int)e.SampleSeed),
            Threads = _threads,
            Logger = _logger,
        };
        var r = model.Drive is { } d
            ? ExactOtoc.Run(d, model.N, exactOptions, cancellationToken)
            : ExactOtoc.Run(model.Hamiltonian, exactOptions, cancellationToken);
        var n = r.MeanSize ?? throw new InvalidOperationException("the exact engine returned no mean size");
        var weights = new double[times.Length][];
        for (int i = 0; i < times.Length; i++)
        {
            weights[i] = new double[model.N];
            foreach (var s in r.Sites) weights[i][s.Site] = s.Weight.Values[i];
        }
        var input = new ScramblingInput
        {
            N = model.N,
            Times = r.Times,
            MeanSize = n.Values,
            SiteWeights = weights,
            ProbeSites = pm.Probe.Support(),
            Geometry = new LatticeGeometry(model.N, model.Lattice.Distance, model.Lattice.IsOneDimensional, model.Lattice.Kind),
        };
        var f = ScramblingAnalysis.Analyze(input, new ScramblingAnalysisOptions { FrontFraction = e.FrontFraction });
        var ts = f.ScramblingTime;
        double? sampling = null;
        if (ts.Value is double tv && ts.BracketLow is double lo && ts.BracketHigh is double hi && hi > lo)
        {
            int i1 = Array.FindIndex(r.Times, t => t >= hi - 1e-12), i0 = Math.Max(0, i1 - 1);
            double slope = (n.Values[i1] - n.Values[i0]) / (r.Times[i1] - r.Times[i0]);
            double w = (tv - r.Times[i0]) / (r.Times[i1] - r.Times[i0]);
            double sigma = (1 - w) * n.Errors[i0] + w * n.Errors[i1];
            sampling = slope > 0 ? sigma / slope : null;
        }
        bool oneD = model.Lattice.IsOneDimensional;
        var growth = oneD ? f.Growth.SizeLinear : f.Growth.SizeExponential;
        var bv = f.Butterfly;
        double? vb = bv?.Primary.Velocity;
        var notes = new List<string> { $"exact engine: {r.Method}, {r.Samples} sample(s), errors: {r.ErrorKind}" };
        if (ts.Value is null) notes.Add($"t* not reached by t = {times[^1]:0.###}: mean size {n.Values[^1]:0.###} < {ts.Target:0.###}");
        if (model.SizeMeasure == SizeMeasure.Majoranas) notes.Add("Majorana model: the exact engine counts qubit size (t* at 3N/8 qubits)");
        return new PointResult
        {
            TStar = ts.Value,
            TStarGridError = ts.GridUncertainty ?? 0,
            TStarTruncationError = ts.Value is null ? null : 0,
            TStarSamplingError = sampling,
            GrowthRate = growth.Rate,
            GrowthKind = growth.Rate is null ? null : oneD ? "linear" : "exponential",
            GrowthRateError = growth.RateError,
            GrowthRateTruncationError = growth.Rate is null ? null : 0,
            GrowthWindow = growth.WindowStart is double a && growth.WindowEnd is double b ? $"{a:0.###}..{b:0.###}" : null,
            VB = vb,
            VBError = vb is null ? null : Math.Sqrt(Math.Pow(bv!.Primary.VelocityError ?? 0, 2) + Math.Pow((bv.ThresholdSpread ?? 0) / 2, 2)),
            VBTruncationError = vb is null ? null : 0,
            DiscardedWeight = 0,
            FinalSizeFraction = n.Values[^1] / pm.SaturationSize,
            FinalTime = times[^1],
            Engine = "exact",
            ProbeResolved = pm.Probe.ToString(),
            Converged = true,
            WallSeconds = sw.Elapsed.TotalSeconds,
            MemoryBytes = r.Cost.PeakWorkingSetBytes,
            Note = string.Join("; ", notes),
        };
    }

    private PointResult RunSearch(SweepPoint point, PointModel pm, Stopwatch sw, CancellationToken ct)
    {
        var e = point.Engine;
        var model = pm.Model;
        var (blocks, groups) = Estimator(e, model);
        // Above N = 12 the planner's t* (quick searches at N = 10 and 12, extrapolated; shared by the seeds of a
        // size and usually already made for the log line before the point) starts the search near t* instead of
        // at the inverse local energy scale, which saves the early evaluations far below the level.
        double? guess = point.N > 12 ? Estimate(point).TStar : null;
        var r = ScramblingTimeSearch.Run(model.Hamiltonian, new ScramblingTimeSearchOptions
        {
            Guess = guess,
            Operator = pm.Probe,
            MajoranaSize = model.SizeMeasure == SizeMeasure.Majoranas,
            MaxTime = e.Time,
            Samples = e.Samples,
            Seed = unchecked((int)e.SampleSeed),
            SiteBlocks = blocks,
            ProbeGroups = groups,
            Threads = _threads,
            Logger = _logger,
        }, ct);
        var last = r.Evaluations[^1];
        var notes = new List<string>
        {
            $"exact engine, t* search: {r.Evaluations.Count - 1} evaluations of the mean size ({r.SizeMeasure}; {r.Estimator}), {r.Samples} random state(s), {r.MatrixVectorProducts} applications of H",
        };
        if (r.TStar is null) notes.Add($"t* not reached by t = {r.LowerBound:0.###}: mean size {last.MeanSize:0.###} < {r.Target:0.###}");
        if (e.Samples == 1) notes.Add("one random state: its sampling noise is not estimated here and enters the seed-to-seed spread");
        return new PointResult
        {
            TStar = r.TStar,
            TStarGridError = r.TStar is null ? 0 : r.LocationError,
            TStarTruncationError = r.TStar is null ? null : 0,
            TStarSamplingError = r.TStar is not null && e.Samples > 1 ? r.SamplingError : null,
            DiscardedWeight = 0,
            FinalSizeFraction = last.MeanSize / r.Saturation,
            FinalTime = last.Time,
            Engine = "exact",
            ProbeResolved = pm.Probe.ToString(),
            Converged = true,
            WallSeconds = sw.Elapsed.TotalSeconds,
            MemoryBytes = Math.Max(r.PeakWorkingSetBytes, r.VectorBytes),
            Note = string.Join("; ", notes),
        };
    }
}

public sealed partial class PointRunners
{
    static partial void CreateExact(int threads, ILogger? logger, ref IPointRunner? runner)
        => runner = new ExactPointRunner(threads, logger);
}
#endif
