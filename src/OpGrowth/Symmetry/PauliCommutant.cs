using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Symmetry;

/// <summary>
/// The Pauli strings that commute with every term of a Hamiltonian: each is conserved. Writing a string
/// as its symplectic vector (x | z), it commutes with a term (x_t | z_t) iff x . z_t + z . x_t = 0 (mod 2),
/// so the conserved strings (up to phases) form the null space over GF(2) of the matrix whose rows are the
/// terms' vectors (z_t | x_t). Global parities (prod_j X_j, prod_j Z_j, sublattice parities) and local
/// conserved strings (every Z_j of a commuting Ising model) both appear as elements of this space.
/// </summary>
/// <remarks>
/// The basis returned is brought to low weight greedily (a generator is replaced by its product with
/// another whenever that has fewer non-identity letters), so local conserved strings show up as
/// themselves; it is one basis of the group, not a canonical one. Source: the symplectic representation
/// of Pauli strings, e.g. Gottesman, PhD thesis, Caltech (1997), arXiv:quant-ph/9705052.
/// Packed layout here: x bits in words [0, W), z bits in words [W, 2W), W = words per half.
/// </remarks>
public static class PauliCommutant
{
    /// <summary>
    /// Generators of the group of Pauli strings (up to phase) that commute with every given term, sorted by
    /// weight (then by first site).
    /// </summary>
    public static IReadOnlyList<PauliString> Generators(int n, IEnumerable<PauliString> terms)
    {
        ArgumentNullException.ThrowIfNull(terms);
        int w = PauliString.WordCount(n);
        var space = new Gf2(2 * w * 64);
        var row = new ulong[2 * w];
        foreach (var t in terms)
        {
            if (t.N != n) throw new ArgumentException($"Term {t} acts on {t.N} qubits, expected {n}.", nameof(terms));
            if (space.Rank == 2 * n) break;
            // row = (z_t | x_t): the first half pairs with the unknown's x, the second with its z
            t.Z.CopyTo(row.AsSpan(0, w));
            t.X.CopyTo(row.AsSpan(w, w));
            space.Add(row);
        }
        var basis = space.NullSpace(f => f % (w << 6) < n);
        Reduce(basis, w);
        return basis.Select(v => new PauliString(n, v.AsSpan(0, w), v.AsSpan(w, w)))
            .OrderBy(s => s.Weight).ThenBy(s => s.FirstSite).ToArray();
    }

    /// <summary>True when every pair of terms commutes (the Hamiltonian is a sum of commuting strings).</summary>
    public static bool AllCommute(IReadOnlyList<PauliString> terms)
    {
        ArgumentNullException.ThrowIfNull(terms);
        if (terms.Count == 0) return true;
        int n = terms[0].N;
        var span = Span(n, Generators(n, terms));
        return terms.All(t => InSpan(span, t));
    }

    /// <summary>The GF(2) span of a set of strings (for membership tests with <see cref="InSpan"/>).</summary>
    internal static Gf2 Span(int n, IEnumerable<PauliString> strings)
    {
        int w = PauliString.WordCount(n);
        var span = new Gf2(2 * w * 64);
        foreach (var s in strings) span.Add(Pack(s));
        return span;
    }

    /// <summary>True when the string is (up to phase) a product of the strings spanned.</summary>
    internal static bool InSpan(Gf2 span, PauliString s) => span.Contains(Pack(s));

    private static ulong[] Pack(PauliString s)
    {
        int w = s.Words;
        var v = new ulong[2 * w];
        s.X.CopyTo(v.AsSpan(0, w));
        s.Z.CopyTo(v.AsSpan(w, w));
        return v;
    }

    /// <summary>Greedy weight reduction: replace b_i by b_i b_j while that lowers its weight.</summary>
    private static void Reduce(List<ulong[]> basis, int w)
    {
        if (basis.Count < 2) return;
        var weights = basis.Select(v => Weight(v, w)).ToArray();
        if (weights.All(x => x <= 1)) return;
        for (int sweep = 0; sweep < 64; sweep++)
        {
            bool improved = false;
            for (int i = 0; i < basis.Count; i++)
            {
                if (weights[i] <= 1) continue;
                for (int j = 0; j < basis.Count; j++)
                {
                    if (i == j || weights[j] > 2 * weights[i]) continue;
                    int x = WeightOfXor(basis[i], basis[j], w);
                    if (x < weights[i])
                    {
                        Gf2.Xor(basis[i], basis[j]);
                        weights[i] = x;
                        improved = true;
                    }
                }
            }
            if (!improved) break;
        }
    }

    private static int Weight(ulong[] v, int w)
    {
        int c = 0;
        for (int k = 0; k < w; k++) c += BitOperations.PopCount(v[k] | v[w + k]);
        return c;
    }

    private static int WeightOfXor(ulong[] a, ulong[] b, int w)
    {
        int c = 0;
        for (int k = 0; k < w; k++) c += BitOperations.PopCount((a[k] ^ b[k]) | (a[w + k] ^ b[w + k]));
        return c;
    }
}
