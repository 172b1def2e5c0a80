using System.Globalization;
using OpGrowth.Pauli;

namespace OpGrowth.Symmetry;

/// <summary>
/// Site permutations that map a Hamiltonian onto itself (every term onto a term with the same coefficient),
/// found by colour refinement and individualisation: sites are coloured by the terms they sit in, colours
/// are refined until stable, and a search tree individualises one site at a time. Used as a guard: after
/// some symmetries were resolved, is there a permutation symmetry outside the resolved group?
/// </summary>
/// <remarks>
/// Source: the individualisation-refinement scheme of graph-isomorphism programs, McKay, Congressus
/// Numerantium 30, 45 (1981); McKay and Piperno, J. Symbolic Comput. 60, 94 (2014). This is a small
/// version without automorphism pruning, with a node budget.
/// </remarks>
public static class SiteAutomorphisms
{
    /// <summary>Outcome of a search.</summary>
    /// <param name="Found">A symmetry outside the known group, or null.</param>
    /// <param name="Complete">False when the node budget ran out before the search finished.</param>
    public sealed record Result(int[]? Found, bool Complete);

    /// <summary>
    /// Looks for a site permutation that maps H onto itself and is not among <paramref name="known"/>
    /// (each a map site j -&gt; map[j]; the identity is always known).
    /// </summary>
    public static Result FindOutside(Hamiltonian h, IEnumerable<IReadOnlyList<int>> known, int nodeBudget = 20_000)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(known);
        int n = h.N;
        var knownSet = new HashSet<string>(known.Select(Key)) { Key(Enumerable.Range(0, n).ToArray()) };
        var terms = h.Terms.Where(t => !t.String.IsIdentity).ToArray();
        double scale = terms.Select(t => Math.Abs(t.Coefficient)).DefaultIfEmpty(1).Max();
        // term key: rounded coefficient (relative 1e-9, common practice for rounding noise)
        var termKey = terms.Select(t => Math.Round(t.Coefficient / scale * 1e9).ToString(CultureInfo.InvariantCulture)).ToArray();
        var sites = terms.Select(t => t.String.Support()).ToArray();
        var letters = terms.Select(t => t.String.Support().Select(j => t.String[j]).ToArray()).ToArray();
        var byTerm = new List<int>[n];
        for (int j = 0; j < n; j++) byTerm[j] = [];
        for (int k = 0; k < terms.Length; k++) foreach (int j in sites[k]) byTerm[j].Add(k);
        var termSet = new Dictionary<string, string>();
        for (int k = 0; k < terms.Length; k++) termSet[TermString(sites[k], letters[k])] = termKey[k];

        int[] Refine(int[] colour)
        {
            var c = (int[])colour.Clone();
            for (int round = 0; round < n + 1; round++)
            {
                var sig = new string[n];
                for (int j = 0; j < n; j++)
                {
                    var parts = new List<string>(byTerm[j].Count);
                    foreach (int k in byTerm[j])
                    {
                        int pos = Array.IndexOf(sites[k], j);
                        var others = new List<string>();
                        for (int q = 0; q < sites[k].Length; q++) if (q != pos) others.Add($"{letters[k][q]}{c[sites[k][q]]}");
                        others.Sort(StringComparer.Ordinal);
                        parts.Add($"{termKey[k]}:{letters[k][pos]}:{string.Join(",", others)}");
                    }
                    parts.Sort(StringComparer.Ordinal);
                    sig[j] = $"{c[j]}|{string.Join(";", parts)}";
                }
                var distinct = sig.Distinct().OrderBy(x => x, StringComparer.Ordinal).ToList();
                var id = new Dictionary<string, int>();
                for (int i = 0; i < distinct.Count; i++) id[distinct[i]] = i;
                var next = sig.Select(x => id[x]).ToArray();
                bool stable = distinct.Count == c.Distinct().Count();
                c = next;
                if (stable) break;
            }
            return c;
        }

        int[] Individualise(int[] colour, int v)
        {
            var c = colour.Select(x => 2 * x).ToArray();
            c[v] = 2 * colour[v] + 1; // splits v off its cell, in a canonical way
            return Refine(c);
        }

        var root = Refine(new int[n]);
        // left path: individualise the first site of the smallest non-singleton cell until discrete
        var left = new List<int[]> { root };
        var leftChoice = new List<int>();
        while (true)
        {
            var c = left[^1];
            int cell = TargetCell(c);
            if (cell < 0) break;
            int v = Enumerable.Range(0, n).First(j => c[j] == cell);
            leftChoice.Add(v);
            left.Add(Individualise(c, v));
        }
        int nodes = 0;
        bool complete = true;
        int[]? found = null;

        void Search(int level, int[] right)
        {
            if (found is not null || !complete) return;
            if (++nodes > nodeBudget)
            {
                complete = false;
                return;
            }
            if (!SameCells(left[level], right)) return;
            if (level == leftChoice.Count)
            {
                // discrete: sigma maps the left site of each colour to the right site of that colour
                var sigma = new int[n];
                var posRight = new int[n];
                for (int j = 0; j < n; j++) posRight[right[j]] = j;
                for (int j = 0; j < n; j++) sigma[j] = posRight[left[level][j]];
                if (!knownSet.Contains(Key(sigma)) && IsAutomorphism(sigma)) found = sigma;
                return;
            }
            int cell = left[level][leftChoice[level]];
            for (int w = 0; w < n && found is null && complete; w++)
            {
                if (right[w] == cell) Search(level + 1, Individualise(right, w));
            }
        }

        bool IsAutomorphism(int[] sigma)
        {
            for (int k = 0; k < terms.Length; k++)
            {
                var img = sites[k].Select(j => sigma[j]).ToArray();
                var order = Enumerable.Range(0, img.Length).OrderBy(q => img[q]).ToArray();
                string key = TermString(order.Select(q => img[q]).ToArray(), order.Select(q => letters[k][q]).ToArray());
                if (!termSet.TryGetValue(key, out string? coef) || coef != termKey[k]) return false;
            }
            return true;
        }

        Search(0, root);
        return new Result(found, complete);
    }

    private static int TargetCell(int[] c)
    {
        var counts = new Dictionary<int, int>();
        foreach (int x in c) counts[x] = counts.GetValueOrDefault(x) + 1;
        var cells = counts.Where(kv => kv.Value > 1).ToList();
        if (cells.Count == 0) return -1;
        return cells.OrderBy(kv => kv.Value).ThenBy(kv => kv.Key).First().Key;
    }

    private static bool SameCells(int[] a, int[] b)
    {
        var ca = new int[a.Length + 1];
        var cb = new int[b.Length + 1];
        foreach (int x in a) if (x < ca.Length) ca[x]++; else return false;
        foreach (int x in b) if (x < cb.Length) cb[x]++; else return false;
        return ca.AsSpan().SequenceEqual(cb);
    }

    private static string TermString(int[] sites, char[] letters)
        => string.Join(",", sites.Select((s, i) => $"{s}{letters[i]}"));

    private static string Key(IReadOnlyList<int> map) => string.Join(",", map);
}
