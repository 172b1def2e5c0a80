#if OPGROWTH_EVOLUTION
using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Sweeps;

/// <summary>
/// Runs a point on the Heisenberg-picture Pauli engine (<see cref="OperatorEvolution"/>): evolves the
/// probe under the model with the plan's time step, string budget and budget series, and reads t*,
/// the growth rate and v_B off the derived figures (<see cref="ScramblingAnalysis"/>). Truncation
/// uncertainties are the movements between the two largest budgets.
/// </summary>
public sealed class PauliPointRunner : IPointRunner
{
    private readonly int _threads;
    private readonly ILogger? _logger;

    public PauliPointRunner(int threads, ILogger? logger = null)
    {
        _threads = Math.Max(1, threads);
        _logger = logger;
    }

    /// <summary>Headroom over the engine's own bytes-per-string estimate: a pass's image can hold several times
    /// more distinct strings than its average (measured: a 24-site chain at 10^5 strings did not fit 1.25x).</summary>
    public const double PassHeadroom = 8;

    /// <summary>
    /// Memory the engine is given for a point: runtime and per-thread reserves plus <see cref="PassHeadroom"/>
    /// times the string budget at the engine's bytes per string, at least 512 MiB. It depends only on the
    /// point (up to 8 threads), so the engine's pass limits, and hence its numbers, do not depend on how the
    /// sweep is scheduled. The budget only caps what the engine may allocate; it is not allocated up front.
    /// </summary>
    public static long EngineMemory(SweepPoint point, int threads)
        => Math.Max(512L << 20, MemoryBudget.RuntimeReserve + Math.Max(8, threads) * MemoryBudget.BufferReservePerThread
           + (long)Math.Ceiling(PassHeadroom * point.Engine.MaxStrings * MemoryBudget.BytesPerString(point.N)));

    public long EstimateMemoryBytes(SweepPoint point) => EngineMemory(point, _threads);

    public PointResult Run(SweepPoint point, CancellationToken cancellationToken)
    {
        var sw = Stopwatch.StartNew();
        var pm = PointModel.Load(point);
        var model = pm.Model;
        var e = point.Engine;
        var problem = new EvolutionProblem
        {
            N = model.N,
            Name = model.Name,
            Hamiltonian = model.Drive is null ? model.Hamiltonian : null,
            Drive = model.Drive is { } d
                ? new PeriodicDrive(d.Layers.Select(l => (IReadOnlyList<DriveRotation>)l.Select(r => new DriveRotation(r.Generator, r.Angle)).ToArray()).ToArray(), d.Period)
                : null,
            Initial = EvolutionProblem.Probe(pm.Probe),
            CountMajoranas = model.SizeMeasure == SizeMeasure.Majoranas,
        };
        var options = new EvolutionOptions
        {
            Method = e.Method switch
            {
                "trotter4" => IntegrationMethod.Trotter4,
                "rk4" => IntegrationMethod.Rk4,
                _ => IntegrationMethod.Trotter2,
            },
            Dt = e.Dt,
            // For a drive the plan's time counts periods.
            Time = model.Drive is { } dd ? Math.Max(1, Math.Ceiling(e.Time - 1e-9)) * dd.Period : e.Time,
            RecordEvery = e.RecordEvery,
            Threads = _threads,
            BudgetCount = e.Budgets,
            Truncation = new TruncationPolicy
            {
                MaxStrings = e.MaxStrings,
                Threshold = e.Threshold,
                MemoryBytes = EngineMemory(point, _threads),
            },
        };
        var geometry = new LatticeGeometry(model.N, model.Lattice.Distance, model.Lattice.IsOneDimensional, model.Lattice.Kind);
        var analysis = new ScramblingAnalysisOptions { FrontFraction = e.FrontFraction };
        var result = OperatorEvolution.Run(problem, options, geometry, _logger, null, cancellationToken, analysis);
        cancellationToken.ThrowIfCancellationRequested();
        if (!result.Completed || result.Figures.Count == 0 || result.Runs[0].Budget.Index != 0)
        {
            string why = result.StopReason ?? "the run did not complete";
            if (result.ResourceLimited) throw new ResourceLimitException($"point {point.Index} ({point}): {why}");
            throw new InvalidOperationException($"point {point.Index} ({point}): {why}");
        }
        return FromFigures(point, pm, result.Figures[0], result.Convergence, result.Main.Records[^1], result.Main.PeakTrackedBytes, sw.Elapsed.TotalSeconds, e.Budgets > 1);
    }

    private static PointResult FromFigures(SweepPoint point, PointModel pm, ScramblingFigures f, IReadOnlyList<FigureConvergence> conv,
        EvolutionRecord last, long bytes, double wall, bool series)
    {
        bool majorana = pm.Model.SizeMeasure == SizeMeasure.Majoranas;
        var ts = majorana && f.MajoranaScramblingTime is not null ? f.MajoranaScramblingTime : f.ScramblingTime;
        FigureConvergence? Get(string name) => conv.FirstOrDefault(c => c.Figure == name);
        bool truncated = last.DiscardedTotal > 0 || point.Engine.Threshold > 0;
        // A single budget: unknown unless nothing was discarded (then exact up to the integrator).
        double? Trunc(string name) => Get(name)?.Movement ?? (series || truncated ? null : 0);
        bool oneD = pm.Model.Lattice.IsOneDimensional;
        var growth = oneD ? f.Growth.SizeLinear : f.Growth.SizeExponential;
        var bv = f.Butterfly;
        double? vb = bv?.Primary.Velocity;
        double? vbErr = vb is null ? null : Math.Sqrt(Sq(bv!.Primary.VelocityError ?? 0) + Sq((bv.ThresholdSpread ?? 0) / 2));
        var tsConv = Get(majorana ? "majoranaScramblingTime" : "scramblingTime");
        double size = majorana ? last.MeanMajoranaSize ?? double.NaN : last.MeanSize;
        var notes = new List<string>();
        if (ts.Value is null) notes.Add($"t* not reached by t = {last.Time:0.###}: mean size {size:0.###} < {ts.Target:0.###}");
        if (tsConv is { Converged: false, Note: { } n }) notes.Add("t* " + n);
        if (ts.Value is double tv && TStarTruncation(tsConv, tv, last.Time) is double lb) notes.Add($"the half budget did not reach t* by t = {last.Time:0.###}: truncation error set to the lower bound {lb:0.###}");
        if (majorana) notes.Add("size counted in Majoranas (t*: mean Majorana size N/2)");
        return new PointResult
        {
            TStar = ts.Value,
            TStarGridError = ts.GridUncertainty ?? 0,
            TStarTruncationError = ts.Value is null ? null : TStarTruncation(tsConv, ts.Value.Value, last.Time) ?? Trunc(majorana ? "majoranaScramblingTime" : "scramblingTime"),
            GrowthRate = growth.Rate,
            GrowthKind = growth.Rate is null ? null : oneD ? "linear" : "exponential",
            GrowthRateError = growth.RateError,
            GrowthRateTruncationError = growth.Rate is null ? null : Trunc(oneD ? "sizeGrowthRateLinear" : "sizeGrowthRateExponential"),
            GrowthWindow = growth.WindowStart is double a && growth.WindowEnd is double b ? $"{a:0.###}..{b:0.###}" : null,
            VB = vb,
            VBError = vbErr,
            VBTruncationError = vb is null ? null : Trunc("butterflyVelocity"),
            DiscardedWeight = last.DiscardedTotal,
            FinalSizeFraction = size / pm.SaturationSize,
            FinalTime = last.Time,
            Engine = "pauli",
            ProbeResolved = pm.Probe.ToString(),
            Converged = tsConv?.Converged ?? !truncated,
            WallSeconds = wall,
            MemoryBytes = bytes,
            Note = notes.Count > 0 ? string.Join("; ", notes) : null,
        };
    }

    /// <summary>
    /// When the half budget never reached the level by the final time T, its t* lies beyond T: the movement is
    /// at least T - t*, which is reported as the (lower-bound) truncation error instead of leaving it unknown.
    /// </summary>
    private static double? TStarTruncation(FigureConvergence? c, double tstar, double finalTime)
        => c is { Movement: null, Values.Length: > 1 } && c.Values[0] is not null && c.Values[1] is null ? Math.Max(0, finalTime - tstar) : null;

    private static double Sq(double x) => x * x;
}

public sealed partial class PointRunners
{
    static partial void CreatePauli(int threads, ILogger? logger, ref IPointRunner? runner)
        => runner = new PauliPointRunner(threads, logger);
}
#endif
