using System.CommandLine;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Sweeps;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth sweep PLAN.toml</c>: runs every point of a sweep plan (sizes, parameters, seeds, probes)
/// on this machine, one point of it (<c>--task-index</c>, for cluster array tasks), or writes and submits
/// a Slurm job array; then merges the results (as <c>opgrowth collect</c>).
/// </summary>
internal static class SweepCommand
{
    public static Command Create()
    {
        var plan = new Argument<string?>("PLAN") { Description = "Sweep plan (TOML). Optional when --model and --sizes are given.", Arity = ArgumentArity.ZeroOrOne };
        var results = CommonOptions.Out("Results folder (shared with array tasks) [default: results/<plan name>].");
        var jobs = new Option<int?>("--jobs") { Description = "Points to run at the same time [default: the number of cores]." };
        var memory = CommonOptions.Memory();
        var threads = CommonOptions.Threads();
        var model = new Option<string[]>("--model") { Description = "Model file to sweep (repeatable); replaces the plan's models.", Arity = ArgumentArity.ZeroOrMore };
        var sizes = new Option<string?>("--sizes") { Description = "Sizes N: a list 8,12,16 or a range from:to[:step] such as 8:32:4; replaces the plan's sizes." };
        var seeds = new Option<string?>("--seeds") { Description = "Disorder seeds: a list 1,2,3 or a range 1:8; replaces the plan's seeds." };
        var probe = new Option<string[]>("--probe") { Description = "Operator to evolve (repeatable), e.g. Z_0, Z_{N-1} or model:0 (the model's first probe at each N); replaces the plan's probes.", Arity = ArgumentArity.ZeroOrMore };
        var grid = new Option<string[]>("--grid") { Description = "Parameter grid NAME=v1,v2 or NAME=from:to:step (repeatable); replaces that parameter's values.", Arity = ArgumentArity.ZeroOrMore };
        var engine = new Option<string?>("--engine") { Description = "Engine: auto (exact at small N, Pauli beyond), pauli, exact, or synthetic (a closed-form stand-in to try the machinery)." };
        var time = new Option<double?>("--time") { Description = "Final time of every run; for a periodic drive, the number of periods." };
        var dt = new Option<double?>("--dt") { Description = "Time step." };
        var maxStrings = new Option<long?>("--max-strings") { Description = "String budget of the Pauli engine (the strings of largest |c| kept after every pass)." };
        var budgets = new Option<int?>("--budgets") { Description = "Budgets in the budget series (1-3): also rerun at half (and a quarter) of --max-strings for the truncation uncertainty." };
        var taskIndex = new Option<int?>("--task-index") { Description = "Run only the point with this index (0-based, plan order): what each Slurm array task does." };
        var noFigures = new Option<bool>("--no-figures") { Description = "Do not draw the t*(N) figures when collecting at the end." };
        var dryRun = new Option<bool>("--dry-run") { Description = "List the points (index, id, state, memory estimate) and stop." };
        var slurmScript = new Option<string?>("--slurm-script") { Description = "Write a Slurm job-array script (one task per point) to this file instead of running locally." };
        var submit = new Option<bool>("--submit") { Description = "Submit the script with sbatch." };
        var wait = new Option<bool>("--wait") { Description = "After --submit, wait until the array has finished, then collect." };
        var waitMinutes = new Option<double>("--wait-minutes") { Description = "Give up waiting after this many minutes.", DefaultValueFactory = _ => 24 * 60 };
        var slurmTime = new Option<string?>("--slurm-time") { Description = "Wall-time limit per task, e.g. 02:00:00." };
        var slurmPartition = new Option<string?>("--slurm-partition") { Description = "Partition to submit to." };
        var slurmCpus = new Option<int>("--slurm-cpus") { Description = "CPUs per task (the point's threads).", DefaultValueFactory = _ => 1 };
        var slurmMaxRunning = new Option<int?>("--slurm-max-running") { Description = "At most this many tasks at once." };
        var slurmOption = new Option<string[]>("--slurm-option") { Description = "Extra #SBATCH line, e.g. --slurm-option=--account=phys (repeatable).", Arity = ArgumentArity.ZeroOrMore };
        var cmd = new Command("sweep",
            "Run a sweep of scrambling times over sizes N, parameters, disorder seeds and probes; results go to one JSON file per point,\n" +
            "finished points are skipped on rerun, and the merged table and the t*(N) fits (ln N against linear) are written at the end.\n" +
            "--threads is shared by the points that run at once (--jobs); --memory is what they may use together.")
        {
            plan, results, jobs, memory, threads, model, sizes, seeds, probe, grid, engine, time, dt, maxStrings, budgets, taskIndex, dryRun, noFigures,
            slurmScript, submit, wait, waitMinutes, slurmTime, slurmPartition, slurmCpus, slurmMaxRunning, slurmOption,
        };
        cmd.SetAction(pr => CliHost.Run(ct =>
        {
            CommonOptions.ApplyMemoryCap(pr.GetValue(memory));
            var p = BuildPlan(pr.GetValue(plan), pr.GetValue(model) ?? [], pr.GetValue(sizes), pr.GetValue(seeds), pr.GetValue(probe) ?? [],
                pr.GetValue(grid) ?? [], pr.GetValue(engine), pr.GetValue(time), pr.GetValue(dt), pr.GetValue(maxStrings), pr.GetValue(budgets));
            string dir = Path.GetFullPath(pr.GetValue(results) ?? Path.Combine("results", p.Name));
            using var lf = CliHost.CreateLoggerFactory();
            var log = lf.CreateLogger("sweep");
            bool figures = !pr.GetValue(noFigures);
            if (pr.GetValue(jobs) is < 1) throw new InputException($"--jobs: found {pr.GetValue(jobs)}; expected at least 1");
            if (pr.GetValue(taskIndex) is int k) return RunTask(p, dir, k, pr.GetValue(threads), log, ct);
            if (pr.GetValue(dryRun)) return DryRun(p, dir, pr.GetValue(jobs), pr.GetValue(threads), log);
            if (pr.GetValue(slurmScript) is string script)
            {
                var so = new SlurmOptions
                {
                    JobName = "og-" + p.Name,
                    CpusPerTask = Math.Max(1, pr.GetValue(slurmCpus)),
                    TimeLimit = pr.GetValue(slurmTime),
                    Partition = pr.GetValue(slurmPartition),
                    MaxConcurrent = pr.GetValue(slurmMaxRunning),
                    ExtraDirectives = pr.GetValue(slurmOption) ?? [],
                };
                return Slurm(p, dir, script, so, pr.GetValue(submit), pr.GetValue(wait), pr.GetValue(waitMinutes), figures, log, ct);
            }
            if (pr.GetValue(submit) || pr.GetValue(wait)) throw new InputException("found --submit or --wait without --slurm-script; expected --slurm-script FILE --submit [--wait]");
            return RunLocal(p, dir, pr.GetValue(jobs), pr.GetValue(memory), pr.GetValue(threads), figures, log, ct);
        }));
        return cmd;
    }

    /// <summary>The plan file (if any) with the command-line ranges applied.</summary>
    internal static SweepPlan BuildPlan(string? planFile, string[] models, string? sizes, string? seeds, string[] probes, string[] grids,
        string? engine, double? time, double? dt, long? maxStrings, int? budgets)
    {
        SweepPlan p;
        if (planFile is not null) p = SweepPlanReader.Load(planFile);
        else
        {
            if (models.Length == 0 || sizes is null) throw new InputException("found neither a plan file nor --model and --sizes; expected 'opgrowth sweep PLAN.toml' or 'opgrowth sweep --model FILE --sizes 8:16:4'");
            p = new SweepPlan { Name = Path.GetFileNameWithoutExtension(models[0]) + "-sweep" };
        }
        if (models.Length > 0)
        {
            var files = new List<string>();
            foreach (string m in models)
            {
                files.Add(Path.GetFullPath(Models.ShippedModels.Resolve(m)));
            }
            p = p with { ModelFiles = files };
        }
        if (sizes is not null)
        {
            var list = SweepPlanReader.ParseIntRange(sizes, "--sizes");
            if (list.Any(n => n < 2 || n > SweepPlanReader.MaxN)) throw new InputException($"found --sizes '{sizes}'; expected sizes N in 2..{SweepPlanReader.MaxN}");
            p = p with { Sizes = list.Select(n => (int)n).Distinct().ToArray() };
        }
        if (seeds is not null) p = p with { Seeds = SweepPlanReader.ParseIntRange(seeds, "--seeds").Distinct().ToArray() };
        if (probes.Length > 0)
        {
            foreach (string pr in probes)
            {
                foreach (int n in p.Sizes)
                {
                    if (!ProbeTemplate.TryResolve(pr, n, out _, out string? err)) throw new InputException($"--probe: {err}");
                }
            }
            p = p with { Probes = probes.Distinct().ToArray() };
        }
        if (grids.Length > 0)
        {
            var axes = p.Parameters.ToList();
            foreach (string g in grids)
            {
                var axis = SweepPlanReader.ParseGrid(g);
                if (axis.Name == "N" || axis.Name == p.SeedParameter) throw new InputException($"found --grid {axis.Name}=...; expected N in --sizes and seeds in --seeds");
                axes.RemoveAll(a => a.Name == axis.Name);
                axes.Add(axis);
            }
            p = p with { Parameters = axes };
        }
        var e = p.Engine;
        if (engine is not null)
        {
            if (!SweepPlanReader.Engines.Contains(engine)) throw new InputException($"found --engine '{engine}'; expected one of {string.Join(", ", SweepPlanReader.Engines)}");
            e = e with { Engine = Enum.Parse<EngineChoice>(engine, ignoreCase: true) };
        }
        if (time is double t)
        {
            if (!(t > 0 && double.IsFinite(t))) throw new InputException($"found --time {t}; expected a positive final time");
            e = e with { Time = t };
        }
        if (dt is double d)
        {
            if (!(d > 0 && d <= e.Time)) throw new InputException($"found --dt {d}; expected a positive step no larger than the final time");
            e = e with { Dt = d };
        }
        if (e.Time / e.Dt > OpGrowth.Evolution.OperatorEvolution.MaxSteps)
            throw new InputException($"found --time {e.Time.ToString(CultureInfo.InvariantCulture)} with --dt {e.Dt.ToString(CultureInfo.InvariantCulture)} ({e.Time / e.Dt:G3} steps); expected at most {OpGrowth.Evolution.OperatorEvolution.MaxSteps:N0} steps per point");
        if (maxStrings is long ms)
        {
            if (ms < 1) throw new InputException($"found --max-strings {ms}; expected at least 1");
            e = e with { MaxStrings = ms };
        }
        if (budgets is int l)
        {
            if (l is < 1 or > 3) throw new InputException($"--budgets: found {l}; expected 1, 2 or 3");
            e = e with { Budgets = l };
        }
        p = p with { Engine = e };
        if (models.Length > 0 || grids.Length > 0 || seeds is not null) SweepPlanReader.CheckParameters(p, null);
        return p;
    }

    private static int RunLocal(SweepPlan plan, string dir, int? jobs, long? memory, int? threads, bool figures, ILogger log, CancellationToken ct)
    {
        var points = plan.Expand();
        var store = Prepare(plan, points, dir, log);
        int total = CommonOptions.ThreadsOrDefault(threads);
        int j = Math.Max(1, jobs ?? Environment.ProcessorCount);
        int th = Math.Max(1, total / j);
        long budget = memory ?? CommonOptions.DefaultMemory;
        var runner = PointRunners.Create(th, log);
        var outcome = new SweepExecutor(store, runner, log).Run(points, new SweepExecution(j, budget), ct);
        int code = Collect(dir, log, figures);
        if (outcome.Failed.Count > 0)
        {
            foreach (var f in outcome.Failed) CliHost.Err.WriteLine($"point {f.Index} ({f.Point}) failed: {CliHost.OneLine(f.Message)}");
            return outcome.Failed.Any(f => f.Kind == "resource-limit") ? ExitCodes.ResourceLimit : ExitCodes.Internal;
        }
        return code;
    }

    private static int RunTask(SweepPlan plan, string dir, int index, int? threads, ILogger log, CancellationToken ct)
    {
        var points = plan.Expand();
        if (index < 0 || index >= points.Count) throw new InputException($"found --task-index {index}; expected 0..{points.Count - 1} (the plan has {points.Count} points)");
        int th = threads ?? (int.TryParse(Environment.GetEnvironmentVariable("SLURM_CPUS_PER_TASK"), NumberStyles.None, CultureInfo.InvariantCulture, out int c) && c > 0 ? c : Environment.ProcessorCount);
        var store = new PointStore(dir, log);
        var runner = PointRunners.Create(th, log);
        var outcome = new SweepExecutor(store, runner, log).Run([points[index]], new SweepExecution(1, long.MaxValue), ct);
        if (outcome.Failed.Count > 0)
        {
            CliHost.Err.WriteLine($"point {index} failed: {CliHost.OneLine(outcome.Failed[0].Message)}");
            return outcome.Failed[0].Kind == "resource-limit" ? ExitCodes.ResourceLimit : ExitCodes.Internal;
        }
        return ExitCodes.Ok;
    }

    private static int DryRun(SweepPlan plan, string dir, int? jobs, int? threads, ILogger log)
    {
        var points = plan.Expand();
        var store = new PointStore(dir);
        int th = Math.Max(1, CommonOptions.ThreadsOrDefault(threads) / Math.Max(1, jobs ?? Environment.ProcessorCount));
        var runner = PointRunners.Create(th, log);
        CliHost.Out.WriteLine("index  id                state     memory     time       point");
        double total = 0;
        foreach (var p in points)
        {
            string state = File.Exists(store.PathOf(p.Id)) ? (store.TryRead(store.PathOf(p.Id), out _) is not null ? "done" : "corrupt") : "todo";
            string mem, time = "-";
            try
            {
                mem = SweepExecutor.FormatBytes(runner.EstimateMemoryBytes(p));
                if (state != "done" && runner.EstimateSeconds(p) is double sec)
                {
                    time = SweepExecutor.FormatDuration(sec);
                    total += sec;
                }
            }
            catch (InputException ex)
            {
                mem = "n/a: " + ex.Problem;
            }
            CliHost.Out.WriteLine($"{p.Index,5}  {p.Id}  {state,-8}  {mem,-9}  {time,-9}  {p}");
        }
        if (total > 0) CliHost.Out.WriteLine($"estimated time of the points to run: {SweepExecutor.FormatDuration(total)} on {th} thread(s) per point (exact-engine t* points; others are not estimated)");
        return ExitCodes.Ok;
    }

    private static int Slurm(SweepPlan plan, string dir, string scriptPath, SlurmOptions so, bool submit, bool wait, double waitMinutes,
        bool figures, ILogger log, CancellationToken ct)
    {
        var points = plan.Expand();
        var store = Prepare(plan, points, dir, log);
        var runner = PointRunners.Create(so.CpusPerTask, log);
        long mem = points.Max(p => runner.EstimateMemoryBytes(p));
        so = so with { MemoryPerTaskBytes = mem + (256L << 20) };
        double longest = points.Select(p => runner.EstimateSeconds(p) ?? 0).DefaultIfEmpty(0).Max();
        if (longest > 0)
        {
            log.LogInformation("longest point estimated at {Time} on {Cpus} CPU(s) per task", SweepExecutor.FormatDuration(longest), so.CpusPerTask);
            if (so.TimeLimit is null)
            {
                // Twice the estimate plus 10 minutes, rounded up to whole minutes (the estimate is not a guarantee).
                int minutes = (int)Math.Ceiling(2 * longest / 60) + 10;
                so = so with { TimeLimit = $"{minutes / 60:00}:{minutes % 60:00}:00" };
                log.LogInformation("--slurm-time not given: per-task limit set to {Limit} (twice the longest estimate plus 10 minutes)", so.TimeLimit);
            }
        }
        string script = Path.GetFullPath(scriptPath);
        string text = SlurmArray.Script(store.PlanPath, store.Root, points.Count, SelfCommand(), so);
        SlurmArray.WriteScript(script, text, store.Root);
        log.LogInformation("wrote {Script}: a job array of {Count} tasks, results in {Dir}", script, points.Count, store.Root);
        if (!submit)
        {
            if (wait) throw new InputException("found --wait without --submit; expected --submit --wait");
            CliHost.Out.WriteLine(script);
            return ExitCodes.Ok;
        }
        string job = SlurmArray.Submit(script, log);
        CliHost.Out.WriteLine(job);
        if (!wait) return ExitCodes.Ok;
        if (!SlurmArray.Wait(job, TimeSpan.FromMinutes(waitMinutes), TimeSpan.FromSeconds(2), log, ct))
        {
            CliHost.Err.WriteLine($"job {job} still running after {waitMinutes} minutes; collect later with: opgrowth collect {dir}");
            return ExitCodes.CheckFailed;
        }
        int code = Collect(dir, log, figures);
        int missing = points.Count(p => !File.Exists(store.PathOf(p.Id)));
        if (missing > 0)
        {
            CliHost.Err.WriteLine($"{missing} of {points.Count} points have no result after job {job}; see the task logs in {Path.Combine(dir, "slurm")} and resubmit (finished points are skipped)");
            return ExitCodes.CheckFailed;
        }
        return code;
    }

    /// <summary>Creates the results folder with the resolved plan and the manifest of points.</summary>
    private static PointStore Prepare(SweepPlan plan, IReadOnlyList<SweepPoint> points, string dir, ILogger log)
    {
        var store = new PointStore(dir, log);
        Directory.CreateDirectory(store.PointsDirectory);
        store.RemoveStaleTemporaryFiles(TimeSpan.FromMinutes(10));
        AtomicFile.WriteAllText(store.PlanPath, plan.ToToml());
        SweepManifest.From(plan, points).Save(store.ManifestPath);
        return store;
    }

    /// <summary>Collects and prints the summary; returns the exit code.</summary>
    internal static int Collect(string dir, ILogger log, bool figures = true)
    {
        var c = SweepCollector.Collect(dir, log);
        var files = c.Write(dir).ToList();
        if (figures) files.AddRange(SweepFigures.Write(c, dir));
        log.LogInformation("wrote {Files}", string.Join(", ", files.Select(f => Path.GetRelativePath(dir, f))));
        CliHost.Out.Write(c.Summary());
        return ExitCodes.Ok;
    }

    /// <summary>How to start this program again (for array tasks): the apphost, or dotnet plus the assembly.</summary>
    internal static IReadOnlyList<string> SelfCommand()
    {
        string? host = Environment.ProcessPath;
        string dll = typeof(SweepCommand).Assembly.Location;
        if (host is null || Path.GetFileNameWithoutExtension(host).Equals("dotnet", StringComparison.OrdinalIgnoreCase)) return [host ?? "dotnet", dll];
        return [host];
    }
}
