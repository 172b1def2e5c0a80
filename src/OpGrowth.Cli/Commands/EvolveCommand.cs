using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pauli;
using Spectre.Console;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth evolve MODEL</c>: Heisenberg evolution O(t) = e^{iHt} O e^{-iHt} (or period by period for
/// a drive) in the Pauli-string basis with accounted truncation; writes evolve.json and CSV series
/// (each atomically) and prints a short summary with the derived scrambling figures.
/// </summary>
internal static class EvolveCommand
{
    private static readonly string[] Methods = ["trotter2", "trotter4", "rk4", "taylor"];
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var model = new Argument<string>("MODEL") { Description = "Model file (.toml) or the name of a shipped model (see 'opgrowth models')." };
        var set = new Option<string[]>("--set")
        {
            Description = "Override a model parameter: NAME=VALUE. Repeat for several.",
            Arity = ArgumentArity.ZeroOrMore,
            AllowMultipleArgumentsPerToken = false,
        };
        var probe = new Option<string?>("--probe") { Description = "Initial operator: a Pauli string such as \"Z_12\" or \"X_3 X_4\", or the index of one of the model's probes (default 0)." };
        var time = new Option<double>("--time") { Description = "Final time (for a drive: in units of the period's duration; rounded up to whole steps).", DefaultValueFactory = _ => 10 };
        var dt = new Option<double>("--dt") { Description = "Time step. Trotter2: global error O(dt^2); trotter4 and rk4: O(dt^4); taylor: exact to rounding at any dt (cost grows with dt). Ignored for drives (exact per period).", DefaultValueFactory = _ => 0.05 };
        var every = new Option<int?>("--record-every") { Description = "Record observables every this many steps (default: about 100 records over the run)." };
        var method = new Option<string>("--method") { Description = "trotter2 | trotter4 (norm-preserving Suzuki splittings over commuting groups) | rk4 (cross-check) | taylor (exact reference, small systems).", DefaultValueFactory = _ => "trotter2" };
        method.AcceptOnlyFromAmong(Methods);
        var threshold = new Option<double>("--threshold") { Description = "Drop strings with |c| below this after every pass. Biases late-time size and plateau low.", DefaultValueFactory = _ => 0 };
        var maxStrings = new Option<long?>("--max-strings") { Description = "Keep the M strings of largest |c| after every pass (default: as many as --memory holds)." };
        var memory = new Option<long?>("--memory")
        {
            Description = "Memory budget for the run's arrays, e.g. 8GiB, 512MiB (default: half of the machine). Never exceeded: a run that cannot hold its requested accuracy stops with exit code 3 and keeps its partial results.",
            CustomParser = ParseMemory,
        };
        var maxSize = new Option<int?>("--max-size") { Description = "Drop strings acting on more than K sites. WARNING: suppresses size growth by construction (mean size, growth rates and saturation biased low, t* late, size never above K)." };
        var damping = new Option<string?>("--damping") { Description = "DAOE damping GAMMA@LSTAR: multiply c_S by exp(-GAMMA (size - LSTAR)) per unit time for strings longer than LSTAR (Rakovszky, von Keyserlingk, Pollmann 2022). Biases long-string quantities (size, OTOC, front) low." };
        var ladder = new Option<int>("--ladder") { Description = "Convergence ladder: also rerun at half (and a quarter of) the budget and report how far each figure moved (its truncation uncertainty); 1 = off.", DefaultValueFactory = _ => 1 };
        var front = new Option<double>("--front-fraction") { Description = "Front threshold for v_B as a fraction of the scrambled site weight 3/4.", DefaultValueFactory = _ => 0.5 };
        var threads = new Option<int>("--threads") { Description = "Worker threads (results are identical at any count).", DefaultValueFactory = _ => Environment.ProcessorCount };
        var outDir = new Option<string?>("--out") { Description = "Output folder (default: evolve-<model>)." };
        var resume = new Option<bool>("--resume") { Description = "Continue from the checkpoints in the output folder (same model and options)." };
        var ckEvery = new Option<double>("--checkpoint-minutes") { Description = "Minutes between checkpoints (taken at record times); 0 = at every record.", DefaultValueFactory = _ => 5 };
        var noCk = new Option<bool>("--no-checkpoints") { Description = "Do not write checkpoints." };
        var keepCk = new Option<bool>("--keep-checkpoints") { Description = "Keep the checkpoints after a completed run (default: removed)." };

        var cmd = new Command("evolve",
            "Evolve an operator in the Heisenberg picture, O(t) = e^{iHt} O e^{-iHt}, in the Pauli-string basis (64 to 1024 qubits) with accounted truncation, " +
            "and read off scrambling: autocorrelation, size distribution, OTOCs against every single-site operator, the front and v_B, growth rates, saturation and t*.\n\n" +
            "Truncation biases: --threshold and --max-strings remove small coefficients (late-time size biased low); --max-size suppresses size growth by construction; " +
            "--damping suppresses long strings. Every step records the discarded weight; use --ladder 3 to measure how much each figure depends on the budget.\n\n" +
            "Examples:\n  opgrowth evolve mixed-field-ising --set N=128 --probe Z_64 --time 12 --max-strings 1000000 --ladder 3\n  opgrowth evolve kicked-ising --time 40 --memory 4GiB --out runs/kicked")
        {
            model, set, probe, time, dt, every, method, threshold, maxStrings, memory, maxSize, damping, ladder, front, threads, outDir, resume, ckEvery, noCk, keepCk,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(new Settings
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
            Ladder = pr.GetValue(ladder),
            FrontFraction = pr.GetValue(front),
            Threads = pr.GetValue(threads),
            Out = pr.GetValue(outDir),
            Resume = pr.GetValue(resume),
            CheckpointMinutes = pr.GetValue(ckEvery),
            NoCheckpoints = pr.GetValue(noCk),
            KeepCheckpoints = pr.GetValue(keepCk),
        }, ct)));
        return cmd;
    }

    private sealed record Settings
    {
        public required string Model { get; init; }
        public required string[] Sets { get; init; }
        public string? Probe { get; init; }
        public double Time { get; init; }
        public double Dt { get; init; }
        public int? RecordEvery { get; init; }
        public required string Method { get; init; }
        public double Threshold { get; init; }
        public long? MaxStrings { get; init; }
        public long? Memory { get; init; }
        public int? MaxSize { get; init; }
        public string? Damping { get; init; }
        public int Ladder { get; init; }
        public double FrontFraction { get; init; }
        public int Threads { get; init; }
        public string? Out { get; init; }
        public bool Resume { get; init; }
        public double CheckpointMinutes { get; init; }
        public bool NoCheckpoints { get; init; }
        public bool KeepCheckpoints { get; init; }
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

    /// <summary>Resolves the probe: a string on the model's qubits, or the index of a model probe.</summary>
    internal static PauliString ResolveProbe(Model m, string? text)
    {
        if (string.IsNullOrWhiteSpace(text)) return m.Probes[0];
        if (int.TryParse(text, NumberStyles.None, Inv, out int idx))
        {
            if (idx >= m.Probes.Count) throw new InputException($"--probe {idx}: the model has {m.Probes.Count} probe(s); expected an index 0..{m.Probes.Count - 1} or a Pauli string such as Z_3");
            return m.Probes[idx];
        }
        if (!PauliString.TryParse(text, m.N, out var s, out string? error)) throw new InputException($"--probe '{text}': {error}");
        if (s!.IsIdentity) throw new InputException($"--probe '{text}': found the identity; expected a non-identity Pauli string");
        return s;
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
        string path = ShippedModels.Resolve(st.Model);
        var overrides = ModelLoader.ParseOverrides(st.Sets, path);
        var model = ModelLoader.Load(path, overrides);
        var probe = ResolveProbe(model, st.Probe);
        var (gamma, lstar) = ParseDamping(st.Damping);
        if (!(st.FrontFraction > 0 && st.FrontFraction <= 1)) throw new InputException($"--front-fraction {st.FrontFraction}; expected a number in (0, 1]");
        if (st.CheckpointMinutes < 0) throw new InputException($"--checkpoint-minutes {st.CheckpointMinutes}; expected a non-negative number");
        string outDir = Path.GetFullPath(st.Out ?? $"evolve-{model.Name}");
        var method = st.Method switch
        {
            "trotter4" => IntegrationMethod.Trotter4,
            "rk4" => IntegrationMethod.Rk4,
            "taylor" => IntegrationMethod.Taylor,
            _ => IntegrationMethod.Trotter2,
        };
        double stepTime = model.Drive?.Period ?? st.Dt;
        long steps = stepTime > 0 ? (long)Math.Ceiling(st.Time / stepTime - 1e-9) : 0;
        int recordEvery = st.RecordEvery ?? (int)Math.Max(1, steps / 100);
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
            Time = st.Time,
            RecordEvery = recordEvery,
            Threads = st.Threads,
            LadderRungs = st.Ladder,
            Truncation = new TruncationPolicy
            {
                Threshold = st.Threshold,
                MaxStrings = st.MaxStrings,
                MemoryBytes = st.Memory,
                MaxSize = st.MaxSize,
                DampingRate = gamma,
                DampingMinSize = lstar,
            },
            CheckpointDirectory = st.NoCheckpoints ? null : Path.Combine(outDir, "checkpoints"),
            CheckpointInterval = TimeSpan.FromMinutes(st.CheckpointMinutes),
            Resume = st.Resume,
        };
        var geometry = new LatticeGeometry(model.N, model.Lattice.Distance, model.Lattice.IsOneDimensional, model.Lattice.Kind);
        var analysis = new ScramblingAnalysisOptions { FrontFraction = st.FrontFraction };

        EvolutionResult result;
        using (var lf = CliHost.CreateLoggerFactory(LogLevel.Information))
        {
            var log = lf.CreateLogger("evolve");
            log.LogInformation("{Model}: {N} qubits, probe {Probe}, {Dynamics}, t = {Time}, output {Out}", model.Name, model.N, probe, model.Drive is null ? $"{st.Method} dt = {st.Dt}" : "periodic drive", st.Time, outDir);
            bool fancy = !Console.IsErrorRedirected && string.IsNullOrEmpty(Environment.GetEnvironmentVariable("CI"));
            if (fancy)
            {
                var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Error) });
                EvolutionResult? r = null;
                console.Progress()
                    .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new ElapsedTimeColumn(), new RemainingTimeColumn())
                    .Start(ctx =>
                    {
                        var rep = new SpectreProgress(ctx);
                        r = OperatorEvolution.Run(problem, options, geometry, log, rep, ct, analysis);
                    });
                result = r!;
            }
            else
            {
                result = OperatorEvolution.Run(problem, options, geometry, log, new LogProgress(log), ct, analysis);
            }
            Write(outDir, result, options, model, probe);
            log.LogInformation("wrote {Out}", outDir);
            if (result.Completed && !st.KeepCheckpoints && options.CheckpointDirectory is { } ck && Directory.Exists(ck)) Directory.Delete(ck, true);
        }
        CliHost.Out.Write(Summary(result, options));
        if (result.ResourceLimited) throw new ResourceLimitException($"{result.StopReason} (partial results written to {outDir})");
        if (result.StopReason == "interrupted") throw new OperationCanceledException();
        return ExitCodes.Ok;
    }

    private sealed class SpectreProgress(ProgressContext ctx) : IProgress<EvolutionProgress>
    {
        private readonly Dictionary<int, ProgressTask> _tasks = [];

        public void Report(EvolutionProgress p)
        {
            if (!_tasks.TryGetValue(p.Rung, out var task))
            {
                task = ctx.AddTask($"rung {p.Rung + 1}/{p.Rungs}", maxValue: Math.Max(1, p.TotalSteps));
                _tasks[p.Rung] = task;
            }
            task.Value = p.Step;
            task.Description = $"rung {p.Rung + 1}/{p.Rungs} t={p.Time:0.###} strings={p.Strings:N0} discarded={p.DiscardedTotal:0.###e0}";
        }
    }

    /// <summary>Plain periodic log lines (redirected output or CI), at most one per 10 seconds plus each rung's end.</summary>
    private sealed class LogProgress(ILogger log) : IProgress<EvolutionProgress>
    {
        private DateTime _last = DateTime.MinValue;

        public void Report(EvolutionProgress p)
        {
            var now = DateTime.UtcNow;
            if ((now - _last).TotalSeconds < 10 && p.Step != p.TotalSteps) return;
            _last = now;
            string eta = p.Remaining is TimeSpan r ? r.ToString(@"hh\:mm\:ss", Inv) : "?";
            log.LogInformation("rung {Rung}/{Rungs}: step {Step}/{Total} t = {Time:0.###} strings {Strings} discarded {Disc:0.###e0} elapsed {Elapsed} eta {Eta}",
                p.Rung + 1, p.Rungs, p.Step, p.TotalSteps, p.Time, p.Strings, p.DiscardedTotal, p.Elapsed.ToString(@"hh\:mm\:ss", Inv), eta);
        }
    }

    // ------------------------------------------------------------------ output

    private static string F(double v) => double.IsFinite(v) ? v.ToString("R", Inv) : "NaN";

    private static string F(double? v) => v is double x ? F(x) : "";

    private static void Write(string dir, EvolutionResult r, EvolutionOptions o, Model model, PauliString probe)
    {
        Directory.CreateDirectory(dir);
        var doc = new
        {
            format = "opgrowth-evolve/1",
            model = new { name = model.Name, source = model.SourceFile, n = model.N, lattice = model.Lattice.Kind, parameters = model.Parameters, seeds = model.Seeds, sizeMeasure = r.SizeMeasure },
            probe = probe.ToString(),
            options = new
            {
                dynamics = r.Dynamics,
                method = r.Method,
                dt = r.Dynamics == "hamiltonian" ? o.Dt : (double?)null,
                time = o.Time,
                recordEvery = o.RecordEvery,
                threads = o.Threads,
                ladder = o.LadderRungs,
                truncation = o.Truncation,
                groupsPerStep = r.Groups,
            },
            completed = r.Completed,
            stopReason = r.StopReason,
            notes = r.Notes,
            figures = r.Figures,
            convergence = r.Convergence,
            rungs = r.Rungs,
            wallSeconds = r.WallSeconds,
        };
        AtomicFile.WriteJson(Path.Combine(dir, "evolve.json"), doc);

        var main = r.Main;
        var fig = r.Figures[0];
        int n = r.N;
        var probeSet = new HashSet<int>(r.ProbeSites);
        var sb = new StringBuilder("time,step,strings,norm_squared,discarded,discarded_total,autocorrelation,mean_size,mean_majorana_size,front,otoc_far,cut_magnitude\n");
        for (int i = 0; i < main.Records.Count; i++)
        {
            var rec = main.Records[i];
            double far = 0;
            int cnt = 0;
            for (int j = 0; j < n; j++)
            {
                if (probeSet.Contains(j)) continue;
                far += 8.0 / 3.0 * rec.SiteWeights[j];
                cnt++;
            }
            string frontV = fig.Butterfly is { } b && i < b.Front.Length ? b.Front[i].ToString(Inv) : "";
            sb.Append(F(rec.Time)).Append(',').Append(rec.Step).Append(',').Append(rec.Strings).Append(',').Append(F(rec.NormSquared)).Append(',')
              .Append(F(rec.DiscardedWeight)).Append(',').Append(F(rec.DiscardedTotal)).Append(',').Append(F(rec.Autocorrelation)).Append(',')
              .Append(F(rec.MeanSize)).Append(',').Append(F(rec.MeanMajoranaSize)).Append(',').Append(frontV).Append(',')
              .Append(cnt > 0 ? F(far / cnt) : "").Append(',').Append(F(rec.CutMagnitude)).Append('\n');
        }
        AtomicFile.WriteAllText(Path.Combine(dir, "series.csv"), sb.ToString());

        AtomicFile.WriteAllText(Path.Combine(dir, "site_weights.csv"), Wide("rho", n, main.Records.Select(x => (x.Time, x.SiteWeights))));
        AtomicFile.WriteAllText(Path.Combine(dir, "size_distribution.csv"), Wide("p", n + 1, main.Records.Select(x => (x.Time, x.SizeDistribution))));
        if (main.Records.Count > 0 && main.Records[0].MajoranaSizeDistribution is not null)
        {
            AtomicFile.WriteAllText(Path.Combine(dir, "majorana_size_distribution.csv"), Wide("p", 2 * n + 1, main.Records.Select(x => (x.Time, x.MajoranaSizeDistribution!))));
        }
        var ot = new StringBuilder("time,site,otoc_x,otoc_y,otoc_z,otoc_mean,site_weight,right_edge,left_edge\n");
        foreach (var rec in main.Records)
        {
            for (int j = 0; j < n; j++)
            {
                ot.Append(F(rec.Time)).Append(',').Append(j).Append(',').Append(F(rec.OtocX[j])).Append(',').Append(F(rec.OtocY[j])).Append(',')
                  .Append(F(rec.OtocZ[j])).Append(',').Append(F(rec.OtocMean[j])).Append(',').Append(F(rec.SiteWeights[j])).Append(',')
                  .Append(F(rec.RightEdge[j])).Append(',').Append(F(rec.LeftEdge[j])).Append('\n');
            }
        }
        AtomicFile.WriteAllText(Path.Combine(dir, "otoc.csv"), ot.ToString());
        var stp = new StringBuilder("rung,max_strings,step,time,strings,discarded,discarded_total\n");
        foreach (var s in r.Rungs)
        {
            foreach (var x in s.Steps)
            {
                stp.Append(s.Budget.Rung).Append(',').Append(s.Budget.MaxStrings?.ToString(Inv) ?? "").Append(',').Append(x.Step).Append(',').Append(F(x.Time)).Append(',')
                   .Append(x.Strings).Append(',').Append(F(x.Discarded)).Append(',').Append(F(x.DiscardedTotal)).Append('\n');
            }
        }
        AtomicFile.WriteAllText(Path.Combine(dir, "steps.csv"), stp.ToString());
        var lad = new StringBuilder("figure,full_budget,half_budget,quarter_budget,movement,relative_movement,converged\n");
        foreach (var c in r.Convergence)
        {
            lad.Append(c.Figure).Append(',').Append(F(c.Values.ElementAtOrDefault(0))).Append(',').Append(F(c.Values.ElementAtOrDefault(1))).Append(',')
               .Append(F(c.Values.ElementAtOrDefault(2))).Append(',').Append(F(c.Movement)).Append(',').Append(F(c.RelativeMovement)).Append(',')
               .Append(c.Converged ? "yes" : "no").Append('\n');
        }
        AtomicFile.WriteAllText(Path.Combine(dir, "ladder.csv"), lad.ToString());
        AtomicFile.WriteAllText(Path.Combine(dir, "summary.txt"), Summary(r, o));
    }

    private static string Wide(string prefix, int width, IEnumerable<(double Time, double[] Values)> rows)
    {
        var sb = new StringBuilder("time");
        for (int k = 0; k < width; k++) sb.Append(',').Append(prefix).Append('_').Append(k);
        sb.Append('\n');
        foreach (var (t, v) in rows)
        {
            sb.Append(F(t));
            foreach (double x in v) sb.Append(',').Append(F(x));
            sb.Append('\n');
        }
        return sb.ToString();
    }

    /// <summary>The short text summary printed on stdout.</summary>
    internal static string Summary(EvolutionResult r, EvolutionOptions o)
    {
        var sb = new StringBuilder();
        var main = r.Main;
        var last = main.Records[^1];
        var fig = r.Figures[0];
        FigureConvergence? Conv(string name) => r.Convergence.FirstOrDefault(c => c.Figure == name);
        string Ladder(string name) => Conv(name) is { } c
            ? $"; ladder movement {F3(c.Movement)}{(c.Converged ? "" : " (NOT CONVERGED)")}"
            : "";
        sb.Append($"model {r.Model} (N = {r.N}), probe {r.Initial}, {r.Dynamics}, {r.Method}, t = {last.Time:0.###}{(r.Completed ? "" : $" (stopped: {r.StopReason})")}\n");
        sb.Append($"strings {last.Strings:N0} (peak {main.PeakStrings:N0}), discarded weight {last.DiscardedTotal:0.###e0}, ||O||^2 {last.NormSquared:0.######}, {main.ElapsedSeconds:0.#} s\n");
        sb.Append($"autocorrelation {last.Autocorrelation:0.#####}, mean size {last.MeanSize:0.###} (random operator {fig.Growth.SaturationExpected:0.###})");
        if (last.MeanMajoranaSize is double mm) sb.Append($", mean Majorana size {mm:0.###}");
        sb.Append('\n');
        if (fig.Butterfly is { } b)
        {
            var p = b.Primary;
            sb.Append(p.Velocity is double v
                ? $"v_B = {v:0.####} +- {F3(p.VelocityError)} sites/time (front at rho >= {p.Threshold:0.###}, distances {p.MinDistance}..{p.MaxDistance}, t in [{p.WindowStart:0.###}, {p.WindowEnd:0.###}]; threshold spread {F3(b.ThresholdSpread)}{Ladder("butterflyVelocity")})\n"
                : $"v_B: {p.Note}\n");
        }
        else sb.Append($"v_B: {fig.ButterflyNote}\n");
        var g = fig.Growth;
        var lin = g.SizeLinear;
        var exp = g.SizeExponential;
        sb.Append($"growth regime: {g.Regime} ({g.RegimeReason})\n");
        if (lin.Rate is double lr) sb.Append($"  dn/dt = {lr:0.####} +- {F3(lin.RateError)} on t in [{lin.WindowStart:0.###}, {lin.WindowEnd:0.###}]{Ladder("sizeGrowthRateLinear")}\n");
        if (exp.Rate is double er) sb.Append($"  lambda (size) = {er:0.####} +- {F3(exp.RateError)} on t in [{exp.WindowStart:0.###}, {exp.WindowEnd:0.###}]{Ladder("sizeGrowthRateExponential")}\n");
        if (g.OtocExponential.Rate is double orr) sb.Append($"  lambda (OTOC) = {orr:0.####} +- {F3(g.OtocExponential.RateError)}{Ladder("otocGrowthRate")}\n");
        sb.Append(g.Saturation is double s
            ? $"saturation: mean size {s:0.###} +- {F3(g.SaturationSpread)} = {g.SaturationRatio:0.###} x random{Ladder("saturationMeanSize")}\n"
            : "saturation: not reached\n");
        var ts = fig.ScramblingTime;
        sb.Append(ts.Value is double tv
            ? $"t* = {tv:0.###} +- {F3(ts.GridUncertainty)} (grid) at n = 3N/8 = {ts.Target:0.###}{Ladder("scramblingTime")}\n"
            : $"t*: n(t) did not reach 3N/8 = {ts.Target:0.###}\n");
        if (fig.MajoranaScramblingTime is { } tm)
        {
            sb.Append(tm.Value is double tmv ? $"t* (Majoranas) = {tmv:0.###} +- {F3(tm.GridUncertainty)}{Ladder("majoranaScramblingTime")}\n" : $"t* (Majoranas): not reached ({tm.Target:0.###})\n");
        }
        foreach (var note in r.Notes) sb.Append("note: ").Append(note).Append('\n');
        return sb.ToString();
    }

    private static string F3(double? v) => v is double x ? x.ToString("0.###e0", Inv) : "n/a";
}
