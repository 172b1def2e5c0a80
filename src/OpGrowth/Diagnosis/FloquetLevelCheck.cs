using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Exact;
using OpGrowth.Models;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Test 1 for a periodic drive: quasienergy gap ratios of the one-period unitary with reflection (and,
/// when every generator allows it, total Z and spin flip) resolved, compared with Poisson and the circular
/// ensemble COE or CUE; the verdict is the shared <see cref="LevelStatisticsCheck.Judge"/>.
/// Source: D'Alessio and Rigol, PRX 4, 041048 (2014); Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013).
/// </summary>
public static class FloquetLevelCheck
{
    /// <summary>Runs the test on the drives of the smaller member(s) (one per disorder realisation).</summary>
    public static (TestVerdict Verdict, LevelFindings? Findings) Run(IReadOnlyList<Model> realizations, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(realizations);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        var m = realizations[0];
        if (m.Drive is null) throw new ArgumentException("The model is not driven.", nameof(realizations));
        ct.ThrowIfCancellationRequested();
        var log = options.Logger;
        var drives = realizations.Select(r => r.Drive!).ToArray();
        var res = FloquetLevelStatistics.Analyze(drives, m.N, new FloquetLevelOptions
        {
            DeclaredSymmetries = m.Symmetries,
            Threads = options.EffectiveThreads,
            Logger = log,
        });
        var warnings = new List<string>(res.Warnings)
        {
            FormattableString.Invariant($"quasienergies of the one-period unitary; {res.EnsembleClass} reference: {res.EnsembleReason}"),
        };
        var findings = new LevelFindings
        {
            N = m.N,
            MeanRatio = res.MeanRatio,
            Error = res.StandardError,
            ErrorKind = res.ErrorKind,
            Gaps = res.Gaps,
            WignerDysonClass = res.EnsembleClass,
            WignerDysonRatio = res.EnsembleRatio,
            PoissonRatio = FloquetLevelStatistics.PoissonRatio,
            Resolved = res.Resolved,
            Unresolved = res.Unresolved,
            Sectors = res.Sectors,
            Warnings = warnings,
            Realizations = res.Realizations,
        };
        var verdict = LevelStatisticsCheck.Judge(findings) with { Seconds = sw.Elapsed.TotalSeconds };
        log?.LogInformation("level statistics (quasienergies, {Class}): <r> = {R:F4} +- {E:F4} over {G} ratios in {S} sectors ({Outcome}, {T:F1} s, {Solver})",
            res.EnsembleClass, findings.MeanRatio, findings.Error, findings.Gaps, res.Sectors.Count, MechanismNames.Of(verdict.Outcome), sw.Elapsed.TotalSeconds, res.Solver);
        return (verdict, findings);
    }
}
