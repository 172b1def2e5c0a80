using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// Splits Pauli generators into groups of mutually commuting strings by greedy colouring of the
/// anticommutation graph (terms in their given order; each joins the first group with no
/// anticommuting member). Only overlapping strings can anticommute, so conflicts are found through
/// a site index: cost linear in the number of terms for local Hamiltonians. Duplicate strings are
/// merged into one generator.
/// </summary>
internal static class CommutingGroups
{
    /// <summary>Colours the terms; returns one group per colour (deterministic: depends on the order only).</summary>
    public static List<RotationGroup<T>> Colour<T>(int n, IReadOnlyList<T> keys, IReadOnlyList<double> weights, CancellationToken ct = default)
        where T : unmanaged, IPauliKey<T>
    {
        // Merge duplicates, keep first-seen order.
        var order = new List<T>();
        var sum = new Dictionary<T, double>();
        for (int i = 0; i < keys.Count; i++)
        {
            if (sum.TryGetValue(keys[i], out double w)) sum[keys[i]] = w + weights[i];
            else
            {
                sum[keys[i]] = weights[i];
                order.Add(keys[i]);
            }
        }
        var terms = new List<T>();
        foreach (var k in order)
        {
            if (sum[k] != 0 && k.Weight > 0) terms.Add(k);
        }

        var colour = new int[terms.Count];
        var atSite = new List<int>[n];
        for (int j = 0; j < n; j++) atSite[j] = [];
        Span<int> sites = stackalloc int[T.Capacity];
        var blocked = new HashSet<int>();
        int colours = 0;
        // a term is compared once with every earlier term that shares a site (stamp: the last term that visited it)
        var seenBy = new int[terms.Count];
        Array.Fill(seenBy, -1);
        for (int t = 0; t < terms.Count; t++)
        {
            if ((t & 63) == 0) ct.ThrowIfCancellationRequested(); // quadratic for dense models (all-to-all Majoranas): honour budgets
            blocked.Clear();
            int m = T.SupportSites(terms[t], sites);
            for (int i = 0; i < m; i++)
            {
                foreach (int u in atSite[sites[i]])
                {
                    if (seenBy[u] == t) continue;
                    seenBy[u] = t;
                    if (T.Anticommute(terms[t], terms[u])) blocked.Add(colour[u]);
                }
            }
            int c = 0;
            while (blocked.Contains(c)) c++;
            colour[t] = c;
            colours = Math.Max(colours, c + 1);
            for (int i = 0; i < m; i++) atSite[sites[i]].Add(t);
        }

        var gk = new List<T>[colours];
        var gw = new List<double>[colours];
        for (int c = 0; c < colours; c++)
        {
            gk[c] = [];
            gw[c] = [];
        }
        for (int t = 0; t < terms.Count; t++)
        {
            gk[colour[t]].Add(terms[t]);
            gw[colour[t]].Add(sum[terms[t]]);
        }
        var groups = new List<RotationGroup<T>>(colours);
        for (int c = 0; c < colours; c++) groups.Add(new RotationGroup<T>(n, gk[c], gw[c]));
        return groups;
    }

    /// <summary>
    /// Splits an ordered rotation sequence into consecutive blocks of mutually commuting generators
    /// (order between blocks is kept, so the product is unchanged). Used for periodic drives, whose
    /// layers must be applied in their time order.
    /// </summary>
    public static List<(List<T> Keys, List<double> Weights)> ConsecutiveBlocks<T>(IReadOnlyList<T> keys, IReadOnlyList<double> weights)
        where T : unmanaged, IPauliKey<T>
    {
        var blocks = new List<(List<T>, List<double>)>();
        List<T>? bk = null;
        List<double>? bw = null;
        for (int i = 0; i < keys.Count; i++)
        {
            if (keys[i].Weight == 0) continue;
            bool fits = bk is not null;
            if (bk is not null)
            {
                foreach (var k in bk)
                {
                    if (T.Anticommute(k, keys[i]))
                    {
                        fits = false;
                        break;
                    }
                }
            }
            if (!fits)
            {
                bk = [];
                bw = [];
                blocks.Add((bk, bw));
            }
            bk!.Add(keys[i]);
            bw!.Add(weights[i]);
        }
        return blocks;
    }
}
