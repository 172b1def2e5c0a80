using System.CommandLine;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Krylov;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Pipeline;
using OpGrowth.Reporting;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth lanczos MODEL</c>: Lanczos coefficients b_n of a probe operator at infinite temperature,
/// their growth class, and the autocorrelation / Krylov complexity they imply. Writes lanczos.json,
/// lanczos.csv, krylov.csv, spectrum.csv (the same names and columns as <c>opgrowth run</c> writes into data/)
/// and summary.txt, each atomically, and prints the summary.
/// </summary>
internal static class LanczosCommand
{
    private static readonly string[] Modes = ["exact", "truncated", "infinite-chain", "extensive"];
    private static readonly string[] ReorthKinds = ["none", "full", "partial"];

    /// <summary>Without truncation, stop before a Krylov vector of more strings than this unless --exact-limit says otherwise (finishes in about a minute on 2 cores).</summary>
    public const long DefaultExactLimit = 2_000_000;

    /// <summary>With the default --exact-limit, also stop before the run's commutator products exceed this (a minute or two on 2 cores).</summary>
    public const long DefaultProductLimit = 2_000_000_000;

    /// <summary>Largest --depth accepted.</summary>
    public const int MaxDepth = 10_000;

    public static Command Create()
    {
        var model = CommonOptions.Model();
        var set = CommonOptions.Set();
        var probe = CommonOptions.Probe();
        var mode = new Option<string>("--mode")
        {
            Description = "exact: the system as given, no truncation (stops at --exact-limit). truncated: top-M strings per Krylov vector at each --max-strings budget (spread = uncertainty). " +
                          "infinite-chain: infinite-chain values for a local probe of a uniform chain/ring. extensive: the translation sum of the probe, one string per translation class.",
            DefaultValueFactory = _ => "exact",
        };
        mode.AcceptOnlyFromAmong(Modes);
        var depth = new Option<int?>("--depth") { Description = $"Number of coefficients b_1..b_n to compute (at most; 1..{MaxDepth:N0}, and at most the dimension of the operator space) [default: 30]." };
        var maxStrings = new Option<long[]>("--max-strings")
        {
            Description = "String budget(s) per Krylov vector, e.g. --max-strings 100000 400000. Truncated mode needs one (a quarter of it is added) or more; optional in infinite-chain and extensive modes.",
            Arity = ArgumentArity.ZeroOrMore,
            AllowMultipleArgumentsPerToken = true,
        };
        var exactLimit = new Option<long?>("--exact-limit") { Description = $"Without truncation: stop (keeping the coefficients so far) before a Krylov vector of more than this many strings; 0 = no limit [default: {DefaultExactLimit:N0}, and at most {NumberFormat.Number(DefaultProductLimit)} commutator products in all]." };
        var memory = CommonOptions.Memory();
        var reorth = new Option<string>("--reorthogonalize")
        {
            Description = "Re-orthogonalize each new Krylov vector against earlier ones: none, full (all kept) or partial (the last --reorth-window). Kept vectors are stored truncated to the budget; their memory is reported.",
            DefaultValueFactory = _ => "none",
        };
        reorth.AcceptOnlyFromAmong(ReorthKinds);
        var window = new Option<int>("--reorth-window") { Description = "Vectors kept for partial re-orthogonalization.", DefaultValueFactory = _ => 8 };
        var threads = CommonOptions.Threads();
        var sites = new Option<int?>("--sites") { Description = "Infinite-chain mode: chain length to use instead of the light-cone choice (still checked at run time)." };
        var reflection = new Option<bool>("--use-reflection") { Description = "Infinite-chain mode: store one string per mirror pair (about half the memory and time); needs a mirror-symmetric model and probe." };
        var fitFrom = new Option<int?>("--fit-from") { Description = "First n of the growth-fit window [default: a third of the depth, at least 3]." };
        var fitTo = new Option<int?>("--fit-to") { Description = "Last n of the growth-fit window [default: the last trusted coefficient]." };
        var contClass = new Option<string?>("--continue-with") { Description = "Growth form used beyond the computed b_n: linear, n-over-log-n, sqrt or bounded [default: the best fit]." };
        contClass.AcceptOnlyFromAmong([.. GrowthClassNames.All]);
        var contFrom = new Option<int?>("--continue-from") { Description = "First n taken from the fitted form [default: one past the last trusted coefficient]." };
        var sensitivity = new Option<int>("--sensitivity") { Description = "Also start the continuation this many n earlier and report the change in C(t), K(t).", DefaultValueFactory = _ => 4 };
        var tMax = new Option<double?>("--t-max") { Description = "Last time for C(t) and K(t) [default: the smaller of 10/b_1 and three times the time the Krylov wave needs to cross the computed coefficients]." };
        var points = new Option<int>("--time-points") { Description = "Number of times from 0 to --t-max.", DefaultValueFactory = _ => 201 };
        var outDir = CommonOptions.Out("Output folder [default: lanczos-<model>-<probe>].");

        var cmd = new Command("lanczos", "Lanczos coefficients b_n of an operator at infinite temperature (recursion method), their growth class and, for linear growth, the bound lambda_L <= 2 alpha, and the autocorrelation C(t) and Krylov complexity K(t) they imply (the part that rests on the fitted continuation of b_n is marked).")
        {
            model, set, probe, mode, depth, maxStrings, exactLimit, memory, reorth, window, threads, sites, reflection,
            fitFrom, fitTo, contClass, contFrom, sensitivity, tMax, points, outDir,
        };
        cmd.SetAction(pr => CliHost.Run(ct => CommonOptions.Capped(pr.GetValue(memory), () => Execute(new Settings
        {
            Model = pr.GetValue(model)!,
            Sets = pr.GetValue(set) ?? [],
            Probe = pr.GetValue(probe),
            Mode = pr.GetValue(mode)!,
            Depth = pr.GetValue(depth),
            MaxStrings = pr.GetValue(maxStrings) ?? [],
            ExactLimit = pr.GetValue(exactLimit),
            Memory = pr.GetValue(memory) ?? CommonOptions.DefaultMemory,
            Reorthogonalize = pr.GetValue(reorth)!,
            ReorthWindow = pr.GetValue(window),
            Threads = CommonOptions.ThreadsOrDefault(pr.GetValue(threads)),
            Sites = pr.GetValue(sites),
            UseReflection = pr.GetValue(reflection),
            FitFrom = pr.GetValue(fitFrom),
            FitTo = pr.GetValue(fitTo),
            ContinueWith = pr.GetValue(contClass),
            ContinueFrom = pr.GetValue(contFrom),
            Sensitivity = pr.GetValue(sensitivity),
            TMax = pr.GetValue(tMax),
            TimePoints = pr.GetValue(points),
            Out = pr.GetValue(outDir),
        }, ct))));
        return cmd;
    }

    /// <summary>Parsed options (one record per command, mapped onto the library's options).</summary>
    private sealed record Settings
    {
        public required string Model { get; init; }
        public required string[] Sets { get; init; }
        public string? Probe { get; init; }
        public required string Mode { get; init; }
        public int? Depth { get; init; }
        public required long[] MaxStrings { get; init; }
        public long? ExactLimit { get; init; }
        public long Memory { get; init; }
        public required string Reorthogonalize { get; init; }
        public int ReorthWindow { get; init; }
        public int Threads { get; init; }
        public int? Sites { get; init; }
        public bool UseReflection { get; init; }
        public int? FitFrom { get; init; }
        public int? FitTo { get; init; }
        public string? ContinueWith { get; init; }
        public int? ContinueFrom { get; init; }
        public int Sensitivity { get; init; }
        public double? TMax { get; init; }
        public int TimePoints { get; init; }
        public string? Out { get; init; }
    }

    private static int Execute(Settings s, CancellationToken ct)
    {
        int requested = s.Depth ?? 30;
        if (requested is < 1 or > MaxDepth) throw new InputException($"--depth: found {requested}; expected 1..{MaxDepth:N0}");
        if (s.TimePoints is < 2 or > 100_000) throw new InputException($"--time-points: found {s.TimePoints}; expected 2..100,000");
        if (s.TMax is double tm && !(tm > 0 && double.IsFinite(tm) && tm <= 1e6)) throw new InputException($"--t-max: found {tm.ToString(CultureInfo.InvariantCulture)}; expected a positive time up to 1e6");
        if (s.MaxStrings.Any(m => m < 1)) throw new InputException($"--max-strings: found {string.Join(" ", s.MaxStrings)}; expected positive string counts");
        if (s.ExactLimit is < 0) throw new InputException($"--exact-limit: found {s.ExactLimit}; expected 0 (no limit) or a positive string count");
        if (s.ReorthWindow < 1) throw new InputException($"--reorth-window: found {s.ReorthWindow}; expected at least 1");
        if (s.Sensitivity < 0) throw new InputException($"--sensitivity: found {s.Sensitivity}; expected 0 or more");
        if (s.FitFrom is int f0 && s.FitTo is int f1 && f1 - f0 < 2)
            throw new InputException($"--fit-from {f0} --fit-to {f1}: found a window of {Math.Max(0, f1 - f0 + 1)} coefficient(s); expected --fit-from below --fit-to with at least 3 coefficients in the window");
        if (s.FitFrom is < 2) throw new InputException($"--fit-from: found {s.FitFrom}; expected at least 2 (b_1 is fixed by the probe's norm)");
        var mode = s.Mode switch
        {
            "truncated" => LanczosMode.Truncated,
            "infinite-chain" => LanczosMode.InfiniteChain,
            "extensive" => LanczosMode.Extensive,
            _ => LanczosMode.Exact,
        };
        if (mode == LanczosMode.Exact && s.MaxStrings.Length > 0)
            throw new InputException("--max-strings with --mode exact: found a truncation budget; expected --mode truncated (or infinite-chain/extensive) to truncate");
        if (s.Sites is not null && mode != LanczosMode.InfiniteChain)
            throw new InputException("--sites outside infinite-chain mode: expected it only with --mode infinite-chain");

        var (path, _, m) = CommonOptions.LoadModel(s.Model, s.Sets);
        var probe = ProbeChoice.Resolve(m, s.Probe);
        var notes = new List<string>();
        int depth = requested;
        if (mode == LanczosMode.Exact && m.N < 32)
        {
            // The exact recursion lives in the space of traceless operators on N qubits: at most 4^N - 1 coefficients.
            long dimension = (1L << (2 * m.N)) - 1;
            if (depth > dimension)
            {
                depth = (int)dimension;
                notes.Add($"--depth {requested} exceeds the dimension of the operator space (4^{m.N} - 1 = {dimension:N0}); at most {depth:N0} coefficients exist");
            }
        }
        long exactLimit = s.ExactLimit ?? DefaultExactLimit;
        using var lf = CliHost.CreateLoggerFactory();
        var log = lf.CreateLogger("lanczos");
        if (m.IsDriven)
        {
            notes.Add("driven (Floquet) model: the coefficients are those of the period-averaged generator (lowest-order Floquet-Magnus term), not of the Floquet map");
            log.LogWarning("{Note}", notes[^1]);
        }
        log.LogInformation("{Name}: {N} qubits, {Terms} terms; probe {Probe}; mode {Mode}; depth {Depth}; memory budget {Mem}",
            m.Name, m.N, m.Hamiltonian.Terms.Count, probe, s.Mode, depth, MemoryBudget.Format(s.Memory));

        var options = new LanczosOptions
        {
            Depth = depth,
            MemoryBudgetBytes = s.Memory,
            StopAtStrings = exactLimit,
            StopAtProducts = s.ExactLimit is null ? DefaultProductLimit : 0,
            Reorthogonalize = s.Reorthogonalize switch { "full" => Reorthogonalization.Full, "partial" => Reorthogonalization.Partial, _ => Reorthogonalization.None },
            ReorthogonalizationWindow = s.ReorthWindow,
            Threads = s.Threads,
            Logger = log,
            Cancellation = ct,
        };
        var est = LanczosStudy.Run(m, probe, mode, options, s.MaxStrings, s.Sites, s.UseReflection);
        var analysisOptions = new KrylovAnalysisOptions
        {
            FitFrom = s.FitFrom,
            FitTo = s.FitTo,
            ContinuationClass = GrowthClassNames.Parse(s.ContinueWith),
            ContinueFrom = s.ContinueFrom,
            SensitivityShift = s.Sensitivity,
            TMax = s.TMax,
            TimePoints = s.TimePoints,
        };
        int trusted = KrylovAnalyzer.TrustedDepth(est);
        if (s.FitFrom is int ff && ff > trusted - 2)
            throw new InputException($"--fit-from: found {ff}; expected 2..{Math.Max(2, trusted - 2)} (b_1..b_{trusted} are available)");
        if (s.FitTo is int ft && (ft > trusted || ft < 4))
            throw new InputException($"--fit-to: found {ft}; expected 4..{trusted} (b_1..b_{trusted} are available)");
        var analysis = KrylovAnalyzer.Analyze(est, analysisOptions);
        notes.AddRange(analysis.Notes);
        var reference = est.Reference;
        if (reference.StopReason == LanczosStopReason.StringLimit)
        {
            string why = reference.StopMessage.StartsWith("work limit", StringComparison.Ordinal)
                ? $"the next step would bring the run's commutator products above {NumberFormat.Number(DefaultProductLimit)} (many terms per string; the default work limit of an exact run)"
                : $"the next Krylov vector would exceed {exactLimit:N0} strings";
            notes.Add($"stopped after b_{reference.B.Count} of {depth}: {why}; to go further: --exact-limit {exactLimit * 10} (about {MemoryBudget.Format((long)(reference.PeakAccountedBytes * 10 * 1.3))}; an explicit limit lifts the work limit), " +
                (m.Lattice.Kind is "chain" or "ring" && m.IsTranslationInvariant && !m.IsDriven ? "--mode infinite-chain (a uniform chain: far deeper at the same cost), " : "") +
                "or --mode truncated --max-strings 1000000 (truncation uncertainty from a second budget)");
        }

        string dir = Path.GetFullPath(s.Out ?? $"lanczos-{Sanitize(m.Name)}-{Sanitize(probe.ToString())}");
        var summary = Summary(m, probe, s, est, analysis, notes);
        WriteOutputs(dir, m, path, probe, s, depth, est, analysis, notes, summary);
        CliHost.Out.Write(summary);
        CliHost.Out.WriteLine($"results in {dir}");
        if (reference.StopReason == LanczosStopReason.Cancelled) throw new OperationCanceledException();
        bool explicitRequest = s.Depth is not null || s.ExactLimit is not null;
        if (reference.B.Count < depth && (reference.StopReason == LanczosStopReason.MemoryBudget || (reference.StopReason == LanczosStopReason.StringLimit && explicitRequest)))
        {
            CliHost.Err.WriteLine($"resource limit: {reference.StopMessage}; {reference.B.Count} of {depth} coefficients written");
            return ExitCodes.ResourceLimit;
        }
        return ExitCodes.Ok;
    }

    private static string Summary(Model m, PauliString probe, Settings s, LanczosEstimate est, KrylovAnalysis a, List<string> notes)
    {
        var r = est.Reference;
        var sb = new StringBuilder();
        var inv = CultureInfo.InvariantCulture;
        sb.AppendLine(inv, $"lanczos: {m.Name} (N = {m.N}), probe {probe}, mode {s.Mode}");
        sb.AppendLine(inv, $"  representation: {r.Representation}");
        sb.AppendLine(inv, $"  computed b_1..b_{est.B.Count} ({r.StopMessage}); trusted b_1..b_{a.TrustedDepth}");
        if (est.IsExact) sb.AppendLine("  exact: no string was dropped (uncertainty = rounding only)");
        else
        {
            sb.AppendLine(inv, $"  truncated at budgets {string.Join(", ", est.Budgets)} strings per vector; uncertainty of b_n = spread across budgets; discarded weight (largest budget) {NumberFormat.Number(r.TotalDiscardedWeight, 3)} in total");
        }
        if (r.Reorthogonalize != Reorthogonalization.None)
            sb.AppendLine(inv, $"  re-orthogonalization {r.Reorthogonalize.ToString().ToLowerInvariant()}: kept vectors hold {MemoryBudget.Format(r.ReorthogonalizationBytes)}");
        int show = Math.Min(est.B.Count, 8);
        if (show > 0)
        {
            sb.Append("  b_n:");
            for (int n = est.B.Count - show; n < est.B.Count; n++)
                sb.Append(inv, $" b_{n + 1} = {(est.Uncertainty[n] > 0 ? NumberFormat.ValueWithUncertainty(est.B[n], est.Uncertainty[n]) : NumberFormat.Number(est.B[n], 8))};");
            sb.Length--;
            sb.AppendLine();
        }
        if (a.Growth is { } g) sb.AppendLine("  " + g.Summary);
        if (a.Dynamics is { } d) sb.AppendLine("  " + d.Summary);
        if (a.Chain is { } c)
        {
            int mid = c.Times.Count / 2;
            sb.AppendLine(inv, $"  C(t): C({NumberFormat.Number(c.Times[mid])}) = {NumberFormat.Number(c.Autocorrelation[mid], 4)}, C({NumberFormat.Number(c.Times[^1])}) = {NumberFormat.Number(c.Autocorrelation[^1], 4)}; K({NumberFormat.Number(c.Times[^1])}) = {NumberFormat.Number(c.Complexity[^1], 4)}; chain length {c.ChainLength}");
        }
        sb.AppendLine(inv, $"  time {NumberFormat.Duration(TimeSpan.FromSeconds(r.Seconds))} ({NumberFormat.Duration(TimeSpan.FromSeconds(r.Steps.Sum(x => x.CpuSeconds)))} CPU), peak accounted memory {MemoryBudget.Format(r.PeakAccountedBytes)}, largest vector {r.Steps.Select(x => x.Strings).DefaultIfEmpty(0).Max():N0} strings");
        foreach (var w in r.Warnings) sb.AppendLine("  warning: " + w);
        foreach (var n in notes) sb.AppendLine("  note: " + n);
        return sb.ToString();
    }

    private static void WriteOutputs(string dir, Model m, string path, PauliString probe, Settings s, int depth, LanczosEstimate est, KrylovAnalysis a, List<string> notes, string summary)
    {
        var r = est.Reference;
        var files = DataFiles.WriteLanczos(dir, est, a);
        var g = a.Growth;
        var d = a.Dynamics;
        var doc = new
        {
            tool = "opgrowth lanczos",
            version = typeof(LanczosCommand).Assembly.GetName().Version?.ToString(),
            model = new { name = m.Name, file = path, qubits = m.N, lattice = m.Lattice.Kind, parameters = m.Parameters, seeds = m.Seeds, driven = m.IsDriven, translationInvariant = m.IsTranslationInvariant },
            probe = probe.ToString(),
            mode = s.Mode,
            conventions = "L = [H, .], O_0 = O/||O||, A_n = i[H, O_{n-1}] + b_{n-1} O_{n-2}, b_n = ||A_n||, (A|B) = Tr(A^dagger B)/2^N, b_1^2 = mu_2",
            representation = r.Representation,
            sites = r.Sites,
            options = new { useReflection = s.UseReflection, depth, memoryBytes = s.Memory, exactLimit = s.ExactLimit ?? DefaultExactLimit, budgets = est.Budgets, reorthogonalize = s.Reorthogonalize, reorthogonalizationWindow = s.ReorthWindow, threads = s.Threads },
            stop = new { reason = StopName(r.StopReason), message = r.StopMessage },
            exact = est.IsExact,
            verifiedDepth = r.VerifiedDepth,
            trustedDepth = a.TrustedDepth,
            coefficients = est.B.Select((b, n) => new
            {
                n = n + 1,
                b,
                uncertainty = est.Uncertainty[n],
                strings = r.Steps[n].Strings,
                stringsBeforeTruncation = r.Steps[n].StringsBeforeTruncation,
                discardedWeight = r.Steps[n].DiscardedWeight,
                seconds = r.Steps[n].Seconds,
                cpuSeconds = r.Steps[n].CpuSeconds,
                accountedBytes = r.Steps[n].AccountedBytes,
                accumulatorBytesPerString = r.Steps[n].AccumulatorBytesPerString,
                supportFirst = r.Steps[n].SupportFirst,
                supportLast = r.Steps[n].SupportLast,
                orthogonalityLoss = r.Steps[n].OrthogonalityLoss,
            }),
            runs = est.Runs.Select((run, i) => new
            {
                budget = est.Budgets[i],
                b = run.B,
                discardedWeight = run.Steps.Select(x => x.DiscardedWeight),
                totalDiscardedWeight = run.TotalDiscardedWeight,
                stop = StopName(run.StopReason),
                seconds = run.Seconds,
                peakAccountedBytes = run.PeakAccountedBytes,
                peakManagedBytes = run.PeakManagedBytes,
                reorthogonalizationBytes = run.ReorthogonalizationBytes,
            }),
            growth = g is null ? null : new
            {
                windowStart = g.WindowStart,
                windowEnd = g.WindowEnd,
                best = GrowthClassNames.Of(g.Best.Class),
                deltaAic = g.DeltaAic,
                alpha = g.Alpha,
                alphaError = g.AlphaError,
                lyapunovBound = g.BoundApplies ? g.LyapunovBound : (double?)null,
                fits = g.Fits.Select(f => new { @class = GrowthClassNames.Of(f.Class), formula = f.Formula, a = f.A, aError = f.AError, c = f.C, cError = f.CError, rss = f.Rss, rmsResidual = f.RmsResidual, aic = f.Aic, slopeAtWindowEnd = f.SlopeAt(f.WindowEnd) }),
            },
            continuation = d is null ? null : new
            {
                form = d.Continuation?.Formula,
                @class = d.Continuation is { } cf ? GrowthClassNames.Of(cf.Class) : null,
                start = d.ContinuationStart,
                sensitivityStart = d.SensitivityStart,
                continuationTime = d.ContinuationTime,
                maxAutocorrelationChange = d.MaxAutocorrelationChange,
                maxRelativeComplexityChange = d.MaxRelativeComplexityChange,
            },
            dynamics = a.Chain is null ? null : new
            {
                times = a.Chain.Times,
                autocorrelation = a.Chain.Autocorrelation,
                krylovComplexity = a.Chain.Complexity,
                chainLength = a.Chain.ChainLength,
                normError = a.Chain.NormError,
                alternative = d?.Alternative is null ? null : new { autocorrelation = d.Alternative.Autocorrelation, krylovComplexity = d.Alternative.Complexity },
            },
            spectrum = a.Spectrum.Count == 0 ? null : new { broadening = a.SpectrumBroadening, omegas = a.Omegas, values = a.Spectrum },
            warnings = r.Warnings,
            notes,
            files,
        };
        AtomicFile.WriteJson(Path.Combine(dir, "lanczos.json"), doc);
        AtomicFile.WriteAllText(Path.Combine(dir, "summary.txt"), summary);
    }

    /// <summary>The stop reason as results files spell it: "depth-reached", "memory-budget", ...</summary>
    private static string StopName(LanczosStopReason reason) => reason switch
    {
        LanczosStopReason.DepthReached => "depth-reached",
        LanczosStopReason.MemoryBudget => "memory-budget",
        LanczosStopReason.KrylovSpaceClosed => "krylov-space-closed",
        LanczosStopReason.Cancelled => "interrupted",
        LanczosStopReason.WindowExceeded => "window-exceeded",
        _ => "string-limit",
    };

    private static string Sanitize(string s)
    {
        var sb = new StringBuilder();
        foreach (char c in s) sb.Append(char.IsLetterOrDigit(c) || c is '-' or '.' ? c : c == ' ' ? '_' : '-');
        return sb.ToString().Replace("_-", "_", StringComparison.Ordinal);
    }
}
