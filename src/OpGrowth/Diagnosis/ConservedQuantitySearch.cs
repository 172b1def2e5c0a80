using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>Options of the conserved-quantity search.</summary>
/// <param name="MaxWeight">Largest string weight k in the search space (all strings of weight 1..k).</param>
/// <param name="RelativeTolerance">A Gram-matrix eigenvalue (squared singular value) below this fraction of the largest counts as zero.</param>
public sealed record ConservedSearchOptions(int MaxWeight = 2, double RelativeTolerance = 1e-9);

/// <summary>One conserved operator found: normalised, ||Q|| = 1, with its largest terms for display.</summary>
/// <param name="Terms">All terms of the operator (normalised).</param>
/// <param name="Label">"H" or "total Z" (and similar) when recognised, otherwise null.</param>
public sealed record ConservedOperator(IReadOnlyList<PauliTerm> Terms, string? Label)
{
    /// <summary>The strongest terms, for a one-line description.</summary>
    public string Describe(int maxTerms = 4)
    {
        var top = Terms.OrderByDescending(t => Math.Abs(t.Coefficient)).Take(maxTerms)
            .Select(t => $"{t.Coefficient:+0.###;-0.###} {t.String}");
        string more = Terms.Count > maxTerms ? $" ... ({Terms.Count} terms)" : string.Empty;
        return (Label is null ? string.Empty : Label + ": ") + string.Join(" ", top) + more;
    }
}

/// <summary>Outcome of the search.</summary>
/// <param name="SearchDimension">Number of strings of weight 1..k (the unknowns).</param>
/// <param name="NullDimension">Dimension of the space of conserved operators found.</param>
/// <param name="Operators">An orthonormal basis of that space; recognised operators (H, totals) first.</param>
/// <param name="ContainsHamiltonian">True when H (traceless part, restricted to weight &lt;= k) lies in the space.</param>
/// <param name="Recognised">Labels of recognised conserved operators ("H", "total Z", "total Z^2" (weight-2 part of the square of a total), ...).</param>
/// <param name="Unexplained">Dimension left after removing the recognised operators.</param>
/// <param name="SmallestNonZero">The smallest singular value above the cut, relative to the largest (the gap that makes the count trustworthy).</param>
public sealed record ConservedSearchResult(
    int SearchDimension,
    int NullDimension,
    IReadOnlyList<ConservedOperator> Operators,
    bool ContainsHamiltonian,
    IReadOnlyList<string> Recognised,
    int Unexplained,
    double SmallestNonZero)
{
    /// <summary>"cluster" (strings on a small cluster) or "translation-invariant" (densities on a ring).</summary>
    public string Mode { get; init; } = "cluster";
}

/// <summary>
/// Finds local conserved quantities: the null space of the linear map c -> i[H, sum_j c_j B_j] over a
/// basis of operators B_j. The map is assembled column by column with the Pauli commutator, then the null
/// space is read off the eigen-decomposition of the Gram matrix M^T M (MathNet, symmetric). Two bases:
/// (a) cluster mode: the Pauli strings of weight 1..k on a small cluster (on lattices with a distance, only
/// strings whose support spans at most k - 1 bonds: local charges); (b) translation-invariant mode: the
/// densities sum_i T^i(p) of every word p of at most k sites on a ring built from a chain's unit cell,
/// which finds the local charges of an integrable chain (the weight-3 charge of the XXZ chain) cheaply.
/// The conserved space V is then compared with the span W of what symmetries explain (H, the totals, the
/// symmetrised products of totals, conserved Pauli strings): dim(V ∩ W) is recognised, the rest is
/// "unexplained" (integrability evidence).
/// Mazur bound on the long-time autocorrelation of a probe A from these Q_k:
/// lim avg (A(t)|A)/(A|A) &gt;= sum_k |(Q_k|A)|^2 / ((Q_k|Q_k)(A|A)).
/// Source: P. Mazur, Physica 43, 533 (1969); M. Suzuki, Physica 51, 277 (1971); local charges of the XXZ
/// chain: Grabowski and Mathieu, Ann. Phys. 243, 299 (1995) (from memory).
/// </summary>
public static class ConservedQuantitySearch
{
    /// <summary>Largest number of basis operators (the Gram matrix is dense).</summary>
    public const int MaxBasis = 6000;

    /// <summary>Runs the search on Hamiltonian <paramref name="h"/> over all strings of weight &lt;= k (at most 64 qubits).</summary>
    public static ConservedSearchResult Run(Hamiltonian h, ConservedSearchOptions options) => Run(h, options, null);

    /// <summary>
    /// Cluster mode. With a lattice (not all-to-all), only strings whose sites lie within graph distance k - 1
    /// of each other are searched (local charges).
    /// </summary>
    public static ConservedSearchResult Run(Hamiltonian h, ConservedSearchOptions options, Models.Lattice? lattice)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (h.N > 64) throw new ArgumentException($"The search runs on clusters of at most 64 qubits, got {h.N}.", nameof(h));
        ArgumentOutOfRangeException.ThrowIfLessThan(options.MaxWeight, 1);
        int n = h.N;
        var strings = EnumerateStrings(n, options.MaxWeight);
        if (lattice is not null && lattice.Kind != "all-to-all")
        {
            strings = strings.Where(s => Diameter(s.ToPauliString(n), lattice) <= options.MaxWeight - 1).ToList();
        }
        if (strings.Count > MaxBasis)
        {
            throw new ArgumentException($"{strings.Count} strings of weight <= {options.MaxWeight} on {n} sites is too many for the dense Gram matrix; use a smaller cluster or weight.", nameof(options));
        }
        var basis = strings.Select(s => new[] { (s, 1.0) }).ToList();
        return Solve(h, n, basis, options, Candidates(h, n, basis, options.MaxWeight), "cluster");
    }

    /// <summary>
    /// Translation-invariant mode: densities of words of at most k sites on a ring of
    /// <paramref name="ringSites"/> sites made from the chain's unit cell (at most 64 sites).
    /// </summary>
    public static ConservedSearchResult RunTranslationInvariant(Krylov.TranslationCell cell, int ringSites, ConservedSearchOptions options)
    {
        ArgumentNullException.ThrowIfNull(cell);
        int k = options.MaxWeight;
        int n = ringSites;
        if (n > 64 || n < 2 * k + 1) throw new ArgumentOutOfRangeException(nameof(ringSites), ringSites, $"Expected a ring of {2 * k + 1} to 64 sites.");
        var h = cell.Ring(n);
        var basis = new List<(Pauli64, double)[]>();
        foreach (string word in Words(k))
        {
            var seen = new HashSet<Pauli64>();
            var terms = new List<(Pauli64, double)>();
            for (int i = 0; i < n; i++)
            {
                var key = Pauli64.From(Krylov.TranslationCell.Place(word, i, n, true));
                if (seen.Add(key)) terms.Add((key, 1.0));
            }
            basis.Add([.. terms]);
        }
        return Solve(h, n, basis, options, Candidates(h, n, basis, k), "translation-invariant");
    }

    /// <summary>Words of 1..k letters whose first and last letters are not the identity (one per local pattern).</summary>
    internal static IEnumerable<string> Words(int k)
    {
        const string L = "XYZ", A = "IXYZ";
        foreach (char c in L) yield return c.ToString();
        for (int len = 2; len <= k; len++)
        {
            int inner = len - 2;
            int total = (int)Math.Pow(4, inner);
            foreach (char first in L)
            {
                foreach (char last in L)
                {
                    for (int code = 0; code < total; code++)
                    {
                        var mid = new char[inner];
                        int c = code;
                        for (int i = 0; i < inner; i++)
                        {
                            mid[i] = A[c % 4];
                            c /= 4;
                        }
                        yield return first + new string(mid) + last;
                    }
                }
            }
        }
    }

    private static int Diameter(PauliString s, Models.Lattice lattice)
    {
        var sup = s.Support();
        int d = 0;
        for (int a = 0; a < sup.Length; a++) for (int b = a + 1; b < sup.Length; b++) d = Math.Max(d, lattice.Distance(sup[a], sup[b]));
        return d;
    }

    /// <summary>What symmetries explain, as named operators on the same space: H, the totals and the products of totals (weight within k).</summary>
    private static List<(string Label, Dictionary<Pauli64, double> Op)> Candidates(Hamiltonian h, int n, List<(Pauli64 Key, double C)[]> basis, int k)
    {
        var list = new List<(string, Dictionary<Pauli64, double>)>();
        var hop = new Dictionary<Pauli64, double>();
        foreach (var t in h.Terms) if (!t.String.IsIdentity) hop[Pauli64.From(t.String)] = t.Coefficient;
        list.Add(("H", hop));
        foreach (char a in "XYZ")
        {
            var tot = new Dictionary<Pauli64, double>();
            for (int j = 0; j < n; j++) tot[Pauli64.From(PauliString.Single(n, j, a))] = 1;
            list.Add(($"total {a}", tot));
        }
        // basis elements made of strings that commute with every term: conserved Pauli strings (local
        // integrals of motion, e.g. every Z_j of a commuting Ising model); they are symmetries, not hidden charges
        var termKeys = h.Terms.Where(t => !t.String.IsIdentity).Select(t => Pauli64.From(t.String)).ToArray();
        foreach (var element in basis)
        {
            if (element.All(e => termKeys.All(t => Commutes(e.Key, t))))
                list.Add((element.Length == 1 ? "conserved Pauli string" : "conserved string density", element.ToDictionary(e => e.Key, e => e.C)));
        }
        if (k >= 2)
        {
            // weight-2 part of {S_a, S_b}/2: sum_{i != j} a_i b_j (the on-site part is a total or the identity)
            const string L = "XYZ";
            for (int x = 0; x < 3; x++)
            {
                for (int y = x; y < 3; y++)
                {
                    var op = new Dictionary<Pauli64, double>();
                    for (int i = 0; i < n; i++)
                    {
                        for (int j = 0; j < n; j++)
                        {
                            if (i == j) continue;
                            var pb = new PauliString.Builder(n);
                            pb.Set(i, L[x]);
                            pb.Set(j, L[y]);
                            var key = Pauli64.From(pb.Build());
                            op[key] = op.GetValueOrDefault(key) + 1;
                        }
                    }
                    list.Add((x == y ? $"total {L[x]}^2" : $"total {L[x]} total {L[y]}", op));
                }
            }
        }
        return list;
    }

    private static bool Commutes(Pauli64 a, Pauli64 b)
        => (System.Numerics.BitOperations.PopCount((a.X & b.Z) ^ (a.Z & b.X)) & 1) == 0;

    /// <summary>The null space of c -> i[H, sum c_j B_j] and its comparison with the explained span.</summary>
    private static ConservedSearchResult Solve(Hamiltonian h, int n, List<(Pauli64 Key, double C)[]> basis, ConservedSearchOptions options,
        List<(string Label, Dictionary<Pauli64, double> Op)> candidates, string mode)
    {
        var hc = h.Compile<Pauli64>();
        var rowIndex = new Dictionary<Pauli64, int>();
        int d = basis.Count;
        var columns = new List<(int Row, double Value)>[d];
        for (int c = 0; c < d; c++)
        {
            var op = new PauliOperator<Pauli64>(n, basis[c].Select(b => b.Key).ToArray(), basis[c].Select(b => b.C).ToArray(), basis[c].Length);
            var img = Liouvillian.Commutator(hc, op);
            var col = new List<(int, double)>(img.Count);
            for (int i = 0; i < img.Count; i++)
            {
                if (Math.Abs(img.Coefficients[i]) < 1e-14) continue;
                if (!rowIndex.TryGetValue(img.Keys[i], out int r))
                {
                    r = rowIndex.Count;
                    rowIndex[img.Keys[i]] = r;
                }
                col.Add((r, img.Coefficients[i]));
            }
            columns[c] = col;
        }
        // Gram matrix G = M^T M, assembled through the rows (each row touches few columns).
        var byRow = new List<(int Col, double Value)>[rowIndex.Count];
        for (int c = 0; c < d; c++)
        {
            foreach (var (r, val) in columns[c]) (byRow[r] ??= []).Add((c, val));
        }
        var g = Matrix<double>.Build.Dense(d, d);
        foreach (var row in byRow)
        {
            if (row is null) continue;
            foreach (var (a, va) in row)
            {
                foreach (var (b, vb) in row) g[a, b] += va * vb;
            }
        }
        // basis norms: (B_a|B_b) = sum over shared strings (orthogonal strings); density bases are orthogonal too
        var norms = basis.Select(b => Math.Sqrt(b.Sum(x => x.C * x.C))).ToArray();
        for (int a = 0; a < d; a++) for (int b = 0; b < d; b++) g[a, b] /= norms[a] * norms[b];
        var evd = g.Evd(Symmetricity.Symmetric);
        double max = Math.Max(evd.EigenValues.Max(e => e.Real), 1e-300);
        double cut = options.RelativeTolerance * max;
        var nullCols = new List<int>();
        double smallestAbove = double.PositiveInfinity;
        for (int i = 0; i < d; i++)
        {
            double e = evd.EigenValues[i].Real;
            if (e <= cut) nullCols.Add(i);
            else smallestAbove = Math.Min(smallestAbove, Math.Sqrt(e / max));
        }
        // V: orthonormal coefficients over the normalised basis
        var v = Matrix<double>.Build.Dense(d, nullCols.Count, (r, c) => evd.EigenVectors[r, nullCols[c]]);
        // candidate vectors in the same (normalised) coordinates; a candidate outside the space is skipped
        var where = new Dictionary<Pauli64, (int Col, double C)>();
        for (int c = 0; c < d; c++) foreach (var (key, coef) in basis[c]) where[key] = (c, coef / norms[c]);
        var labels = new List<string>();
        var labelled = new List<Vector<double>>();
        var explainedVectors = new List<Vector<double>>();
        bool containsH = false;
        foreach (var (label, op) in candidates)
        {
            // a candidate counts only when every one of its strings lies in the search space
            if (!op.Keys.All(where.ContainsKey)) continue;
            var vec = Coordinates(op, where, d);
            double norm = vec.L2Norm();
            if (norm == 0) continue;
            var u = vec / norm;
            explainedVectors.Add(u);
            if ((v * v.TransposeThisAndMultiply(u) - u).L2Norm() > 1e-7) continue; // not conserved by itself
            foreach (var q in labelled) u -= q.DotProduct(u) * q;
            if (u.L2Norm() < 1e-7) continue;
            labelled.Add(u / u.L2Norm());
            labels.Add(label);
            if (label == "H") containsH = true;
        }
        var ops = new List<ConservedOperator>();
        for (int i = 0; i < labelled.Count; i++) ops.Add(new ConservedOperator(ToTerms(basis, labelled[i], norms, n), labels[i]));
        // dim(V ∩ W): singular values of V^T Q_W equal to 1; what V holds beyond W is unexplained
        int explained = 0;
        var rest = new List<Vector<double>>();
        if (nullCols.Count > 0)
        {
            Matrix<double>? qw = null;
            if (explainedVectors.Count > 0)
            {
                var orth = new List<Vector<double>>();
                foreach (var x in explainedVectors)
                {
                    var u = x.Clone();
                    foreach (var q in orth) u -= q.DotProduct(u) * q;
                    if (u.L2Norm() > 1e-9) orth.Add(u / u.L2Norm());
                }
                qw = Matrix<double>.Build.DenseOfColumnVectors(orth);
            }
            var inW = new List<Vector<double>>();
            if (qw is not null)
            {
                var svd = v.TransposeThisAndMultiply(qw).Svd(true);
                for (int i = 0; i < svd.S.Count; i++)
                {
                    if (svd.S[i] > 1 - 1e-6)
                    {
                        explained++;
                        inW.Add(v * svd.U.Column(i));
                    }
                }
            }
            // directions of the explained part not named by a single candidate (e.g. total spin S^2 with a field)
            var named = new List<Vector<double>>(labelled);
            foreach (var x in inW)
            {
                var u = x.Clone();
                foreach (var q in named) u -= q.DotProduct(u) * q;
                if (u.L2Norm() < 1e-6) continue;
                u /= u.L2Norm();
                named.Add(u);
                ops.Add(new ConservedOperator(ToTerms(basis, u, norms, n), "symmetry algebra (a combination of products of totals)"));
            }
            for (int c = 0; c < v.ColumnCount; c++)
            {
                var u = v.Column(c);
                foreach (var q in named.Concat(rest)) u -= q.DotProduct(u) * q;
                if (u.L2Norm() < 1e-6) continue;
                rest.Add(u / u.L2Norm());
            }
        }
        foreach (var u in rest) ops.Add(new ConservedOperator(ToTerms(basis, u, norms, n), null));
        return new ConservedSearchResult(d, nullCols.Count, ops, containsH, labels, rest.Count,
            double.IsPositiveInfinity(smallestAbove) ? 0 : smallestAbove) { Mode = mode };
    }

    /// <summary>Coordinates of an operator in the normalised basis (least squares: each basis element's overlap).</summary>
    private static Vector<double> Coordinates(Dictionary<Pauli64, double> op, Dictionary<Pauli64, (int Col, double C)> where, int d)
    {
        var vec = Vector<double>.Build.Dense(d);
        // (B_c|O) / ||B_c|| for each basis element: the orthogonal projection (basis elements are orthogonal)
        foreach (var (key, coef) in op)
        {
            if (!where.TryGetValue(key, out var w)) continue;
            vec[w.Col] += coef * w.C; // w.C = (string coefficient in B_c) / ||B_c||
        }
        return vec;
    }

    private static List<PauliTerm> ToTerms(List<(Pauli64 Key, double C)[]> basis, Vector<double> v, double[] norms, int n)
    {
        var acc = new Dictionary<Pauli64, double>();
        for (int c = 0; c < basis.Count; c++)
        {
            if (v[c] == 0) continue;
            foreach (var (key, coef) in basis[c]) acc[key] = acc.GetValueOrDefault(key) + v[c] * coef / norms[c];
        }
        double max = acc.Values.Select(Math.Abs).DefaultIfEmpty(0).Max();
        return acc.Where(kv => Math.Abs(kv.Value) > 1e-10 * max).Select(kv => new PauliTerm(kv.Key.ToPauliString(n), kv.Value)).ToList();
    }

    /// <summary>
    /// Mazur bound sum_k (Q_k|A)^2 / ((Q_k|Q_k)(A|A)) for mutually orthogonal Q_k.
    /// Source: P. Mazur, Physica 43, 533 (1969); M. Suzuki, Physica 51, 277 (1971).
    /// </summary>
    public static double MazurBound(IEnumerable<IReadOnlyList<PauliTerm>> conserved, IReadOnlyList<PauliTerm> probe)
    {
        var a = probe.GroupBy(t => t.String).ToDictionary(g => g.Key, g => g.Sum(t => t.Coefficient));
        double aa = a.Values.Sum(c => c * c);
        if (aa == 0) throw new ArgumentException("The probe operator is zero.", nameof(probe));
        double bound = 0;
        foreach (var q in conserved)
        {
            double qa = 0, qq = 0;
            foreach (var t in q)
            {
                qq += t.Coefficient * t.Coefficient;
                if (a.TryGetValue(t.String, out double c)) qa += c * t.Coefficient;
            }
            if (qq > 0) bound += qa * qa / (qq * aa);
        }
        return bound;
    }

    /// <summary>All strings of weight 1..k on n sites, in a fixed order.</summary>
    internal static List<Pauli64> EnumerateStrings(int n, int k)
    {
        var result = new List<Pauli64>();
        var sites = new int[k];
        for (int w = 1; w <= Math.Min(k, n); w++) Combine(0, 0, w);
        return result;

        void Combine(int start, int depth, int w)
        {
            if (depth == w)
            {
                int total = 1;
                for (int i = 0; i < w; i++) total *= 3;
                for (int code = 0; code < total; code++)
                {
                    ulong x = 0, z = 0;
                    int c = code;
                    for (int i = 0; i < w; i++)
                    {
                        int letter = c % 3 + 1; // 1 = X, 2 = Z, 3 = Y
                        c /= 3;
                        if ((letter & 1) != 0) x |= 1UL << sites[i];
                        if ((letter & 2) != 0) z |= 1UL << sites[i];
                    }
                    result.Add(new Pauli64(x, z));
                }
                return;
            }
            for (int s = start; s < n; s++)
            {
                sites[depth] = s;
                Combine(s + 1, depth + 1, w);
            }
        }
    }
}
