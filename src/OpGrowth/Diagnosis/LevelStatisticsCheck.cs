using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Test 1: level statistics at small N with the symmetries resolved. The mean gap ratio &lt;r&gt; is compared
/// with Poisson (0.3863) and GOE/GUE (0.5307/0.5996); the verdict uses its distance from the midpoint in
/// units of the error bar. A Poisson-like value is not trusted while a symmetry of H is unresolved
/// (merged independent blocks also look Poissonian).
/// Source: Oganesyan and Huse, PRB 75, 155111 (2007) (gap ratio); Atas, Bogomolny, Giraud, Roux,
/// PRL 110, 084101 (2013) (reference values).
/// </summary>
public static class LevelStatisticsCheck
{
    /// <summary>Test name.</summary>
    public const string Name = "level statistics";

    /// <summary>Runs the test on the smaller member(s) of the family (one per disorder realisation).</summary>
    public static (TestVerdict Verdict, LevelFindings? Findings) Run(IReadOnlyList<Model> realizations, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(realizations);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        var m = realizations[0];
        if (m.IsDriven) return FloquetLevelCheck.Run(realizations, options, ct);
        ct.ThrowIfCancellationRequested();
        var log = options.Logger;
        var h0 = m.Hamiltonian;
        var warnings = new List<string>();
        LevelFindings findings;
        bool su2 = OperatorAlgebra.HasSpinRotationSymmetry(h0);
        if (su2)
        {
            log?.LogInformation("level statistics: H has SU(2) spin-rotation symmetry; resolving total spin by multiplet subtraction (N = {N})", m.N);
            findings = RunSpinResolved(realizations, options, warnings) ?? RunSectors(realizations, options, warnings, su2);
        }
        else
        {
            findings = RunSectors(realizations, options, warnings, su2);
        }
        var verdict = Judge(findings) with { Seconds = sw.Elapsed.TotalSeconds };
        log?.LogInformation("level statistics: <r> = {R:F4} +- {E:F4} over {G} ratios ({Outcome}, {S:F1} s)", findings.MeanRatio, findings.Error, findings.Gaps, MechanismNames.Of(verdict.Outcome), sw.Elapsed.TotalSeconds);
        return (verdict, findings);
    }

    private static LevelFindings RunSectors(IReadOnlyList<Model> realizations, DiagnosisOptions options, List<string> warnings, bool su2)
    {
        var m = realizations[0];
        var hs = realizations.Select(r => r.Hamiltonian).ToArray();
        var (candidates, swap) = SpatialCandidates(m.Lattice);
        var res = LevelStatistics.Analyze(hs, new LevelStatisticsOptions
        {
            DeclaredSymmetries = m.Symmetries,
            SpatialCandidates = candidates,
            SwapCandidate = swap,
            Threads = options.EffectiveThreads,
            Logger = options.Logger,
        });
        var unresolved = new List<string>();
        foreach (var d in res.Detected.Where(d => !res.Resolved.Contains(d))) unresolved.Add(d);
        foreach (var s in m.Symmetries)
        {
            string name = s == "fermion-parity" ? "spin-flip" : s;
            if (name is "time-reversal") continue;
            if (!res.Resolved.Contains(name) && !unresolved.Contains(name)) unresolved.Add(name);
        }
        if (su2)
        {
            unresolved.Add("total spin (SU(2))");
            warnings.Add("H conserves total X, Y and Z (SU(2)); the multiplet subtraction failed, so sectors of different total spin are mixed and <r> is biased toward Poisson");
        }
        warnings.AddRange(res.Warnings);
        return new LevelFindings
        {
            N = m.N,
            MeanRatio = res.MeanRatio,
            Error = res.StandardError,
            ErrorKind = res.ErrorKind,
            Gaps = res.Gaps,
            WignerDysonClass = res.RealBlocks ? "GOE" : "GUE",
            WignerDysonRatio = res.RealBlocks ? DiagnosisThresholds.GoeRatio : DiagnosisThresholds.GueRatio,
            PoissonRatio = DiagnosisThresholds.PoissonRatio,
            Resolved = res.Resolved,
            Unresolved = unresolved,
            Sectors = res.Sectors,
            Warnings = warnings,
            Realizations = res.Realizations,
        };
    }

    private static LevelFindings? RunSpinResolved(IReadOnlyList<Model> realizations, DiagnosisOptions options, List<string> warnings)
    {
        const double central = 0.8; // same central fraction as the exact engine's default (common practice)
        const int minBlock = 32;
        var all = new List<double>();
        var perReal = new List<double>();
        var sectors = new List<SectorStatistics>();
        var m = realizations[0];
        bool refl = LevelStatistics.DetectSymmetries(m.Hamiltonian).Contains("reflection");
        bool real = m.Hamiltonian.Terms.All(t => PauliMask.From(t.String).IsReal);
        for (int ri = 0; ri < realizations.Count; ri++)
        {
            var blocks = SpinMultipletLevels.Resolve(realizations[ri].Hamiltonian, refl, options.EffectiveThreads, out string? problem);
            if (blocks is null)
            {
                warnings.Add($"total spin could not be resolved: {problem}");
                return null;
            }
            var mine = new List<double>();
            foreach (var b in blocks)
            {
                if (b.Levels.Length < minBlock) continue;
                var (r, deg) = LevelStatistics.GapRatios(b.Levels, central);
                mine.AddRange(r);
                if (ri == 0)
                {
                    var (mean, se) = LevelStatistics.Mean(r);
                    sectors.Add(new SectorStatistics(b.Label, b.Levels.Length, r.Length, mean, se, deg));
                }
            }
            all.AddRange(mine);
            perReal.Add(LevelStatistics.Mean(mine).Mean);
        }
        var (mAll, err, kind) = LevelStatistics.Pooled(all, perReal);
        var resolved = new List<string> { "total spin (SU(2) multiplets)", "total-z" };
        if (refl) resolved.Add("reflection");
        var unresolved = m.Symmetries.Where(s => s is not ("time-reversal" or "total-z" or "spin-flip" or "fermion-parity") && !(s == "reflection" && refl)).ToList();
        // lattice mirrors other than the chain reversal are not resolved on this path
        var (candidates, swap) = SpatialCandidates(m.Lattice);
        foreach (var name in LevelStatistics.DetectSymmetries(m.Hamiltonian, candidates, swap))
        {
            if (name is "total-z" or "spin-flip" || (name == "reflection" && refl) || unresolved.Contains(name)) continue;
            unresolved.Add(name);
            warnings.Add($"H maps onto itself under '{name}', which the total-spin path does not resolve: independent blocks are mixed");
        }
        return new LevelFindings
        {
            N = m.N,
            MeanRatio = mAll,
            Error = err,
            ErrorKind = kind,
            Gaps = all.Count,
            WignerDysonClass = real ? "GOE" : "GUE",
            WignerDysonRatio = real ? DiagnosisThresholds.GoeRatio : DiagnosisThresholds.GueRatio,
            PoissonRatio = DiagnosisThresholds.PoissonRatio,
            Resolved = resolved,
            Unresolved = unresolved,
            Sectors = sectors,
            Warnings = warnings,
            Realizations = realizations.Count,
        };
    }

    /// <summary>
    /// Spatial symmetries to test: for a square lattice (sites y Lx + x) and a ladder (sites 2x + leg) the
    /// mirrors x -&gt; Lx-1-x and y -&gt; Ly-1-y and their product (the reversal j -&gt; N-1-j), plus the
    /// diagonal mirror of a square; otherwise the reversal j -&gt; N-1-j only.
    /// </summary>
    public static (IReadOnlyList<SitePermutation> Mirrors, SitePermutation? Swap) SpatialCandidates(Lattice lattice)
    {
        ArgumentNullException.ThrowIfNull(lattice);
        int n = lattice.N;
        if (lattice.Kind is "square" or "ladder" && lattice.Width * lattice.Height == n)
        {
            int w = lattice.Width, hgt = lattice.Height;
            var coords = Enumerable.Range(0, n).Select(lattice.Coordinate).ToArray();
            var site = new Dictionary<(int, int), int>();
            for (int j = 0; j < n; j++) site[coords[j]] = j;
            SitePermutation Make(string name, Func<int, int, (int, int)> f)
                => new(name, Enumerable.Range(0, n).Select(j => site[f(coords[j].X, coords[j].Y)]).ToArray());
            var list = new List<SitePermutation>
            {
                Make("mirror-x", (x, y) => (w - 1 - x, y)),
                Make("mirror-y", (x, y) => (x, hgt - 1 - y)),
                SitePermutation.Reversal(n),
            };
            SitePermutation? diag = w == hgt && w > 1 ? Make("diagonal", (x, y) => (y, x)) : null;
            return (list.Where(p => !p.IsIdentity).ToArray(), diag);
        }
        return ([SitePermutation.Reversal(n)], null);
    }

    /// <summary>The verdict from the measured &lt;r&gt; (pure: no computation).</summary>
    public static TestVerdict Judge(LevelFindings f)
    {
        ArgumentNullException.ThrowIfNull(f);
        string wd = f.WignerDysonClass;
        string figure = FormattableString.Invariant($"<r> = {f.MeanRatio:F4} +- {f.Error:F4} (N = {f.N}, {f.Gaps} ratios)");
        string threshold = FormattableString.Invariant(
            $"midpoint {f.Midpoint:F4} of Poisson {f.PoissonRatio:F4} and {wd} {f.WignerDysonRatio:F4}, at least {DiagnosisThresholds.LevelSigmas:0} error bars away");
        const string source = "Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013); 3 error bars: common practice";
        var notes = new List<string>(f.Warnings);
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => new()
        {
            Number = 1,
            Name = Name,
            Outcome = o,
            Figure = figure,
            Threshold = threshold,
            Source = source,
            Reason = reason,
            Evidence = ev,
            Notes = notes,
        };
        if (f.Gaps < DiagnosisThresholds.MinimumGaps || !double.IsFinite(f.Error) || f.Error <= 0)
        {
            return V(TestOutcome.Inconclusive, $"only {f.Gaps} gap ratios in the resolved sectors: too few for a verdict (raise the small size)");
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
            $"no level repulsion: <r> is {-z:F1} error bars below the midpoint, on the Poisson side (integrable, free or localized)"),
            Mechanism.InteractingIntegrable, Mechanism.FreeFermions, Mechanism.Localized, Mechanism.Frozen);
    }
}
