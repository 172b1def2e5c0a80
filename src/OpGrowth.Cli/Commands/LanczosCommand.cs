using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Krylov;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth lanczos MODEL</c>: Lanczos coefficients b_n of a probe operator at infinite temperature,
/// their growth class, and the autocorrelation / Krylov complexity they imply. Writes lanczos.json,
/// coefficients.csv, dynamics.csv, spectrum.csv and summary.txt (each atomically) and prints the summary.
/// </summary>
internal static class LanczosCommand
{
    private static readonly string[] Modes = ["exact", "truncated", "infinite-chain", "extensive"];
    private static readonly string[] ReorthKinds = ["none", "full", "partial"];
    private static readonly string[] ClassNames = ["linear", "n-over-log-n", "sqrt", "bounded"];

    public static Command Create()
    {
        var model = new Argument<string>("MODEL") { Description = "Model file (.toml) or the name of a shipped model (see 'opgrowth models')." };
        var set = new Option<string[]>("--set")
        {
            Description = "Override a model parameter: NAME=VALUE. Repeat for several.",
            Arity = ArgumentArity.ZeroOrMore,
            AllowMultipleArgumentsPerToken = false,
        };
        var probe = new Option<string?>("--probe")
        {
            Description = "Operator to study: a Pauli string such as \"Z_10\" or \"X_3 X_4\", or the index of one of the model's probes (default 0, the model's first probe).",
        };
        var mode = new Option<string>("--mode")
        {
            Description = "exact: the system as given, no truncation. truncated: top-M strings per Krylov vector at each --max-strings budget (spread = uncertainty). " +
                          "infinite-chain: infinite-chain values for a local probe of a uniform chain/ring. extensive: the translation sum of the probe, one string per translation class.",
            DefaultValueFactory = _ => "exact",
        };
        mode.AcceptOnlyFromAmong(Modes);
        var depth = new Option<int>("--depth") { Description = "Number of coefficients b_1..b_n to compute (at most).", DefaultValueFactory = _ => 30 };
        var maxStrings = new Option<long[]>("--max-strings")
        {
            Description = "String budget(s) per Krylov vector, e.g. --max-strings 100000 400000. Truncated mode needs one (a quarter of it is added) or more; optional in infinite-chain and extensive modes.",
            Arity = ArgumentArity.ZeroOrMore,
            AllowMultipleArgumentsPerToken = true,
        };
        var memory = new Option<long>("--memory")
        {
            Description = "Memory budget for the recursion, e.g. 20GiB, 512MiB or bytes. The run stops cleanly before a step that would not fit (default: 70% of available memory). Accounted bytes are multiplied by 1.3 for heap overhead before the comparison.",
            CustomParser = ParseMemory,
            DefaultValueFactory = _ => (long)(0.7 * GC.GetGCMemoryInfo().TotalAvailableMemoryBytes),
        };
        var reorth = new Option<string>("--reorthogonalize")
        {
            Description = "Re-orthogonalize each new Krylov vector against earlier ones: none, full (all kept) or partial (the last --reorth-window). Kept vectors are stored truncated to the budget; their memory is reported.",
            DefaultValueFactory = _ => "none",
        };
        reorth.AcceptOnlyFromAmong(ReorthKinds);
        var window = new Option<int>("--reorth-window") { Description = "Vectors kept for partial re-orthogonalization.", DefaultValueFactory = _ => 8 };
        var threads = new Option<int>("--threads") { Description = "Worker threads.", DefaultValueFactory = _ => Environment.ProcessorCount };
        var sites = new Option<int?>("--sites") { Description = "Infinite-chain mode: chain length to use instead of the light-cone choice (still checked at run time)." };
        var reflection = new Option<bool>("--use-reflection") { Description = "Infinite-chain mode: store one string per mirror pair (about half the memory and time); needs a mirror-symmetric model and probe." };
        var fitFrom = new Option<int?>("--fit-from") { Description = "First n of the growth-fit window (default: a third of the depth, at least 3)." };
        var fitTo = new Option<int?>("--fit-to") { Description = "Last n of the growth-fit window (default: the last trusted coefficient)." };
        var contClass = new Option<string?>("--continue-with") { Description = "Growth form used beyond the computed b_n: linear, n-over-log-n, sqrt or bounded (default: the best fit)." };
        contClass.AcceptOnlyFromAmong(ClassNames);
        var contFrom = new Option<int?>("--continue-from") { Description = "First n taken from the fitted form (default: one past the last trusted coefficient)." };
        var sensitivity = new Option<int>("--sensitivity") { Description = "Also start the continuation this many n earlier and report the change in C(t), K(t).", DefaultValueFactory = _ => 4 };
        var tMax = new Option<double?>("--t-max") { Description = "Last time for C(t) and K(t) (default: the smaller of 10/b_1 and three times the time the Krylov wave needs to cross the computed coefficients)." };
        var points = new Option<int>("--time-points") { Description = "Number of times from 0 to --t-max.", DefaultValueFactory = _ => 201 };
        var outDir = new Option<string?>("--out") { Description = "Output folder (default: lanczos-<model>-<probe>)." };

        var cmd = new Command("lanczos", "Lanczos coefficients b_n of an operator at infinite temperature (recursion method), their growth class and the bound lambda_L <= 2 alpha, and the autocorrelation C(t) and Krylov complexity K(t) they imply.")
        {
            model, set, probe, mode, depth, maxStrings, memory, reorth, window, threads, sites, reflection,
            fitFrom, fitTo, contClass, contFrom, sensitivity, tMax, points, outDir,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(new Settings
        {
            Model = pr.GetValue(model)!,
            Sets = pr.GetValue(set) ?? [],
            Probe = pr.GetValue(probe),
            Mode = pr.GetValue(mode)!,
            Depth = pr.GetValue(depth),
            MaxStrings = pr.GetValue(maxStrings) ?? [],
            Memory = pr.GetValue(memory),
            Reorthogonalize = pr.GetValue(reorth)!,
            ReorthWindow = pr.GetValue(window),
            Threads = pr.GetValue(threads),
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
        }, ct)));
        return cmd;
    }

    /// <summary>Parsed options (one record per command, mapped onto the library's options).</summary>
    private sealed record Settings
    {
        public required string Model { get; init; }
        public required string[] Sets { get; init; }
        public string? Probe { get; init; }
        public required string Mode { get; init; }
        public int Depth { get; init; }
        public required long[] MaxStrings { get; init; }
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

    /// <summary>"20GiB", "512MiB", "2.5GB", "1e9" (bytes). Binary and decimal units, case-insensitive.</summary>
    internal static long ParseMemory(ArgumentResult result)
    {
        string raw = result.Tokens.Count > 0 ? result.Tokens[0].Value : "";
        if (TryParseMemory(raw, out long bytes)) return bytes;
        result.AddError($"--memory: found '{raw}'; expected a size such as 20GiB, 512MiB, 8GB or a number of bytes (at least 1MiB)");
        return 0;
    }

    internal static bool TryParseMemory(string text, out long bytes)
    {
        bytes = 0;
        string s = text.Trim();
        int i = 0;
        while (i < s.Length && (char.IsDigit(s[i]) || s[i] is '.' or 'e' or 'E' or '+' or '-')) i++;
        // "e" may belong to a unit only if nothing numeric follows; units here never start with e.
        if (!double.TryParse(s[..i], NumberStyles.Float, CultureInfo.InvariantCulture, out double v) || !(v > 0)) return false;
        double mult = s[i..].Trim().ToUpperInvariant() switch
        {
            "" or "B" => 1,
            "K" or "KIB" => 1L << 10,
            "M" or "MIB" => 1L << 20,
            "G" or "GIB" => 1L << 30,
            "T" or "TIB" => 1L << 40,
            "KB" => 1e3,
            "MB" => 1e6,
            "GB" => 1e9,
            "TB" => 1e12,
            _ => -1,
        };
        if (mult < 0) return false;
        double b = v * mult;
        if (b < 1 << 20 || b > long.MaxValue / 2) return false;
        bytes = (long)b;
        return true;
    }

    private static int Execute(Settings s, CancellationToken ct)
    {
        if (s.Depth < 1) throw new InputException(null, 0, $"found --depth {s.Depth}; expected at least 1");
        if (s.Threads < 1) throw new InputException(null, 0, $"found --threads {s.Threads}; expected at least 1");
        if (s.TimePoints < 2) throw new InputException(null, 0, $"found --time-points {s.TimePoints}; expected at least 2");
        if (s.TMax is double tm && !(tm > 0 && double.IsFinite(tm))) throw new InputException(null, 0, $"found --t-max {tm}; expected a positive time");
        if (s.MaxStrings.Any(m => m < 1)) throw new InputException(null, 0, $"found --max-strings {string.Join(" ", s.MaxStrings)}; expected positive string counts");
        if (s.ReorthWindow < 1) throw new InputException(null, 0, $"found --reorth-window {s.ReorthWindow}; expected at least 1");
        var mode = s.Mode switch
        {
            "truncated" => LanczosMode.Truncated,
            "infinite-chain" => LanczosMode.InfiniteChain,
            "extensive" => LanczosMode.Extensive,
            _ => LanczosMode.Exact,
        };
        if (mode == LanczosMode.Exact && s.MaxStrings.Length > 0)
            throw new InputException(null, 0, "found --max-strings with --mode exact; expected --mode truncated (or infinite-chain/extensive) to truncate");
        if (s.Sites is not null && mode != LanczosMode.InfiniteChain)
            throw new InputException(null, 0, "found --sites outside infinite-chain mode; expected it only with --mode infinite-chain");

        string path = ShippedModels.Resolve(s.Model);
        var overrides = ModelLoader.ParseOverrides(s.Sets, path);
        var m = ModelLoader.Load(path, overrides);
        var probe = ResolveProbe(m, s.Probe);
        using var lf = CliHost.CreateLoggerFactory(LogLevel.Information);
        var log = lf.CreateLogger("lanczos");
        var notes = new List<string>();
        if (m.IsDriven)
        {
            notes.Add("driven (Floquet) model: the coefficients are those of the period-averaged generator (lowest-order Floquet-Magnus term), not of the Floquet map");
            log.LogWarning("{Note}", notes[^1]);
        }
        log.LogInformation("model {Name}: {N} qubits, {Terms} terms; probe {Probe}; mode {Mode}; depth {Depth}; memory budget {Mem}",
            m.Name, m.N, m.Hamiltonian.Terms.Count, probe, s.Mode, s.Depth, FormatBytes(s.Memory));

        var options = new LanczosOptions
        {
            Depth = s.Depth,
            MemoryBudgetBytes = s.Memory,
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
            ContinuationClass = s.ContinueWith switch
            {
                "linear" => GrowthClass.Linear,
                "n-over-log-n" => GrowthClass.LinearOverLog,
                "sqrt" => GrowthClass.SquareRoot,
                "bounded" => GrowthClass.Bounded,
                _ => null,
            },
            ContinueFrom = s.ContinueFrom,
            SensitivityShift = s.Sensitivity,
            TMax = s.TMax,
            TimePoints = s.TimePoints,
        };
        int trusted = KrylovAnalyzer.TrustedDepth(est);
        if (s.FitFrom is int ff && (ff < 2 || ff > trusted - 2))
            throw new InputException(null, 0, $"found --fit-from {ff}; expected 2..{Math.Max(2, trusted - 2)} (b_1..b_{trusted} are available)");
        var analysis = KrylovAnalyzer.Analyze(est, analysisOptions);
        notes.AddRange(analysis.Notes);

        string dir = s.Out ?? $"lanczos-{Sanitize(m.Name)}-{Sanitize(probe.ToString())}";
        var summary = Summary(m, probe, s, mode, est, analysis, notes);
        WriteOutputs(dir, m, path, probe, s, est, analysis, notes, summary);
        CliHost.Out.Write(summary);
        CliHost.Out.WriteLine($"results in {Path.GetFullPath(dir)}");
        var reference = est.Reference;
        if (reference.StopReason == LanczosStopReason.Cancelled) throw new OperationCanceledException();
        if (reference.StopReason == LanczosStopReason.MemoryBudget && reference.B.Count < s.Depth)
        {
            CliHost.Err.WriteLine($"resource limit: {reference.StopMessage}; {reference.B.Count} of {s.Depth} coefficients written");
            return ExitCodes.ResourceLimit;
        }
        return ExitCodes.Ok;
    }

    private static PauliString ResolveProbe(Model m, string? text)
    {
        if (string.IsNullOrWhiteSpace(text)) return m.Probes[0];
        if (int.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out int idx))
        {
            if (idx >= m.Probes.Count) throw new InputException(m.SourceFile, 0, $"found --probe {idx}; expected a probe index 0..{m.Probes.Count - 1} or a Pauli string such as Z_{m.N / 2}");
            return m.Probes[idx];
        }
        if (!PauliString.TryParse(text, m.N, out var p, out string? error)) throw new InputException(null, 0, $"--probe: {error}");
        if (p!.IsIdentity) throw new InputException(null, 0, "found --probe I; expected a non-identity Pauli string such as Z_0");
        return p;
    }

    private static string Summary(Model m, PauliString probe, Settings s, LanczosMode mode, LanczosEstimate est, KrylovAnalysis a, List<string> notes)
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
            sb.AppendLine(inv, $"  truncated at budgets {string.Join(", ", est.Budgets)} strings per vector; uncertainty of b_n = spread across budgets; discarded weight (largest budget) {r.TotalDiscardedWeight:G3} in total");
        }
        if (r.Reorthogonalize != Reorthogonalization.None)
            sb.AppendLine(inv, $"  re-orthogonalization {r.Reorthogonalize}: kept vectors hold {FormatBytes(r.ReorthogonalizationBytes)}");
        int show = Math.Min(est.B.Count, 8);
        if (show > 0)
        {
            sb.Append("  b_n:");
            for (int n = est.B.Count - show; n < est.B.Count; n++) sb.Append(inv, $" b_{n + 1}={est.B[n]:F6}{(est.Uncertainty[n] > 0 ? $"+-{est.Uncertainty[n]:G2}" : "")}");
            sb.AppendLine();
        }
        if (a.Growth is { } g) sb.AppendLine("  " + g.Summary);
        if (a.Dynamics is { } d) sb.AppendLine("  " + d.Summary);
        if (a.Chain is { } c)
        {
            int mid = c.Times.Count / 2;
            sb.AppendLine(inv, $"  C(t): C({c.Times[mid]:G4}) = {c.Autocorrelation[mid]:G6}, C({c.Times[^1]:G4}) = {c.Autocorrelation[^1]:G6}; K({c.Times[^1]:G4}) = {c.Complexity[^1]:G6}; chain length {c.ChainLength}");
        }
        sb.AppendLine(inv, $"  time {r.Seconds:F1} s ({r.Steps.Sum(x => x.CpuSeconds):F1} s CPU), peak accounted memory {FormatBytes(r.PeakAccountedBytes)}, largest vector {r.Steps.Select(x => x.Strings).DefaultIfEmpty(0).Max():N0} strings");
        foreach (var w in r.Warnings) sb.AppendLine("  warning: " + w);
        foreach (var n in notes) sb.AppendLine("  note: " + n);
        return sb.ToString();
    }

    private static void WriteOutputs(string dir, Model m, string path, PauliString probe, Settings s, LanczosEstimate est, KrylovAnalysis a, List<string> notes, string summary)
    {
        var inv = CultureInfo.InvariantCulture;
        var r = est.Reference;
        // coefficients.csv: one row per n; per-budget values as extra columns.
        var csv = new StringBuilder();
        csv.Append("n,b,uncertainty,strings,strings_before_truncation,discarded_weight,seconds,cpu_seconds,support_first,support_last");
        for (int i = 0; i < est.Runs.Count - 1; i++) csv.Append(inv, $",b_budget_{est.Budgets[i]}");
        csv.AppendLine();
        for (int n = 0; n < est.B.Count; n++)
        {
            var st = r.Steps[n];
            csv.Append(inv, $"{n + 1},{est.B[n]:R},{Num(est.Uncertainty[n])},{st.Strings},{st.StringsBeforeTruncation},{st.DiscardedWeight:R},{st.Seconds:F4},{st.CpuSeconds:F4},{st.SupportFirst},{st.SupportLast}");
            for (int i = 0; i < est.Runs.Count - 1; i++) csv.Append(',').Append(n < est.Runs[i].B.Count ? est.Runs[i].B[n].ToString("R", inv) : "");
            csv.AppendLine();
        }
        AtomicFile.WriteAllText(Path.Combine(dir, "coefficients.csv"), csv.ToString());

        if (a.Chain is { } chain)
        {
            var dyn = new StringBuilder("t,autocorrelation,krylov_complexity");
            var alt = a.Dynamics?.Alternative;
            if (alt is not null) dyn.Append(inv, $",autocorrelation_continued_from_{a.Dynamics!.SensitivityStart},krylov_complexity_continued_from_{a.Dynamics.SensitivityStart}");
            dyn.AppendLine();
            for (int i = 0; i < chain.Times.Count; i++)
            {
                dyn.Append(inv, $"{chain.Times[i]:R},{chain.Autocorrelation[i]:R},{chain.Complexity[i]:R}");
                if (alt is not null) dyn.Append(i < alt.Times.Count ? string.Create(inv, $",{alt.Autocorrelation[i]:R},{alt.Complexity[i]:R}") : ",,");
                dyn.AppendLine();
            }
            AtomicFile.WriteAllText(Path.Combine(dir, "dynamics.csv"), dyn.ToString());
        }
        if (a.Spectrum.Count > 0)
        {
            var sp = new StringBuilder("omega,spectral_function").AppendLine();
            for (int i = 0; i < a.Omegas.Count; i++) sp.Append(inv, $"{a.Omegas[i]:R},{a.Spectrum[i]:R}").AppendLine();
            AtomicFile.WriteAllText(Path.Combine(dir, "spectrum.csv"), sp.ToString());
        }

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
            options = new { useReflection = s.UseReflection, depth = s.Depth, memoryBudgetBytes = s.Memory, budgets = est.Budgets, reorthogonalize = s.Reorthogonalize, reorthogonalizationWindow = s.ReorthWindow, threads = s.Threads },
            stop = new { reason = r.StopReason.ToString(), message = r.StopMessage },
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
                stop = run.StopReason.ToString(),
                seconds = run.Seconds,
                peakAccountedBytes = run.PeakAccountedBytes,
                peakManagedBytes = run.PeakManagedBytes,
                reorthogonalizationBytes = run.ReorthogonalizationBytes,
            }),
            growth = g is null ? null : new
            {
                windowStart = g.WindowStart,
                windowEnd = g.WindowEnd,
                best = g.Best.Class.ToString(),
                deltaAic = g.DeltaAic,
                alpha = g.Alpha,
                alphaError = g.AlphaError,
                lyapunovBound = g.LyapunovBound,
                fits = g.Fits.Select(f => new { @class = f.Class.ToString(), formula = f.Formula, a = f.A, aError = f.AError, c = f.C, cError = f.CError, rss = f.Rss, rmsResidual = f.RmsResidual, aic = f.Aic, slopeAtWindowEnd = f.SlopeAt(f.WindowEnd) }),
            },
            continuation = d is null ? null : new
            {
                form = d.Continuation?.Formula,
                @class = d.Continuation?.Class.ToString(),
                start = d.ContinuationStart,
                sensitivityStart = d.SensitivityStart,
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
        };
        AtomicFile.WriteJson(Path.Combine(dir, "lanczos.json"), doc);
        AtomicFile.WriteAllText(Path.Combine(dir, "summary.txt"), summary);
    }

    private static string Num(double v) => double.IsNaN(v) ? "nan" : v.ToString("R", CultureInfo.InvariantCulture);

    private static string Sanitize(string s)
    {
        var sb = new StringBuilder();
        foreach (char c in s) sb.Append(char.IsLetterOrDigit(c) || c is '-' or '.' ? c : c == ' ' ? '_' : '-');
        return sb.ToString().Replace("_-", "_", StringComparison.Ordinal);
    }

    private static string FormatBytes(long b) => b >= 1L << 30
        ? (b / (double)(1L << 30)).ToString("F2", CultureInfo.InvariantCulture) + " GiB"
        : (b / (double)(1L << 20)).ToString("F1", CultureInfo.InvariantCulture) + " MiB";
}
