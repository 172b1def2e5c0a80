#if OPGROWTH_EXACT && OPGROWTH_EVOLUTION
using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Exact;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Sweeps;

/// <summary>
/// Runs a point on the exact state-vector engine (<see cref="ExactOtoc"/>): site-resolved OTOCs of the
/// probe against X_j, Y_j, Z_j on every site give the site weights rho_j(t) = (3/4)(1 - Fbar_j(t)) and the
/// mean size n(t) = sum_j rho_j(t); t*, the growth rate and v_B then come from the same analysis as the
/// Pauli engine's (<see cref="ScramblingAnalysis"/>). Nothing is truncated (truncation error 0); with
/// random-state traces (N above 8) the mean size carries a statistical error, propagated to t* as
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

    /// <summary>Dense matrices up to N = 8 (a few 2^N x 2^N complex matrices), else about 24 state vectors per thread.</summary>
    public long EstimateMemoryBytes(SweepPoint point)
    {
        long dim = 1L << point.N;
        long vectors = point.N <= 8 ? 8 * dim * dim * 16 : 24L * _threads * dim * 16;
        return (128L << 20) + vectors;
    }

    public PointResult Run(SweepPoint point, CancellationToken cancellationToken)
    {
        var sw = Stopwatch.StartNew();
        var pm = PointModel.Load(point);
        var model = pm.Model;
        var e = point.Engine;
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
}

public sealed partial class PointRunners
{
    static partial void CreateExact(int threads, ILogger? logger, ref IPointRunner? runner)
        => runner = new ExactPointRunner(threads, logger);
}
#endif
