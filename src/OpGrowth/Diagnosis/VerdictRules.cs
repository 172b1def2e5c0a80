namespace OpGrowth.Diagnosis;

/// <summary>
/// Combines the test verdicts into the overall verdict by weighing evidence.
/// <para>
/// Evidence: test 7 (term structure) is exact: commuting terms, or a free-fermion frustration graph, decide
/// on their own. Otherwise every test adds weight to "chaotic" or to a non-scrambling mechanism: strong (2)
/// for chaotic level statistics (1 scrambles), Poisson levels with every symmetry resolved (1 fails), local
/// charges outside the symmetry algebra (5), and a stopped front with little truncation (4: localization);
/// moderate (1) for linear Lanczos growth (2 scrambles), exact sqrt(n) growth (2 fails), bounded b_n, size
/// saturation (3 scrambles), an unexplained memory plateau (3 fails) and low-temperature freezing (6); for a
/// drive, a ballistic front stands in for the Lanczos test (moderate, chaotic).
/// </para>
/// <para>
/// A definite "fails" needs weight at least 2 for its mechanism and no strong chaotic evidence against it; a
/// definite "scrambles" needs chaotic weight at least 2 from at least two tests, or the strong level
/// statistics with another chaotic test, and no strong non-chaotic evidence. Strong evidence on both sides,
/// or too little on either, gives "inconclusive", naming the tests that disagree. A probe that is itself
/// (nearly) conserved (Mazur bound at least 0.5) fails for conservation laws; a smaller Mazur bound in a
/// chaotic model is only noted (memory of a conserved total: 1/N for a U(1) model).
/// </para>
/// OTOC decay is never used on its own: test 6 enters only through freezing.
/// </summary>
public static class VerdictRules
{
    /// <summary>Mazur bound at or above which the probe counts as conserved for the verdict (common practice).</summary>
    public const double ConservedProbeBound = 0.5;

    /// <summary>Applies the rules.</summary>
    /// <param name="tests">The test verdicts.</param>
    /// <param name="spreading">Findings of tests 3-4 (front kind).</param>
    /// <param name="driven">True for a periodic drive (no Hamiltonian: the Lanczos test does not apply).</param>
    /// <param name="conserved">Findings of test 5 (Mazur bounds), when run.</param>
    /// <param name="disorderedShortRange">True for random couplings on a lattice with distances (not all-to-all): there
    /// Poisson levels together with a local memory plateau are the signature of many-body localization (local integrals
    /// of motion: Serbyn, Papic, Abanin, PRL 111, 127201 (2013); Huse, Nandkishore, Oganesyan, PRB 90, 174202 (2014);
    /// Luitz, Laflorencie, Alet, PRB 91, 081103 (2015)), even when the truncated front cannot tell.</param>
    public static OverallVerdict Decide(IReadOnlyList<TestVerdict> tests, SpreadingFindings? spreading = null, bool driven = false, ConservedFindings? conserved = null, bool disorderedShortRange = false)
    {
        ArgumentNullException.ThrowIfNull(tests);
        TestVerdict? T(int n) => tests.FirstOrDefault(t => t.Number == n);
        bool Is(int n, TestOutcome o) => T(n)?.Outcome == o;
        bool Has(int n, TestOutcome o, Mechanism m) => T(n) is { } t && t.Outcome == o && t.Evidence.Contains(m);
        string frontKind = spreading?.Front?.Kind ?? "not measured";
        // A front stopped under heavy truncation is not evidence of localization (same guard as test 4).
        bool noFront = frontKind is "none" or "logarithmic" or "stalled" && spreading!.Front!.Discarded <= DiagnosisThresholds.FrontMaxDiscarded;
        bool ballistic = frontKind == "ballistic";

        var others = new List<Mechanism>();
        OverallVerdict Verdict(TestOutcome o, Mechanism m, string reason, IEnumerable<int> support)
            => new(o, m, reason, support.Where(n => T(n) is not null).Distinct().OrderBy(n => n).ToArray(), others.Where(x => x != m).Distinct().ToArray());

        // 1. exact structure of the terms
        if (Has(7, TestOutcome.Fails, Mechanism.Commuting))
            return Verdict(TestOutcome.Fails, Mechanism.Commuting, "every term commutes with every other: each term is conserved and operators cannot spread (exact, from the terms)", [7]);
        if (Has(7, TestOutcome.Fails, Mechanism.FreeFermions))
        {
            var sup = new List<int> { 7 };
            if (Is(1, TestOutcome.Fails)) sup.Add(1);
            if (Has(5, TestOutcome.Fails, Mechanism.InteractingIntegrable)) sup.Add(5);
            string loc = noFront ? " (and the front does not move: Anderson localization of free fermions)" : string.Empty;
            if (noFront) others.Add(Mechanism.Localized);
            return Verdict(TestOutcome.Fails, noFront ? Mechanism.Localized : Mechanism.FreeFermions,
                "the frustration graph of the terms is a line graph: an exact map to free fermions" + loc, noFront ? [.. sup, 4] : sup);
        }

        // 2. weigh the rest
        bool chaoticLevels = Is(1, TestOutcome.Scrambles);
        bool poisson = Has(1, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        bool linear = Is(2, TestOutcome.Scrambles);
        bool sqrt = Has(2, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        bool bounded = Has(2, TestOutcome.Fails, Mechanism.Localized);
        bool saturates = Is(3, TestOutcome.Scrambles);
        bool plateau3 = Has(3, TestOutcome.Fails, Mechanism.Frozen);
        bool charges = Has(5, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        bool frozen6 = Has(6, TestOutcome.Fails, Mechanism.Frozen);
        bool clawFree = Has(7, TestOutcome.Fails, Mechanism.InteractingIntegrable);
        bool driveFront = driven && ballistic && !Is(2, TestOutcome.Scrambles);
        double mazur = conserved?.LargestBound ?? 0;

        var chaotic = new List<(int Test, int Weight, string What)>();
        if (chaoticLevels) chaotic.Add((1, 2, "chaotic level statistics"));
        if (linear) chaotic.Add((2, 1, "linear Lanczos growth"));
        if (saturates) chaotic.Add((3, 1, "operator growth to the random-operator size"));
        if (driveFront) chaotic.Add((4, 1, "a ballistic front (standing in for the Lanczos test, which a drive does not have)"));
        int chaoticWeight = chaotic.Sum(c => c.Weight);

        var against = new Dictionary<Mechanism, List<(int Test, int Weight, string What)>>();
        void Add(Mechanism m, int test, int w, string what)
        {
            if (!against.TryGetValue(m, out var l)) against[m] = l = [];
            l.Add((test, w, what));
            others.Add(m);
        }
        if (noFront) Add(Mechanism.Localized, 4, 2, frontKind switch { "none" => "the operator front does not move", "stalled" => "the operator front stops", _ => "the front spreads only logarithmically" });
        if (noFront && poisson) Add(Mechanism.Localized, 1, 2, "levels are Poisson");
        if (noFront && bounded) Add(Mechanism.Localized, 2, 1, "Lanczos coefficients stay bounded");
        if (noFront && plateau3) Add(Mechanism.Localized, 3, 1, "the autocorrelation keeps a plateau");
        // random couplings on a short-range lattice: Poisson levels and a local memory plateau mean localization
        bool mbl = !noFront && poisson && plateau3 && disorderedShortRange && !ballistic;
        if (mbl)
        {
            Add(Mechanism.Localized, 1, 2, "levels are Poisson in a disordered short-range model");
            Add(Mechanism.Localized, 3, 1, "a local probe keeps a memory plateau far above its Mazur bound (local integrals of motion)");
        }
        if (!noFront && poisson && !mbl) Add(Mechanism.InteractingIntegrable, 1, 2, "levels are Poisson with every symmetry resolved");
        if (charges) Add(Mechanism.InteractingIntegrable, 5, 2, "local conserved charges outside the symmetry algebra exist");
        if (clawFree) Add(Mechanism.InteractingIntegrable, 7, 2, "the frustration graph is claw-free (a hierarchy of commuting charges)");
        if (sqrt) Add(Mechanism.InteractingIntegrable, 2, 1, "exact Lanczos coefficients grow like sqrt(n)");
        if (plateau3 && !ballistic && !noFront && !mbl) Add(Mechanism.Frozen, 3, 1, "single-site autocorrelations stay far above the Mazur bound");
        if (frozen6 && !saturates && !ballistic) Add(Mechanism.Frozen, 6, 1, "autocorrelations freeze at low temperature");
        if (!noFront && bounded) Add(Mechanism.Localized, 2, 1, "Lanczos coefficients stay bounded");

        int strongAgainst = against.Values.SelectMany(l => l).Where(x => x.Weight >= 2).Select(x => x.Test).Distinct().Count();
        var lead = against.Select(kv => (Mechanism: kv.Key, Weight: kv.Value.Sum(x => x.Weight), Items: kv.Value))
            .OrderByDescending(x => x.Weight).ThenBy(x => Order(x.Mechanism)).FirstOrDefault();

        // a probe that is itself (nearly) conserved
        if (mazur >= ConservedProbeBound && (lead.Items is null || lead.Weight < 2))
            return Verdict(TestOutcome.Fails, Mechanism.ConservationLaws, $"the probe is (nearly) conserved: at least {mazur:0.##} of its autocorrelation can never decay (Mazur bound)", [5]);

        if (lead.Items is not null && lead.Weight >= 2 && !chaoticLevels)
        {
            string why = string.Join(", ", lead.Items.Select(x => x.What).Distinct());
            string contrary = chaoticWeight > 0 ? $" (against: {string.Join(", ", chaotic.Select(c => $"{c.What} ({c.Test})"))})" : string.Empty;
            if (chaoticWeight >= 2)
            {
                return Verdict(TestOutcome.Inconclusive, lead.Mechanism,
                    $"the tests disagree: {why} ({string.Join(", ", lead.Items.Select(x => x.Test).Distinct())}) point to {MechanismNames.Of(lead.Mechanism)}, but {string.Join(", ", chaotic.Select(c => $"{c.What} ({c.Test})"))} point to scrambling",
                    [.. lead.Items.Select(x => x.Test), .. chaotic.Select(c => c.Test)]);
            }
            return Verdict(TestOutcome.Fails, lead.Mechanism, $"{why}: {Describe(lead.Mechanism)}{contrary}", lead.Items.Select(x => x.Test));
        }

        if (chaoticWeight >= 2 && (chaotic.Count >= 2 || chaoticLevels) && strongAgainst == 0)
        {
            var notes = new List<string>();
            var weak = against.Values.SelectMany(l => l).ToList();
            if (weak.Count > 0) notes.Add($"not against it strongly, but noted: {string.Join(", ", weak.Select(x => $"{x.What} ({x.Test})"))}");
            if (mazur >= DiagnosisThresholds.MazurSignificant) notes.Add($"the probe keeps at least {mazur:0.###} of its autocorrelation through conserved quantities (Mazur bound)");
            if (frozen6) notes.Add("autocorrelations freeze at low temperature");
            string reason = string.Join(", ", chaotic.Select(c => c.What)) + " agree" + (notes.Count > 0 ? $" ({string.Join("; ", notes)})" : string.Empty);
            if (chaotic.Count == 1) reason = $"{chaotic[0].What} (a single strong test; the others undecided)" + (notes.Count > 0 ? $" ({string.Join("; ", notes)})" : string.Empty);
            return Verdict(TestOutcome.Scrambles, Mechanism.Scrambles, reason, chaotic.Select(c => c.Test));
        }

        if (chaoticLevels && lead.Items is not null && lead.Weight >= 2)
        {
            return Verdict(TestOutcome.Inconclusive, lead.Mechanism,
                $"the tests disagree: chaotic level statistics (1) against {string.Join(", ", lead.Items.Select(x => $"{x.What} ({x.Test})"))}",
                [1, .. lead.Items.Select(x => x.Test)]);
        }
        string missing = chaoticWeight > 0
            ? $"only {string.Join(", ", chaotic.Select(c => $"{c.What} ({c.Test})"))} point to scrambling"
            : "no test points clearly to scrambling";
        string weakAgainst = lead.Items is not null ? $", and only {string.Join(", ", lead.Items.Select(x => $"{x.What} ({x.Test})"))} against it" : string.Empty;
        return Verdict(TestOutcome.Inconclusive, lead.Items is not null ? lead.Mechanism : Mechanism.Undetermined,
            $"too little evidence: {missing}{weakAgainst} (a higher effort uses larger members and more coefficients)",
            [.. chaotic.Select(c => c.Test), .. (lead.Items ?? []).Select(x => x.Test)]);
    }

    private static int Order(Mechanism m) => m switch
    {
        Mechanism.Localized => 0,
        Mechanism.Frozen => 1,
        Mechanism.InteractingIntegrable => 2,
        _ => 3,
    };

    private static string Describe(Mechanism m) => m switch
    {
        Mechanism.Localized => "localization",
        Mechanism.Frozen => "glass-like frozen dynamics (no conservation law explains the memory)",
        Mechanism.InteractingIntegrable => "an interacting integrable model",
        Mechanism.FreeFermions => "free fermions",
        _ => MechanismNames.Of(m),
    };
}
