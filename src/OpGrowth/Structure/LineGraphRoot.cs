namespace OpGrowth.Structure;

/// <summary>
/// Recognises line graphs: finds a root graph R whose line graph is the given graph, i.e. one edge of R
/// (a pair of root vertices) per vertex of the graph, with two vertices adjacent exactly when their edges
/// share an endpoint. Vertices are placed one at a time in breadth-first order; a new vertex must share
/// one endpoint with the edge of a placed neighbour, and its neighbours among the placed vertices must be
/// exactly the edges at its two endpoints. Only small graphs (the triangle, which is the line graph of both
/// a triangle and a star) leave a choice, so the search backtracks rarely; a step budget bounds it.
/// </summary>
/// <remarks>
/// Source: the characterisation of line graphs by a partition into cliques with every vertex in at most
/// two (Krausz 1943); linear-time recognition: Roussopoulos, Inf. Proc. Lett. 2, 108 (1973); Lehot,
/// J. ACM 21, 569 (1974). This incremental form (quadratic in the worst case) follows the idea of
/// Degiorgi and Simon, WG 1995 (from memory).
/// </remarks>
public static class LineGraphRoot
{
    /// <summary>A root: edge (A[v], B[v]) of the root graph for every vertex v; <see cref="RootVertices"/> root vertices.</summary>
    public sealed record Root(int[] A, int[] B, int RootVertices);

    /// <summary>The root graph, or null when the graph is not a line graph (or the step budget ran out: <paramref name="complete"/> false).</summary>
    public static Root? Find(int count, Func<int, IReadOnlyList<int>> neighbours, out bool complete, out int failedAt, int stepBudget = 5_000_000)
    {
        ArgumentNullException.ThrowIfNull(neighbours);
        complete = true;
        failedAt = -1;
        var a = new int[count];
        var b = new int[count];
        var placed = new bool[count];
        var incident = new List<List<int>>();
        int rootCount = 0;
        // breadth-first order over every component
        var order = new List<int>(count);
        var seen = new bool[count];
        for (int s = 0; s < count; s++)
        {
            if (seen[s]) continue;
            seen[s] = true;
            var q = new Queue<int>();
            q.Enqueue(s);
            while (q.Count > 0)
            {
                int v = q.Dequeue();
                order.Add(v);
                foreach (int u in neighbours(v))
                {
                    if (!seen[u])
                    {
                        seen[u] = true;
                        q.Enqueue(u);
                    }
                }
            }
        }
        // choice stack: per step, the candidates and which one is in use
        var candidates = new List<(int A, int B)>[count];
        var choice = new int[count];
        int steps = 0;
        int k = 0;
        int deepestFail = -1;
        while (k < count)
        {
            if (++steps > stepBudget)
            {
                complete = false;
                return null;
            }
            int v = order[k];
            if (candidates[k] is null)
            {
                candidates[k] = Candidates(v, neighbours(v), placed, a, b, incident, rootCount);
                choice[k] = 0;
            }
            else
            {
                Undo(v, a, b, incident, placed, ref rootCount);
                choice[k]++;
            }
            if (choice[k] >= candidates[k].Count)
            {
                deepestFail = Math.Max(deepestFail, k);
                candidates[k] = null!;
                k--;
                if (k < 0)
                {
                    failedAt = order[Math.Max(0, deepestFail)];
                    return null;
                }
                continue;
            }
            var (ca, cb) = candidates[k][choice[k]];
            Place(v, ca, cb, a, b, incident, placed, ref rootCount);
            k++;
        }
        return new Root(a, b, rootCount);
    }

    private static List<(int, int)> Candidates(int v, IReadOnlyList<int> nb, bool[] placed, int[] a, int[] b, List<List<int>> incident, int rootCount)
    {
        var s = nb.Where(u => placed[u]).ToHashSet();
        var result = new List<(int, int)>();
        if (s.Count == 0)
        {
            result.Add((rootCount, rootCount + 1)); // a new component: a fresh edge
            return result;
        }
        int u0 = s.First();
        foreach (int end in new[] { a[u0], b[u0] })
        {
            var atEnd = incident[end];
            if (!atEnd.All(s.Contains)) continue; // every placed edge at this endpoint must be a neighbour
            var rest = s.Where(x => !atEnd.Contains(x)).ToList();
            if (rest.Count == 0)
            {
                result.Add((end, rootCount)); // the other endpoint is new
                continue;
            }
            int t = rest[0];
            foreach (int other in new[] { a[t], b[t] })
            {
                if (other == end) continue;
                var atOther = incident[other];
                if (atOther.Count != rest.Count || !rest.All(atOther.Contains)) continue;
                if (atOther.Any(atEnd.Contains)) continue; // an edge (end, other) exists already: no parallel edges
                if (!result.Contains((other, end)) && !result.Contains((end, other))) result.Add((end, other));
            }
        }
        return result;
    }

    private static void Place(int v, int ca, int cb, int[] a, int[] b, List<List<int>> incident, bool[] placed, ref int rootCount)
    {
        while (incident.Count <= Math.Max(ca, cb)) incident.Add([]);
        rootCount = Math.Max(rootCount, Math.Max(ca, cb) + 1);
        a[v] = ca;
        b[v] = cb;
        incident[ca].Add(v);
        incident[cb].Add(v);
        placed[v] = true;
    }

    private static void Undo(int v, int[] a, int[] b, List<List<int>> incident, bool[] placed, ref int rootCount)
    {
        if (!placed[v]) return;
        incident[a[v]].Remove(v);
        incident[b[v]].Remove(v);
        placed[v] = false;
        while (rootCount > 0 && incident[rootCount - 1].Count == 0) rootCount--;
    }
}
