using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.Diagnosis;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Sweeps;

namespace OpGrowth.Pipeline;

/// <summary>The t*(N) stage's outcome: where its results live and what the sweep library collected.</summary>
public sealed record SweepStage
{
    /// <summary>Results folder of the sweep (inside the report folder; rerunning the run resumes it).</summary>
    public required string Folder { get; init; }
    /// <summary>Sizes requested.</summary>
    public required IReadOnlyList<int> Sizes { get; init; }
    /// <summary>The engine settings every point ran with.</summary>
    public required EngineSettings Engine { get; init; }
    /// <summary>The merged table and the two fits (null when nothing could be collected).</summary>
    public SweepCollection? Collection { get; init; }
    /// <summary>Points that failed, with the reason.</summary>
    public IReadOnlyList<string> Failures { get; init; } = [];
    /// <summary>Points computed in this run and points reused from an earlier one.</summary>
    public int Computed { get; init; }
    public int Reused { get; init; }
    /// <summary>Files the collector wrote, relative to <see cref="Folder"/>.</summary>
    public IReadOnlyList<string> Files { get; init; } = [];
    /// <summary>The single series of this run (the model's first probe), if collected.</summary>
    public SeriesFit? Series => Collection?.Series.FirstOrDefault();
}

/// <summary>The run's overall answer to "does it scramble?", reconciled with the diagnosis battery.</summary>
/// <param name="Outcome">"scrambles", "does not scramble" or "inconclusive".</param>
/// <param name="Mechanism">Leading mechanism (diagnosis battery) or "-" when it did not run.</param>
/// <param name="Reason">One or two sentences naming the evidence.</param>
/// <param name="Source">"diagnosis battery" or "evolution" (the stage the outcome rests on).</param>
public sealed record RunVerdict(string Outcome, string Mechanism, string Reason, string Source);

/// <summary>Adapters from the pipeline to the diagnosis battery and the sweep library.</summary>
public static class RunStages
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// The diagnosis battery's settings for an effort: the same batteries as <c>opgrowth diagnose --effort</c>
    /// (<see cref="DiagnosisOptions.For"/>), so both commands reach the same verdict from the same evidence.
    /// </summary>
    public static DiagnosisOptions DiagnosisFor(RunEffort effort, int threads)
        => DiagnosisOptions.For(effort.ToString().ToLowerInvariant()) with { Threads = threads, Seed = 1 };

    /// <summary>
    /// The battery's wall-time limits are set this high on purpose: work is bounded by string budgets and
    /// times, so the verdict does not depend on how busy the machine is (a limit that fires on a loaded
    /// machine cuts the evolution short and can change a test's verdict). It stays only as a safety net.
    /// </summary>
    public const double SafetySeconds = 900;

    /// <summary>Runs the diagnosis battery on the model (smaller members from the same file and overrides).</summary>
    public static DiagnosisReport Diagnose(string path, IReadOnlyDictionary<string, string> overrides, Model model, DiagnosisOptions options, CancellationToken ct)
    {
        var members = FamilyMembers.FromFile(path, overrides, model);
        return DiagnosisBattery.Run(model, members, options, ct);
    }

    /// <summary>Text of an outcome as the run prints it.</summary>
    public static string OutcomeText(TestOutcome o) => o switch
    {
        TestOutcome.Scrambles => "scrambles",
        TestOutcome.Fails => "does not scramble",
        _ => "inconclusive",
    };

    /// <summary>
    /// The sweep plan of a run's t*(N) stage: the model file with the run's overrides (numbers become
    /// one-value parameter axes; <c>seed</c> becomes the seed list), the run's probe (a model probe index
    /// becomes that probe of every member; a Pauli string must exist at every size), the given sizes, and
    /// <paramref name="engine"/>.
    /// </summary>
    public static SweepPlan SweepPlanFor(string path, Model model, IReadOnlyDictionary<string, string> overrides, IReadOnlyList<int> sizes, EngineSettings engine, string? probe = null)
    {
        string template = ProbeChoice.IsIndex(probe, out int index) ? $"model:{index}" : probe!.Trim();
        foreach (int n in sizes)
        {
            if (!ProbeTemplate.TryResolve(template, n, out _, out string? err)) throw new InputException($"--sweep with --probe {probe}: {err}");
        }
        string shown = template.StartsWith("model:", StringComparison.Ordinal) ? (index == 0 ? "the model's first probe" : $"the model's probe {index}") : template;
        var axes = new List<ParameterAxis>();
        var seeds = new List<long>();
        foreach (var kv in overrides.OrderBy(k => k.Key, StringComparer.Ordinal))
        {
            if (kv.Key == "N") continue;
            if (kv.Key == "seed" && long.TryParse(kv.Value, NumberStyles.Integer, Inv, out long s))
            {
                seeds.Add(s);
                continue;
            }
            if (!double.TryParse(kv.Value, NumberStyles.Float, Inv, out double v))
                throw new InputException($"--sweep: the override {kv.Key}={kv.Value} is not a number; expected numeric overrides when sweeping");
            axes.Add(new ParameterAxis(kv.Key, [v]));
        }
        return new SweepPlan
        {
            Name = "tstar-" + ScramblingRun.Sanitize(model.Name),
            Description = $"t*(N) of {model.Name}, {shown}, from opgrowth run",
            ModelFiles = [Path.GetFullPath(path)],
            Sizes = sizes.Distinct().OrderBy(n => n).ToArray(),
            Seeds = seeds,
            Probes = [template],
            Parameters = axes,
            Engine = engine,
        };
    }

    /// <summary>
    /// Runs the t*(N) sweep through the sweep library: points go to <paramref name="folder"/> (one file per
    /// point, so a rerun skips finished points), one point at a time with all threads, then the collector
    /// merges them and fits t* = a + b ln N against t* = a + N/v.
    /// </summary>
    public static SweepStage Sweep(SweepPlan plan, string folder, int threads, long memoryBytes, ILogger? log, CancellationToken ct)
    {
        var points = plan.Expand();
        var store = new PointStore(folder, log);
        Directory.CreateDirectory(store.PointsDirectory);
        store.RemoveStaleTemporaryFiles(TimeSpan.FromMinutes(10));
        AtomicFile.WriteAllText(store.PlanPath, plan.ToToml());
        SweepManifest.From(plan, points).Save(store.ManifestPath);
        var runner = PointRunners.Create(threads, log);
        var outcome = new SweepExecutor(store, runner, log).Run(points, new SweepExecution(1, memoryBytes), ct);
        SweepCollection? c = null;
        var written = new List<string>();
        if (!ct.IsCancellationRequested || points.Any(p => File.Exists(store.PathOf(p.Id))))
        {
            c = SweepCollector.Collect(folder, log);
            written.AddRange(c.Write(folder).Select(f => Path.GetFileName(f)));
        }
        return new SweepStage
        {
            Folder = folder,
            Sizes = plan.Sizes,
            Engine = plan.Engine,
            Collection = c,
            Failures = outcome.Failed.Select(f => $"{f.Point}: {f.Message}").ToList(),
            Computed = outcome.Computed,
            Files = written,
            Reused = outcome.Skipped,
        };
    }
}
