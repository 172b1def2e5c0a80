using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Structure;

/// <summary>
/// The frustration graph of a Hamiltonian written as a sum of Pauli strings: one vertex per term, an edge
/// between two terms that anticommute. Its shape decides whether the model is solved by free fermions:
/// a line graph gives a generalised Jordan-Wigner map of every term to a Majorana bilinear (Chapman and
/// Flammia, Quantum 4, 278 (2020)); a graph with a claw (one term anticommuting with three mutually
/// commuting ones) has no such map and none of the claw-free solutions either (Elman, Chapman, Flammia,
/// arXiv:2012.07857; Chapman, Elman, Mann, arXiv:2305.15625; Fendley, J. Phys. A 52, 335002 (2019)).
/// </summary>
public sealed class FrustrationGraph
{
    private readonly List<int>[] _adj;
    private readonly ulong[] _bits; // adjacency matrix, row-major bit rows
    private readonly int _rowWords;

    /// <summary>The terms (vertices), in the order given.</summary>
    public IReadOnlyList<PauliString> Terms { get; }

    /// <summary>Number of vertices.</summary>
    public int Count => Terms.Count;

    /// <summary>Neighbours (anticommuting terms) of a vertex.</summary>
    public IReadOnlyList<int> Neighbours(int v) => _adj[v];

    /// <summary>True when terms u and v anticommute.</summary>
    public bool Adjacent(int u, int v) => (_bits[(long)u * _rowWords + (v >> 6)] >> (v & 63) & 1) != 0;

    /// <summary>Number of edges.</summary>
    public int EdgeCount { get; }

    private FrustrationGraph(IReadOnlyList<PauliString> terms, List<int>[] adj, ulong[] bits, int rowWords, int edges)
    {
        Terms = terms;
        _adj = adj;
        _bits = bits;
        _rowWords = rowWords;
        EdgeCount = edges;
    }

    /// <summary>Largest number of terms accepted (the pairwise test is quadratic).</summary>
    public const int MaxTerms = 20_000;

    /// <summary>Builds the graph (identity terms are left out: they commute with everything).</summary>
    public static FrustrationGraph Of(IEnumerable<PauliString> terms)
    {
        ArgumentNullException.ThrowIfNull(terms);
        var list = terms.Where(t => !t.IsIdentity).Distinct().ToArray();
        int count = list.Length;
        if (count > MaxTerms) throw new ArgumentException($"{count} terms: at most {MaxTerms} for the frustration graph.", nameof(terms));
        int w = count == 0 ? 1 : list[0].Words;
        // symplectic words side by side: x then z, for a branch-free parity test per pair
        var x = new ulong[count * w];
        var z = new ulong[count * w];
        for (int i = 0; i < count; i++)
        {
            list[i].X.CopyTo(x.AsSpan(i * w, w));
            list[i].Z.CopyTo(z.AsSpan(i * w, w));
        }
        int rowWords = (count + 63) >> 6;
        var bits = new ulong[(long)count * rowWords];
        var adj = new List<int>[count];
        for (int i = 0; i < count; i++) adj[i] = [];
        int edges = 0;
        for (int u = 0; u < count; u++)
        {
            var xu = x.AsSpan(u * w, w);
            var zu = z.AsSpan(u * w, w);
            for (int v = u + 1; v < count; v++)
            {
                int parity = 0;
                for (int k = 0; k < w; k++) parity ^= BitOperations.PopCount((xu[k] & z[v * w + k]) ^ (zu[k] & x[v * w + k]));
                if ((parity & 1) == 0) continue;
                bits[(long)u * rowWords + (v >> 6)] |= 1UL << (v & 63);
                bits[(long)v * rowWords + (u >> 6)] |= 1UL << (u & 63);
                adj[u].Add(v);
                adj[v].Add(u);
                edges++;
            }
        }
        foreach (var l in adj) l.Sort();
        return new FrustrationGraph(list, adj, bits, rowWords, edges);
    }

    /// <summary>A claw: a centre adjacent to three mutually non-adjacent vertices, or null when the graph is claw-free.</summary>
    public (int Centre, int A, int B, int C)? FindClaw()
    {
        for (int v = 0; v < Count; v++)
        {
            var nb = _adj[v];
            for (int i = 0; i < nb.Count; i++)
            {
                for (int j = i + 1; j < nb.Count; j++)
                {
                    if (Adjacent(nb[i], nb[j])) continue;
                    for (int k = j + 1; k < nb.Count; k++)
                    {
                        if (!Adjacent(nb[i], nb[k]) && !Adjacent(nb[j], nb[k])) return (v, nb[i], nb[j], nb[k]);
                    }
                }
            }
        }
        return null;
    }

    /// <summary>
    /// A simplicial clique (a non-empty clique K such that, for every vertex of K, its neighbours outside K
    /// form a clique), searched among the closed neighbourhoods' maximal cliques grown greedily from each
    /// vertex; null when none of those candidates is one (the search is not exhaustive).
    /// </summary>
    public IReadOnlyList<int>? FindSimplicialClique()
    {
        for (int v = 0; v < Count; v++)
        {
            // grow a maximal clique containing v, preferring low-degree vertices
            var clique = new List<int> { v };
            foreach (int u in _adj[v].OrderBy(u => _adj[u].Count))
            {
                if (clique.All(w => Adjacent(u, w))) clique.Add(u);
            }
            if (IsSimplicial(clique)) return clique;
            if (IsSimplicial([v])) return [v];
        }
        return null;
    }

    private bool IsSimplicial(List<int> clique)
    {
        var set = clique.ToHashSet();
        foreach (int v in clique)
        {
            var outside = _adj[v].Where(u => !set.Contains(u)).ToList();
            for (int i = 0; i < outside.Count; i++)
            {
                for (int j = i + 1; j < outside.Count; j++)
                {
                    if (!Adjacent(outside[i], outside[j])) return false;
                }
            }
        }
        return true;
    }

    /// <summary>
    /// An induced cycle of even length between 4 and <paramref name="maxLength"/> (an "even hole"), or null
    /// when none exists up to that length (bounded depth-first search; <paramref name="budget"/> caps the work).
    /// </summary>
    public (IReadOnlyList<int>? Hole, bool Complete) FindEvenHole(int maxLength = 8, int budget = 2_000_000)
    {
        int work = 0;
        var path = new List<int>();
        var onPath = new bool[Count];
        List<int>? found = null;
        bool complete = true;

        void Extend(int start)
        {
            if (found is not null || !complete) return;
            if (++work > budget)
            {
                complete = false;
                return;
            }
            int m = path.Count - 1; // path = p0 .. pm, p0 = start (the smallest vertex of the cycle)
            foreach (int u in _adj[path[m]])
            {
                if (u <= start || onPath[u]) continue;
                bool chord = false;
                for (int i = 1; i < m && !chord; i++) chord = Adjacent(u, path[i]);
                if (chord) continue;
                if (m >= 1 && Adjacent(u, start))
                {
                    if (m >= 2 && (m + 2) % 2 == 0) // closes an induced cycle of even length m + 2 >= 4
                    {
                        found = [.. path, u];
                        return;
                    }
                    continue;
                }
                if (m + 2 >= maxLength) continue;
                path.Add(u);
                onPath[u] = true;
                Extend(start);
                path.RemoveAt(path.Count - 1);
                onPath[u] = false;
                if (found is not null || !complete) return;
            }
        }

        for (int s = 0; s < Count && found is null && complete; s++)
        {
            path.Clear();
            path.Add(s);
            onPath[s] = true;
            Extend(s);
            onPath[s] = false;
        }
        return (found, complete);
    }

}
