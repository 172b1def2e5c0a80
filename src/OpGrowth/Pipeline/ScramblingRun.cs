using System.Diagnostics;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Diagnosis;
using OpGrowth.Evolution;
using OpGrowth.Exact;
using OpGrowth.IO;
using OpGrowth.Krylov;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Reporting;

namespace OpGrowth.Pipeline;

/// <summary>
/// The whole job from a model to a scrambling report: validate the model; evolve its first probe in the
/// Heisenberg picture with the budget series and derive size growth, light cone, v_B or growth rate,
/// saturation and t*; Lanczos coefficients with their growth class; Pauli engine against the exact engine at
/// a small N of the same family; then report.html, report.md, figures, results.json, CSV series and
/// manifest.json. Each stage's data files are written as soon as the stage finishes, so an interrupted run
/// keeps what it finished.
/// </summary>
public static partial class ScramblingRun
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Resolves the model, builds every engine's inputs, runs the stages and writes the report folder.</summary>
    public static ScramblingRunResult Execute(ScramblingRunOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (options.Threads < 1) throw new InputException($"--threads {options.Threads}; expected at least 1");
        if (options.Time is double tt && !(tt > 0 && double.IsFinite(tt))) throw new InputException($"--time: found {tt.ToString(Inv)}; expected a positive time (for a drive: a number of periods)");
        if (options.SweepSizes.Any(n => n < 2)) throw new InputException("--sweep: found a size below 2; expected sizes such as 8,12,16");
        var log = options.Logger;
        var timings = new Dictionary<string, double>();
        var clock = Stopwatch.StartNew();

        // ---- stage 1: model
        string path = ShippedModels.Resolve(options.Model ?? ScramblingRunOptions.DefaultModel);
        var model = ModelLoader.Load(path, options.Overrides);
        var probe = ProbeChoice.Resolve(model, options.Probe);
        var preset = EffortPreset.For(options.Effort);
        // Everything the later stages need is checked before any heavy work.
        if (options.SweepSizes.Count > 0) RunStages.SweepPlanFor(path, model, options.Overrides, options.SweepSizes, new OpGrowth.Sweeps.EngineSettings(), options.Probe);
        OperatorEvolution.CheckSteps(AbsoluteTime(model, options.Time ?? preset.Time), model.Drive?.Period ?? preset.Dt);
        string folder = Path.GetFullPath(options.OutputFolder ?? Path.Combine("opgrowth-report", Sanitize(model.Name)));
        Directory.CreateDirectory(folder);
        string dataDir = Path.Combine(folder, "data");
        Directory.CreateDirectory(dataDir);
        var files = new List<string>();
        timings["model"] = Lap(clock);
        log?.LogInformation("{Model}: {N} qubits, {Terms} terms, probe {Probe}, effort {Effort}; report in {Folder}",
            model.Name, model.N, model.Hamiltonian.Terms.Count, probe, options.Effort.ToString().ToLowerInvariant(), folder);

        // ---- stage 2: evolution with the budget series
        var (problem, evoOptions, budgetNote) = EvolutionInputs(model, probe, options, preset);
        if (budgetNote is not null) log?.LogInformation("{Note}", budgetNote);
        var geometry = GeometryOf(model);
        EvolutionResult? evo = null;
        var notes = new List<string>();
        string? stop = null;
        Report(options, "evolution", 0, $"{evoOptions.BudgetCount} budget(s) up to t = {evoOptions.Time.ToString("0.##", Inv)}");
        evo = OperatorEvolution.Run(problem, evoOptions, geometry, log, new EvolutionProgressAdapter(options.Progress), ct);
        timings["evolution"] = Lap(clock);
        if (budgetNote is not null) notes.Add(budgetNote);
        notes.AddRange(evo.Notes);
        if (!evo.Completed) stop = "evolution: " + (evo.StopReason ?? "stopped");
        if (evo.Runs.Count > 0 && evo.Main.Records.Count > 0) files.AddRange(DataFiles.WriteEvolution(dataDir, evo).Select(f => "data/" + f));
        Report(options, "evolution", 1, "done");

        // ---- stage 3: Lanczos
        LanczosOptions? lzOptions = null;
        LanczosEstimate? lz = null;
        KrylovAnalysis? krylov = null;
        // A drive has no single generator: the Krylov recursion of the period-averaged Hamiltonian would describe a
        // different dynamics (and the battery's test 2 says "not run" for drives), so run states the same.
        if (options.RunLanczos && model.IsDriven)
            notes.Add("Lanczos coefficients not computed: a periodic drive has no single generator (the period-averaged Hamiltonian describes other dynamics); the battery's test 2 is not run for drives either");
        if (options.RunLanczos && !model.IsDriven && !ct.IsCancellationRequested && stop is null)
        {
            Report(options, "lanczos", 0, $"depth {preset.LanczosDepth}, budgets {string.Join("/", preset.LanczosBudgets)}");
            lzOptions = LanczosInputs(options, preset, ct);
            lz = LanczosStudy.Run(model, probe, LanczosMode.Truncated, lzOptions with { Logger = log }, preset.LanczosBudgets);
            if (lz.B.Count >= 3) krylov = KrylovAnalyzer.Analyze(lz, new KrylovAnalysisOptions());
            if (lz.Reference.StopReason == LanczosStopReason.Cancelled) stop = "lanczos: interrupted";
            files.AddRange(DataFiles.WriteLanczos(dataDir, lz, krylov).Select(f => "data/" + f));
            timings["lanczos"] = Lap(clock);
            Report(options, "lanczos", 1, "done");
        }

        // ---- stage 4: exact cross-check
        CrossCheck? cross = null;
        if (options.RunExact && !ct.IsCancellationRequested && stop is null)
        {
            Report(options, "exact cross-check", 0, "Pauli engine (no truncation) and exact engine");
            cross = RunCrossCheck(path, model, options, preset, log, ct);
            if (cross.Ran) files.Add("data/" + DataFiles.WriteComparison(dataDir, cross));
            timings["exact"] = Lap(clock);
            Report(options, "exact cross-check", 1, cross.Ran ? (cross.Passed ? "passed" : "FAILED") : "skipped");
        }
        // ---- stage 5: diagnosis battery (bounded)
        OpGrowth.Diagnosis.DiagnosisReport? diagnosis = null;
        string? diagnosisSkip = options.RunDiagnosis ? null : "turned off (--no-diagnosis)";
        if (options.RunDiagnosis && !ct.IsCancellationRequested && stop is null)
        {
            var dOptions = (options.Diagnosis ?? RunStages.DiagnosisFor(options.Effort, options.Threads)) with { Logger = options.DiagnosisLogger ?? log };
            Report(options, "diagnosis", 0, $"seven tests, small members N = {dOptions.LevelN}/{dOptions.ClusterN}/{dOptions.ThermalN}");
            try
            {
                diagnosis = RunStages.Diagnose(path, options.Overrides, model, dOptions, ct);
                AtomicFile.WriteAllText(Path.Combine(dataDir, "diagnosis.json"), diagnosis.ToJson() + Environment.NewLine);
                AtomicFile.WriteAllText(Path.Combine(dataDir, "diagnosis.txt"), diagnosis.ToText());
                files.Add("data/diagnosis.json");
                files.Add("data/diagnosis.txt");
            }
            catch (OperationCanceledException)
            {
                stop = "diagnosis: interrupted";
                diagnosisSkip = "interrupted";
            }
            catch (Exception ex) when (ex is OutOfMemoryException || (ex is AggregateException ag && ag.Flatten().InnerExceptions.Any(i => i is OutOfMemoryException)))
            {
                // The battery sizes its own work; under a tight --memory cap it may not fit. The rest of the report stands.
                diagnosisSkip = "did not fit the memory cap (--memory); rerun with more memory or 'opgrowth diagnose' on its own";
            }
            timings["diagnosis"] = Lap(clock);
            Report(options, "diagnosis", 1, diagnosis is null ? "interrupted" : RunStages.OutcomeText(diagnosis.Overall.Outcome));
        }
        else if (options.RunDiagnosis) diagnosisSkip = "not reached (run stopped)";

        // ---- stage 5b: the scrambling-time statement at the model's own N (measured, predicted or bound)
        OpGrowth.Sweeps.ScramblingTimeStatement? tstar = null;
        FrontStage? front = null;
        FreeFermionStage? free = null;
        // A model the battery finds free gets no scrambling time but its free-fermion figures (exact at any N).
        if (diagnosis?.Overall is { Outcome: OpGrowth.Diagnosis.TestOutcome.Fails, Leading: OpGrowth.Diagnosis.Mechanism.FreeFermions } && !ct.IsCancellationRequested)
        {
            var times = evo.Main.Records.Count > 1 ? evo.Main.Records.Select(x => x.Time).ToArray() : Enumerable.Range(0, 41).Select(i => i * (options.Time ?? preset.Time) / 40).ToArray();
            free = FreeFermionStage.TryRun(model, problem.Initial[0].String, times);
            if (free is not null)
            {
                log?.LogInformation("{Free}", free.Text());
                files.Add("data/" + DataFiles.WriteFreeFermion(dataDir, free));
            }
            timings["freeFermions"] = Lap(clock);
        }
        if (!ct.IsCancellationRequested && stop is null && free is null)
        {
            Report(options, "t* statement", 0, $"t* at N = {model.N}");
            try
            {
                tstar = ScramblingTimeStage.Run(path, model, options, preset, evo, log, ct, out front);
                files.AddRange(DataFiles.WriteScramblingTime(dataDir, tstar, front).Select(f => "data/" + f));
                log?.LogInformation("{Statement}", tstar.Text());
            }
            catch (OperationCanceledException)
            {
                stop = "t* statement: interrupted";
            }
            timings["tstar"] = Lap(clock);
            Report(options, "t* statement", 1, tstar?.Route ?? "interrupted");
        }

        // ---- stage 6: optional t*(N) sweep (sweep library; results inside the report folder, so a rerun resumes)
        SweepStage? sweep = null;
        if (options.SweepSizes.Count > 0 && !ct.IsCancellationRequested && stop is null)
        {
            double? tMain = evo.Figures.Count > 0 ? evo.Figures[0].ScramblingTime.Value / (model.Drive?.Period ?? 1) : null;
            double sweepTime = options.SweepTime ?? SweepTimeFor(preset, options, model.N, tMain, options.SweepSizes.Max());
            var engine = new OpGrowth.Sweeps.EngineSettings
            {
                Time = sweepTime,
                Dt = preset.Dt,
                RecordEvery = 2,
                MaxStrings = preset.MaxStrings,
                Budgets = 2,
            };
            var plan = RunStages.SweepPlanFor(path, model, options.Overrides, options.SweepSizes, engine, options.Probe);
            Report(options, "t*(N) sweep", 0, $"N = {string.Join(",", plan.Sizes)}, t up to {sweepTime.ToString("0.##", Inv)}");
            try
            {
                long mem = options.MemoryBytes ?? (long)(0.5 * GC.GetGCMemoryInfo().TotalAvailableMemoryBytes);
                sweep = RunStages.Sweep(plan, Path.Combine(folder, "sweep"), options.Threads, mem, log, ct);
                files.AddRange(sweep.Files.Select(f => "sweep/" + f));
                if (sweep.Failures.Count > 0) notes.AddRange(sweep.Failures.Select(f => "t*(N) point failed: " + f));
            }
            catch (OperationCanceledException)
            {
                stop = "sweep: interrupted";
            }
            timings["sweep"] = Lap(clock);
            Report(options, "t*(N) sweep", 1, sweep?.Series?.Comparison?.Preferred is { } pref ? "prefers " + pref : "done");
        }
        bool cancelled = ct.IsCancellationRequested || evo.StopReason == "interrupted";
        if (cancelled) stop ??= "interrupted";

        // ---- stage 7: report
        Report(options, "report", 0, "figures and files");
        var result = new ScramblingRunResult
        {
            Model = model,
            ModelFile = path,
            Folder = folder,
            Options = options,
            Preset = preset,
            Problem = problem,
            EvolutionOptions = evoOptions,
            Geometry = geometry,
            Evolution = evo,
            LanczosOptions = lzOptions,
            Lanczos = lz,
            Krylov = krylov,
            CrossCheck = cross,
            Diagnosis = diagnosis,
            DiagnosisSkipReason = diagnosis is null ? diagnosisSkip : null,
            Sweep = sweep,
            ScramblingTime = tstar,
            Front = front,
            FreeFermion = free,
            Completed = stop is null,
            StopReason = stop,
            Cancelled = cancelled,
            Notes = notes,
        };
        result = RunReport.Write(result, files, timings, clock);
        Report(options, "report", 1, "done");
        log?.LogInformation("wrote {Folder} ({Files} files)", folder, result.Files.Count);
        return result;
    }

    /// <summary>The evolution problem of a model's Hamiltonian (or drive) for one probe.</summary>
    private static EvolutionProblem ProblemOf(Model model, PauliString probe) => new()
    {
        N = model.N,
        Name = model.Name,
        Hamiltonian = model.Drive is null ? model.Hamiltonian : null,
        Drive = DriveOf(model),
        Initial = EvolutionProblem.Probe(probe),
        CountMajoranas = model.SizeMeasure == SizeMeasure.Majoranas,
    };

    /// <summary>
    /// A final time in the model's own unit (time for a Hamiltonian, drive periods for a periodic drive) as
    /// absolute time: a drive runs whole periods.
    /// </summary>
    public static double AbsoluteTime(Model model, double time)
        => model.Drive is { } d ? Math.Max(1, Math.Ceiling(time - 1e-9)) * d.Period : time;

    /// <summary>The evolution problem and options the pipeline uses for a model (also for tests and reruns).</summary>
    public static (EvolutionProblem Problem, EvolutionOptions Options, string? BudgetNote) EvolutionInputs(Model model, PauliString probe, ScramblingRunOptions options, EffortPreset preset)
    {
        double time = AbsoluteTime(model, options.Time ?? preset.Time);
        double stepTime = model.Drive?.Period ?? preset.Dt;
        long steps = (long)Math.Ceiling(time / stepTime - 1e-9);
        var problem = ProblemOf(model, probe);
        long maxStrings = preset.MaxStrings;
        string? note = null;
        // Many-term models (all-to-all, SYK): keep quick and standard within their time by lowering the string
        // budget, never the time; the budget series then shows what truncation costs.
        if (TargetEvolutionSeconds(options.Effort) is double target)
        {
            int terms = model.Drive is null ? model.Hamiltonian.Terms.Count : model.Drive.Layers.Sum(l => l.Count);
            double estimate = EvolutionSecondsEstimate(terms, maxStrings, steps, preset.Budgets, options.Threads);
            if (estimate > target)
            {
                long lowered = Math.Max(MinRunStrings, (long)(maxStrings * target / estimate) / 1000 * 1000);
                if (lowered < maxStrings)
                {
                    note = FormattableString.Invariant($"string budget lowered from {maxStrings:N0} to {lowered:N0} so that the evolution stays near {target:0} s at this effort ({terms:N0} terms, {steps} steps; estimated {estimate:0} s at the full budget); a larger budget: --effort thorough");
                    maxStrings = lowered;
                }
            }
        }
        var evo = new EvolutionOptions
        {
            Method = IntegrationMethod.Trotter2,
            Dt = preset.Dt,
            Time = time,
            RecordEvery = (int)Math.Clamp(steps / 60, 1, int.MaxValue),
            Threads = options.Threads,
            BudgetCount = preset.Budgets,
            Truncation = new TruncationPolicy { MaxStrings = maxStrings, MemoryBytes = options.MemoryBytes },
        };
        return (problem, evo, note);
    }

    /// <summary>The smallest string budget a run lowers to.</summary>
    public const long MinRunStrings = 2_000;

    /// <summary>Wall time the evolution aims at per effort (quick 45 s, standard 180 s; thorough: no target).</summary>
    public static double? TargetEvolutionSeconds(RunEffort effort) => effort switch
    {
        RunEffort.Quick => 45,
        RunEffort.Standard => 180,
        _ => null,
    };

    /// <summary>
    /// Upper estimate of the evolution's wall time: terms x strings x steps x 2 (second-order Trotter) over the budget
    /// series (each budget half the previous), at 1.2e7 term-string updates per second per thread (measured on the
    /// 2-core test machine: SYK of 20 Majoranas, 4,845 terms, about 2.4e7 per second on 2 threads under load).
    /// </summary>
    public static double EvolutionSecondsEstimate(int terms, long maxStrings, long steps, int budgets, int threads)
    {
        double series = 0;
        for (int b = 0; b < Math.Max(1, budgets); b++) series += Math.Pow(0.5, b);
        return (double)terms * maxStrings * series * steps * 2 / (1.2e7 * Math.Max(1, Math.Min(threads, Environment.ProcessorCount)));
    }

    /// <summary>The Lanczos options the pipeline uses (budgets are <see cref="EffortPreset.LanczosBudgets"/>, truncated mode).</summary>
    public static LanczosOptions LanczosInputs(ScramblingRunOptions options, EffortPreset preset, CancellationToken ct = default) => new()
    {
        Depth = preset.LanczosDepth,
        MemoryBudgetBytes = options.MemoryBytes ?? (long)(0.5 * GC.GetGCMemoryInfo().TotalAvailableMemoryBytes),
        Threads = options.Threads,
        Cancellation = ct,
    };

    /// <summary>Distances of the model's lattice, as the analysis wants them.</summary>
    public static LatticeGeometry GeometryOf(Model model)
        => new(model.N, model.Lattice.Distance, model.Lattice.IsOneDimensional, model.Lattice.Kind);

    private static PeriodicDrive? DriveOf(Model model) => model.Drive is { } d
        ? new PeriodicDrive(d.Layers.Select(l => (IReadOnlyList<DriveRotation>)l.Select(r => new DriveRotation(r.Generator, r.Angle)).ToArray()).ToArray(), d.Period)
        : null;

    private static CrossCheck RunCrossCheck(string path, Model model, ScramblingRunOptions options, EffortPreset preset, ILogger? log, CancellationToken ct)
    {
        double time = Math.Min(options.Time ?? preset.Time, preset.ExactTime);
        // the largest member of the family with at most ExactN sites (squares and ladders shrink along one
        // direction, edge lists run at their own size); a model that small is checked on itself
        Model? small;
        try
        {
            small = FamilyMembers.FromFile(path, options.Overrides, model)(preset.ExactN, 0);
        }
        catch (InputException ex)
        {
            return new CrossCheck { SkipReason = $"no member of the family with at most {preset.ExactN} sites loads: {ex.Message}", Tolerance = options.CrossCheckTolerance };
        }
        if (small is null)
            return new CrossCheck { SkipReason = $"the model has {model.N} sites and no size parameter to shrink (name one with size = \"...\" in the model file), so no member of at most {preset.ExactN} sites is defined", Tolerance = options.CrossCheckTolerance };
        foreach (var note in small.LoadNotes) log?.LogInformation("cross-check member: {Note}", note);
        return CompareEngines(small, time, options.CrossCheckTolerance, options.Threads, log, ct, options.Probe);
    }

    /// <summary>
    /// Pauli engine (no truncation, Taylor steps: exact to rounding) against the exact state-vector
    /// engine (dense traces) for the model file at size <paramref name="n"/> (set through its parameter N):
    /// OTOCs against X, Y, Z on every site and the autocorrelation of the probe on the same times.
    /// <paramref name="time"/> is in the model's unit (periods for a drive); <paramref name="probeText"/> is a
    /// --probe text (null: the model's first probe).
    /// </summary>
    public static CrossCheck CompareEngines(string path, IReadOnlyDictionary<string, string> overrides, int n, double time, double tolerance, int threads, ILogger? log, CancellationToken ct, string? probeText = null)
    {
        var ov = new Dictionary<string, string>(overrides) { ["N"] = n.ToString(Inv) };
        Model small;
        try
        {
            small = ModelLoader.Load(path, ov);
        }
        catch (InputException ex)
        {
            return new CrossCheck { SkipReason = $"the model does not load at N = {n}: {ex.Message}", Tolerance = tolerance };
        }
        return CompareEngines(small, time, tolerance, threads, log, ct, probeText);
    }

    /// <summary>The same comparison on a model already built (a member of the family, or the model itself).</summary>
    public static CrossCheck CompareEngines(Model small, double time, double tolerance, int threads, ILogger? log, CancellationToken ct, string? probeText = null)
    {
        ArgumentNullException.ThrowIfNull(small);
        var options = new ScramblingRunOptions { CrossCheckTolerance = tolerance, Threads = threads, Time = time };
        if (small.N > PauliMask.MaxQubits || small.N > DenseSpectrum.DefaultMaxQubits)
            return new CrossCheck { SkipReason = $"N = {small.N} is too large for the dense exact engine", Tolerance = options.CrossCheckTolerance };
        PauliString probe;
        try
        {
            probe = ProbeChoice.Resolve(small, probeText);
        }
        catch (InputException ex)
        {
            return new CrossCheck { SkipReason = $"the probe does not exist at N = {small.N}: {ex.Message}", Tolerance = options.CrossCheckTolerance };
        }
        time = AbsoluteTime(small, time);
        // Taylor steps cost about the same per unit time at any dt, plus a fixed tail per step (terms until 1e-17):
        // dt = 0.25 with a record every step (13 times up to t = 3) takes half the time of dt = 0.1 (measured on the
        // 8-site demo chain: 19 s against 38 s on a loaded machine) and compares the engines at every record.
        double dt = small.Drive?.Period ?? 0.25;
        long steps = Math.Max(1, (long)Math.Ceiling(time / dt - 1e-9));
        var problem = ProblemOf(small, probe);
        // Taylor: exact to rounding at any dt; no truncation: the Pauli engine is then exact as well.
        var evoOptions = new EvolutionOptions
        {
            Method = IntegrationMethod.Taylor,
            Dt = dt,
            Time = time,
            RecordEvery = (int)Math.Max(1, steps / 20),
            Threads = options.Threads,
            BudgetCount = 1,
            Truncation = TruncationPolicy.None,
        };
        log?.LogInformation("cross-check at N = {N}: probe {Probe}, t = {Time}", small.N, probe, time);
        var pauli = OperatorEvolution.Run(problem, evoOptions, GeometryOf(small), null, null, ct);
        ct.ThrowIfCancellationRequested();
        var recs = pauli.Main.Records;
        double[] times = recs.Select(r => r.Time).ToArray();
        var exactOptions = new ExactOtocOptions
        {
            Operator = probe,
            Times = times,
            Method = OtocMethod.Dense,
            Tolerance = 1e-12,
            Threads = options.Threads,
        };
        var exact = small.Drive is null ? ExactOtoc.Run(small.Hamiltonian, exactOptions, ct) : ExactOtoc.Run(small.Drive, small.N, exactOptions, ct);
        double maxF = 0, maxC = 0;
        for (int i = 0; i < times.Length; i++)
        {
            maxC = Math.Max(maxC, Math.Abs(recs[i].Autocorrelation - exact.Autocorrelation.Values[i]));
            foreach (var site in exact.Sites)
            {
                int j = site.Site;
                maxF = Math.Max(maxF, Math.Abs(recs[i].OtocX[j] - site.X.Values[i]));
                maxF = Math.Max(maxF, Math.Abs(recs[i].OtocY[j] - site.Y.Values[i]));
                maxF = Math.Max(maxF, Math.Abs(recs[i].OtocZ[j] - site.Z.Values[i]));
            }
        }
        return new CrossCheck
        {
            Ran = true,
            N = small.N,
            Probe = probe.ToString(),
            Times = times,
            PauliAutocorrelation = recs.Select(r => r.Autocorrelation).ToArray(),
            ExactAutocorrelation = exact.Autocorrelation.Values,
            MaxOtocDifference = maxF,
            MaxAutocorrelationDifference = maxC,
            Tolerance = options.CrossCheckTolerance,
            ExactMethod = exact.Method,
            Sites = exact.Sites.Select(s => new SiteComparison(s.Site,
                recs.Select(x => x.OtocX[s.Site]).ToArray(), s.X.Values,
                recs.Select(x => x.OtocY[s.Site]).ToArray(), s.Y.Values,
                recs.Select(x => x.OtocZ[s.Site]).ToArray(), s.Z.Values)).ToArray(),
        };
    }

    /// <summary>
    /// Final time of the t*(N) points: 1.5 times the main run's t* scaled linearly to the largest size
    /// (a ballistic front needs time proportional to N; a faster scrambler finishes early), and never less
    /// than the effort's evolution time. All times in the model's unit (periods for a drive).
    /// </summary>
    public static double SweepTimeFor(EffortPreset preset, ScramblingRunOptions options, int n, double? tStar, int largest)
    {
        double t = options.Time ?? preset.Time;
        if (tStar is double ts && ts > 0) t = Math.Max(t, 1.5 * ts * Math.Max(1.0, (double)largest / n));
        else t = Math.Max(t, 2 * preset.Time);
        return Math.Ceiling(t);
    }

    private static double Lap(Stopwatch clock)
    {
        double s = clock.Elapsed.TotalSeconds;
        clock.Restart();
        return s;
    }

    private static void Report(ScramblingRunOptions o, string stage, double fraction, string detail)
        => o.Progress?.Report(new RunProgress(stage, fraction, detail));

    /// <summary>A name made safe for a folder name (letters, digits, '-', '_', '.'; anything else becomes '-').</summary>
    public static string Sanitize(string s)
    {
        var chars = s.Select(c => char.IsLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '-').ToArray();
        return new string(chars);
    }

    private sealed class EvolutionProgressAdapter(IProgress<RunProgress>? target) : IProgress<EvolutionProgress>
    {
        public void Report(EvolutionProgress p)
        {
            if (target is null) return;
            double f = (p.Run + (p.TotalSteps > 0 ? (double)p.Step / p.TotalSteps : 1)) / Math.Max(1, p.Runs);
            target.Report(new RunProgress("evolution", Math.Clamp(f, 0, 1),
                FormattableString.Invariant($"budget {p.Run + 1}/{p.Runs} t={p.Time:0.##} strings={p.Strings:N0}"), p.Remaining));
        }
    }
}
