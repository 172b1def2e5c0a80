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
    double SmallestNonZero);

/// <summary>
/// Finds local conserved quantities: the null space of the linear map c -> i[H, sum_S c_S S] over
/// all strings S of weight &lt;= k on the given (small) cluster. The map is assembled column by
/// column with the Pauli commutator, then the null space is read off the eigen-decomposition of
/// the Gram matrix M^T M (MathNet, symmetric). Recognised operators (H itself, total X/Y/Z and the
/// weight-2 parts of products of conserved totals) are
/// projected out first so the remainder counts what is not explained.
/// Mazur bound on the long-time autocorrelation of a probe A from these Q_k:
/// lim avg (A(t)|A)/(A|A) &gt;= sum_k |(Q_k|A)|^2 / ((Q_k|Q_k)(A|A)).
/// Source: P. Mazur, Physica 43, 533 (1969); M. Suzuki, Physica 51, 277 (1971).
/// </summary>
public static class ConservedQuantitySearch
{
    /// <summary>Runs the search on Hamiltonian <paramref name="h"/> (at most 64 qubits; keep the cluster small: the Gram matrix is dense).</summary>
    public static ConservedSearchResult Run(Hamiltonian h, ConservedSearchOptions options)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (h.N > 64) throw new ArgumentException($"The search runs on clusters of at most 64 qubits, got {h.N}.", nameof(h));
        ArgumentOutOfRangeException.ThrowIfLessThan(options.MaxWeight, 1);
        int n = h.N;
        var basis = EnumerateStrings(n, options.MaxWeight);
        if (basis.Count > 6000)
        {
            throw new ArgumentException($"{basis.Count} strings of weight <= {options.MaxWeight} on {n} sites is too many for the dense Gram matrix; use a smaller cluster or weight.", nameof(options));
        }
        var hc = h.Compile<Pauli64>();
        var rowIndex = new Dictionary<Pauli64, int>();
        var columns = new List<(int Row, double Value)>[basis.Count];
        for (int c = 0; c < basis.Count; c++)
        {
            var img = Liouvillian.Commutator(hc, new PauliOperator<Pauli64>(n, [basis[c]], [1.0], 1));
            var col = new List<(int, double)>(img.Count);
            for (int i = 0; i < img.Count; i++)
            {
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
        for (int c = 0; c < columns.Length; c++)
        {
            foreach (var (r, v) in columns[c]) (byRow[r] ??= []).Add((c, v));
        }
        int d = basis.Count;
        var g = Matrix<double>.Build.Dense(d, d);
        foreach (var row in byRow)
        {
            if (row is null) continue;
            foreach (var (a, va) in row)
            {
                foreach (var (b, vb) in row) g[a, b] += va * vb;
            }
        }
        var evd = g.Evd(Symmetricity.Symmetric);
        double max = Math.Max(evd.EigenValues.Max(e => e.Real), 1e-300);
        // Eigenvalues of G are squared singular values of M; rounding in G is ~1e-16 of its largest
        // eigenvalue, so the cut is applied to G's eigenvalues (singular values below sqrt(tol)).
        double cut = options.RelativeTolerance * max;
        var nullCols = new List<int>();
        double smallestAbove = double.PositiveInfinity;
        for (int i = 0; i < d; i++)
        {
            double e = evd.EigenValues[i].Real;
            if (e <= cut) nullCols.Add(i);
            else smallestAbove = Math.Min(smallestAbove, Math.Sqrt(e / max));
        }
        var nullBasis = Matrix<double>.Build.Dense(d, nullCols.Count, (r, c) => evd.EigenVectors[r, nullCols[c]]);

        // Recognise H and the totals by projecting candidates onto the null space.
        var labels = new List<string>();
        var recognised = new List<Vector<double>>();
        var candidates = new List<(string Label, Vector<double> V)>();
        var index = new Dictionary<Pauli64, int>();
        for (int i = 0; i < d; i++) index[basis[i]] = i;
        var hv = Vector<double>.Build.Dense(d);
        bool hInSpan = true;
        foreach (var t in h.Terms)
        {
            if (t.String.IsIdentity) continue;
            if (index.TryGetValue(Pauli64.From(t.String), out int i)) hv[i] = t.Coefficient;
            else hInSpan = false;
        }
        if (hv.L2Norm() > 0) candidates.Add(("H", hv));
        foreach (char a in "XYZ")
        {
            var v = Vector<double>.Build.Dense(d);
            for (int j = 0; j < n; j++) v[index[Pauli64.From(PauliString.Single(n, j, a))]] = 1;
            candidates.Add(($"total {a}", v));
        }
        bool containsH = false;
        void Recognise(string label, Vector<double> v)
        {
            var u = v / v.L2Norm();
            var proj = nullBasis * (nullBasis.TransposeThisAndMultiply(u));
            if ((proj - u).L2Norm() > 1e-7) return;
            // Orthogonalise against the ones already recognised.
            foreach (var q in recognised) u -= q.DotProduct(u) * q;
            if (u.L2Norm() < 1e-7) return;
            u /= u.L2Norm();
            recognised.Add(u);
            labels.Add(label);
            if (label == "H" && hInSpan) containsH = true;
        }
        foreach (var (label, v) in candidates) Recognise(label, v);
        // Products of conserved totals are conserved too: the weight-2 part of {S_a, S_b}/2 is
        // sum_{i != j} a_i b_j (the on-site part has weight <= 1 and is a total or the identity).
        if (options.MaxWeight >= 2 && n >= 2)
        {
            var totals = labels.Where(l => l.StartsWith("total ", StringComparison.Ordinal)).Select(l => l[^1]).ToList();
            for (int x = 0; x < totals.Count; x++)
            {
                for (int y = x; y < totals.Count; y++)
                {
                    char a = totals[x], b = totals[y];
                    var v = Vector<double>.Build.Dense(d);
                    for (int i = 0; i < n; i++)
                    {
                        for (int j = 0; j < n; j++)
                        {
                            if (i == j) continue;
                            var pb = new PauliString.Builder(n);
                            pb.Set(i, a);
                            pb.Set(j, b);
                            v[index[Pauli64.From(pb.Build())]] += 1;
                        }
                    }
                    Recognise(a == b ? $"total {a}^2" : $"total {a} total {b}", v);
                }
            }
        }
        // Remaining null directions: orthogonal complement of the recognised ones inside the null space.
        var ops = new List<ConservedOperator>();
        for (int i = 0; i < recognised.Count; i++) ops.Add(new ConservedOperator(ToTerms(basis, recognised[i], n), labels[i]));
        var rest = new List<Vector<double>>();
        for (int c = 0; c < nullBasis.ColumnCount; c++)
        {
            var u = nullBasis.Column(c);
            foreach (var q in recognised.Concat(rest)) u -= q.DotProduct(u) * q;
            if (u.L2Norm() < 1e-6) continue;
            u /= u.L2Norm();
            rest.Add(u);
            ops.Add(new ConservedOperator(ToTerms(basis, u, n), null));
        }
        return new ConservedSearchResult(d, nullCols.Count, ops, containsH, labels, rest.Count,
            double.IsPositiveInfinity(smallestAbove) ? 0 : smallestAbove);
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

    private static List<PauliTerm> ToTerms(List<Pauli64> basis, Vector<double> v, int n)
    {
        var list = new List<PauliTerm>();
        double max = v.AbsoluteMaximum();
        for (int i = 0; i < basis.Count; i++)
        {
            if (Math.Abs(v[i]) > 1e-10 * max) list.Add(new PauliTerm(basis[i].ToPauliString(n), v[i]));
        }
        return list;
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
