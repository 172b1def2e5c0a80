using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pipeline;
using Spectre.Console;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth run [MODEL]</c>: the whole job in one command (evolution with the convergence ladder, Lanczos,
/// exact cross-check, report folder). With no model it runs the shipped demo's lead candidate.
/// </summary>
internal static class RunCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var model = new Argument<string?>("MODEL") { Description = $"Model file (.toml) or shipped model name (default: {ScramblingRunOptions.DefaultModel}).", Arity = ArgumentArity.ZeroOrOne };
        var set = new Option<string[]>("--set") { Description = "Override a model parameter: NAME=VALUE. Repeat for several.", Arity = ArgumentArity.ZeroOrMore, AllowMultipleArgumentsPerToken = false };
        var outDir = new Option<string?>("--out") { Description = "Report folder (default: ./opgrowth-report/<model name>)." };
        var effort = new Option<string>("--effort") { Description = "quick (seconds; a first look), standard (a few minutes for the demo on a laptop), thorough (larger budgets, longer times).", DefaultValueFactory = _ => "standard" };
        effort.AcceptOnlyFromAmong("quick", "standard", "thorough");
        var memory = new Option<long?>("--memory") { Description = "Memory budget, e.g. 8GiB or 512MiB (default: half of the machine).", CustomParser = ParseMemory };
        var threads = new Option<int>("--threads") { Description = "Worker threads.", DefaultValueFactory = _ => Environment.ProcessorCount };
        var time = new Option<double?>("--time") { Description = "Final evolution time (default: the effort's)." };
        var noExact = new Option<bool>("--no-exact") { Description = "Skip the exact cross-check at small N." };
        var noLanczos = new Option<bool>("--no-lanczos") { Description = "Skip the Lanczos coefficients." };
        var noDiagnosis = new Option<bool>("--no-diagnosis") { Description = "Skip the diagnosis battery." };
        var sweep = new Option<string?>("--sweep") { Description = "Also run t*(N) at these sizes, e.g. 8,10,12, and fit t* = a + b ln N against t* = a + N/v (results kept in <out>/sweep; a rerun reuses finished sizes)." };
        var exactTStar = new Option<bool>("--exact-tstar") { Description = "Measure t* at the model's own N with the exact engine even when it exceeds the effort's budget (the cost estimate is logged before it starts; --effort thorough always does)." };
        var ensemble = new Option<string>("--ensemble") { Description = "static (the model as written), brownian (its white-noise counterpart, as opgrowth ensemble), or both side by side at the same N (counterpart report in <out>/brownian). A circuit file always runs its random-circuit ensemble.", DefaultValueFactory = _ => "static" };
        ensemble.AcceptOnlyFromAmong("static", "brownian", "both");
        var cmd = new Command("run",
            "From a model to a scrambling report in one command: Heisenberg evolution of the model's first probe with the convergence ladder " +
            "(size growth, OTOC light cone, v_B or growth rate, saturation, t*), Lanczos coefficients with their growth class, and the Pauli engine " +
            "checked against the exact engine at a small N of the same family, a bounded diagnosis battery (does it scramble, and if not, why), and optionally t*(N). Writes report.html, report.md, figures, results.json, CSV series and manifest.json.\n\n" +
            "Examples:\n  opgrowth run\n  opgrowth run mixed-field-ising --set N=10 --effort quick --out runs/mfi\n  opgrowth run demo/tilted-chain --sweep 8,10,12")
        {
            model, set, outDir, effort, memory, threads, time, noExact, noLanczos, noDiagnosis, sweep, ensemble, exactTStar,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(pr.GetValue(model), pr.GetValue(set) ?? [], pr.GetValue(outDir), pr.GetValue(effort)!, pr.GetValue(memory),
            pr.GetValue(threads), pr.GetValue(time), pr.GetValue(noExact), pr.GetValue(noLanczos), pr.GetValue(noDiagnosis), pr.GetValue(sweep), pr.GetValue(ensemble)!, ct, pr.GetValue(exactTStar))));
        return cmd;
    }

    private static long? ParseMemory(ArgumentResult result)
    {
        string raw = result.Tokens.Count > 0 ? result.Tokens[0].Value : "";
        try
        {
            return MemoryBudget.Parse(raw);
        }
        catch (InputException ex)
        {
            result.AddError("--memory: " + ex.Message);
            return null;
        }
    }

    private static int Execute(string? modelArg, string[] sets, string? outDir, string effort, long? memory, int threads, double? time, bool noExact, bool noLanczos, bool noDiagnosis, string? sweep, string ensemble, CancellationToken ct, bool exactTStar = false)
    {
        // Random circuits and Brownian counterparts: the ensemble route (docs/ensembles.md).
        if (modelArg is not null && OpGrowth.Ensembles.ShippedCircuits.TryResolve(modelArg) is { } circuitPath && OpGrowth.Ensembles.CircuitLoader.IsCircuitFile(circuitPath))
            return EnsembleCommand.Execute(circuitPath, sets, outDir, effort, null, 1, threads, time, 1, "auto", sweep, null, ct);
        if (ensemble == "brownian")
            return EnsembleCommand.Execute(modelArg ?? ScramblingRunOptions.DefaultModel, sets, outDir, effort, null, 1, threads, time, 1, "auto", sweep, null, ct);
        string path = ShippedModels.Resolve(modelArg ?? ScramblingRunOptions.DefaultModel);
        var overrides = ModelLoader.ParseOverrides(sets, path);
        var sizes = EnsembleCommand.ParseSizes(sweep);
        using var lf = CliHost.CreateLoggerFactory(LogLevel.Information);
        var log = lf.CreateLogger("run");
        var options = new ScramblingRunOptions
        {
            Model = path,
            Overrides = overrides,
            OutputFolder = outDir,
            Effort = effort switch { "quick" => RunEffort.Quick, "thorough" => RunEffort.Thorough, _ => RunEffort.Standard },
            MemoryBytes = memory,
            Threads = threads,
            Time = time,
            RunExact = !noExact,
            RunLanczos = !noLanczos,
            RunDiagnosis = !noDiagnosis,
            SweepSizes = sizes,
            ExactScramblingTime = exactTStar,
            Logger = log,
        };
        bool fancy = !Console.IsErrorRedirected && string.IsNullOrEmpty(Environment.GetEnvironmentVariable("CI")) && ReferenceEquals(CliHost.Err, Console.Error);
        ScramblingRunResult result;
        if (fancy)
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
            result = ScramblingRun.Execute(options with { Progress = new LogProgress(log) }, ct);
        }
        var o = CliHost.Out;
        o.WriteLine($"{result.Model.Name} (N = {result.Model.N}), probe {result.Problem.Initial[0].String}, effort {effort}");
        if (result.Verdict is { } verdict)
            o.WriteLine($"  VERDICT: {verdict.Outcome}{(verdict.Mechanism == "-" ? "" : $" (leading mechanism: {verdict.Mechanism})")} [{verdict.Source}]");
        foreach (var h in result.Headlines) o.WriteLine($"  {h.Name}: {h.Value.FormatValue()}{(h.Converged ? "" : " (not converged)")}");
        if (result.ScramblingTime is { } st) o.WriteLine($"  {st.Text()}");
        foreach (var v in result.Verdicts) o.WriteLine($"  verdict: {v.Test}: {v.Verdict}");
        foreach (var c in result.Checks) o.WriteLine($"  check: {c.Name}: {(c.Passed ? "passed" : "FAILED")}");
        if (result.Diagnosis is { } d)
            foreach (var t in d.Tests) o.WriteLine($"  diagnosis {t.Number} {t.Name}: {OpGrowth.Diagnosis.MechanismNames.Of(t.Outcome)} ({t.Figure})");
        if (result.Sweep?.Series is { } sw)
        {
            foreach (var a in sw.Data) o.WriteLine(a.TStar is double ts ? FormattableString.Invariant($"  t*(N = {a.N}) = {OpGrowth.Reporting.NumberFormat.ValueWithUncertainty(ts, a.TStarTotalError)}") : $"  t*(N = {a.N}) not reached");
            if (sw.Comparison is { } c) o.WriteLine($"  t*(N): {c.Verdict}");
        }
        if (result.CrossCheck is { Ran: false } x) o.WriteLine($"  exact cross-check skipped: {x.SkipReason}");
        o.WriteLine($"report: {Path.Combine(result.Folder, "report.html")}");
        if (ensemble == "both" && !result.Cancelled && result.Evolution is { } ev && ev.Figures.Count > 0)
        {
            var recs = ev.Main.Records;
            var stat = new OpGrowth.Ensembles.StaticComparison($"static model (truncated, {ev.Main.Budget.MaxStrings:N0} strings)", recs.Select(x => x.Time).ToArray(), recs.Select(x => x.MeanSize).ToArray(), ev.Figures[0], recs[^1].DiscardedTotal);
            EnsembleCommand.Execute(path, sets, Path.Combine(result.Folder, "brownian"), effort, null, 1, threads, result.EvolutionOptions.Time, 1, "auto", null, stat, ct);
        }
        if (result.Cancelled) throw new OperationCanceledException();
        if (result.Evolution is { ResourceLimited: true } e) throw new ResourceLimitException($"{e.StopReason} (partial report written to {result.Folder})");
        return ExitCodes.Ok;
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
