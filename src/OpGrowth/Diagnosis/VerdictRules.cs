namespace OpGrowth.Diagnosis;

/// <summary>
/// Combines the six test verdicts into the overall verdict. The rules are ordered; the first that applies
/// names the leading mechanism:
/// 1. localized: no front (or a logarithmic one, in both cases with at most FrontMaxDiscarded weight lost to
///    truncation) together with a memory plateau, Poisson levels or bounded
///    Lanczos coefficients;
/// 2. frozen (glass-like): an infinite-temperature autocorrelation plateau that conservation laws do not
///    explain, without a ballistic front; or low-temperature freezing when the infinite-temperature size
///    test does not show scrambling;
/// 3. free fermions: bounded Lanczos coefficients of a local probe;
/// 4. conservation laws: the probe's Mazur bound is large while the spectrum and Lanczos growth look chaotic;
/// 5. interacting integrable: sqrt(n) Lanczos growth (unless the levels are Wigner-Dyson), Poisson levels with
///    every symmetry resolved, or extra local conserved operators;
/// 6. conservation laws (any remaining case where they were flagged);
/// 7. scrambles: no test fails (a sqrt(n) Lanczos reading against Wigner-Dyson levels is only noted) and at
///    least two of level statistics, Lanczos growth and operator size say so; for a periodic drive, where
///    the Lanczos test (and level statistics, when not measured) do not apply, a ballistic front counts as
///    one of the two.
/// Otherwise the verdict is inconclusive. OTOC decay is never used on its own: test 6 enters only through
/// freezing (rule 2) or as support.
/// </summary>
public static class VerdictRules
{
    /// <summary>Applies the rules.</summary>
    /// <param name="tests">The test verdicts.</param>
    /// <param name="spreading">Findings of tests 3-4 (front kind).</param>
    /// <param name="driven">True for a periodic drive (no Hamiltonian: the Lanczos test does not apply).</param>
    public static OverallVerdict Decide(IReadOnlyList<TestVerdict> tests, SpreadingFindings? spreading = null, bool driven = false)
    {
        ArgumentNullException.ThrowIfNull(tests);
        TestVerdict? T(int n) => tests.FirstOrDefault(t => t.Number == n);
        bool Is(int n, TestOutcome o) => T(n)?.Outcome == o;
        bool Has(int n, TestOutcome o, Mechanism m) => T(n) is { } t && t.Outcome == o && t.Evidence.Contains(m);
        string frontKind = spreading?.Front?.Kind ?? "not measured";
        // A front stopped under heavy truncation is not evidence of localization (same guard as test 4).
        bool noFront = frontKind is "none" or "logarithmic" or "stalled" && spreading!.Front!.Discarded <= DiagnosisThresholds.FrontMaxDiscarded;
        bool ballistic = frontKind == "ballistic";
        bool plateau3 = Has(3, TestOutcome.Fails, Mechanism.Frozen);
        bool frozen6 = Has(6, TestOutcome.Fails, Mechanism.Frozen);
        bool poisson = Has(1, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        bool bounded = Has(2, TestOutcome.Fails, Mechanism.FreeFermions);
        bool sqrt = Has(2, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        bool extraCharges = Has(5, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        bool mazur = Has(5, TestOutcome.Fails, Mechanism.ConservationLaws) || Has(3, TestOutcome.Fails, Mechanism.ConservationLaws);
        bool chaoticSpectrum = Is(1, TestOutcome.Scrambles);
        bool linear = Is(2, TestOutcome.Scrambles);
        var others = new List<Mechanism>();
        if (poisson) others.Add(Mechanism.InteractingIntegrable);
        if (bounded) others.Add(Mechanism.FreeFermions);
        if (mazur) others.Add(Mechanism.ConservationLaws);
        if (frozen6 || plateau3) others.Add(Mechanism.Frozen);
        if (noFront) others.Add(Mechanism.Localized);

        OverallVerdict Fail(Mechanism m, string reason, params int[] support)
            => new(TestOutcome.Fails, m, reason, support.Where(n => T(n) is not null).ToArray(), others.Where(o => o != m).Distinct().ToArray());

        if (noFront && (plateau3 || poisson || bounded))
        {
            var why = new List<string> { frontKind switch { "none" => "the operator front does not move (v_B = 0)", "stalled" => "the operator front stops (v_B = 0 at long times)", _ => "the front spreads only logarithmically" } };
            var sup = new List<int> { 4 };
            if (plateau3) { why.Add("the autocorrelation keeps a plateau"); sup.Add(3); }
            if (poisson) { why.Add("levels are Poisson"); sup.Add(1); }
            if (bounded) { why.Add("Lanczos coefficients stay bounded"); sup.Add(2); }
            if (frozen6) sup.Add(6);
            return Fail(Mechanism.Localized, string.Join(", ", why) + (bounded ? ": Anderson localization of free fermions" : ": localization"), [.. sup]);
        }
        if ((plateau3 && !ballistic) || (frozen6 && !Is(3, TestOutcome.Scrambles) && !ballistic))
        {
            var sup = new List<int>();
            var why = new List<string>();
            if (plateau3) { sup.Add(3); why.Add("single-site autocorrelations stay far above the Mazur bound at infinite temperature"); }
            if (frozen6) { sup.Add(6); why.Add("they freeze at low temperature"); }
            if (Is(5, TestOutcome.Scrambles)) sup.Add(5);
            return Fail(Mechanism.Frozen, string.Join(" and ", why) + ", with no conservation law to explain it and no front to carry the memory away: glass-like frozen dynamics", [.. sup]);
        }
        if (bounded)
        {
            var sup = new List<int> { 2 };
            if (Is(1, TestOutcome.Fails)) sup.Add(1);
            if (Has(3, TestOutcome.Fails, Mechanism.FreeFermions)) sup.Add(3);
            if (extraCharges) sup.Add(5);
            return Fail(Mechanism.FreeFermions, "a local operator keeps bounded Lanczos coefficients (it stays quadratic in fermions)" + (Is(1, TestOutcome.Fails) ? " and the levels show no repulsion" : string.Empty) + ": free fermions", [.. sup]);
        }
        if (mazur && (chaoticSpectrum || linear) && !sqrt && !poisson)
        {
            return Fail(Mechanism.ConservationLaws, "the dynamics look chaotic, but the probe overlaps conserved quantities so strongly that its autocorrelation cannot decay below the Mazur bound", 5, 3);
        }
        // sqrt(n) growth alone does not overrule Wigner-Dyson levels: over a few dozen coefficients the 1D
        // chaotic form n/ln n and sqrt(n) are hard to tell apart (Parker et al. 2019).
        bool sqrtCounts = sqrt && !chaoticSpectrum;
        if (sqrtCounts || poisson || extraCharges)
        {
            var sup = new List<int>();
            var why = new List<string>();
            if (poisson) { sup.Add(1); why.Add("levels are Poisson with every symmetry resolved"); }
            if (sqrtCounts) { sup.Add(2); why.Add("Lanczos coefficients grow like sqrt(n)"); }
            if (extraCharges) { sup.Add(5); why.Add("extra local conservation laws exist"); }
            if (ballistic) sup.Add(4);
            return Fail(Mechanism.InteractingIntegrable, string.Join(", ", why) + (ballistic ? ", while operators still spread ballistically" : string.Empty) + ": an interacting integrable model", [.. sup]);
        }
        if (mazur)
        {
            return Fail(Mechanism.ConservationLaws, "the probe's autocorrelation is held up by conserved quantities (Mazur bound)", 5, 3);
        }
        var core = new[] { 1, 2, 3 };
        int votes = core.Count(n => Is(n, TestOutcome.Scrambles));
        // A periodic drive has no Liouvillian for the Lanczos test (2): a ballistic front stands in for it as
        // a vote, so that level statistics (quasienergies) or the operator size can make the second one.
        bool driveFrontVote = driven && ballistic && Is(4, TestOutcome.Scrambles) && !Is(2, TestOutcome.Scrambles);
        if (driveFrontVote) votes++;
        // A sqrt(n) reading of test 2 against Wigner-Dyson levels is noted, not counted as a failure.
        bool Overruled(TestVerdict t) => t.Number == 2 && sqrt && chaoticSpectrum;
        bool anyFail = tests.Any(t => t.Outcome == TestOutcome.Fails && !Overruled(t));
        if (!anyFail && votes >= 2)
        {
            var sup = tests.Where(t => t.Outcome == TestOutcome.Scrambles).Select(t => t.Number).ToArray();
            string caveat = frozen6 ? " (but autocorrelations freeze at low temperature)" : string.Empty;
            if (sqrt && chaoticSpectrum) caveat += " (the Lanczos coefficients look sub-linear over the computed window; in one dimension n/ln n and sqrt(n) are hard to tell apart at this depth)";
            var agree = new List<string>();
            if (Is(1, TestOutcome.Scrambles)) agree.Add("chaotic level statistics");
            if (Is(2, TestOutcome.Scrambles)) agree.Add("linear Lanczos growth");
            if (Is(3, TestOutcome.Scrambles)) agree.Add("operator growth to the random-operator size");
            if (driveFrontVote) agree.Add("a ballistic front (it stands in for the Lanczos test, which a periodic drive does not have)");
            return new OverallVerdict(TestOutcome.Scrambles, Mechanism.Scrambles,
                string.Join(", ", agree) + " agree" + caveat, sup, others);
        }
        var failing = tests.Where(t => t.Outcome == TestOutcome.Fails).ToArray();
        var lead = failing.SelectMany(t => t.Evidence).Where(m => m != Mechanism.Scrambles).GroupBy(m => m).OrderByDescending(g => g.Count()).Select(g => g.Key).FirstOrDefault(Mechanism.Undetermined);
        return new OverallVerdict(TestOutcome.Inconclusive, lead,
            anyFail
                ? $"the tests disagree: {string.Join(", ", failing.Select(t => t.Name))} fail{(failing.Length == 1 ? "s" : string.Empty)}, but no mechanism has enough support"
                : $"only {votes} of level statistics, Lanczos growth and operator size clearly show scrambling (raise --effort)",
            failing.Select(t => t.Number).ToArray(), others);
    }
}
