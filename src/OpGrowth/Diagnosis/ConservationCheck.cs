using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Test 5: local conserved quantities (strings of weight &lt;= k on a small cluster, null space of
/// c -&gt; i[H, sum c_S S]) and the Mazur bound on each probe's long-time autocorrelation at the full size,
/// from the conserved operators that also commute with the full-size H (H itself and total X/Y/Z).
/// Source: P. Mazur, Physica 43, 533 (1969); M. Suzuki, Physica 51, 277 (1971).
/// </summary>
public static class ConservationCheck
{
    /// <summary>Test name.</summary>
    public const string Name = "conserved quantities";

    /// <summary>Runs the search on <paramref name="cluster"/> and the Mazur bounds on <paramref name="full"/>.</summary>
    public static (TestVerdict Verdict, ConservedFindings? Findings) Run(Model full, Model cluster, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(full);
        ArgumentNullException.ThrowIfNull(cluster);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        if (full.IsDriven) return (TestVerdict.NotRun(5, Name, "a driven model has no conserved energy; the Floquet search is not implemented"), null);
        if (cluster.N > 64) return (TestVerdict.NotRun(5, Name, $"cluster of {cluster.N} sites is above the search limit of 64"), null);
        ct.ThrowIfCancellationRequested();
        var log = options.Logger;
        int k = options.MaxWeight;
        ConservedSearchResult search;
        int searchN = cluster.N;
        Krylov.TranslationCell? cell = null;
        if (full.IsTranslationInvariant && full.Lattice.Kind is "chain" or "ring")
        {
            try
            {
                cell = Krylov.TranslationCell.FromHamiltonian(full.Hamiltonian, full.Lattice.Kind == "ring", full.SourceFile);
            }
            catch (InputException)
            {
                cell = null; // e.g. couplings at half the ring's length: not a one-site cell
            }
            if (cell is not null && cell.Range > 4) cell = null; // long-range couplings: the ring would not be the same model
        }
        if (cell is not null)
        {
            // a uniform short-range chain: translation-invariant densities of words of up to k + 1 sites on a ring made from its cell
            int kk = Math.Min(k + 1, 4);
            searchN = Math.Min(64, 2 * kk + 2 * cell.Range + 2);
            log?.LogInformation("conserved quantities: translation-invariant densities of up to {K} sites on a ring of {N} sites", kk, searchN);
            search = ConservedQuantitySearch.RunTranslationInvariant(cell, searchN, new ConservedSearchOptions(MaxWeight: kk));
            k = kk;
        }
        else
        {
            // local strings (support within k - 1 bonds); one weight more on sparse lattices when it stays small
            var lattice = cluster.Lattice;
            if (lattice.Kind != "all-to-all" && k < 3 && LocalCount(cluster, k + 1) <= 2500) k++;
            log?.LogInformation("conserved quantities: local strings of weight <= {K} on a cluster of {N} sites", k, cluster.N);
            search = ConservedQuantitySearch.Run(cluster.Hamiltonian, new ConservedSearchOptions(MaxWeight: k), lattice);
        }
        // Full size: H itself and every total that commutes with the full H.
        var used = KnownConserved(full);
        var mazur = full.Probes.Select(p => MazurOf(used, p)).ToList();
        var findings = new ConservedFindings
        {
            ClusterN = searchN,
            MaxWeight = k,
            Mode = search.Mode,
            SearchDimension = search.SearchDimension,
            NullDimension = search.NullDimension,
            ContainsHamiltonian = search.ContainsHamiltonian,
            Recognised = search.Recognised,
            Unexplained = search.Unexplained,
            Operators = search.Operators.Take(12).Select(o => o.Describe()).ToArray(),
            Charges = search.Operators.Take(12).Select(o => new ConservedCharge(Classify(o.Label), o.Describe())).ToArray(),
            Gap = search.SmallestNonZero,
            UsedAtFullSize = used.Where(u => u.Label != "all terms").Select(u => u.Label).ToArray(),
            Mazur = mazur,
        };
        var verdict = Judge(findings) with { Seconds = sw.Elapsed.TotalSeconds };
        log?.LogInformation("conserved quantities: {Dim} found ({Rec}; {Unexp} unexplained); largest Mazur bound {B:F4} ({S:F1} s)",
            search.NullDimension, string.Join(", ", search.Recognised), search.Unexplained, findings.LargestBound, sw.Elapsed.TotalSeconds);
        return (verdict, findings);
    }

    private static int LocalCount(Model cluster, int k)
    {
        int count = 0;
        int n = cluster.N;
        for (int i = 0; i < n; i++)
        {
            int near = Enumerable.Range(0, n).Count(j => j != i && cluster.Lattice.Distance(i, j) <= k - 1);
            count += 3 + 9 * near; // rough: one- and two-site strings from site i (enough to bound the size)
        }
        return count * (k >= 3 ? 4 : 1);
    }

    /// <summary>The class of a conserved operator from its label.</summary>
    internal static string Classify(string? label) => label switch
    {
        "H" => "the Hamiltonian",
        "conserved Pauli string" or "conserved string density" => "conserved Pauli string (a local integral of motion: the terms commute with it)",
        null => "local charge outside the symmetry algebra (integrability)",
        string l when l.StartsWith("total ", StringComparison.Ordinal) && !l.Contains('^', StringComparison.Ordinal) && l.Count(c => c == ' ') == 1 => "conserved total (U(1) symmetry)",
        _ => "symmetry algebra (products of conserved totals, e.g. total spin)",
    };

    /// <summary>
    /// The conserved operators known without a search: total X, Y, Z when they commute with H, and H itself
    /// (traceless, orthogonalised against those totals so the Mazur bound may add their shares).
    /// </summary>
    public static IReadOnlyList<(string Label, IReadOnlyList<PauliTerm> Q)> KnownConserved(Model model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var used = new List<(string Label, IReadOnlyList<PauliTerm> Q)>();
        if (model.IsDriven) return used;
        foreach (char a in "XYZ")
        {
            var q = OperatorAlgebra.Total(model.N, a);
            if (OperatorAlgebra.Commutes(model.Hamiltonian, q)) used.Add(($"total {a}", q));
        }
        var hOrth = Orthogonalise(OperatorAlgebra.Traceless(model.Hamiltonian), used.Select(u => u.Q));
        // the terms themselves, to recognise a probe that commutes with all of them (not used as a conserved operator)
        used.Add(("all terms", OperatorAlgebra.Traceless(model.Hamiltonian)));
        if (hOrth.Count > 0) used.Insert(0, ("H", hOrth));
        return used;
    }

    /// <summary>Mazur bound of one probe from mutually orthogonal conserved operators, with each share.</summary>
    public static MazurEntry MazurOf(IReadOnlyList<(string Label, IReadOnlyList<PauliTerm> Q)> conserved, PauliString probe)
    {
        ArgumentNullException.ThrowIfNull(conserved);
        ArgumentNullException.ThrowIfNull(probe);
        var self = conserved.FirstOrDefault(c => c.Label == "all terms");
        if (self.Q is not null && self.Q.All(t => t.String.CommutesWith(probe)))
        {
            // the probe commutes with every term: it is itself conserved (bound 1; every other operator in the
            // bound is orthogonal to it or adds nothing beyond 1)
            return new MazurEntry(probe.ToString(), 1.0, [new MazurShare("the probe itself (it commutes with every term)", 1.0)]);
        }
        conserved = conserved.Where(c => c.Label != "all terms").ToArray();
        var a = new[] { new PauliTerm(probe, 1.0) };
        var shares = conserved.Select(u => new MazurShare(u.Label, ConservedQuantitySearch.MazurBound([u.Q], a))).ToArray();
        return new MazurEntry(probe.ToString(), shares.Sum(x => x.Share), shares);
    }

    /// <summary>Q minus its projections on the (mutually orthogonal) operators <paramref name="others"/>.</summary>
    internal static IReadOnlyList<PauliTerm> Orthogonalise(IReadOnlyList<PauliTerm> q, IEnumerable<IReadOnlyList<PauliTerm>> others)
    {
        var v = new Dictionary<PauliString, double>();
        foreach (var t in q) v[t.String] = v.GetValueOrDefault(t.String) + t.Coefficient;
        foreach (var o in others)
        {
            double dot = 0, norm = 0;
            foreach (var t in o)
            {
                norm += t.Coefficient * t.Coefficient;
                dot += t.Coefficient * v.GetValueOrDefault(t.String);
            }
            if (norm == 0) continue;
            foreach (var t in o) v[t.String] = v.GetValueOrDefault(t.String) - dot / norm * t.Coefficient;
        }
        double scale = v.Values.Select(Math.Abs).DefaultIfEmpty(0).Max();
        return v.Where(kv => Math.Abs(kv.Value) > 1e-12 * scale).Select(kv => new PauliTerm(kv.Key, kv.Value)).ToArray();
    }

    /// <summary>The verdict from the search and the bounds (pure).</summary>
    public static TestVerdict Judge(ConservedFindings f)
    {
        ArgumentNullException.ThrowIfNull(f);
        var top = f.Mazur.OrderByDescending(m => m.Bound).FirstOrDefault();
        string bounds = string.Join(", ", f.Mazur.Select(m => FormattableString.Invariant($"{m.Probe}: {m.Bound:0.####}")));
        string where = f.Mode == "translation-invariant"
            ? FormattableString.Invariant($"translation-invariant densities of up to {f.MaxWeight} sites, ring of {f.ClusterN}")
            : FormattableString.Invariant($"local strings of weight <= {f.MaxWeight}, N = {f.ClusterN}");
        var grouped = f.Recognised.GroupBy(l => l).Select(g => g.Count() == 1 ? g.Key : $"{g.Count()} x {g.Key}").ToList();
        string figure = FormattableString.Invariant(
            $"{f.NullDimension} conserved ({where}): {(grouped.Count > 0 ? string.Join(", ", grouped) : "none recognised")}{(f.NullDimension - f.Unexplained - f.Recognised.Count > 0 ? $" + {f.NullDimension - f.Unexplained - f.Recognised.Count} from the symmetry algebra" : string.Empty)}{(f.Unexplained > 0 ? $" + {f.Unexplained} other local charge(s)" : string.Empty)}; Mazur bound {bounds}");
        string threshold = FormattableString.Invariant(
            $"Mazur bound >= {DiagnosisThresholds.MazurSignificant} means conservation laws dominate; a local charge outside the algebra of H and the symmetries (totals, their products, conserved strings) signals integrability");
        const string source = "Mazur, Physica 43, 533 (1969); Suzuki, Physica 51, 277 (1971); local charges of integrable chains: Grabowski and Mathieu, Ann. Phys. 243, 299 (1995) (from memory); thresholds: common practice";
        var notes = new List<string>();
        if (!f.ContainsHamiltonian) notes.Add("H itself has strings outside the search space (longer range or weight), so it is not among the operators searched");
        if (f.Gap < 1e-3 && f.Gap > 0) notes.Add(FormattableString.Invariant($"smallest non-zero singular value is only {f.Gap:G2} of the largest: the count of conserved operators may be fragile"));
        foreach (var c in f.Charges.Take(6)) notes.Add($"{c.Class}: {c.Operator}");
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => TestVerdict.Of(5, Name, figure, threshold, source, notes, o, reason, ev);
        if (top is not null && top.Bound >= DiagnosisThresholds.MazurSignificant)
        {
            var lead = top.Contributions.OrderByDescending(c => c.Share).First();
            return V(TestOutcome.Fails, FormattableString.Invariant(
                $"the probe {top.Probe} overlaps the conserved {lead.Label}: at least {top.Bound:0.###} of its autocorrelation can never decay"), Mechanism.ConservationLaws);
        }
        if (f.Unexplained > 0)
        {
            return V(TestOutcome.Fails, FormattableString.Invariant(
                $"{f.Unexplained} local conserved operator(s) outside the algebra of H and the symmetries: extensive local conservation laws, the mark of integrability"),
                Mechanism.InteractingIntegrable, Mechanism.FreeFermions);
        }
        string what = f.Recognised.Count > 0 ? $"only {string.Join(" and ", f.Recognised)}" + (f.NullDimension > f.Recognised.Count ? " (and the symmetry algebra)" : string.Empty) : "nothing (H itself lies outside the search space)";
        return V(TestOutcome.Scrambles, FormattableString.Invariant(
            $"{what} conserved among the local operators searched, and the Mazur bound ({(top?.Bound ?? 0):0.####}) leaves the probe free to decay"), Mechanism.Scrambles);
    }
}
