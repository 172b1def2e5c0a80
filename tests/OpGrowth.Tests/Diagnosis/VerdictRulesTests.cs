using OpGrowth.Diagnosis;

namespace OpGrowth.Tests.Diagnosis;

/// <summary>The overall verdict from synthetic test verdicts: each rule of <see cref="VerdictRules"/> in turn.</summary>
public class VerdictRulesTests
{
    private static TestVerdict T(int n, TestOutcome o, params Mechanism[] ev) => new()
    {
        Number = n,
        Name = $"test {n}",
        Outcome = o,
        Figure = "-",
        Threshold = "-",
        Source = "-",
        Reason = "-",
        Evidence = ev,
    };

    private static readonly Mechanism[] Poisson = [Mechanism.InteractingIntegrable, Mechanism.FreeFermions, Mechanism.Localized, Mechanism.Frozen];

    private static SpreadingFindings Front(string kind, double discarded = 0) => new([], [], new FrontFigures
    {
        Discarded = discarded,
        Probe = "Z_0",
        Threshold = 0.19,
        MaxDistance = 11,
        Reached = 3,
        ArrivalTimes = [],
        Kind = kind,
        TimeReached = 10,
        TimeInLocalUnits = 10,
    });

    private static TestVerdict[] Chaotic() =>
    [
        T(1, TestOutcome.Scrambles, Mechanism.Scrambles),
        T(2, TestOutcome.Scrambles, Mechanism.Scrambles),
        T(3, TestOutcome.Scrambles, Mechanism.Scrambles),
        T(4, TestOutcome.Scrambles, Mechanism.Scrambles),
        T(5, TestOutcome.Scrambles, Mechanism.Scrambles),
        T(6, TestOutcome.Inconclusive),
    ];

    [Fact]
    public void Decide_AllChaotic_Scrambles()
    {
        var v = VerdictRules.Decide(Chaotic(), Front("ballistic"));
        Assert.Equal(TestOutcome.Scrambles, v.Outcome);
        Assert.Equal(Mechanism.Scrambles, v.Leading);
    }

    [Fact]
    public void Decide_DriveWithSizeAndBallisticFront_Scrambles()
    {
        // A periodic drive: tests 1, 2, 5 and 6 do not apply (no Hamiltonian); size and front both scramble.
        TestVerdict[] t =
        [
            TestVerdict.NotRun(1, "level statistics", "a driven model has no energy levels"),
            TestVerdict.NotRun(2, "Lanczos growth", "a driven model has no Liouvillian"),
            T(3, TestOutcome.Scrambles, Mechanism.Scrambles),
            T(4, TestOutcome.Scrambles, Mechanism.Scrambles),
            TestVerdict.NotRun(5, "conserved quantities", "a driven model has no H"),
            TestVerdict.NotRun(6, "finite temperature", "a driven model has no temperature"),
        ];
        var v = VerdictRules.Decide(t, Front("ballistic"), driven: true);
        Assert.Equal(TestOutcome.Scrambles, v.Outcome);
        Assert.Contains("ballistic front", v.Reason, StringComparison.Ordinal);
        // The same two votes for a Hamiltonian model are not enough.
        Assert.Equal(TestOutcome.Inconclusive, VerdictRules.Decide(t, Front("ballistic")).Outcome);
        // Nor for a drive whose front stops.
        var stalled = t.ToArray();
        stalled[3] = T(4, TestOutcome.Fails, Mechanism.Localized);
        Assert.NotEqual(TestOutcome.Scrambles, VerdictRules.Decide(stalled, Front("stalled"), driven: true).Outcome);
    }

    [Fact]
    public void Decide_StalledFrontWithPlateauAndPoissonLevels_IsLocalized()
    {
        var t = Chaotic();
        t[0] = T(1, TestOutcome.Fails, Poisson);
        t[2] = T(3, TestOutcome.Fails, Mechanism.Frozen, Mechanism.Localized);
        t[3] = T(4, TestOutcome.Fails, Mechanism.Localized);
        t[1] = T(2, TestOutcome.Fails, Mechanism.Localized, Mechanism.FreeFermions);
        var v = VerdictRules.Decide(t, Front("stalled"));
        Assert.Equal(Mechanism.Localized, v.Leading);
        Assert.Equal(TestOutcome.Fails, v.Outcome);
    }

    [Fact]
    public void Decide_StalledFrontAgainstWignerDysonLevels_IsInconclusiveNamingBoth()
    {
        // Strong evidence on both sides (a stopped front and chaotic levels) is a disagreement, not a verdict.
        var t = Chaotic();
        t[2] = T(3, TestOutcome.Fails, Mechanism.Frozen, Mechanism.Localized);
        t[3] = T(4, TestOutcome.Fails, Mechanism.Localized);
        var v = VerdictRules.Decide(t, Front("stalled"));
        Assert.Equal(TestOutcome.Inconclusive, v.Outcome);
        Assert.Equal(Mechanism.Localized, v.Leading);
        Assert.Contains("disagree", v.Reason, StringComparison.Ordinal);
        Assert.Contains(1, v.Supporting);
        Assert.Contains(4, v.Supporting);
    }

    [Fact]
    public void Decide_LogarithmicFrontUnderHeavyTruncation_IsNotLocalized()
    {
        // A logarithmic front with 0.99 of the weight discarded (FrontMaxDiscarded = 0.1, common practice) is a
        // string-budget effect: with Poisson levels the rule falls through to "interacting integrable" instead
        // of localization, and localization is not listed among the other mechanisms.
        var t = Chaotic();
        t[0] = T(1, TestOutcome.Fails, Poisson);
        t[3] = T(4, TestOutcome.Inconclusive);
        var cut = VerdictRules.Decide(t, Front("logarithmic", discarded: 0.99));
        Assert.NotEqual(Mechanism.Localized, cut.Leading);
        Assert.DoesNotContain(Mechanism.Localized, cut.Others);
        // The same front with the weight kept still reads as localization.
        t[3] = T(4, TestOutcome.Fails, Mechanism.Localized);
        Assert.Equal(Mechanism.Localized, VerdictRules.Decide(t, Front("logarithmic", discarded: 0.01)).Leading);
    }

    [Fact]
    public void Decide_PlateauWithoutFront_IsFrozen()
    {
        // The glass-cluster pattern: levels and Lanczos undecided, a memory plateau at infinite temperature
        // and freezing at low temperature, no front (all-to-all).
        var t = Chaotic();
        t[0] = T(1, TestOutcome.Inconclusive);
        t[1] = T(2, TestOutcome.Inconclusive);
        t[2] = T(3, TestOutcome.Fails, Mechanism.Frozen, Mechanism.Localized);
        t[3] = TestVerdict.NotRun(4, "front", "all-to-all");
        t[5] = T(6, TestOutcome.Fails, Mechanism.Frozen);
        var v = VerdictRules.Decide(t, Front("not applicable"));
        Assert.Equal(Mechanism.Frozen, v.Leading);
        Assert.Equal(TestOutcome.Fails, v.Outcome);
    }

    /// <summary>
    /// Many-body localization when the truncated front cannot tell (strongly disordered Heisenberg chain at the
    /// standard effort): Poisson levels and a local memory plateau in a disordered short-range model are
    /// localization (local integrals of motion; Luitz, Laflorencie, Alet, PRB 91, 081103 (2015)), not
    /// interacting integrability; the same tests in a clean model stay interacting integrable.
    /// </summary>
    [Fact]
    public void Decide_PoissonAndPlateauInDisorderedChain_IsLocalizedEvenWithoutAFront()
    {
        var t = Chaotic();
        t[0] = T(1, TestOutcome.Fails, Poisson);
        t[1] = T(2, TestOutcome.Inconclusive);
        t[2] = T(3, TestOutcome.Fails, Mechanism.Frozen, Mechanism.Localized);
        t[3] = T(4, TestOutcome.Inconclusive);
        t[5] = T(6, TestOutcome.Inconclusive);
        var disordered = VerdictRules.Decide(t, Front("irregular", 0.5), disorderedShortRange: true);
        Assert.Equal(TestOutcome.Fails, disordered.Outcome);
        Assert.Equal(Mechanism.Localized, disordered.Leading);
        var clean = VerdictRules.Decide(t, Front("irregular", 0.5), disorderedShortRange: false);
        Assert.Equal(Mechanism.InteractingIntegrable, clean.Leading);
    }

    [Fact]
    public void Decide_BoundedLanczosWithoutStructure_IsNotCalledFree()
    {
        // Bounded b_n alone mean a small operator space (localized, or a short window), never free fermions:
        // only the structure of the terms (test 7) may say free.
        var t = Chaotic();
        t[0] = T(1, TestOutcome.Fails, Poisson);
        t[1] = T(2, TestOutcome.Fails, Mechanism.Localized, Mechanism.FreeFermions);
        Assert.NotEqual(Mechanism.FreeFermions, VerdictRules.Decide(t, Front("ballistic")).Leading);
    }

    [Fact]
    public void Decide_LineGraphStructure_IsFreeFermionsWhateverElse()
    {
        var t = Chaotic().Append(T(7, TestOutcome.Fails, Mechanism.FreeFermions)).ToArray();
        var v = VerdictRules.Decide(t, Front("ballistic"));
        Assert.Equal(TestOutcome.Fails, v.Outcome);
        Assert.Equal(Mechanism.FreeFermions, v.Leading);
    }

    [Fact]
    public void Decide_CommutingTerms_IsCommuting()
    {
        var t = Chaotic().Append(T(7, TestOutcome.Fails, Mechanism.Commuting)).ToArray();
        Assert.Equal(Mechanism.Commuting, VerdictRules.Decide(t, Front("none")).Leading);
    }

    [Fact]
    public void Decide_PoissonWithBallisticFront_IsInteractingIntegrable()
    {
        var t = Chaotic();
        t[0] = T(1, TestOutcome.Fails, Poisson);
        t[1] = T(2, TestOutcome.Inconclusive);
        Assert.Equal(Mechanism.InteractingIntegrable, VerdictRules.Decide(t, Front("ballistic")).Leading);
    }

    [Fact]
    public void Decide_SqrtAgainstWignerDyson_StillScramblesWithCaveat()
    {
        var t = Chaotic();
        t[1] = T(2, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        var v = VerdictRules.Decide(t, Front("ballistic"));
        Assert.Equal(TestOutcome.Scrambles, v.Outcome);
        Assert.Contains("sqrt(n)", v.Reason);
    }

    private static ConservedFindings Mazur(double bound) => new()
    {
        ClusterN = 10,
        MaxWeight = 2,
        SearchDimension = 1,
        NullDimension = 1,
        ContainsHamiltonian = true,
        Recognised = ["H"],
        Unexplained = 0,
        Operators = [],
        Gap = 1,
        UsedAtFullSize = ["H"],
        Mazur = [new MazurEntry("Z_0", bound, [new MazurShare("total Z", bound)])],
    };

    [Fact]
    public void Decide_ModerateMazurBoundWithChaoticSpectrum_ScramblesWithANote()
    {
        // 1/N memory of a conserved total in a chaotic model is noted, not a failure to scramble.
        var t = Chaotic();
        t[4] = T(5, TestOutcome.Fails, Mechanism.ConservationLaws);
        var v = VerdictRules.Decide(t, Front("ballistic"), conserved: Mazur(0.2));
        Assert.Equal(TestOutcome.Scrambles, v.Outcome);
        Assert.Contains("Mazur", v.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Decide_ConservedProbe_IsConservationLaws()
    {
        var t = Chaotic();
        t[4] = T(5, TestOutcome.Fails, Mechanism.ConservationLaws);
        Assert.Equal(Mechanism.ConservationLaws, VerdictRules.Decide(t, Front("ballistic"), conserved: Mazur(0.9)).Leading);
    }

    [Fact]
    public void Decide_NothingDecisive_IsInconclusive()
    {
        var t = Chaotic().Select(x => x with { Outcome = TestOutcome.Inconclusive, Evidence = [] }).ToArray();
        var v = VerdictRules.Decide(t, Front("undetermined"));
        Assert.Equal(TestOutcome.Inconclusive, v.Outcome);
    }
}
