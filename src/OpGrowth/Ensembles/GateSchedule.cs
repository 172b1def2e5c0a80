namespace OpGrowth.Ensembles;

/// <summary>
/// Where the gates of each layer act. Brickwork: a proper edge colouring of the lattice (every colour class a
/// set of bonds with no shared qubit), cycled layer by layer. Random pairs: a fresh random matching per layer,
/// drawn from the sample's own stream. Pairs are written as flat (a, b) lists into caller-owned scratch arrays,
/// so no layer allocates.
/// </summary>
internal sealed class GateSchedule
{
    private readonly int _n;
    private readonly int[][] _classes = [];
    private readonly int[] _edges = [];
    private readonly bool _allToAll;

    /// <summary>True for the open-chain brickwork, whose gates the sampler visits only around the string's support.</summary>
    public bool IsChainBrickwork { get; }

    /// <summary>Largest number of pair entries (2 per gate) a layer can have.</summary>
    public int MaxPairEntries { get; }

    public GateSchedule(Circuit circuit)
    {
        _n = circuit.N;
        var lattice = circuit.Lattice;
        if (circuit.Layout == CircuitLayout.Brickwork)
        {
            if (lattice is null) throw new ArgumentException("a brickwork layout needs a lattice with bonds; an all-to-all circuit uses random pairs", nameof(circuit));
            _classes = Colour(lattice);
            IsChainBrickwork = lattice.Kind == "chain";
            MaxPairEntries = _classes.Max(c => c.Length);
        }
        else if (lattice is null || lattice.Kind == "all-to-all")
        {
            _allToAll = true;
            MaxPairEntries = 2 * (_n / 2);
        }
        else
        {
            _edges = lattice.Edges.SelectMany(e => new[] { e.A, e.B }).ToArray();
            MaxPairEntries = 2 * (_n / 2);
        }
    }

    /// <summary>Number of colour classes of the brickwork (layers per period).</summary>
    public int Period => _classes.Length;

    /// <summary>The bonds of brickwork layer <paramref name="layer"/> (1-based).</summary>
    public int[] BrickworkClass(int layer) => _classes[(layer - 1) % _classes.Length];

    /// <summary>
    /// Writes the pairs of a random-pairs layer into <paramref name="pairs"/> and returns the number of entries;
    /// <paramref name="scratch"/> has at least max(N, bonds) entries, <paramref name="stamp"/> N entries.
    /// </summary>
    public int RandomLayer(ref SampleRandom rng, int[] pairs, int[] scratch, int[] stamp, int layerStamp)
    {
        if (_allToAll)
        {
            // Fisher-Yates shuffle of 0..N-1, then consecutive pairs: a uniformly random pairing.
            for (int i = 0; i < _n; i++) scratch[i] = i;
            for (int i = _n - 1; i > 0; i--)
            {
                int j = rng.NextInt(i + 1);
                (scratch[i], scratch[j]) = (scratch[j], scratch[i]);
            }
            int m = 2 * (_n / 2);
            Array.Copy(scratch, pairs, m);
            return m;
        }
        // Random maximal matching: bonds in random order, each taken when both ends are still free.
        int e = _edges.Length / 2;
        for (int i = 0; i < e; i++) scratch[i] = i;
        int count = 0;
        for (int i = e - 1; i >= 0; i--)
        {
            int k = rng.NextInt(i + 1);
            (scratch[i], scratch[k]) = (scratch[k], scratch[i]);
            int edge = scratch[i];
            int a = _edges[2 * edge], b = _edges[2 * edge + 1];
            if (stamp[a] == layerStamp || stamp[b] == layerStamp) continue;
            stamp[a] = layerStamp;
            stamp[b] = layerStamp;
            pairs[count++] = a;
            pairs[count++] = b;
        }
        return count;
    }

    /// <summary>Scratch entries <see cref="RandomLayer"/> needs.</summary>
    public int ScratchLength => Math.Max(_n, _edges.Length / 2);

    /// <summary>
    /// A proper edge colouring: for a chain or ring the even and odd bonds (a third class for an odd ring), for a
    /// square lattice rows and columns by parity, otherwise greedy in bond order; each class lists (a, b) flat.
    /// </summary>
    internal static int[][] Colour(OpGrowth.Models.Lattice lattice)
    {
        var edges = lattice.Edges;
        var colour = new int[edges.Count];
        bool structured = true;
        for (int i = 0; i < edges.Count; i++)
        {
            var (a, b) = edges[i];
            int lo = Math.Min(a, b), hi = Math.Max(a, b);
            colour[i] = lattice.Kind switch
            {
                "chain" => lo % 2,
                "ring" => hi - lo == 1 ? lo % 2 : (lattice.N % 2 == 0 ? 1 : 2),
                "square" => SquareColour(lattice, a, b),
                _ => -1,
            };
            if (colour[i] < 0) structured = false;
        }
        if (!structured || !IsProper(lattice.N, edges, colour)) Greedy(lattice.N, edges, colour);
        int classes = edges.Count == 0 ? 0 : colour.Max() + 1;
        var lists = Enumerable.Range(0, classes).Select(_ => new List<int>()).ToArray();
        for (int i = 0; i < edges.Count; i++)
        {
            lists[colour[i]].Add(edges[i].A);
            lists[colour[i]].Add(edges[i].B);
        }
        return lists.Where(l => l.Count > 0).Select(l => l.ToArray()).ToArray();
    }

    private static int SquareColour(OpGrowth.Models.Lattice l, int a, int b)
    {
        var (xa, ya) = l.Coordinate(a);
        var (xb, yb) = l.Coordinate(b);
        if (ya == yb) return Math.Min(xa, xb) == 0 && Math.Max(xa, xb) == l.Width - 1 && l.Width > 2 ? (l.Width - 1) % 2 : Math.Min(xa, xb) % 2;
        return 2 + (Math.Min(ya, yb) == 0 && Math.Max(ya, yb) == l.Height - 1 && l.Height > 2 ? (l.Height - 1) % 2 : Math.Min(ya, yb) % 2);
    }

    private static bool IsProper(int n, IReadOnlyList<(int A, int B)> edges, int[] colour)
    {
        var seen = new HashSet<(int Site, int Colour)>();
        for (int i = 0; i < edges.Count; i++)
        {
            if (!seen.Add((edges[i].A, colour[i])) || !seen.Add((edges[i].B, colour[i]))) return false;
        }
        return n >= 0;
    }

    private static void Greedy(int n, IReadOnlyList<(int A, int B)> edges, int[] colour)
    {
        var used = new List<HashSet<int>>(); // per colour: sites taken
        for (int i = 0; i < edges.Count; i++)
        {
            var (a, b) = edges[i];
            int c = 0;
            while (c < used.Count && (used[c].Contains(a) || used[c].Contains(b))) c++;
            if (c == used.Count) used.Add([]);
            used[c].Add(a);
            used[c].Add(b);
            colour[i] = c;
        }
        _ = n;
    }
}
