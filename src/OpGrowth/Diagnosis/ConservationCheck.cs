using System.Diagnostics;
using Microsoft.Extensions.Logging;
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
        log?.LogInformation("conserved quantities: strings of weight <= {K} on a cluster of {N} sites", k, cluster.N);
        var search = ConservedQuantitySearch.Run(cluster.Hamiltonian, new ConservedSearchOptions(MaxWeight: k));
        // Full size: H itself and every total that commutes with the full H.
        var used = KnownConserved(full);
        var mazur = full.Probes.Select(p => MazurOf(used, p)).ToList();
        var findings = new ConservedFindings
        {
            ClusterN = cluster.N,
            MaxWeight = k,
            SearchDimension = search.SearchDimension,
            NullDimension = search.NullDimension,
            ContainsHamiltonian = search.ContainsHamiltonian,
            Recognised = search.Recognised,
            Unexplained = search.Unexplained,
            Operators = search.Operators.Take(12).Select(o => o.Describe()).ToArray(),
            Gap = search.SmallestNonZero,
            UsedAtFullSize = used.Select(u => u.Label).ToArray(),
            Mazur = mazur,
        };
        var verdict = Judge(findings) with { Seconds = sw.Elapsed.TotalSeconds };
        log?.LogInformation("conserved quantities: {Dim} found ({Rec}; {Unexp} unexplained); largest Mazur bound {B:F4} ({S:F1} s)",
            search.NullDimension, string.Join(", ", search.Recognised), search.Unexplained, findings.LargestBound, sw.Elapsed.TotalSeconds);
        return (verdict, findings);
    }

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
        if (hOrth.Count > 0) used.Insert(0, ("H", hOrth));
        return used;
    }

    /// <summary>Mazur bound of one probe from mutually orthogonal conserved operators, with each share.</summary>
    public static MazurEntry MazurOf(IReadOnlyList<(string Label, IReadOnlyList<PauliTerm> Q)> conserved, PauliString probe)
    {
        ArgumentNullException.ThrowIfNull(conserved);
        ArgumentNullException.ThrowIfNull(probe);
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
        string figure = FormattableString.Invariant(
            $"{f.NullDimension} conserved (weight <= {f.MaxWeight}, N = {f.ClusterN}): {(f.Recognised.Count > 0 ? string.Join(", ", f.Recognised) : "none recognised")}{(f.Unexplained > 0 ? $" + {f.Unexplained} other" : string.Empty)}; Mazur bound {bounds}");
        string threshold = FormattableString.Invariant(
            $"Mazur bound >= {DiagnosisThresholds.MazurSignificant} means conservation laws dominate; any conserved operator beyond H and the totals signals integrability");
        const string source = "Mazur, Physica 43, 533 (1969); Suzuki, Physica 51, 277 (1971); thresholds: common practice";
        var notes = new List<string>();
        if (!f.ContainsHamiltonian) notes.Add("H itself has strings of weight > k, so it is not in the search space (raise --max-weight)");
        if (f.Gap < 1e-3 && f.Gap > 0) notes.Add(FormattableString.Invariant($"smallest non-zero singular value is only {f.Gap:G2} of the largest: the count of conserved operators may be fragile"));
        if (f.Unexplained > 0) notes.Add("other conserved operators: " + string.Join("; ", f.Operators.Skip(f.Recognised.Count).Take(3)));
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => new()
        {
            Number = 5,
            Name = Name,
            Outcome = o,
            Figure = figure,
            Threshold = threshold,
            Source = source,
            Reason = reason,
            Evidence = ev,
            Notes = notes,
        };
        if (top is not null && top.Bound >= DiagnosisThresholds.MazurSignificant)
        {
            var lead = top.Contributions.OrderByDescending(c => c.Share).First();
            return V(TestOutcome.Fails, FormattableString.Invariant(
                $"the probe {top.Probe} overlaps the conserved {lead.Label}: at least {top.Bound:0.###} of its autocorrelation can never decay"), Mechanism.ConservationLaws);
        }
        if (f.Unexplained > 0)
        {
            return V(TestOutcome.Fails, FormattableString.Invariant(
                $"{f.Unexplained} local conserved operator(s) of weight <= {f.MaxWeight} beyond H and the totals: extensive conservation laws, the mark of integrability"),
                Mechanism.FreeFermions, Mechanism.InteractingIntegrable);
        }
        string what = f.Recognised.Count > 0 ? $"only {string.Join(" and ", f.Recognised)}" : "nothing (H itself has larger weight)";
        return V(TestOutcome.Scrambles, FormattableString.Invariant(
            $"{what} conserved up to weight {f.MaxWeight}, and the Mazur bound ({(top?.Bound ?? 0):0.####}) leaves the probe free to decay"), Mechanism.Scrambles);
    }
}
