using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Krylov;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Test 2: growth of the Lanczos coefficients of local probes at infinite temperature. Linear growth
/// (n/ln n in one dimension) is the chaotic class, sqrt(n) the interacting-integrable class and bounded
/// b_n the free class. Uniform chains use the infinite-chain recursion (exact, within a memory and time
/// budget); other models the finite system with top-M truncation at two budgets. A probe whose
/// straight-line slope is not significant (|alpha| &lt; 3 standard errors) counts as bounded: its operator
/// does not keep growing (free or localized).
/// Source: Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019).
/// </summary>
public static class LanczosGrowthCheck
{
    /// <summary>Test name.</summary>
    public const string Name = "Lanczos growth";

    /// <summary>Largest relative uncertainty of a b_n used in the fit (common practice).</summary>
    public const double MaxRelativeUncertainty = 0.1;

    /// <summary>The probes used: the model's first probe and, when it sits on one site, X and Z on that site (not when H has SU(2) symmetry, which makes them equivalent).</summary>
    public static IReadOnlyList<PauliString> ProbesOf(Model model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var first = model.Probes[0];
        var list = new List<PauliString> { first };
        // With SU(2) spin-rotation symmetry a global rotation maps X_j onto Z_j (and leaves H alone), so the
        // other letters on the probe's site give the same size, autocorrelation and Lanczos coefficients.
        if (first.Weight == 1 && model.SizeMeasure == SizeMeasure.Qubits && !OperatorAlgebra.HasSpinRotationSymmetry(model.Hamiltonian))
        {
            int s = first.Support()[0];
            foreach (char a in "XZ")
            {
                var p = PauliString.Single(model.N, s, a);
                if (!list.Contains(p)) list.Add(p);
            }
        }
        return list;
    }

    /// <summary>Runs the test on the full model.</summary>
    public static (TestVerdict Verdict, LanczosFindings? Findings) Run(Model model, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        if (model.IsDriven) return (TestVerdict.NotRun(2, Name, "a driven model has no Liouvillian [H, .]: Lanczos growth is not defined for the period map"), null);
        var log = options.Logger;
        // the exact infinite-chain recursion needs a short-range cell: with couplings at every distance the
        // light cone is the whole chain and the recursion's chain would grow without bound
        bool chain = model.IsTranslationInvariant && model.Lattice.Kind is "chain" or "ring" && ShortRange(model);
        var results = new List<LanczosProbeFindings>();
        foreach (var probe in ProbesOf(model))
        {
            ct.ThrowIfCancellationRequested();
            results.Add(RunProbe(model, probe, chain, options, ct));
            var r = results[^1];
            log?.LogInformation("Lanczos growth: {Probe}: {Kind} ({Formula}, delta AIC {D:F1}, alpha {A:F3} +- {E:F3}) from {Used} coefficients, {Mode}, {S:F1} s",
                r.Probe, r.Kind, r.BestFormula ?? "no fit", r.DeltaAic, r.Alpha, r.AlphaError, r.Used, r.Mode, r.Seconds);
        }
        var findings = new LanczosFindings(results);
        return (Judge(findings) with { Seconds = sw.Elapsed.TotalSeconds }, findings);
    }

    private static LanczosProbeFindings RunProbe(Model model, PauliString probe, bool chain, DiagnosisOptions o, CancellationToken ct)
    {
        var sw = Stopwatch.StartNew();
        using var limit = new WorkBudget(o.LanczosSeconds, o.EffectiveThreads, ct);
        var lo = new LanczosOptions
        {
            Depth = o.LanczosDepth,
            MemoryBudgetBytes = o.LanczosMemoryBytes,
            Threads = o.EffectiveThreads,
            Cancellation = limit.Token,
        };
        LanczosEstimate est;
        string mode;
        if (chain)
        {
            est = LanczosStudy.Run(model, probe, LanczosMode.InfiniteChain, lo, []);
            mode = "infinite chain, exact";
        }
        else
        {
            est = LanczosStudy.Run(model, probe, LanczosMode.Truncated, lo, [o.LanczosMaxStrings]);
            mode = FormattableString.Invariant($"finite system (N = {model.N}), top-M truncation at M = {o.LanczosMaxStrings / 4} and {o.LanczosMaxStrings}");
        }
        ct.ThrowIfCancellationRequested();
        var b = est.B;
        var u = est.Uncertainty;
        int used = KrylovAnalyzer.TrustedDepth(est);
        for (int n = 0; n < used; n++)
        {
            if (u[n] > MaxRelativeUncertainty * Math.Abs(b[n])) { used = n; break; }
        }
        // A finite system: the b_n stop growing once the operator fills the system (Parker et al. 2019: linear
        // growth lasts up to n ~ N); only the window before that is fitted.
        string? saturation = null;
        if (!chain)
        {
            int cut = SaturationCut(b.Take(used).ToArray(), model.N);
            if (cut < used)
            {
                saturation = $"b_n of the finite system stop growing after n = {cut} (finite-size saturation; N = {model.N}{OperatorSpaceNote(model)}): only b_1..b_{cut} fitted";
                used = cut;
            }
        }
        var (kind, formula, delta, alpha, alphaErr, window) = Classify(b.Take(used).ToArray());
        if (!chain && kind == "sqrt")
        {
            // sqrt(n) from a finite (or truncated) system is not evidence: n/ln n and the bending of finite-size
            // saturation look the same over this window; only exact infinite-chain coefficients can tell.
            kind = "undecided";
            saturation = (saturation is null ? string.Empty : saturation + "; ") + "sqrt(n) fits best, but a finite system's b_n bend like sqrt(n) near saturation and n/ln n is also concave: not counted as integrability evidence";
        }
        string stop = est.Reference.StopMessage;
        if (limit.Spent && !ct.IsCancellationRequested) stop = $"{limit.Describe(o.LanczosSeconds, o.EffectiveThreads)} after b_{b.Count}";
        return new LanczosProbeFindings
        {
            Probe = probe.ToString(),
            Mode = mode,
            B = b,
            Uncertainty = u,
            Used = used,
            Kind = kind,
            BestFormula = formula,
            DeltaAic = delta,
            Alpha = alpha,
            AlphaError = alphaErr,
            WindowStart = window.Item1,
            WindowEnd = window.Item2,
            StopMessage = saturation is null ? stop : string.IsNullOrEmpty(stop) ? saturation : $"{stop}; {saturation}",
            DiscardedWeight = est.Reference.TotalDiscardedWeight,
            Seconds = sw.Elapsed.TotalSeconds,
        };
    }

    /// <summary>Largest interaction range (in sites) for which the exact infinite-chain recursion is used.</summary>
    public const int MaxChainRange = 4;

    private static bool ShortRange(Model model)
    {
        try
        {
            var cell = TranslationCell.FromHamiltonian(model.Hamiltonian, model.Lattice.Kind == "ring", model.SourceFile);
            return cell.Range <= MaxChainRange;
        }
        catch (IO.InputException)
        {
            return false;
        }
    }

    /// <summary>Fewest coefficients in the fit window for a class to count as evidence (common practice).</summary>
    public const int MinimumWindow = 10;

    /// <summary>AIC margin over the best fit of another kind for strong evidence (common practice: Burnham and Anderson (2002) read a margin above 6-10 as strong).</summary>
    public const double StrongDeltaAic = 6;

    /// <summary>
    /// Where the b_n of a finite system stop growing: n = min(N, first n with a stall), a stall being a
    /// mean slope over the next four coefficients below a third of the mean slope so far (common practice).
    /// </summary>
    internal static int SaturationCut(IReadOnlyList<double> b, int n)
    {
        int cut = Math.Min(b.Count, n);
        for (int k = 6; k + 4 <= cut; k++)
        {
            double overall = (b[k - 1] - b[0]) / (k - 1);
            double local = (b[k + 3] - b[k - 1]) / 4;
            if (overall > 0 && local < overall / 3) return k;
        }
        return cut;
    }

    private static string OperatorSpaceNote(Model model)
    {
        double log10 = model.N * Math.Log10(4);
        return FormattableString.Invariant($"; operator space of dimension 4^{model.N} - 1 ~ 1e{log10:0}");
    }

    /// <summary>Kind of a growth class: "linear" for n and n/ln n, "sqrt", "bounded".</summary>
    public static string KindOf(GrowthClass c) => c switch
    {
        GrowthClass.Linear or GrowthClass.LinearOverLog => "linear",
        GrowthClass.SquareRoot => "sqrt",
        _ => "bounded",
    };

    /// <summary>
    /// Classifies coefficients b_1..b_n: fits every class over the default window; "bounded" when the
    /// straight-line slope is not significant or the best growing fit has a negative amplitude; otherwise the
    /// best class, decided only when the best fit of another kind trails by at least the AIC margin.
    /// </summary>
    public static (string Kind, string? Formula, double DeltaAic, double Alpha, double AlphaError, (int, int) Window) Classify(IReadOnlyList<double> b)
    {
        ArgumentNullException.ThrowIfNull(b);
        if (b.Count < 6) return ("undecided", null, 0, double.NaN, double.NaN, (0, 0));
        int start = Math.Max(3, (int)Math.Ceiling(b.Count / 4.0));
        if (b.Count - start + 1 < 4) start = Math.Max(2, b.Count - 3);
        var g = LanczosGrowth.Fit(b, start, b.Count);
        var best = g.Best;
        string kind = KindOf(best.Class);
        var other = g.Fits.Where(f => KindOf(f.Class) != kind).MinBy(f => f.Aic);
        double delta = other is null ? double.PositiveInfinity : other.Aic - best.Aic;
        bool flat = !(g.Alpha > 3 * g.AlphaError) || (best.Class != GrowthClass.Bounded && best.A <= 0);
        if (flat && g.WindowEnd - g.WindowStart + 1 >= MinimumWindow)
        {
            var bounded = g.Fits.First(f => f.Class == GrowthClass.Bounded);
            return ("bounded", bounded.Formula, Math.Max(0, delta), g.Alpha, g.AlphaError, (g.WindowStart, g.WindowEnd));
        }
        if (kind == "bounded") kind = "undecided"; // significant slope but a constant fits best: contradictory, do not decide
        // Evidence needs depth and margin: over a short window n/ln n, n and sqrt(n) are hard to tell apart.
        int points = g.WindowEnd - g.WindowStart + 1;
        if (delta < StrongDeltaAic || points < MinimumWindow) kind = "undecided";
        return (kind, best.Formula, delta, g.Alpha, g.AlphaError, (g.WindowStart, g.WindowEnd));
    }

    /// <summary>The verdict from the per-probe growth kinds (pure).</summary>
    public static TestVerdict Judge(LanczosFindings f)
    {
        ArgumentNullException.ThrowIfNull(f);
        var inv = System.Globalization.CultureInfo.InvariantCulture;
        string figure = string.Join("; ", f.Probes.Select(p => string.Create(inv,
            $"{p.Probe}: {p.Kind}{(p.BestFormula is null ? string.Empty : $" ({p.BestFormula}, n = {p.WindowStart}..{p.WindowEnd}, dAIC {p.DeltaAic:0.0})")}")));
        string threshold = string.Create(inv,
            $"best class by AIC over at least {MinimumWindow} coefficients before any finite-size saturation, decided when the best fit of another kind trails by >= {StrongDeltaAic} (strong evidence); bounded when the slope alpha is below 3 standard errors");
        const string source = "Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019); AIC margin and 3 sigma: common practice";
        var notes = f.Probes.Where(p => !string.IsNullOrEmpty(p.StopMessage)).Select(p => $"{p.Probe}: {p.StopMessage}").ToList();
        foreach (var p in f.Probes.Where(p => p.DiscardedWeight > 0))
            notes.Add(string.Create(inv, $"{p.Probe}: truncation discarded weight {p.DiscardedWeight:G3} in total; b_n with budget spread above {MaxRelativeUncertainty:P0} were not used ({p.Used} of {p.B.Count} used)"));
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => TestVerdict.Of(2, Name, figure, threshold, source, notes, o, reason, ev);
        var bounded = f.Probes.FirstOrDefault(p => p.Kind == "bounded");
        if (bounded is not null)
        {
            return V(TestOutcome.Fails, string.Create(inv,
                $"the Lanczos coefficients of {bounded.Probe} stay bounded (slope {bounded.Alpha:0.###} +- {bounded.AlphaError:0.###}): the operator stays in a small operator space (localized, or quadratic in fermions; only test 7 can say free)"),
                Mechanism.Localized, Mechanism.FreeFermions);
        }
        bool anyLinear = f.Probes.Any(p => p.Kind == "linear");
        var sqrt = f.Probes.FirstOrDefault(p => p.Kind == "sqrt");
        if (anyLinear && sqrt is null && f.Probes.All(p => p.Kind is "linear" or "undecided"))
        {
            var l = f.Probes.First(p => p.Kind == "linear");
            return V(TestOutcome.Scrambles, string.Create(inv,
                $"b_n of {l.Probe} grow linearly (alpha = {l.Alpha:0.###} +- {l.AlphaError:0.###}, so lambda_L <= {2 * l.Alpha:0.###} at infinite temperature): the chaotic growth class"), Mechanism.Scrambles);
        }
        if (sqrt is not null && !anyLinear)
        {
            return V(TestOutcome.Fails, $"b_n of {sqrt.Probe} grow like sqrt(n), the class of interacting integrable models", Mechanism.InteractingIntegrable);
        }
        return V(TestOutcome.Inconclusive, anyLinear && sqrt is not null
            ? "probes disagree (one linear, one sqrt(n)): no single growth class"
            : $"undecided: no growth class leads by at least {StrongDeltaAic} in AIC over {MinimumWindow} or more coefficients (in one dimension n/ln n and sqrt(n) need depth to be told apart; a higher effort computes more b_n)");
    }
}
