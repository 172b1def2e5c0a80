using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Exact;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Symmetry;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Test 1: level statistics at small N with the symmetries found from the terms resolved
/// (<see cref="SymmetryDiscovery"/>: conserved totals along any axis, total spin, conserved Pauli strings,
/// lattice translations and mirrors, time reversal). The mean gap ratio &lt;r&gt; is compared with Poisson
/// (0.3863) and the Wigner-Dyson value of the sectors' classes; the verdict uses its distance from the
/// midpoint in units of the error bar. A Poisson-like value is not trusted while a symmetry that maps a
/// used sector onto itself is unresolved (merged independent blocks also look Poissonian).
/// Source: Oganesyan and Huse, PRB 75, 155111 (2007) (gap ratio); Atas, Bogomolny, Giraud, Roux,
/// PRL 110, 084101 (2013) (reference values).
/// </summary>
public static class LevelStatisticsCheck
{
    /// <summary>Test name.</summary>
    public const string Name = "level statistics";

    /// <summary>
    /// Runs the test on a smaller member of the family (and more realisations for disordered models). The
    /// size is chosen as the largest member, from <see cref="DiagnosisOptions.LevelN"/> + 4 down, whose
    /// symmetry blocks fit the cost budget <see cref="DiagnosisOptions.LevelSeconds"/> (symmetries that split
    /// the space finely, such as translations, allow larger members).
    /// </summary>
    public static (TestVerdict Verdict, LevelFindings? Findings) Run(Model model, Func<int, int, Model?> member, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(member);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        var log = options.Logger;
        if (model.IsDriven)
        {
            int dn = FloquetLevelStatistics.DrivenSize(options.LevelN);
            var reals = Realizations(model, member, dn, options);
            if (reals.Count == 0) return (TestVerdict.NotRun(1, Name, $"no member of the family with at most {dn} sites"), null);
            return FloquetLevelCheck.Run(reals, options, ct);
        }
        if (model.Hamiltonian.Terms.Count > 0 && Symmetry.PauliCommutant.AllCommute(model.Hamiltonian.Terms.Where(t => !t.String.IsIdentity).Select(t => t.String).ToList()))
        {
            return (TestVerdict.NotRun(1, Name, "the terms commute with each other (test 7): the levels are sums of the terms' eigenvalues, degenerate by construction, and gap ratios say nothing more"), null);
        }
        int top = Math.Min(model.N, Math.Min(options.LevelN + 4, 20));
        SymmetryAnalysis? chosen = null;
        Model? chosenModel = null;
        IReadOnlyList<SymmetryBlock>? blocks = null;
        double estimate = 0;
        string? lastProblem = null;
        for (int n = top; n >= 4 && chosen is null; n--)
        {
            ct.ThrowIfCancellationRequested();
            var m = member(n, 0);
            if (m is null || m.N != n) continue;
            var a = SymmetryDiscovery.Analyze(m.Hamiltonian, m.Lattice, m.SizeMeasure == SizeMeasure.Majoranas);
            IReadOnlyList<SymmetryBlock> b;
            try
            {
                b = SectorSpace.Enumerate(a.N, a.ResolveTotalZ, a.Abelian, a.Swap, a.HalfFillingFlip, a.Real, a.SpinRotation ? a.N / 2 : int.MaxValue, a.Residual);
            }
            catch (ArgumentException ex)
            {
                lastProblem = ex.Message;
                continue;
            }
            double cost = b.Where(x => x.Dimension >= 32).Sum(x => SecondsFor(x.Dimension, a.Real));
            if (cost > options.LevelSeconds || b.Any(x => x.Dimension > options.LevelMaxDimension))
            {
                lastProblem = FormattableString.Invariant($"at N = {n} the largest block has {b.Max(x => x.Dimension)} levels (estimated {cost:0} s)");
                continue;
            }
            (chosen, chosenModel, blocks, estimate) = (a, m, b, cost);
        }
        if (chosen is null || chosenModel is null)
        {
            return (TestVerdict.NotRun(1, Name, "no member of the family fits the level-statistics budget" + (lastProblem is null ? string.Empty : $" ({lastProblem})"), sw.Elapsed.TotalSeconds), null);
        }
        log?.LogInformation("level statistics: N = {N}, {Blocks} blocks (largest {D}, estimated {S:F0} s); resolved: {Resolved}", chosen.N, blocks!.Count, blocks.Max(b => b.Dimension), estimate, string.Join("; ", chosen.Resolved));
        var analyses = new List<SymmetryAnalysis> { chosen };
        if (chosenModel.IsDisordered)
        {
            foreach (var r in Realizations(chosenModel, member, chosen.N, options).Skip(1))
                analyses.Add(SymmetryDiscovery.Analyze(r.Hamiltonian, r.Lattice, r.SizeMeasure == SizeMeasure.Majoranas));
        }
        SectorLevelsResult res;
        try
        {
            res = SectorLevels.Run(analyses, options.EffectiveThreads, log: log);
        }
        catch (ResourceLimitException ex)
        {
            return (TestVerdict.NotRun(1, Name, ex.Message, sw.Elapsed.TotalSeconds), null);
        }
        var findings = Findings(chosen, res, chosenModel);
        var verdict = Judge(findings) with { Seconds = sw.Elapsed.TotalSeconds };
        log?.LogInformation("level statistics: <r> = {R:F4} +- {E:F4} over {G} ratios ({Outcome}, {S:F1} s)", findings.MeanRatio, findings.Error, findings.Gaps, MechanismNames.Of(verdict.Outcome), sw.Elapsed.TotalSeconds);
        return (verdict, findings);
    }

    /// <summary>Estimated seconds to diagonalise one block (measured on the 2-core reference machine, managed solver; common practice to scale as d^3).</summary>
    internal static double SecondsFor(int d, bool real) => real ? 4.0 * Math.Pow(d / 3000.0, 3) : 12.0 * Math.Pow(d / 2000.0, 3);

    private static List<Model> Realizations(Model model, Func<int, int, Model?> member, int n, DiagnosisOptions options)
    {
        int count = model.IsDisordered ? Math.Max(1, options.LevelRealizations) : 1;
        return Enumerable.Range(0, count).Select(r => member(n, r)).Where(m => m is not null).Select(m => m!).ToList();
    }

    private static LevelFindings Findings(SymmetryAnalysis a, SectorLevelsResult res, Model m)
    {
        var warnings = new List<string>(a.Notes);
        warnings.AddRange(res.Warnings);
        var residualNames = a.Residual.Select(r => r.Name).ToHashSet();
        // Unresolved symmetries that matter: those mixing a used block, and those that act in ways the
        // sectors cannot account for (not a permutation of the sectors).
        var unresolved = res.MixedBy.Concat(a.Unresolved.Where(u => !residualNames.Contains(u))).Distinct().ToList();
        var harmless = a.Unresolved.Where(u => residualNames.Contains(u) && !res.MixedBy.Contains(u)).ToList();
        if (harmless.Count > 0) warnings.Add($"not resolved, but no sector used is mapped onto itself by: {string.Join(", ", harmless)}");
        return new LevelFindings
        {
            N = a.N,
            MeanRatio = res.MeanRatio,
            Error = res.Error,
            ErrorKind = res.ErrorKind,
            Gaps = res.Gaps,
            WignerDysonClass = res.WignerDysonClass,
            WignerDysonRatio = res.WignerDysonRatio,
            PoissonRatio = DiagnosisThresholds.PoissonRatio,
            Resolved = a.Resolved,
            Unresolved = unresolved,
            Sectors = res.Blocks.Select(b => new SectorStatistics(b.Label, b.Dimension, b.Ratios, b.Mean, b.Error, b.Degenerate)).ToArray(),
            Warnings = warnings,
            Realizations = res.Realizations,
            ConservedTotals = a.ConservedTotals.Select(c => $"total {c}").ToArray(),
            ConservedStrings = a.ConservedStrings.Count,
            ConservedStringExamples = a.ConservedStrings.Take(6).Select(s => s.ToString()).ToArray(),
            Commuting = a.Commuting,
            DimensionCovered = res.DimensionCovered,
            FullDimension = res.FullDimension,
            SizeMeasure = m.SizeMeasure == SizeMeasure.Majoranas ? $"{2 * m.N} Majoranas" : $"{m.N} sites",
        };
    }

    /// <summary>The verdict from the measured &lt;r&gt; (pure: no computation).</summary>
    public static TestVerdict Judge(LevelFindings f)
    {
        ArgumentNullException.ThrowIfNull(f);
        string wd = f.WignerDysonClass;
        string figure = f.Gaps > 1 && double.IsFinite(f.Error)
            ? FormattableString.Invariant($"<r> = {f.MeanRatio:F4} +- {f.Error:F4} (N = {f.N}, {f.Gaps} ratios)")
            : FormattableString.Invariant($"{f.Gaps} gap ratios (N = {f.N})");
        string threshold = FormattableString.Invariant(
            $"midpoint {f.Midpoint:F4} of Poisson {f.PoissonRatio:F4} and {wd} {f.WignerDysonRatio:F4}, at least {DiagnosisThresholds.LevelSigmas:0} error bars away");
        const string source = "Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013); 3 error bars: common practice";
        var notes = new List<string>(f.Warnings);
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => TestVerdict.Of(1, Name, figure, threshold, source, notes, o, reason, ev);
        if (f.Gaps < DiagnosisThresholds.MinimumGaps || !double.IsFinite(f.Error) || f.Error <= 0 || !double.IsFinite(f.MeanRatio))
        {
            return V(TestOutcome.NotRun, $"only {f.Gaps} gap ratios in the resolved sectors: too few for a verdict (at least {DiagnosisThresholds.MinimumGaps}; raise the effort for a larger member)");
        }
        double z = f.SigmasFromMidpoint;
        if (Math.Abs(z) < DiagnosisThresholds.LevelSigmas)
        {
            return V(TestOutcome.Inconclusive, FormattableString.Invariant(
                $"<r> lies {Math.Abs(z):F1} error bars from the Poisson/{wd} midpoint: between integrable and chaotic statistics (crossover or finite size)"));
        }
        if (z > 0)
        {
            double off = f.SigmasFromWignerDyson;
            if (Math.Abs(off) > DiagnosisThresholds.LevelSigmas)
                notes.Add(FormattableString.Invariant($"<r> is {off:+0.0;-0.0} error bars from {wd}: level repulsion, but not fully developed at this size"));
            return V(TestOutcome.Scrambles, FormattableString.Invariant(
                $"levels repel: <r> is {z:F1} error bars above the midpoint, on the {wd} (chaotic) side"), Mechanism.Scrambles);
        }
        if (f.MeanRatio < f.PoissonRatio - DiagnosisThresholds.LevelSigmas * f.Error)
        {
            notes.Add(FormattableString.Invariant(
                $"<r> is {-f.SigmasFromPoisson:F1} error bars below Poisson: degenerate levels (an unresolved symmetry, or the additive spectrum of free fermions)"));
        }
        if (f.Unresolved.Count > 0)
        {
            return V(TestOutcome.Inconclusive,
                $"Poisson-like <r>, but the unresolved symmetry ({string.Join(", ", f.Unresolved)}) mixes independent blocks, which also gives Poisson-like statistics");
        }
        return V(TestOutcome.Fails, FormattableString.Invariant(
            $"no level repulsion with every symmetry found resolved: <r> is {-z:F1} error bars below the midpoint, on the Poisson side (integrable, free, localized or commuting)"),
            Mechanism.InteractingIntegrable, Mechanism.FreeFermions, Mechanism.Localized, Mechanism.Commuting);
    }
}
