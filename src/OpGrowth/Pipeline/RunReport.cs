using System.Diagnostics;
using System.Globalization;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Krylov;
using OpGrowth.Reporting;

namespace OpGrowth.Pipeline;

/// <summary>Turns a <see cref="ScramblingRunResult"/> into the report folder: figures, report.html/.md, results.json, manifest.json.</summary>
public static class RunReport
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>File name of the machine-readable results.</summary>
    public const string ResultsFileName = "results.json";

    /// <summary>Top-level keys of results.json (documented in docs/run.md).</summary>
    public static readonly IReadOnlyList<string> ResultKeys =
    [
        "format", "toolVersion", "created", "model", "options", "effort", "seeds", "threads", "completed", "stopReason",
        "verdict", "headline", "scramblingTime", "freeFermions", "evolution", "lanczos", "crossCheck", "diagnosis", "sweep", "verdicts", "checks", "cautions", "notes",
        "timingsSeconds", "files",
    ];

    /// <summary>Headline names of the Lanczos figures.</summary>
    public const string LanczosSlope = "Lanczos slope alpha";
    public const string LyapunovBound = "bound on lambda_L (2 alpha)";

    /// <summary>
    /// Headline figures, each stated once: v_B (chains) or the size growth rate, t*, the saturation (from the
    /// evolution, see <see cref="EvolutionHeadlines"/>), the Lanczos slope alpha and, when the b_n grow linearly,
    /// the bound lambda_L &lt;= 2 alpha. The diagnosis battery's own estimates are labelled in its section.
    /// </summary>
    public static List<HeadlineFigure> Headlines(ScramblingRunResult r)
    {
        var list = new List<HeadlineFigure>();
        if (r.Evolution is { } evo)
        {
            // One voice: with a t* statement at the model's N, the evolution's own t* is not a second headline.
            var evoHeadlines = EvolutionHeadlines.Of(evo, TimeUnits.For(r.Model.IsDriven));
            if (r.ScramblingTime is not null || r.FreeFermion is not null) evoHeadlines.RemoveAll(x => x.Name == EvolutionHeadlines.ScramblingTime);
            list.AddRange(evoHeadlines);
        }
        if (r.ScramblingTime is { Value: not null } st) list.Add(ScramblingTimeHeadline(st, TimeUnits.For(r.Model.IsDriven)));
        if (r.Krylov?.Growth is { } lg && r.Lanczos is { } lz)
        {
            bool conv = LanczosConverged(lz, lg.WindowStart, lg.WindowEnd);
            var w = new FitWindow(lg.WindowStart, lg.WindowEnd, "n");
            string note = "b_n in the fit window moved by more than 5% between string budgets";
            list.Add(new HeadlineFigure(LanczosSlope,
                new Measured(lg.Alpha, lg.AlphaError, $"slope of a straight line through b_n; best growth class {GrowthClassNames.Of(lg.Best.Class)} ({lg.Best.Formula})", w), conv)
            { Note = conv ? null : note });
            if (lg.BoundApplies)
            {
                list.Add(new HeadlineFigure(LyapunovBound,
                    new Measured(lg.LyapunovBound, 2 * lg.AlphaError, "lambda_L <= 2 alpha at infinite temperature (Parker et al., PRX 9, 041017 (2019))", w, TimeUnits.For(r.Model.IsDriven).Rate), conv)
                { Note = conv ? null : note });
            }
        }
        return list;
    }

    /// <summary>Name of the headline that carries the t* statement.</summary>
    public const string ScramblingTimeName = "scrambling time t*";

    /// <summary>The t* statement as a headline: value and uncertainty (a bound shows as its value with NaN uncertainty), route in the note.</summary>
    public static HeadlineFigure ScramblingTimeHeadline(OpGrowth.Sweeps.ScramblingTimeStatement st, TimeUnits? units = null)
    {
        string unit = (units ?? TimeUnits.Hamiltonian).Time;
        string def = $"t* at N = {st.N}, {st.Route}: {st.Method}";
        if (st.Value is double v)
        {
            var m = new Measured(v, st.Uncertainty is double u && double.IsFinite(u) ? u : double.NaN, def, null, unit);
            return new HeadlineFigure(ScramblingTimeName, m, true) { Note = $"{st.Route}; band {Band(st)}; {st.Basis}" };
        }
        var b = new Measured(st.Low ?? double.NaN, double.NaN, def + (st.Low is double lb ? FormattableString.Invariant($" (lower bound: t* > {lb:0.##})") : " (not quoted)"), null, unit);
        return new HeadlineFigure(ScramblingTimeName, b, false) { Note = $"{st.Route}: {st.Basis}" };
    }

    private static string Band(OpGrowth.Sweeps.ScramblingTimeStatement st)
        => st.Low is double lo && st.High is double hi ? FormattableString.Invariant($"{lo:0.###}..{hi:0.###} (2 sigma)") : "none";

    /// <summary>True when every b_n in the window agrees across budgets within 5% (common practice).</summary>
    public static bool LanczosConverged(LanczosEstimate lz, int from, int to)
    {
        for (int n = Math.Max(1, from); n <= Math.Min(to, lz.B.Count); n++)
        {
            double u = lz.Uncertainty[n - 1];
            if (double.IsNaN(u) || u > 0.05 * Math.Abs(lz.B[n - 1])) return false;
        }
        return true;
    }

    /// <summary>Writes every file of the report and returns the result with headlines, verdicts, checks, files and timings.</summary>
    public static ScramblingRunResult Write(ScramblingRunResult r, List<string> dataFiles, Dictionary<string, double> timings, Stopwatch clock)
    {
        var headlines = Headlines(r);
        r = r with { Verdict = Decide(r) };
        var verdicts = Verdicts(r, headlines);
        var checks = Checks(r);
        var cautions = Cautions(r);
        var doc = new ReportDocument($"Scrambling report: {r.Model.Name}")
        {
            Subtitle = $"Does {r.Problem.Initial[0].String} scramble under {r.Model.Name}, how fast, and can the answer be trusted?",
            Created = DateTimeOffset.UtcNow,
            VerdictSummary = Summary(r, headlines),
        };
        doc.AddModel("name", r.Model.Name).AddModel("description", r.Model.Description).AddModel("file", r.ModelFile)
           .AddModel("lattice", $"{r.Model.Lattice.Kind}, N = {r.Model.N} qubits")
           .AddModel("dynamics", r.Model.IsDriven ? $"periodic drive, period {r.Model.Drive!.Period.ToString("G6", Inv)}" : $"Hamiltonian with {r.Model.Hamiltonian.Terms.Count} terms")
           .AddModel("probe", r.Problem.Initial[0].String.ToString())
           .AddModel("parameters", string.Join(", ", r.Model.Parameters.Select(kv => $"{kv.Key} = {kv.Value.ToString("G6", Inv)}")))
           .AddModel("symmetries", r.Model.Symmetries.Count == 0 ? "none declared" : string.Join(", ", r.Model.Symmetries))
           .AddModel("effort", $"{r.Options.Effort.ToString().ToLowerInvariant()}: t = {NumberFormat.Number(r.EvolutionOptions.Time, 4)}{(r.Model.IsDriven ? "" : $", dt = {NumberFormat.Number(r.EvolutionOptions.Dt, 4)}")}, budget series of {r.EvolutionOptions.BudgetCount} from {r.Preset.MaxStrings:N0} strings, Lanczos depth {r.Preset.LanczosDepth}")
           .AddModel("status", r.Completed ? "completed" : $"stopped early ({r.StopReason}); finished stages are reported");
        foreach (var h in headlines) doc.Headlines.Add(h);
        foreach (var v in verdicts) doc.Verdicts.Add(v);
        foreach (var t in Tables(r)) doc.Tables.Add(t);
        foreach (var c in checks) doc.Checks.Add(c);
        foreach (var c in cautions) doc.Cautions.Add(c);
        foreach (var f in RunFigures.All(r with { Headlines = headlines })) doc.Figures.Add(f);
        foreach (var d in dataFiles) doc.DataFiles.Add(new DataFileEntry(d, Describe(d)));
        doc.DataFiles.Add(new DataFileEntry(ReportWriter.JsonFileName, "the report's own content (headlines, verdicts, checks, tables) as JSON"));
        doc.DataFiles.Add(new DataFileEntry(ResultsFileName, "every headline figure, window, uncertainty, option and seed"));
        doc.DataFiles.Add(new DataFileEntry(ManifestWriter.FileName, "tool version, model file SHA-256, options, seeds, threads, timings, file hashes"));

        var written = ReportWriter.Write(doc, r.Folder);
        timings["report"] = clock.Elapsed.TotalSeconds;
        clock.Restart();
        var files = new List<string>(dataFiles);
        files.AddRange(written.RelativePaths);
        files.Add(ResultsFileName);

        var withReport = r with
        {
            Headlines = headlines,
            Verdicts = verdicts,
            Checks = checks,
            FigureCount = doc.Figures.Count,
            TimingsSeconds = timings,
            Files = files.Append(ManifestWriter.FileName).ToList(),
        };
        AtomicFile.WriteJson(Path.Combine(r.Folder, ResultsFileName), ResultsJson(withReport, cautions));
        ManifestWriter.Write(r.Folder, new RunManifest
        {
            Command = "run",
            ModelFile = r.ModelFile,
            ModelSha256 = ManifestWriter.Sha256OfFile(r.ModelFile),
            Options = OptionsJson(withReport),
            Seeds = r.Model.Seeds,
            Threads = r.Options.Threads,
            TimingsSeconds = timings,
        }, files);
        return withReport;
    }

    private static string Describe(string path) => DataFiles.Descriptions.TryGetValue(Path.GetFileName(path), out var d) ? d : Path.GetFileName(path) switch
    {
        "table.csv" => "t*(N) sweep: one row per point (t*, its errors, engine, discarded weight)",
        "table.json" => "t*(N) sweep: the same table as JSON",
        "averages.csv" => "t*(N) sweep: per size (seed averages)",
        "series.csv" => "t*(N) sweep: both scaling fits with errors and information criteria",
        "timings.csv" => "t*(N) sweep: wall time and memory per point",
        "fits.json" => "t*(N) sweep: both scaling fits, residuals and the preferred law",
        "tstar_members.csv" => "t* statement: exact t* at the smaller members of the family (mean over seeds, error, seed spread, half-volume distance, front arrival there)",
        "front_arrival.csv" => "front engine: arrival time of the front at every distance, per bond dimension of the budget series, and its uncertainty",
        _ => "data",
    };

    /// <summary>A number rounded to <paramref name="digits"/> significant digits (for check figures: no more digits than they mean).</summary>
    private static double Sig(double v, int digits = 2)
    {
        if (v == 0 || !double.IsFinite(v)) return v;
        double scale = Math.Pow(10, Math.Floor(Math.Log10(Math.Abs(v))) - digits + 1);
        return Math.Round(v / scale) * scale;
    }

    private static string Summary(ScramblingRunResult r, List<HeadlineFigure> h)
    {
        var parts = new List<string>();
        if (r.Verdict is { } verdict) parts.Add(VerdictText(verdict) + ".");
        var evo = r.Evolution;
        if (evo is not null && evo.Figures.Count > 0 && evo.Main.Records.Count > 0)
        {
            // Majorana models state sizes in Majoranas (level N/2, random value N of 2N), qubit models in qubits (3N/8, 3N/4).
            bool maj = evo.Figures[0].MajoranaGrowth is not null && evo.Figures[0].MajoranaScramblingTime is not null;
            var g = evo.Figures[0].MajoranaGrowth ?? evo.Figures[0].Growth;
            var ts = maj ? evo.Figures[0].MajoranaScramblingTime! : evo.Figures[0].ScramblingTime;
            string level = maj ? "N/2 Majoranas" : "3N/8", full = maj ? "N (of 2N Majoranas)" : "3N/4";
            string first;
            if (r.FreeFermion is { } ff)
            {
                parts.Add(char.ToUpperInvariant(ff.Text()[0]) + ff.Text()[1..] + ".");
                first = "The truncated Pauli evolution's mean size ";
                first += ts.Value is double tv1 ? FormattableString.Invariant($"passes {level} at t = {NumberFormat.Number(tv1, 3)} (not a scrambling time for a free model) and ") : $"does not reach {level}, and ";
            }
            else if (r.ScramblingTime is { } st)
            {
                parts.Add(st.Text() + ".");
                first = ts.Value is double tv0
                    ? FormattableString.Invariant($"In the truncated Pauli evolution (method: budget series) the mean size reaches {level} at t = {NumberFormat.Number(tv0, 3)} and ")
                    : FormattableString.Invariant($"In the truncated Pauli evolution the mean size does not reach {level} = {NumberFormat.Number(ts.Target, 3)} by t = {NumberFormat.Number(evo.Main.Records[^1].Time, 3)}, and ");
            }
            else
            {
                first = ts.Value is double tv
                    ? FormattableString.Invariant($"The operator's mean size reaches {level} at t* = {NumberFormat.Number(tv, 3)} and ")
                    : FormattableString.Invariant($"The operator's mean size does not reach {level} = {NumberFormat.Number(ts.Target, 3)} by t = {NumberFormat.Number(evo.Main.Records[^1].Time, 3)}, and ");
            }
            parts.Add(first + (g.SaturationRatio is double sr ? FormattableString.Invariant($"saturates at {NumberFormat.Number(sr, 2)} of the random-operator value {full}.") : "has not saturated by the end of the run."));
            parts.Add($"Discarded weight: {EvolutionHeadlines.DiscardedText(evo)}.");
        }
        foreach (var x in h.Where(x => x.Name == EvolutionHeadlines.ButterflyVelocity || x.Name.StartsWith("size growth", StringComparison.Ordinal)))
            parts.Add($"{char.ToUpperInvariant(x.Name[0])}{x.Name[1..]}: {x.Value.FormatValue()}.");
        if (r.Krylov?.Growth is { } lg) parts.Add($"The Lanczos coefficients grow best as {GrowthClassNames.Of(lg.Best.Class)} ({lg.Best.Formula}).");
        if (r.CrossCheck is { } c) parts.Add(c.Ran ? (c.Passed ? $"The Pauli engine agrees with the exact engine at N = {c.N}." : $"The Pauli engine DISAGREES with the exact engine at N = {c.N}.") : "The exact cross-check was skipped: " + c.SkipReason + ".");
        if (r.Sweep?.Series?.Comparison is { } cmp) parts.Add($"t*(N) over N = {string.Join(", ", r.Sweep.Series.Data.Select(d => d.N))}: {cmp.Verdict}.");
        int nc = h.Count(x => !x.Converged);
        if (nc > 0) parts.Add($"{nc} headline figure(s) are not converged across the budget series; treat them as estimates.");
        return string.Join(" ", parts);
    }

    /// <summary>"Verdict: scrambles, from the diagnosis battery" or "Verdict: does not scramble (leading mechanism: localized), from ...".</summary>
    public static string VerdictText(RunVerdict v)
        => $"Verdict: {v.Outcome}" + (v.Mechanism == "-" ? "" : $" (leading mechanism: {v.Mechanism})") + $", from the {v.Source}";

    /// <summary>
    /// What to do when the evolution ends before the operator saturates. A longer truncated run helps only while
    /// little weight has been discarded; beyond that it measures the truncation, and a t*(N) sweep at smaller N
    /// (exact there) or the exact engine answers the question (the same advice as the README).
    /// </summary>
    public static string LongerRunAdvice(EvolutionResult evo)
    {
        ArgumentNullException.ThrowIfNull(evo);
        double discarded = evo.Main.Records.Count > 0 ? evo.Main.Records[^1].DiscardedTotal : 0;
        return discarded <= 0.1
            ? $"a longer run (--time) can follow it further: only {NumberFormat.Number(discarded, 2)} of the weight has been discarded so far"
            : $"a longer run at this budget would measure the truncation (already {NumberFormat.Number(discarded, 2)} of the weight discarded): use a t*(N) sweep at smaller N (e.g. --sweep 8,10,12, exact engine there) or 'opgrowth exact'";
    }

    private static List<VerdictRow> Verdicts(ScramblingRunResult r, List<HeadlineFigure> headlines)
    {
        var list = new List<VerdictRow>();
        var evo = r.Evolution;
        if (evo is not null && evo.Figures.Count > 0 && evo.Main.Records.Count > 0)
        {
            var fig = evo.Figures[0];
            var g = fig.Growth;
            double end = evo.Main.Records[^1].Time;
            double last = evo.Main.Records[^1].MeanSize;
            double ratio = g.SaturationRatio ?? last / g.SaturationExpected;
            string verdict = g.Saturation is not null && ratio >= 0.9 ? "scrambles" : fig.ScramblingTime.Value is not null ? "spreading (not yet saturated)" : "inconclusive";
            list.Add(new VerdictRow("operator spreads to a random operator",
                Measured.Exact(Sig(ratio, 3), g.Saturation is not null ? "saturation mean size / (3N/4)" : $"mean size / (3N/4) at t = {NumberFormat.Number(end, 3)}"),
                ">= 0.9 of 3N/4 at late times", verdict,
                g.Saturation is not null ? $"the mean size settles at {NumberFormat.Number(ratio, 3)} of a random operator's" : $"no plateau by t = {NumberFormat.Number(end, 3)}; {LongerRunAdvice(evo)}"));
            if (headlines.FirstOrDefault(x => x.Name == EvolutionHeadlines.ButterflyVelocity) is { } vb)
            {
                double v = vb.Value.Value, err = vb.Value.Uncertainty;
                bool finite = double.IsFinite(err) && v > 2 * err;
                list.Add(new VerdictRow("ballistic operator front", vb.Value, "v_B > 2 standard errors", finite ? "yes" : "inconclusive",
                    finite ? "the front moves at a finite speed (the headline v_B)" : "the velocity is not resolved from zero"));
            }
            list.Add(new VerdictRow("growth regime of the mean size",
                g.SizeLinear.Rate is double lr ? new Measured(lr, g.SizeLinear.RateError ?? double.NaN, "slope of the mean size", Win(g.SizeLinear.WindowStart, g.SizeLinear.WindowEnd), TimeUnits.For(r.Model.IsDriven).Velocity) : Measured.Exact(double.NaN, "slope of the mean size"),
                "regime of the best fit", g.Regime, g.RegimeReason));
        }
        if (r.Krylov?.Growth is { } lg && headlines.FirstOrDefault(x => x.Name == LanczosSlope) is { } alpha)
        {
            string meaning = lg.Best.Class switch
            {
                GrowthClass.Linear or GrowthClass.LinearOverLog => "consistent with chaos (linear growth, with a log correction in 1D)",
                GrowthClass.SquareRoot => "points to interacting integrable dynamics",
                _ => "points to free (quadratic) dynamics",
            };
            list.Add(new VerdictRow("Lanczos growth class", alpha.Value,
                "best AIC among linear, n-over-log-n, sqrt, bounded", GrowthClassNames.Of(lg.Best.Class),
                $"{meaning}; AIC of the next class higher by {NumberFormat.Number(lg.DeltaAic, 2)}"));
        }
        if (r.Diagnosis is { } d)
        {
            int ran = d.Tests.Count(t => t.Figure != "not measured");
            int yes = d.Tests.Count(t => t.Outcome == OpGrowth.Diagnosis.TestOutcome.Scrambles);
            int no = d.Tests.Count(t => t.Outcome == OpGrowth.Diagnosis.TestOutcome.Fails);
            list.Insert(0, new VerdictRow("overall (diagnosis battery)",
                Measured.Exact(yes, FormattableString.Invariant($"tests that say scrambles, of {ran} measured ({no} say fails)")),
                "the battery's rules combine the seven tests (see the diagnosis table)", r.Verdict!.Outcome, r.Verdict.Reason));
        }
        else
        {
            list.Add(new VerdictRow("diagnosis battery", Measured.Exact(0, "diagnostic tests run"), "-", "not run", r.DiagnosisSkipReason ?? "not run"));
            if (r.Verdict is { } v)
                list.Insert(0, new VerdictRow("overall (evolution only)", Measured.Exact(list.Count(x => x.Verdict == "scrambles"), "rows above that say scrambles"), "saturation >= 0.9 of 3N/4", v.Outcome, v.Reason));
        }
        if (r.Options.SweepSizes.Count > 0)
        {
            if (r.Sweep?.Series is { Comparison: { } cmp } series)
                list.Add(new VerdictRow("t*(N) scaling", Measured.Exact(Sig(cmp.DeltaAic, 2), "Delta AIC = AIC(a + N/v) - AIC(a + b ln N); positive favours ln N"),
                    "|Delta AIC| >= 2 to prefer one law, and only with fits that describe the data (Kass-Raftery scale)", cmp.Preferred switch { "log" => "ln N (fast)", "linear" => "linear in N (ballistic)", _ => "neither" }, cmp.Verdict));
            else
                list.Add(new VerdictRow("t*(N) scaling", Measured.Exact(r.Sweep?.Series?.Data.Count(x => x.TStar is not null) ?? 0, "sizes with t*"), "at least 3 sizes with t*", "not fitted",
                    r.Sweep?.Series?.Note ?? (r.Sweep is null ? "the sweep did not run (run stopped)" : "no sweep results")));
        }
        return list;
    }

    private static List<CheckRow> Checks(ScramblingRunResult r)
    {
        var list = new List<CheckRow>();
        if (r.CrossCheck is { Ran: true } x)
        {
            string tol = $"<= {NumberFormat.Number(x.Tolerance)} (both engines are exact to rounding here)";
            list.Add(new CheckRow($"Pauli vs exact OTOCs F_j(t), N = {x.N}", Measured.Exact(Sig(x.MaxOtocDifference), "max |Delta F| over times, sites, X/Y/Z"), tol, x.MaxOtocDifference <= x.Tolerance));
            list.Add(new CheckRow($"Pauli vs exact autocorrelation, N = {x.N}", Measured.Exact(Sig(x.MaxAutocorrelationDifference), "max |Delta C| over times"), tol, x.MaxAutocorrelationDifference <= x.Tolerance));
        }
        if (r.Evolution is { } evo && evo.Main.Records.Count > 0)
        {
            var last = evo.Main.Records[^1];
            double budget = Math.Abs(last.NormSquared + last.DiscardedTotal - 1);
            list.Add(new CheckRow("norm accounting: ||O(t)||^2 + discarded weight = 1", Measured.Exact(Sig(budget), "|norm + discarded - 1| at the last time"), "<= 1e-8 (rounding)", budget <= 1e-8));
            var (growth, _) = EvolutionHeadlines.NormGrowth(evo);
            list.Add(new CheckRow("the kept norm never grows (passes stay unitary)", Measured.Exact(Sig(Math.Max(0, growth)), "largest increase of ||O(t)||^2 between records"), $"<= {NumberFormat.Number(EvolutionHeadlines.NormGrowthTolerance)} (rotations keep it, truncation lowers it)", growth <= EvolutionHeadlines.NormGrowthTolerance));
            string tolerance = $"moves by at most {r.EvolutionOptions.ConvergenceTolerance.ToString("P0", Inv)} of its value, or less than its own fit error";
            foreach (var c in evo.Convergence.Where(c => c.Values.Any(v => v is not null)))
                list.Add(new CheckRow($"budget series: {EvolutionHeadlines.FigureName(c.Figure)}", Measured.Exact(Sig(c.Movement ?? double.NaN), "movement between the two largest budgets"), tolerance, c.Converged));
        }
        return list;
    }

    private static List<string> Cautions(ScramblingRunResult r)
    {
        var list = new List<string>
        {
            $"Truncation bias: the evolution keeps the {r.Preset.MaxStrings:N0} strings of largest |c| after every pass. Dropping small coefficients removes weight mostly from large strings, so late-time mean size, saturation and t* shift with the budget (the direction depends on the model: on the mixed-field Ising chain at N = 20, t* moved later as the budget grew); the discarded weight is recorded (see the discarded-weight figure) and the budget series (half and quarter budgets) shows how much each figure depends on the budget.",
            $"Finite-size and boundary effects: N = {r.Model.N} on a {r.Model.Lattice.Kind}. The front velocity is fitted only before the front reaches the boundary; t* depends on N (a t*(N) sweep separates ballistic from logarithmic scaling); the exact cross-check is at a smaller N and checks the engine, not the large-N physics.",
            "Infinite temperature: every figure is computed with all states equally weighted (the trace inner product). An experiment at finite temperature or in a particular initial state may see slower or different dynamics; these numbers describe, and bound, the high-temperature regime.",
        };
        if (r.Model.IsDriven) list.Add("Driven model: the Lanczos coefficients belong to the period-averaged generator, not to the Floquet map.");
        if (!r.Completed) list.Add($"The run stopped early ({r.StopReason}); stages that did not finish are missing from this report.");
        if (r.Evolution is { } e && EvolutionHeadlines.NormGrowthWarning(e) is { } broken) list.Add("Warning: " + char.ToUpperInvariant(broken[0]) + broken[1..] + ".");
        foreach (var n in r.Notes) list.Add("Note: " + n);
        return list;
    }

    private static object OptionsJson(ScramblingRunResult r) => new
    {
        model = r.Options.Model ?? ScramblingRunOptions.DefaultModel,
        overrides = r.Options.Overrides,
        probe = r.Problem.Initial[0].String.ToString(),
        effort = r.Options.Effort.ToString().ToLowerInvariant(),
        memoryBytes = r.Options.MemoryBytes,
        threads = r.Options.Threads,
        runExact = r.Options.RunExact,
        runLanczos = r.Options.RunLanczos,
        runDiagnosis = r.Options.RunDiagnosis,
        sweepSizes = r.Options.SweepSizes,
        time = r.EvolutionOptions.Time,
        crossCheckTolerance = r.Options.CrossCheckTolerance,
        evolution = new
        {
            method = r.EvolutionOptions.Method.ToString().ToLowerInvariant(),
            dt = r.EvolutionOptions.Dt,
            recordEvery = r.EvolutionOptions.RecordEvery,
            budgets = r.EvolutionOptions.BudgetCount,
            convergenceTolerance = r.EvolutionOptions.ConvergenceTolerance,
            truncation = r.EvolutionOptions.Truncation,
        },
        lanczos = r.LanczosOptions is null ? null : new { depth = r.LanczosOptions.Depth, budgets = r.Preset.LanczosBudgets, mode = "truncated", memoryBytes = r.LanczosOptions.MemoryBudgetBytes },
        exact = new { n = r.Preset.ExactN, time = r.Preset.ExactTime, method = "taylor (Pauli, no truncation) vs dense (exact)" },
        diagnosis = r.Diagnosis?.Settings,
        sweep = r.Sweep is { } sw ? new { sizes = sw.Sizes, folder = "sweep", engine = sw.Engine.CanonicalAllJson() } : null,
    };

    /// <summary>
    /// The run's overall verdict. When the diagnosis battery ran, its overall outcome and leading mechanism are
    /// the verdict (it weighs six independent tests); the evolution's own saturation signal is quoted beside it
    /// and any disagreement is stated. Without the battery the verdict rests on the evolution: saturation of the
    /// mean size at 0.9 or more of 3N/4 says scrambles, anything else is inconclusive.
    /// </summary>
    public static RunVerdict Decide(ScramblingRunResult r)
    {
        string? own = null;
        bool ownScrambles = false;
        bool ownPlateau = false;
        if (r.Evolution is { } evo && evo.Figures.Count > 0 && evo.Main.Records.Count > 0)
        {
            var g = evo.Figures[0].Growth;
            double ratio = g.SaturationRatio ?? evo.Main.Records[^1].MeanSize / g.SaturationExpected;
            ownScrambles = g.Saturation is not null && ratio >= 0.9;
            ownPlateau = g.Saturation is not null;
            own = g.Saturation is not null
                ? FormattableString.Invariant($"the evolution at N = {r.Model.N} saturates at {ratio:0.###} of the random-operator size 3N/4")
                : FormattableString.Invariant($"the evolution at N = {r.Model.N} reaches {ratio:0.###} of 3N/4 by t = {evo.Main.Records[^1].Time:0.##} without a plateau");
        }
        if (r.Diagnosis is { } d)
        {
            var o = d.Overall;
            string outcome = RunStages.OutcomeText(o.Outcome);
            string reason = $"{o.Reason} (tests {string.Join(", ", o.Supporting)})";
            if (own is not null)
            {
                // Without a plateau the evolution neither supports nor contradicts the battery.
                bool? agree = !ownPlateau ? null : o.Outcome switch
                {
                    OpGrowth.Diagnosis.TestOutcome.Scrambles => ownScrambles,
                    OpGrowth.Diagnosis.TestOutcome.Fails => !ownScrambles,
                    _ => true,
                };
                reason += agree switch
                {
                    null => $"; the evolution does not decide it: {own} (the run ended before saturation).",
                    true => $"; consistent with this: {own}.",
                    false => $"; note: {own}, which alone would point the other way (operator size also saturates in interacting integrable models, so the battery's combined tests decide).",
                };
            }
            // A leading mechanism is named only when it adds something ("scrambles" under "scrambles" would not).
            string mechanism = o.Leading is OpGrowth.Diagnosis.Mechanism.Scrambles or OpGrowth.Diagnosis.Mechanism.Undetermined ? "-" : o.LeadingName;
            return new RunVerdict(outcome, mechanism, reason, "diagnosis battery");
        }
        if (own is null) return new RunVerdict("inconclusive", "-", "no evolution data", "evolution");
        return new RunVerdict(ownScrambles ? "scrambles" : "inconclusive", "-",
            own + (ownScrambles ? "." : "; without the diagnosis battery this is not enough to decide."), "evolution");
    }

    private static List<ReportTable> Tables(ScramblingRunResult r)
    {
        var list = new List<ReportTable>();
        if (r.Diagnosis is { } d)
        {
            var rows = d.Tests.Select(t => (IReadOnlyList<string>)[t.Number.ToString(Inv), t.Name, OpGrowth.Diagnosis.MechanismNames.Of(t.Outcome), t.Figure,
                t.Threshold == "-" ? "-" : t.Threshold + " (source: " + WithoutOutsideFiles(t.Source) + ")", t.Reason]).ToList();
            var s = d.Settings;
            list.Add(new ReportTable("diagnosis", "Diagnosis", ["#", "test", "verdict", "figure", "threshold", "reason"], rows)
            {
                Intro = FormattableString.Invariant($"Overall: {RunStages.OutcomeText(d.Overall.Outcome)}{(r.Verdict is { Mechanism: not "-" } v ? $" (leading mechanism: {v.Mechanism})" : "")}. {d.Overall.Reason}. ") +
                    FormattableString.Invariant($"Bounded battery ({d.Seconds:0} s): level statistics at N = {s.LevelN}, conserved quantities on N = {s.ClusterN} (weight <= {s.MaxWeight}), operator size at N = {s.SizeN}, finite temperature at N = {s.ThermalN}; Lanczos depth {s.LanczosDepth} and evolution to t = {s.EvolutionTime:0.#}/epsilon on the full model (epsilon = {d.Epsilon:0.###}). ") +
                    "The battery runs its own, smaller computations, so its figures (for example the front velocity of test 4 and the Lanczos slope of test 2) come from a shorter evolution with a smaller string budget and from its own recursion; they are cross-checks of the outcome, not second values of the headline figures above, and may differ from them within those differences in method.",
                Footer = d.Caveats.Count == 0 ? null : "Caveats: " + string.Join("; ", d.Caveats) + ".",
                EmphasisColumn = 2,
            });
        }
        if (r.ScramblingTime is { } st)
        {
            var rows = new List<IReadOnlyList<string>>
            {
                new[] { "route", st.Route },
                new[] { "t*", st.Value is double v ? NumberFormat.ValueWithUncertainty(v, st.Uncertainty ?? double.NaN) : st.Low is double lb ? "> " + lb.ToString("0.##", Inv) : "not quoted" },
                new[] { "band", Band(st) },
                new[] { "method", st.Method },
                new[] { "basis", st.Basis },
            };
            foreach (var l in st.Laws) rows.Add(new[] { l.Law == "log" ? "law a + b ln N" : "law a + N/v", FormattableString.Invariant($"{NumberFormat.ValueWithUncertainty(l.Value, l.Error)} at N = {st.N} (Akaike weight {l.Weight:0.00}; a = {l.Fit.A:0.###}, slope = {l.Fit.Slope:0.####})") });
            foreach (var m in st.Members)
                rows.Add(new[] { $"member N = {m.N}", FormattableString.Invariant($"t* = {NumberFormat.ValueWithUncertainty(m.TStar, m.Error)}") + (m.Seeds > 1 ? FormattableString.Invariant($" ({m.Seeds} seeds, spread {m.Spread:0.###})") : "") + (m.HalfDistance is double hd ? FormattableString.Invariant($"; half-volume distance {hd:0.##}, front arrival {m.FrontArrival:0.###}") : "") });
            if (st.Cost is { } cost) rows.Add(new[] { "cost", cost });
            foreach (var a in st.Also) rows.Add(new[] { "also", a });
            if (r.Front is { } fs)
            {
                var fr = fs.Result;
                rows.Add(new[] { "front budget series", FormattableString.Invariant($"bond dimensions {string.Join("/", fr.Runs.Select(x => x.BondDimension))}, agree to distance {fr.ConvergedDistance} of {fr.MaxDistance}") + (fr.PartDistance is int pd ? FormattableString.Invariant($"; part at distance {pd} (t = {fr.PartTime:0.##})") : "; never part") + FormattableString.Invariant($" ({fr.WallSeconds:0.0} s)") });
            }
            list.Add(new ReportTable("tstar-statement", $"Scrambling time at N = {st.N}", ["", "value"], rows)
            {
                Intro = "Every run states t* at the model's own size by the best route available: measured (exact engine, or a converged Pauli budget series), predicted (from exact t* at smaller members: through the operator front for short-range models, through t* = a + b ln N and t* = a + N/v for all-to-all ones), or a bound (what the converged data exclude). The band is the value plus or minus two standard uncertainties.",
            });
        }
        if (r.Sweep?.Series is { } series)
        {
            var rows = series.Data.Select(a => (IReadOnlyList<string>)[a.N.ToString(Inv), a.Engine,
                a.TStar is double t ? NumberFormat.ValueWithUncertainty(t, a.TStarTotalError) : "not reached",
                a.MaxDiscardedWeight.ToString("G3", Inv), a.Converged ? "yes" : "no"]).ToList();
            string? fits = null;
            if (series.Comparison is { } c)
            {
                fits = FormattableString.Invariant($"t* = a + b ln N: a = {NumberFormat.ValueWithUncertainty(c.Log.A, c.Log.AError)}, b = {NumberFormat.ValueWithUncertainty(c.Log.Slope, c.Log.SlopeError)}, chi2/dof = {c.Log.ReducedChiSquared:0.##}. ")
                    + (c.Linear.V is double v
                        ? FormattableString.Invariant($"t* = a + N/v: a = {NumberFormat.ValueWithUncertainty(c.Linear.A, c.Linear.AError)}, v = {NumberFormat.ValueWithUncertainty(v, c.Linear.VError ?? double.NaN)}, chi2/dof = {c.Linear.ReducedChiSquared:0.##}. ")
                        : FormattableString.Invariant($"t* = a + N/v: slope {NumberFormat.ValueWithUncertainty(c.Linear.Slope, c.Linear.SlopeError)} is not positive, so no velocity. "))
                    + "Preferred: " + c.Verdict + ".";
            }
            list.Add(new ReportTable("tstar-scaling", "Scrambling time against size", ["N", "engine", "t*", "discarded weight", "converged"], rows)
            {
                Intro = $"t* (mean size reaches 3N/8) of {SweepProbeText(r)} at each N, from the sweep library (results in sweep/; rerunning the same command reuses finished points). Uncertainty: statistical, truncation (movement across budgets), grid and sampling in quadrature. Engines: exact at N <= {r.Sweep.Engine.ExactMaxN}, Pauli strings above, final time {NumberFormat.Number(r.Sweep.Engine.Time, 3)}.",
                Footer = fits ?? series.Note,
            });
        }
        return list;
    }

    /// <summary>
    /// The battery names some sources by design notes that are not part of the repository (conventions.md,
    /// check-values.md); the report points to what a reader has instead: the README's Conventions section and
    /// docs/diagnosis.md.
    /// </summary>
    internal static string WithoutOutsideFiles(string text)
        => text.Replace("conventions.md", "README, Conventions", StringComparison.Ordinal)
               .Replace("check-values.md", "docs/diagnosis.md", StringComparison.Ordinal);

    private static FitWindow? Win(double? a, double? b, string v = "t")
        => a is double x && b is double y && double.IsFinite(x) && double.IsFinite(y) && y >= x ? new FitWindow(x, y, v) : null;

    /// <summary>The probe of the t*(N) stage in words (the plan's template "model:K" is the model's probe K at each N).</summary>
    public static string SweepProbeText(ScramblingRunResult r)
    {
        string? template = r.Sweep?.Series?.Probe;
        if (template is null || !template.StartsWith("model:", StringComparison.Ordinal)) return template is null ? "the probe" : $"the probe {template}";
        string k = template["model:".Length..];
        return k == "0" ? $"the model's first probe ({r.Problem.Initial[0].String} at N = {r.Model.N})" : $"the model's probe {k}";
    }

    private static object DiagnosisJson(ScramblingRunResult r)
    {
        if (r.Diagnosis is not { } d) return new { ran = false, reason = r.DiagnosisSkipReason ?? "not run" };
        return new
        {
            ran = true,
            overall = new { verdict = RunStages.OutcomeText(d.Overall.Outcome), leadingMechanism = d.Overall.LeadingName, reason = d.Overall.Reason, supportingTests = d.Overall.Supporting, others = d.Overall.Others.Select(OpGrowth.Diagnosis.MechanismNames.Of) },
            tests = d.Tests.Select(t => new { number = t.Number, name = t.Name, verdict = OpGrowth.Diagnosis.MechanismNames.Of(t.Outcome), figure = t.Figure, threshold = t.Threshold, source = t.Source, reason = t.Reason, notes = t.Notes, seconds = t.Seconds }),
            caveats = d.Caveats,
            settings = d.Settings,
            epsilon = d.Epsilon,
            seconds = d.Seconds,
            file = "data/diagnosis.json",
        };
    }

    private static object SweepJson(ScramblingRunResult r)
    {
        if (r.Options.SweepSizes.Count == 0) return new { ran = false, requested = r.Options.SweepSizes, reason = "not requested" };
        if (r.Sweep is not { } s) return new { ran = false, requested = r.Options.SweepSizes, reason = "not reached (run stopped)" };
        var series = s.Series;
        object? Fit(OpGrowth.Sweeps.ScalingFit f) => new { law = f.Law, formula = f.Formula, a = f.A, aError = f.AError, slope = f.Slope, slopeError = f.SlopeError, v = f.V, vError = f.VError, chiSquared = f.ChiSquared, reducedChiSquared = f.ReducedChiSquared, aic = f.Aic, bic = f.Bic, weighted = f.Weighted };
        return new
        {
            ran = true,
            requested = r.Options.SweepSizes,
            folder = "sweep",
            computed = s.Computed,
            reused = s.Reused,
            failures = s.Failures,
            engine = s.Engine.CanonicalAllJson(),
            points = series?.Data.Select(a => new { n = a.N, engine = a.Engine, tStar = a.TStar, uncertainty = a.TStarTotalError, truncationError = a.TStarTruncationError, gridError = a.TStarGridError, samplingError = a.TStarSamplingError, discardedWeight = a.MaxDiscardedWeight, converged = a.Converged }),
            fits = series?.Comparison is { } c ? new { log = Fit(c.Log), linear = Fit(c.Linear), deltaAic = c.DeltaAic, logWeight = c.LogWeight, linearWeight = c.LinearWeight, preferred = c.Preferred, strength = c.Strength, verdict = c.Verdict } : null,
            note = series?.Note,
        };
    }

    private static object? ScramblingTimeJson(ScramblingRunResult r)
    {
        if (r.ScramblingTime is not { } st) return null;
        object Fit(OpGrowth.Sweeps.ScalingFit f) => new { law = f.Law, formula = f.Formula, a = f.A, aError = f.AError, slope = f.Slope, slopeError = f.SlopeError, correlation = f.Correlation, reducedChiSquared = f.ReducedChiSquared, aic = f.Aic };
        return new
        {
            n = st.N,
            route = st.Route,
            value = st.Value,
            uncertainty = st.Uncertainty,
            bandLow = st.Low,
            bandHigh = st.High,
            lowerBound = st.Route == "bound" ? st.Low : null,
            method = st.Method,
            basis = st.Basis,
            laws = st.Laws.Select(l => new { law = l.Law, value = l.Value, error = l.Error, weight = l.Weight, fit = Fit(l.Fit) }),
            members = st.Members.Select(m => new { n = m.N, tStar = m.TStar, error = m.Error, seedSpread = m.Spread, seeds = m.Seeds, halfDistance = m.HalfDistance, frontArrival = m.FrontArrival }),
            also = st.Also,
            cost = st.Cost,
            front = r.Front is { } fs ? new
            {
                bondDimensions = fs.Result.Runs.Select(x => x.BondDimension),
                threshold = fs.Result.Threshold,
                arrival = fs.Result.Arrival,
                arrivalUncertainty = fs.Result.ArrivalUncertainty,
                convergedDistance = fs.Result.ConvergedDistance,
                partDistance = fs.Result.PartDistance,
                partTime = fs.Result.PartTime,
                maxDistance = fs.Result.MaxDistance,
                velocity = fs.Result.Runs.Select(x => x.Figures.Butterfly?.Primary.Velocity),
                seconds = fs.Result.WallSeconds,
                file = "data/front_arrival.csv",
            } : null,
        };
    }

    private static object M(Measured m) => new { value = m.Value, uncertainty = m.Uncertainty, definition = m.Definition, unit = m.Unit, window = m.Window is { } w ? new { variable = w.Variable, start = w.Start, end = w.End } : null };

    private static Dictionary<string, object?> ResultsJson(ScramblingRunResult r, List<string> cautions)
    {
        var evo = r.Evolution;
        var lz = r.Lanczos;
        var d = new Dictionary<string, object?>
        {
            ["format"] = "opgrowth-run/1",
            ["toolVersion"] = ReportWriter.ToolVersion,
            ["created"] = DateTimeOffset.UtcNow,
            ["model"] = new { name = r.Model.Name, file = r.ModelFile, sha256 = ManifestWriter.Sha256OfFile(r.ModelFile), n = r.Model.N, lattice = r.Model.Lattice.Kind, parameters = r.Model.Parameters, probe = r.Problem.Initial[0].String.ToString(), driven = r.Model.IsDriven },
            ["options"] = OptionsJson(r),
            ["effort"] = r.Preset,
            ["seeds"] = r.Model.Seeds,
            ["threads"] = r.Options.Threads,
            ["completed"] = r.Completed,
            ["stopReason"] = r.StopReason,
            ["headline"] = r.Headlines.Select(h => new { name = h.Name, converged = h.Converged, note = h.Note, measured = M(h.Value) }).ToList(),
            ["scramblingTime"] = ScramblingTimeJson(r),
            ["freeFermions"] = r.FreeFermion is { } ff ? new { modes = ff.Modes, majorana = ff.Majorana, majoranaNote = ff.MajoranaNote, energyMin = ff.Energies[0], energyMax = ff.Energies[^1], energies = ff.Energies, reason = ff.Reason, lightConeFile = "data/free_fermion_light_cone.csv" } : null,
            ["evolution"] = evo is null ? null : new
            {
                completed = evo.Completed,
                stopReason = evo.StopReason,
                method = evo.Method,
                figures = evo.Figures,
                convergence = evo.Convergence,
                budgets = evo.Runs.Select(s => new { maxStrings = s.Budget.MaxStrings, completed = s.Completed, peakStrings = s.PeakStrings, seconds = s.ElapsedSeconds, discardedTotal = s.Records.Count > 0 ? s.Records[^1].DiscardedTotal : 0 }),
                times = evo.Main.Records.Select(x => x.Time),
                meanSize = evo.Main.Records.Select(x => x.MeanSize),
                autocorrelation = evo.Main.Records.Select(x => x.Autocorrelation),
                discardedTotal = evo.Main.Records.Select(x => x.DiscardedTotal),
                wallSeconds = evo.WallSeconds,
            },
            ["lanczos"] = lz is null ? null : new
            {
                b = lz.B,
                uncertainty = lz.Uncertainty,
                budgets = lz.Budgets,
                trustedDepth = r.Krylov?.TrustedDepth,
                stop = lz.Reference.StopReason.ToString(),
                growth = r.Krylov?.Growth is { } g ? new
                {
                    best = GrowthClassNames.Of(g.Best.Class),
                    formula = g.Best.Formula,
                    alpha = g.Alpha,
                    alphaError = g.AlphaError,
                    lyapunovBound = g.BoundApplies ? g.LyapunovBound : (double?)null,
                    windowStart = g.WindowStart,
                    windowEnd = g.WindowEnd,
                    deltaAic = g.DeltaAic,
                    fits = g.Fits.Select(f => new { @class = GrowthClassNames.Of(f.Class), formula = f.Formula, a = f.A, aError = f.AError, c = f.C, cError = f.CError, aic = f.Aic }),
                } : null,
            },
            ["crossCheck"] = r.CrossCheck is { } x ? new
            {
                ran = x.Ran, skipReason = x.SkipReason, n = x.N, probe = x.Probe, tolerance = x.Tolerance, passed = x.Passed,
                maxOtocDifference = x.MaxOtocDifference, maxAutocorrelationDifference = x.MaxAutocorrelationDifference, exactMethod = x.ExactMethod, times = x.Times,
            } : new { ran = false, skipReason = (string?)(r.Options.RunExact ? "not reached (run stopped)" : "turned off (--no-exact)"), n = 0, probe = "", tolerance = r.Options.CrossCheckTolerance, passed = false, maxOtocDifference = double.NaN, maxAutocorrelationDifference = double.NaN, exactMethod = "", times = Array.Empty<double>() },
            ["verdict"] = r.Verdict is { } rv ? new { outcome = rv.Outcome, mechanism = rv.Mechanism, reason = rv.Reason, source = rv.Source } : null,
            ["diagnosis"] = DiagnosisJson(r),
            ["sweep"] = SweepJson(r),
            ["verdicts"] = r.Verdicts.Select(v => new { test = v.Test, verdict = v.Verdict, threshold = v.Threshold, reason = v.Reason, figure = M(v.Figure) }).ToList(),
            ["checks"] = r.Checks.Select(c => new { name = c.Name, passed = c.Passed, tolerance = c.Tolerance, figure = M(c.Figure) }).ToList(),
            ["cautions"] = cautions,
            ["notes"] = r.Notes,
            ["timingsSeconds"] = r.TimingsSeconds,
            ["files"] = r.Files,
        };
        return d;
    }
}
