using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// A permutation of the sites, site j -&gt; <see cref="Map"/>[j], acting on computational basis states by
/// moving bit j to bit Map[j], and on Pauli strings by moving the letter on j to Map[j]. Used for the
/// spatial symmetries (reflections, lattice mirrors) resolved by <see cref="SymmetrySector"/>.
/// </summary>
public sealed class SitePermutation
{
    private readonly int[] _map;
    private int[][]? _tables;

    /// <summary>A permutation named <paramref name="name"/> with site j -&gt; map[j].</summary>
    public SitePermutation(string name, IReadOnlyList<int> map)
    {
        ArgumentNullException.ThrowIfNull(name);
        ArgumentNullException.ThrowIfNull(map);
        var seen = new bool[map.Count];
        foreach (int j in map)
        {
            if (j < 0 || j >= map.Count || seen[j]) throw new ArgumentException("Not a permutation of the sites.", nameof(map));
            seen[j] = true;
        }
        Name = name;
        _map = [.. map];
    }

    /// <summary>Name used in reports ("reflection", "mirror-x", "mirror-y", "diagonal", ...).</summary>
    public string Name { get; }

    /// <summary>Number of sites.</summary>
    public int N => _map.Length;

    /// <summary>Image of each site.</summary>
    public IReadOnlyList<int> Map => _map;

    /// <summary>True when every site is fixed.</summary>
    public bool IsIdentity => _map.Select((m, j) => m == j).All(b => b);

    /// <summary>True when applying it twice gives the identity.</summary>
    public bool IsInvolution => _map.Select((m, j) => _map[m] == j).All(b => b);

    /// <summary>The site reversal j -&gt; N-1-j of a chain (the 180-degree rotation of a row-major rectangle).</summary>
    public static SitePermutation Reversal(int n)
        => new("reflection", Enumerable.Range(0, n).Select(j => n - 1 - j).ToArray());

    /// <summary>
    /// Candidate point-group involutions of an Lx x Ly rectangle with row-major sites j = y Lx + x:
    /// mirror x (x -&gt; Lx-1-x), mirror y (y -&gt; Ly-1-y) and the 180-degree rotation (both; equal to the
    /// chain reversal), each left out when it is the identity. The diagonal mirror of a square is
    /// <see cref="RectangleDiagonal"/>.
    /// </summary>
    public static IReadOnlyList<SitePermutation> RectangleMirrors(int lx, int ly)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(lx, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(ly, 1);
        int n = lx * ly;
        var mx = new int[n];
        var my = new int[n];
        for (int y = 0; y < ly; y++)
        {
            for (int x = 0; x < lx; x++)
            {
                mx[y * lx + x] = y * lx + (lx - 1 - x);
                my[y * lx + x] = (ly - 1 - y) * lx + x;
            }
        }
        var list = new List<SitePermutation> { new("mirror-x", mx), new("mirror-y", my), Reversal(n) };
        return list.Where(p => !p.IsIdentity).ToArray();
    }

    /// <summary>The diagonal mirror (x, y) -&gt; (y, x) of an L x L square (row-major sites), or null when Lx != Ly.</summary>
    public static SitePermutation? RectangleDiagonal(int lx, int ly)
    {
        if (lx != ly || lx < 2) return null;
        var d = new int[lx * ly];
        for (int y = 0; y < ly; y++) for (int x = 0; x < lx; x++) d[y * lx + x] = x * lx + y;
        return new SitePermutation("diagonal", d);
    }

    /// <summary>This permutation after <paramref name="first"/>: site j -&gt; this(first(j)).</summary>
    public SitePermutation After(SitePermutation first)
    {
        ArgumentNullException.ThrowIfNull(first);
        if (first.N != N) throw new ArgumentException("Different numbers of sites.", nameof(first));
        return new SitePermutation($"{Name}*{first.Name}", first._map.Select(j => _map[j]).ToArray());
    }

    /// <summary>Same site map.</summary>
    public bool SameMap(SitePermutation other) => other is not null && other._map.AsSpan().SequenceEqual(_map);

    /// <summary>True when the two permutations commute.</summary>
    public bool CommutesWith(SitePermutation other) => After(other).SameMap(other.After(this));

    /// <summary>The image of a Pauli string (letter on j moved to Map[j]).</summary>
    public PauliString Apply(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        if (s.N != N) throw new ArgumentException($"String on {s.N} qubits, permutation on {N}.", nameof(s));
        var b = new PauliString.Builder(N);
        for (int j = 0; j < N; j++) b.Set(_map[j], s[j]);
        return b.Build();
    }

    /// <summary>
    /// True when the permutation maps H onto itself: every term goes to a term with the same coefficient
    /// (relative tolerance 1e-12 of the summed |coefficients|: rounding, common practice).
    /// </summary>
    public bool IsSymmetryOf(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (h.N != N) return false;
        var map = new Dictionary<PauliString, double>();
        foreach (var t in h.Terms) map[t.String] = map.GetValueOrDefault(t.String) + t.Coefficient;
        double scale = h.Terms.Sum(t => Math.Abs(t.Coefficient)) + 1e-300;
        foreach (var (s, c) in map)
        {
            if (!map.TryGetValue(Apply(s), out double c2) || Math.Abs(c - c2) > 1e-12 * scale) return false;
        }
        return true;
    }

    /// <summary>The image of a basis-state index (bit j moved to bit Map[j]); N &lt;= 30.</summary>
    public int ApplyToIndex(int s)
    {
        var t = _tables ??= BuildTables();
        int r = 0;
        for (int c = 0; c < t.Length; c++) r |= t[c][(s >> (8 * c)) & 0xFF];
        return r;
    }

    private int[][] BuildTables()
    {
        int chunks = (N + 7) / 8;
        var t = new int[chunks][];
        for (int c = 0; c < chunks; c++)
        {
            t[c] = new int[256];
            for (int v = 0; v < 256; v++)
            {
                int r = 0;
                for (int b = 0; b < 8; b++)
                {
                    int j = 8 * c + b;
                    if (j < N && (v >> b & 1) != 0) r |= 1 << _map[j];
                }
                t[c][v] = r;
            }
        }
        return t;
    }

    /// <inheritdoc/>
    public override string ToString() => Name;
}
