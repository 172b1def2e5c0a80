using System.CommandLine;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pipeline;
using OpGrowth.Reporting;
using Spectre.Console;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth evolve MODEL</c>: Heisenberg evolution O(t) = e^{iHt} O e^{-iHt} (or period by period for
/// a drive) in the Pauli-string basis with accounted truncation; writes evolve.json and the evolution's data
/// files (the same names and columns as <c>opgrowth run</c> writes into data/) and prints the headline figures.
/// </summary>
internal static class EvolveCommand
{
    private static readonly string[] Methods = ["trotter2", "trotter4", "rk4", "taylor"];
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>String budget when no truncation option is given, for models with up to three terms per site.</summary>
    public const long DefaultMaxStrings = 100_000;

    /// <summary>
    /// The default string budget of a model: <see cref="DefaultMaxStrings"/> times (3 / terms per site)^2 when a
    /// model has more than three terms (or drive rotations) per site, never below 2,000. A step costs more with
    /// more terms per site both through more passes and through more anticommuting generators per string, so
    /// with this budget every shipped model finishes in a few minutes on 2 cores with no budget option.
    /// </summary>
    /// <summary>
    /// The default final time: 10, or 10 x 1,200 / terms for a model of more than 1,200 terms (or rotations), at
    /// least 1: every commuting group is one pass per step, so a step of such a model costs seconds however small
    /// the budget.
    /// </summary>
    public static double DefaultTimeFor(Model model)
    {
        ArgumentNullException.ThrowIfNull(model);
        int terms = model.Drive is { } d ? d.RotationCount : model.Hamiltonian.Terms.Count;
        return terms <= 1200 ? 10 : Math.Max(1, Math.Round(20.0 * 1200 / terms) / 2);
    }

    public static long DefaultBudgetFor(Model model)
    {
        ArgumentNullException.ThrowIfNull(model);
        int terms = model.Drive is { } d ? d.RotationCount : model.Hamiltonian.Terms.Count;
        double perSite = (double)terms / Math.Max(1, model.N);
        double scale = perSite <= 3 ? 1 : 9 / (perSite * perSite);
        return Math.Max(2_000, (long)(DefaultMaxStrings * scale) / 1000 * 1000);
    }

    public static Command Create()
    {
        var model = CommonOptions.Model();
        var set = CommonOptions.Set();
        var probe = CommonOptions.Probe();
        var time = new Option<double?>("--time") { Description = "Final time; for a periodic drive, the number of periods [default: 10; shorter for models of more than 1,200 terms, as the summary says]." };
        var dt = new Option<double>("--dt") { Description = "Time step. trotter2: global error O(dt^2); trotter4 and rk4: O(dt^4); taylor: exact to rounding at any dt (cost grows with dt). Ignored for drives (exact per period).", DefaultValueFactory = _ => 0.05 };
        var every = new Option<int?>("--record-every") { Description = "Record observables every this many steps [default: about 100 records over the run]." };
        var method = new Option<string>("--method") { Description = "trotter2 | trotter4 (norm-preserving Suzuki splittings over commuting groups) | rk4 (cross-check) | taylor (exact reference, small systems).", DefaultValueFactory = _ => "trotter2" };
        method.AcceptOnlyFromAmong(Methods);
        var threshold = new Option<double>("--threshold") { Description = "Drop strings with |c| below this after every pass. Biases late-time size and plateau low.", DefaultValueFactory = _ => 0 };
        var maxStrings = new Option<long?>("--max-strings") { Description = $"Keep the M strings of largest |c| after every pass [default, when no other truncation option and no --memory is given: {DefaultMaxStrings:N0}, fewer for models with more than three terms per site; with --memory alone: as many as it holds]." };
        var memory = CommonOptions.Memory();
        var maxSize = new Option<int?>("--max-size") { Description = "Drop strings acting on more than K sites. WARNING: suppresses size growth by construction (mean size, growth rates and saturation biased low, t* late, size never above K)." };
        var damping = new Option<string?>("--damping") { Description = "DAOE damping GAMMA@LSTAR: multiply c_S by exp(-GAMMA (size - LSTAR)) per unit time for strings longer than LSTAR (Rakovszky, von Keyserlingk, Pollmann 2022). Biases long-string quantities (size, OTOC, front) low." };
        var budgets = new Option<int>("--budgets") { Description = "Budget series: also rerun at half (2) and a quarter (3) of the budget and report how far each figure moved (its truncation uncertainty); 1 = the given budget only.", DefaultValueFactory = _ => 1 };
        var front = new Option<double>("--front-fraction") { Description = "Front threshold for v_B as a fraction of the scrambled site weight 3/4.", DefaultValueFactory = _ => 0.5 };
        var threads = CommonOptions.Threads();
        var outDir = CommonOptions.Out("Output folder [default: evolve-<model name>].");
        var resume = new Option<bool>("--resume") { Description = "Continue from the checkpoints in the output folder (same model and options); an error when there are none." };
        var ckEvery = new Option<double>("--checkpoint-minutes") { Description = "Minutes between checkpoints (taken at record times; an interruption always writes one); 0 = at every record.", DefaultValueFactory = _ => 5 };
        var noCk = new Option<bool>("--no-checkpoints") { Description = "Do not write checkpoints." };
        var keepCk = new Option<bool>("--keep-checkpoints") { Description = "Keep the checkpoints after a completed run [default: removed]." };

        var cmd = new Command("evolve",
            "Evolve an operator in the Heisenberg picture, O(t) = e^{iHt} O e^{-iHt}, in the Pauli-string basis (up to 1024 qubits) with accounted truncation, " +
            "and read off scrambling: autocorrelation, size distribution, OTOCs against every single-site operator, the front and v_B, growth rates, saturation and t*.\n\n" +
            "Truncation biases: --threshold and --max-strings remove small coefficients (late-time size biased low); --max-size suppresses size growth by construction; " +
            "--damping suppresses long strings. Every step records the discarded weight; use --budgets 3 to measure how much each figure depends on the budget. " +
            "Ctrl-C or SIGTERM stops between two passes, writes a checkpoint and the results so far; --resume continues.")
        {
            model, set, probe, time, dt, every, method, threshold, maxStrings, memory, maxSize, damping, budgets, front, threads, outDir, resume, ckEvery, noCk, keepCk,
        };
        cmd.SetAction(pr => CliHost.Run(ct => CommonOptions.Capped(pr.GetValue(memory), () => Execute(new Settings
        {
            Model = pr.GetValue(model)!,
            Sets = pr.GetValue(set) ?? [],
            Probe = pr.GetValue(probe),
            Time = pr.GetValue(time),
            Dt = pr.GetValue(dt),
            RecordEvery = pr.GetValue(every),
            Method = pr.GetValue(method)!,
            Threshold = pr.GetValue(threshold),
            MaxStrings = pr.GetValue(maxStrings),
            Memory = pr.GetValue(memory),
            MaxSize = pr.GetValue(maxSize),
            Damping = pr.GetValue(damping),
            Budgets = pr.GetValue(budgets),
            FrontFraction = pr.GetValue(front),
            Threads = CommonOptions.ThreadsOrDefault(pr.GetValue(threads)),
            Out = pr.GetValue(outDir),
            Resume = pr.GetValue(resume),
            CheckpointMinutes = pr.GetValue(ckEvery),
            NoCheckpoints = pr.GetValue(noCk),
            KeepCheckpoints = pr.GetValue(keepCk),
        }, ct))));
        return cmd;
    }

    private sealed record Settings
    {
        public required string Model { get; init; }
        public required string[] Sets { get; init; }
        public string? Probe { get; init; }
        public double? Time { get; init; }
        public double Dt { get; init; }
        public int? RecordEvery { get; init; }
        public required string Method { get; init; }
        public double Threshold { get; init; }
        public long? MaxStrings { get; init; }
        public long? Memory { get; init; }
        public int? MaxSize { get; init; }
        public string? Damping { get; init; }
        public int Budgets { get; init; }
        public double FrontFraction { get; init; }
        public int Threads { get; init; }
        public string? Out { get; init; }
        public bool Resume { get; init; }
        public double CheckpointMinutes { get; init; }
        public bool NoCheckpoints { get; init; }
        public bool KeepCheckpoints { get; init; }
    }

    private static (double Gamma, int LStar) ParseDamping(string? text)
    {
        if (text is null) return (0, 0);
        var parts = text.Split('@');
        if (parts.Length != 2
            || !double.TryParse(parts[0], NumberStyles.Float, Inv, out double g) || !(g >= 0) || !double.IsFinite(g)
            || !int.TryParse(parts[1], NumberStyles.None, Inv, out int l))
        {
            throw new InputException($"--damping '{text}': expected GAMMA@LSTAR with GAMMA >= 0 and an integer LSTAR >= 0, e.g. 0.1@8");
        }
        return (g, l);
    }

    private static int Execute(Settings st, CancellationToken ct)
    {
        // Options first (cheap), then the model: every refusal comes before any heavy work.
        var (gamma, lstar) = ParseDamping(st.Damping);
        if (!(st.FrontFraction > 0 && st.FrontFraction <= 1)) throw new InputException($"--front-fraction: found {st.FrontFraction.ToString(Inv)}; expected a number in (0, 1]");
        if (!(st.CheckpointMinutes >= 0) || !double.IsFinite(st.CheckpointMinutes)) throw new InputException($"--checkpoint-minutes: found {st.CheckpointMinutes.ToString(Inv)}; expected a non-negative number");
        if (!(st.Dt > 0) || !double.IsFinite(st.Dt)) throw new InputException($"--dt: found {st.Dt.ToString(Inv)}; expected a positive time step");
        if (st.Budgets is < 1 or > 3) throw new InputException($"--budgets: found {st.Budgets}; expected 1, 2 or 3");
        if (st.MaxStrings is < 1) throw new InputException($"--max-strings: found {st.MaxStrings}; expected at least 1");
        if (st.RecordEvery is < 1) throw new InputException($"--record-every: found {st.RecordEvery}; expected at least 1");
        if (!(st.Threshold >= 0) || !double.IsFinite(st.Threshold)) throw new InputException($"--threshold: found {st.Threshold.ToString(Inv)}; expected a non-negative number");
        var (path, _, model) = CommonOptions.LoadModel(st.Model, st.Sets);
        var probe = ProbeChoice.Resolve(model, st.Probe);
        double time = CommonOptions.AbsoluteTime(st.Time ?? DefaultTimeFor(model), model, st.Dt, OperatorEvolution.MaxSteps);
        string outDir = Path.GetFullPath(st.Out ?? $"evolve-{ScramblingRun.Sanitize(model.Name)}");
        string checkpoints = Path.Combine(outDir, "checkpoints");
        if (st.Resume && (st.NoCheckpoints || !Directory.Exists(checkpoints) || Directory.GetFiles(checkpoints, "checkpoint-*.bin").Length == 0))
            throw new InputException($"--resume: found no checkpoint in {checkpoints}; expected the output folder of an interrupted run (same --out, model and options)");
        var method = st.Method switch
        {
            "trotter4" => IntegrationMethod.Trotter4,
            "rk4" => IntegrationMethod.Rk4,
            "taylor" => IntegrationMethod.Taylor,
            _ => IntegrationMethod.Trotter2,
        };
        double stepTime = model.Drive?.Period ?? st.Dt;
        long steps = (long)Math.Ceiling(time / stepTime - 1e-9);
        int recordEvery = st.RecordEvery ?? (int)Math.Clamp(steps / 100, 1, int.MaxValue);
        // With no truncation option at all, a budget that finishes quickly; the summary says how to go further.
        bool defaultBudget = st.MaxStrings is null && st.Memory is null && st.Threshold == 0 && st.MaxSize is null && gamma == 0;
        var problem = new EvolutionProblem
        {
            N = model.N,
            Name = model.Name,
            Hamiltonian = model.Drive is null ? model.Hamiltonian : null,
            Drive = model.Drive is { } d
                ? new PeriodicDrive(d.Layers.Select(l => (IReadOnlyList<DriveRotation>)l.Select(r => new DriveRotation(r.Generator, r.Angle)).ToArray()).ToArray(), d.Period)
                : null,
            Initial = EvolutionProblem.Probe(probe),
            CountMajoranas = model.SizeMeasure == SizeMeasure.Majoranas,
        };
        var options = new EvolutionOptions
        {
            Method = method,
            Dt = st.Dt,
            Time = time,
            RecordEvery = recordEvery,
            Threads = st.Threads,
            BudgetCount = st.Budgets,
            Truncation = new TruncationPolicy
            {
                Threshold = st.Threshold,
                MaxStrings = defaultBudget ? DefaultBudgetFor(model) : st.MaxStrings,
                MemoryBytes = st.Memory,
                MaxSize = st.MaxSize,
                DampingRate = gamma,
                DampingMinSize = lstar,
            },
            CheckpointDirectory = st.NoCheckpoints ? null : checkpoints,
            CheckpointInterval = TimeSpan.FromMinutes(st.CheckpointMinutes),
            Resume = st.Resume,
        };
        var geometry = ScramblingRun.GeometryOf(model);
        var analysis = new ScramblingAnalysisOptions { FrontFraction = st.FrontFraction };

        EvolutionResult result;
        using (var lf = CliHost.CreateLoggerFactory())
        {
            var log = lf.CreateLogger("evolve");
            log.LogInformation("{Model}: {N} qubits, probe {Probe}, {Dynamics}, t = {Time}, output {Out}", model.Name, model.N, probe,
                model.Drive is null ? $"{st.Method} dt = {NumberFormat.Number(st.Dt)}" : "periodic drive", NumberFormat.Number(time), outDir);
            if (CliHost.FancyProgress)
            {
                var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Error) });
                EvolutionResult? r = null;
                console.Progress()
                    .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new ElapsedTimeColumn(), new RemainingTimeColumn())
                    .Start(ctx => r = OperatorEvolution.Run(problem, options, geometry, log, new SpectreProgress(ctx), ct, analysis));
                result = r!;
            }
            else
            {
                result = OperatorEvolution.Run(problem, options, geometry, log, CliHost.Verbosity == Verbosity.Quiet ? null : new LogProgress(log), ct, analysis);
            }
            string summary = Summary(result, defaultBudget ? DefaultBudgetFor(model) : null, st.Time is null && DefaultTimeFor(model) < 10 ? DefaultTimeFor(model) : null);
            Write(outDir, result, options, model, path, probe, summary);
            log.LogInformation("wrote {Out}", outDir);
            if (result.Completed && !st.KeepCheckpoints && options.CheckpointDirectory is { } ck && Directory.Exists(ck)) Directory.Delete(ck, true);
            CliHost.Out.Write(summary);
        }
        if (result.ResourceLimited) throw new ResourceLimitException($"{result.StopReason} (partial results written to {outDir})");
        if (result.StopReason == "interrupted") throw new OperationCanceledException();
        return ExitCodes.Ok;
    }

    private sealed class SpectreProgress(ProgressContext ctx) : IProgress<EvolutionProgress>
    {
        private readonly Dictionary<int, ProgressTask> _tasks = [];

        public void Report(EvolutionProgress p)
        {
            if (!_tasks.TryGetValue(p.Run, out var task))
            {
                task = ctx.AddTask($"budget {p.Run + 1}/{p.Runs}", maxValue: Math.Max(1, p.TotalSteps));
                _tasks[p.Run] = task;
            }
            task.Value = p.Step;
            task.Description = FormattableString.Invariant($"budget {p.Run + 1}/{p.Runs} t={p.Time:0.###} strings={p.Strings:N0} discarded={NumberFormat.Number(Math.Max(0, p.DiscardedTotal), 2)}");
        }
    }

    /// <summary>Plain periodic log lines (redirected output or CI), at most one per 10 seconds plus the end of each budget's run.</summary>
    private sealed class LogProgress(ILogger log) : IProgress<EvolutionProgress>
    {
        private DateTime _last = DateTime.MinValue;

        public void Report(EvolutionProgress p)
        {
            var now = DateTime.UtcNow;
            if ((now - _last).TotalSeconds < 10 && p.Step != p.TotalSteps) return;
            _last = now;
            string eta = p.Remaining is TimeSpan r ? r.ToString(@"hh\:mm\:ss", Inv) : "?";
            log.LogInformation("budget {Run}/{Runs}: step {Step}/{Total} t = {Time} strings {Strings} discarded {Disc} elapsed {Elapsed} eta {Eta}",
                p.Run + 1, p.Runs, p.Step, p.TotalSteps, NumberFormat.Number(p.Time), p.Strings, NumberFormat.Number(Math.Max(0, p.DiscardedTotal), 2), p.Elapsed.ToString(@"hh\:mm\:ss", Inv), eta);
        }
    }

    // ------------------------------------------------------------------ output

    private static void Write(string dir, EvolutionResult r, EvolutionOptions o, Model model, string modelFile, Pauli.PauliString probe, string summary)
    {
        Directory.CreateDirectory(dir);
        var doc = new
        {
            format = "opgrowth-evolve/1",
            model = new { name = model.Name, file = modelFile, n = model.N, lattice = model.Lattice.Kind, parameters = model.Parameters, seeds = model.Seeds, sizeMeasure = r.SizeMeasure },
            probe = probe.ToString(),
            options = new
            {
                dynamics = r.Dynamics,
                method = r.Method,
                dt = r.Dynamics == "hamiltonian" ? o.Dt : (double?)null,
                time = o.Time,
                recordEvery = o.RecordEvery,
                threads = o.Threads,
                budgets = o.BudgetCount,
                truncation = o.Truncation,
                groupsPerStep = r.Groups,
            },
            completed = r.Completed,
            stopReason = r.StopReason,
            headline = EvolutionHeadlines.Of(r, TimeUnits.For(model.IsDriven)).Select(h => new { name = h.Name, value = h.Value.Value, uncertainty = h.Value.Uncertainty, unit = h.Value.Unit, definition = h.Value.Definition, converged = h.Converged, note = h.Note }),
            discardedWeight = r.Main.Records.Count > 0 ? r.Main.Records[^1].DiscardedTotal : 0,
            notes = r.Notes,
            figures = r.Figures,
            convergence = r.Convergence,
            budgetRuns = r.Runs.Select(s => new { maxStrings = s.Budget.MaxStrings, threshold = s.Budget.Threshold, maxSize = s.Budget.MaxSize, completed = s.Completed, stopReason = s.StopReason, peakStrings = s.PeakStrings, peakTrackedBytes = s.PeakTrackedBytes, seconds = s.ElapsedSeconds, discardedTotal = s.Records.Count > 0 ? s.Records[^1].DiscardedTotal : 0 }),
            wallSeconds = r.WallSeconds,
            files = DataFiles.Descriptions.Keys.Where(f => File.Exists(Path.Combine(dir, f))).ToList(),
        };
        if (r.Main.Records.Count > 0) DataFiles.WriteEvolution(dir, r);
        AtomicFile.WriteJson(Path.Combine(dir, "evolve.json"), doc);
        AtomicFile.WriteAllText(Path.Combine(dir, "summary.txt"), summary);
    }

    /// <summary>The short text summary printed on stdout (and written to summary.txt).</summary>
    internal static string Summary(EvolutionResult r, long? defaultBudget, double? shortTime = null)
    {
        var sb = new StringBuilder();
        var main = r.Main;
        if (main.Records.Count == 0) return $"model {r.Model} (N = {r.N}), probe {r.Initial}: no record ({r.StopReason})\n";
        var last = main.Records[^1];
        var fig = r.Figures[0];
        string stopped = r.Completed ? "" : $" (stopped: {r.StopReason})";
        sb.Append(Inv, $"{r.Model} (N = {r.N}), probe {r.Initial}, {r.Dynamics}{(r.Dynamics == "hamiltonian" ? ", " + r.Method : "")}, t = {NumberFormat.Number(last.Time)}{stopped}\n");
        sb.Append(Inv, $"  strings: {last.Strings:N0} (peak {main.PeakStrings:N0}); discarded weight: {EvolutionHeadlines.DiscardedText(r)}; {NumberFormat.Duration(TimeSpan.FromSeconds(main.ElapsedSeconds))}\n");
        sb.Append(Inv, $"  autocorrelation: {NumberFormat.Number(last.Autocorrelation, 3)}; mean size: {NumberFormat.Number(last.MeanSize, 3)} (random operator {NumberFormat.Number(fig.Growth.SaturationExpected, 3)})");
        if (last.MeanMajoranaSize is double mm) sb.Append(Inv, $", in Majoranas {NumberFormat.Number(mm, 3)}");
        sb.Append('\n');
        var heads = EvolutionHeadlines.Of(r, TimeUnits.For(r.Dynamics != "hamiltonian"));
        foreach (var h in heads) sb.Append("  ").Append(EvolutionHeadlines.Line(h)).Append('\n');
        if (fig.Butterfly is null) sb.Append("  butterfly velocity v_B: ").Append(fig.ButterflyNote).Append('\n');
        else if (fig.Butterfly.Primary.Velocity is null) sb.Append("  butterfly velocity v_B: ").Append(fig.Butterfly.Primary.Note).Append('\n');
        var g = fig.Growth;
        sb.Append("  growth regime: ").Append(g.Regime).Append(" (").Append(g.RegimeReason).Append(")\n");
        if (fig.ScramblingTime.Value is null)
            sb.Append("  scrambling time t*: not reached: the mean size ").Append(NumberFormat.Number(last.MeanSize, 3)).Append(" is below 3N/8 = ").Append(NumberFormat.Number(fig.ScramblingTime.Target, 3))
              .Append(" at t = ").Append(NumberFormat.Number(last.Time)).Append("; ").Append(RunReport.LongerRunAdvice(r)).Append('\n');
        if (fig.MajoranaScramblingTime is { } tm)
        {
            sb.Append("  t* (Majoranas): ").Append(tm.Value is double tmv ? NumberFormat.Number(tmv, 3) + (EvolutionHeadlines.Convergence(r, "majoranaScramblingTime") is { Converged: false, Note: var note } ? $" (not converged: {note})" : "") : $"not reached (level {NumberFormat.Number(tm.Target, 3)})").Append('\n');
        }
        if (EvolutionHeadlines.NormGrowthWarning(r) is { } broken) sb.Append("  WARNING: ").Append(broken).Append('\n');
        foreach (var note in r.Notes) sb.Append("  note: ").Append(note).Append('\n');
        if (defaultBudget is long budget)
        {
            long more = budget * 10;
            sb.Append(Inv, $"  note: default budget of {budget:N0} strings; to go further: --max-strings {more} --budgets 3 (about {MemoryBudget.Format((long)(more * MemoryBudget.BytesPerString(r.N)))} at the full budget, about ten times the time)\n");
        }
        if (shortTime is double ts)
            sb.Append(Inv, $"  note: default time {NumberFormat.Number(ts)} for a model of this many terms (each step applies every commuting group); to go further: --time 10\n");
        return sb.ToString();
    }
}
