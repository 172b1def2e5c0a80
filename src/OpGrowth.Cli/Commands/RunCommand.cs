using System.CommandLine;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pipeline;
using OpGrowth.Reporting;
using Spectre.Console;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth run [MODEL]</c>: the whole job in one command (evolution with the budget series, Lanczos,
/// exact cross-check, diagnosis battery, optional t*(N), report folder). With no model it runs the shipped
/// demo's lead candidate. The console states each headline figure once, as the report does.
/// </summary>
internal static class RunCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var model = new Argument<string?>("MODEL") { Description = $"Model file (.toml) or shipped model name [default: {ScramblingRunOptions.DefaultModel}].", Arity = ArgumentArity.ZeroOrOne };
        var set = CommonOptions.Set();
        var probe = CommonOptions.Probe();
        var outDir = CommonOptions.Out("Report folder [default: ./opgrowth-report/<model name>].");
        var effort = new Option<string>("--effort") { Description = "quick (seconds; a first look), standard (about a minute for the demo on 2 cores), thorough (larger budgets, longer times).", DefaultValueFactory = _ => "standard" };
        effort.AcceptOnlyFromAmong("quick", "standard", "thorough");
        var memory = CommonOptions.Memory();
        var threads = CommonOptions.Threads();
        var time = new Option<double?>("--time") { Description = "Final evolution time; for a periodic drive, the number of periods [default: the effort's]." };
        var noExact = new Option<bool>("--no-exact") { Description = "Skip the exact cross-check at small N." };
        var noLanczos = new Option<bool>("--no-lanczos") { Description = "Skip the Lanczos coefficients." };
        var noDiagnosis = new Option<bool>("--no-diagnosis") { Description = "Skip the diagnosis battery." };
        var sweep = new Option<string?>("--sweep") { Description = "Also run t*(N) at these sizes, e.g. 8,10,12, and fit t* = a + b ln N against t* = a + N/v (results kept in <out>/sweep; a rerun reuses finished sizes)." };
        var exactTStar = new Option<bool>("--exact-tstar") { Description = "Measure t* at the model's own N with the exact engine even when it exceeds the effort's budget (the cost estimate is logged before it starts; --effort thorough always does)." };
        var ensemble = new Option<string>("--ensemble") { Description = "static (the model as written), brownian (its white-noise counterpart, as opgrowth ensemble), or both side by side at the same N (counterpart report in <out>/brownian). A circuit file always runs its random-circuit ensemble.", DefaultValueFactory = _ => "static" };
        ensemble.AcceptOnlyFromAmong("static", "brownian", "both");
        var cmd = new Command("run",
            "From a model to a scrambling report in one command: Heisenberg evolution of the probe with a budget series " +
            "(size growth, OTOC light cone, v_B or growth rate, saturation, t*, discarded weight), Lanczos coefficients with their growth class, the Pauli engine " +
            "checked against the exact engine at a small N of the same family, a bounded diagnosis battery (does it scramble, and if not, why), and optionally t*(N). " +
            "Writes report.html, report.md, figures, results.json, data/*.csv and manifest.json.")
        {
            model, set, probe, outDir, effort, memory, threads, time, noExact, noLanczos, noDiagnosis, sweep, ensemble, exactTStar,
        };
        cmd.SetAction(pr => CliHost.Run(ct => CommonOptions.Capped(pr.GetValue(memory), () => Execute(new ScramblingRunOptions
        {
            Model = pr.GetValue(model),
            Probe = pr.GetValue(probe),
            OutputFolder = pr.GetValue(outDir),
            Effort = pr.GetValue(effort) switch { "quick" => RunEffort.Quick, "thorough" => RunEffort.Thorough, _ => RunEffort.Standard },
            MemoryBytes = pr.GetValue(memory),
            Threads = CommonOptions.ThreadsOrDefault(pr.GetValue(threads)),
            Time = pr.GetValue(time),
            RunExact = !pr.GetValue(noExact),
            RunLanczos = !pr.GetValue(noLanczos),
            RunDiagnosis = !pr.GetValue(noDiagnosis),
            ExactScramblingTime = pr.GetValue(exactTStar),
        }, pr.GetValue(set) ?? [], pr.GetValue(sweep), pr.GetValue(ensemble)!, ct))));
        return cmd;
    }

    private static int Execute(ScramblingRunOptions options, string[] sets, string? sweep, string ensemble, CancellationToken ct)
    {
        // Random circuits and Brownian counterparts: the ensemble route (docs/ensembles.md).
        string effortName = options.Effort.ToString().ToLowerInvariant();
        if (options.Model is { } modelArg && OpGrowth.Ensembles.ShippedCircuits.TryResolve(modelArg) is { } circuitPath && OpGrowth.Ensembles.CircuitLoader.IsCircuitFile(circuitPath))
            return EnsembleCommand.Execute(circuitPath, sets, options.OutputFolder, effortName, null, 1, options.Threads, options.Time, 1, "auto", sweep, null, ct);
        if (ensemble == "brownian")
            return EnsembleCommand.Execute(options.Model ?? ScramblingRunOptions.DefaultModel, sets, options.OutputFolder, effortName, null, 1, options.Threads, options.Time, 1, "auto", sweep, null, ct);
        string path = ShippedModels.Resolve(options.Model ?? ScramblingRunOptions.DefaultModel);
        var overrides = ModelLoader.ParseOverrides(sets, path);
        var sizes = new List<int>();
        if (sweep is not null)
        {
            var parts = sweep.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            if (parts.Length == 0) throw new InputException($"--sweep: found '{sweep}'; expected sizes such as 8,10,12");
            foreach (var part in parts)
            {
                if (!int.TryParse(part, NumberStyles.None, Inv, out int n) || n < 2 || n > 1024) throw new InputException($"--sweep: found '{part}'; expected sizes N in 2..1024 such as 8,10,12");
                sizes.Add(n);
            }
        }
        using var lf = CliHost.CreateLoggerFactory();
        // The battery's own progress lines appear only with -v; its result is reported below and in the report.
        using var battery = CliHost.CreateLoggerFactory(LogLevel.Warning);
        var log = lf.CreateLogger("run");
        options = options with
        {
            Model = path,
            Overrides = overrides,
            SweepSizes = sizes,
            Logger = log,
            DiagnosisLogger = battery.CreateLogger("diagnose"),
        };
        ScramblingRunResult result;
        if (CliHost.FancyProgress)
        {
            var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Error) });
            ScramblingRunResult? r = null;
            console.Progress()
                .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new ElapsedTimeColumn(), new RemainingTimeColumn())
                .Start(ctx => r = ScramblingRun.Execute(options with { Logger = null, Progress = new SpectreProgress(ctx) }, ct));
            result = r!;
        }
        else
        {
            result = ScramblingRun.Execute(options with { Progress = CliHost.Verbosity == Verbosity.Quiet ? null : new LogProgress(log) }, ct);
        }
        CliHost.Out.Write(Summary(result));
        if (ensemble == "both" && !result.Cancelled && result.Evolution is { } ev && ev.Figures.Count > 0)
        {
            var recs = ev.Main.Records;
            var stat = new OpGrowth.Ensembles.StaticComparison($"static model (truncated, {ev.Main.Budget.MaxStrings:N0} strings)", recs.Select(x => x.Time).ToArray(), recs.Select(x => x.MeanSize).ToArray(), ev.Figures[0], recs[^1].DiscardedTotal);
            EnsembleCommand.Execute(path, sets, Path.Combine(result.Folder, "brownian"), effortName, null, 1, options.Threads, result.EvolutionOptions.Time, 1, "auto", null, stat, ct);
        }
        if (result.Cancelled) throw new OperationCanceledException();
        if (result.Evolution is { ResourceLimited: true } e) throw new ResourceLimitException($"{e.StopReason} (partial report written to {result.Folder})");
        return ExitCodes.Ok;
    }

    /// <summary>The console summary: every figure once, in the report's words.</summary>
    internal static string Summary(ScramblingRunResult r)
    {
        var o = new StringWriter(Inv);
        double seconds = r.TimingsSeconds.Values.Sum();
        o.WriteLine($"{r.Model.Name} (N = {r.Model.N}{(r.Model.SizeMeasure == SizeMeasure.Majoranas ? $" qubits, {2 * r.Model.N} Majoranas" : "")}), probe {r.Problem.Initial[0].String}, effort {r.Options.Effort.ToString().ToLowerInvariant()}: {(r.Completed ? "completed" : "stopped early (" + r.StopReason + ")")} in {NumberFormat.Duration(TimeSpan.FromSeconds(seconds))}");
        if (r.Verdict is { } verdict) o.WriteLine($"  {RunReport.VerdictText(verdict).Replace("Verdict: ", "verdict: ", StringComparison.Ordinal)}");
        foreach (var h in r.Headlines.Where(h => r.ScramblingTime is null || h.Name != RunReport.ScramblingTimeName)) o.WriteLine("  " + EvolutionHeadlines.Line(h));
        if (r.ScramblingTime is { } st) o.WriteLine($"  {EvolutionHeadlines.ScramblingTime}: {st.Text()}");
        if (r.FreeFermion is { } ff) o.WriteLine($"  {ff.Text()}");
        if (r.Evolution is { } evo && evo.Figures.Count > 0 && evo.Main.Records.Count > 0)
        {
            var ts = evo.Figures[0].ScramblingTime;
            var last = evo.Main.Records[^1];
            if (ts.Value is null && r.ScramblingTime is null && r.FreeFermion is null)
                o.WriteLine($"  {EvolutionHeadlines.ScramblingTime}: not reached by t = {NumberFormat.Number(last.Time, 3)} (mean size {NumberFormat.Number(last.MeanSize, 3)} of 3N/8 = {NumberFormat.Number(ts.Target, 3)})");
            o.WriteLine($"  {EvolutionHeadlines.DiscardedWeight}: {EvolutionHeadlines.DiscardedText(evo)}");
        }
        foreach (var v in r.Verdicts.Where(v => !v.Test.StartsWith("overall", StringComparison.Ordinal)))
            o.WriteLine($"  test: {v.Test}: {v.Verdict}");
        int failed = r.Checks.Count(c => !c.Passed);
        o.WriteLine($"  checks: {r.Checks.Count - failed} of {r.Checks.Count} passed");
        foreach (var c in r.Checks.Where(c => !c.Passed)) o.WriteLine($"  check FAILED: {c.Name}: {c.Figure.FormatValue()} ({c.Tolerance})");
        if (r.Diagnosis is { } d)
        {
            o.WriteLine("  diagnosis battery (its own runs on smaller members; figures in the report's Diagnosis section):");
            o.WriteLine("    " + string.Join("; ", d.Tests.Select(t => $"{t.Number} {t.Name}: {RunStages.OutcomeText(t.Outcome)}")));
        }
        else if (r.DiagnosisSkipReason is { } why) o.WriteLine($"  diagnosis battery: {why}");
        if (r.Sweep?.Series is { } sw)
        {
            foreach (var a in sw.Data)
                o.WriteLine(a.TStar is double ts ? $"  t*(N = {a.N}) = {NumberFormat.ValueWithUncertainty(ts, a.TStarTotalError)}{(a.Converged ? "" : " (not converged)")}" : $"  t*(N = {a.N}): not reached");
            if (sw.Comparison is { } c) o.WriteLine($"  t*(N): {c.Verdict}");
            else if (sw.Note is { } note) o.WriteLine($"  t*(N): {note}");
        }
        if (r.CrossCheck is { Ran: false } x) o.WriteLine($"  exact cross-check skipped: {x.SkipReason}");
        o.WriteLine($"report: {ShortPath(Path.Combine(r.Folder, "report.html"))}");
        return o.ToString();
    }

    /// <summary>A path relative to the working folder when it lies inside it, else the full path.</summary>
    private static string ShortPath(string path)
    {
        var rel = Path.GetRelativePath(Environment.CurrentDirectory, path);
        return rel.StartsWith("..", StringComparison.Ordinal) || Path.IsPathRooted(rel) ? path : rel;
    }

    private sealed class SpectreProgress(ProgressContext ctx) : IProgress<RunProgress>
    {
        private readonly Dictionary<string, ProgressTask> _tasks = [];

        public void Report(RunProgress p)
        {
            if (!_tasks.TryGetValue(p.Stage, out var task))
            {
                task = ctx.AddTask(p.Stage, maxValue: 1000);
                _tasks[p.Stage] = task;
            }
            task.Value = Math.Round(1000 * p.Fraction);
            task.Description = $"{p.Stage}: {Markup.Escape(p.Detail)}";
        }
    }

    /// <summary>Plain log lines: each stage's start and end, and at most one line per 10 seconds in between.</summary>
    private sealed class LogProgress(ILogger log) : IProgress<RunProgress>
    {
        private DateTime _last = DateTime.MinValue;

        public void Report(RunProgress p)
        {
            var now = DateTime.UtcNow;
            bool edge = p.Fraction is 0 or 1;
            if (!edge && (now - _last).TotalSeconds < 10) return;
            _last = now;
            log.LogInformation("{Stage}: {Percent:0}% {Detail}{Eta}", p.Stage, 100 * p.Fraction, p.Detail,
                p.Remaining is TimeSpan r ? " eta " + r.ToString(@"hh\:mm\:ss", Inv) : "");
        }
    }
}
