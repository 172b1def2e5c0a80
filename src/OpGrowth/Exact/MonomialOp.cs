using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// A unitary that maps every computational basis state to a phase times a basis state: a site permutation
/// followed by a Pauli string, g = i^Phase P(x, z) pi. Site permutations, Pauli strings and their products
/// are all of this form, so a group of symmetries built from them can be resolved into sectors
/// (<see cref="SectorSpace"/>).
/// </summary>
/// <remarks>
/// Basis convention of this class and of <see cref="SectorSpace"/>: bit j of a basis index is site j
/// (1 = Z eigenvalue -1). The permutation moves bit j to bit Perm[j]; then
/// P(x, z) |c&gt; = i^{|x &amp; z|} (-1)^{|z &amp; c|} |c ^ x&gt; (the Hermitian string convention of
/// <see cref="PauliString"/>). Composition: (P2 pi2)(P1 pi1) = (P2 pi2(P1)) (pi2 pi1), whose phase is worked
/// out in <see cref="Then"/>. At most 30 sites.
/// </remarks>
public sealed class MonomialOp : IEquatable<MonomialOp>
{
    private readonly int[] _perm;
    private readonly int[][] _tables; // byte tables of the permutation, 8 sites per table

    /// <summary>Site permutation (site j goes to Perm[j]).</summary>
    public IReadOnlyList<int> Perm => _perm;

    /// <summary>X bits of the Pauli part (site bits).</summary>
    public ulong X { get; }

    /// <summary>Z bits of the Pauli part (site bits).</summary>
    public ulong Z { get; }

    /// <summary>Extra phase power: the operator carries i^Phase besides the Hermitian string's own phase.</summary>
    public int Phase { get; }

    /// <summary>Number of sites.</summary>
    public int N => _perm.Length;

    /// <summary>True when the permutation is the identity.</summary>
    public bool PermIsIdentity { get; }

    private MonomialOp(int[] perm, ulong x, ulong z, int phase)
    {
        _perm = perm;
        X = x;
        Z = z;
        Phase = phase & 3;
        PermIsIdentity = perm.Select((p, j) => p == j).All(b => b);
        _tables = BuildTables(perm);
    }

    /// <summary>The identity on n sites.</summary>
    public static MonomialOp Identity(int n) => new(Enumerable.Range(0, Check(n)).ToArray(), 0, 0, 0);

    /// <summary>A site permutation (site j -&gt; map[j]).</summary>
    public static MonomialOp OfPermutation(IReadOnlyList<int> map)
    {
        ArgumentNullException.ThrowIfNull(map);
        Check(map.Count);
        var seen = new bool[map.Count];
        foreach (int j in map)
        {
            if (j < 0 || j >= map.Count || seen[j]) throw new ArgumentException("Not a permutation of the sites.", nameof(map));
            seen[j] = true;
        }
        return new MonomialOp([.. map], 0, 0, 0);
    }

    /// <summary>A Hermitian Pauli string.</summary>
    public static MonomialOp OfString(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        Check(s.N);
        return new MonomialOp(Enumerable.Range(0, s.N).ToArray(), s.X[0], s.Z[0], 0);
    }

    /// <summary>True for the identity operator (no permutation, no string, no phase).</summary>
    public bool IsIdentity => PermIsIdentity && X == 0 && Z == 0 && Phase == 0;

    /// <summary>True when the operator is a multiple of the identity (possibly with a phase).</summary>
    public bool IsScalar => PermIsIdentity && X == 0 && Z == 0;

    /// <summary>True when the matrix is real: the total phase power i^(Phase + |x &amp; z|) is real.</summary>
    public bool IsReal => ((Phase + BitOperations.PopCount(X & Z)) & 1) == 0;

    /// <summary>Moves the bits of a basis index by the permutation.</summary>
    public int PermuteIndex(int s)
    {
        if (PermIsIdentity) return s;
        int r = 0;
        for (int c = 0; c < _tables.Length; c++) r |= _tables[c][(s >> (8 * c)) & 0xFF];
        return r;
    }

    /// <summary>Moves site bits of a mask by the permutation.</summary>
    public ulong PermuteMask(ulong m) => PermIsIdentity ? m : (ulong)(uint)PermuteIndex((int)m);

    /// <summary>g|s&gt; = i^(phase power) |target&gt;: returns the target and the phase power (0..3).</summary>
    public (int Target, int PhasePower) Apply(int s)
    {
        int c = PermuteIndex(s);
        int p = Phase + BitOperations.PopCount(X & Z) + 2 * BitOperations.PopCount(Z & (ulong)(uint)c);
        return (c ^ (int)X, p & 3);
    }

    /// <summary>This operator after <paramref name="first"/>: (this)(first).</summary>
    public MonomialOp Then(MonomialOp first) => Compose(this, first);

    /// <summary>g2 g1 for g = i^p P(x, z) pi.</summary>
    public static MonomialOp Compose(MonomialOp g2, MonomialOp g1)
    {
        ArgumentNullException.ThrowIfNull(g2);
        ArgumentNullException.ThrowIfNull(g1);
        if (g1.N != g2.N) throw new ArgumentException("Different numbers of sites.", nameof(g1));
        var perm = g1._perm.Select(j => g2._perm[j]).ToArray();
        ulong x1 = g2.PermuteMask(g1.X), z1 = g2.PermuteMask(g1.Z); // pi2 P1 pi2^-1 = P(pi2 x1, pi2 z1)
        ulong x = x1 ^ g2.X, z = z1 ^ g2.Z;
        // P2 P1' = i^{|x2&z2|} X^x2 Z^z2 i^{|x1&z1|} X^x1 Z^z1 = i^{..} (-1)^{|z2 & x1|} X^x Z^z
        int p = g1.Phase + g2.Phase + BitOperations.PopCount(g1.X & g1.Z) + BitOperations.PopCount(g2.X & g2.Z)
            + 2 * BitOperations.PopCount(g2.Z & x1) - BitOperations.PopCount(x & z);
        return new MonomialOp(perm, x, z, ((p % 4) + 4) % 4);
    }

    /// <summary>The smallest k &gt;= 1 with g^k a multiple of the identity, and that multiple's phase power.</summary>
    public (int Order, int ScalarPhase) Order(int limit = 4096)
    {
        var g = this;
        for (int k = 1; k <= limit; k++)
        {
            if (g.IsScalar) return (k, g.Phase);
            g = Compose(this, g);
        }
        throw new InvalidOperationException("Order exceeds the limit.");
    }

    /// <inheritdoc/>
    public bool Equals(MonomialOp? other) => other is not null && X == other.X && Z == other.Z && Phase == other.Phase && _perm.AsSpan().SequenceEqual(other._perm);

    /// <inheritdoc/>
    public override bool Equals(object? obj) => obj is MonomialOp m && Equals(m);

    /// <inheritdoc/>
    public override int GetHashCode()
    {
        var h = new HashCode();
        h.Add(X);
        h.Add(Z);
        h.Add(Phase);
        foreach (int p in _perm) h.Add(p);
        return h.ToHashCode();
    }

    private static int Check(int n)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(n, 30);
        return n;
    }

    private static int[][] BuildTables(int[] perm)
    {
        int n = perm.Length;
        int chunks = (n + 7) / 8;
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
                    if (j < n && (v >> b & 1) != 0) r |= 1 << perm[j];
                }
                t[c][v] = r;
            }
        }
        return t;
    }
}
