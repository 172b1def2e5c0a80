using System.Numerics;

namespace OpGrowth.Symmetry;

/// <summary>
/// Linear algebra over GF(2) on bit vectors packed in <see cref="ulong"/> words: a row space kept in
/// reduced row-echelon form (one pivot bit per row, cleared from every other row) and its null space.
/// </summary>
internal sealed class Gf2
{
    private readonly int _bits;
    private readonly int _words;
    private readonly List<ulong[]> _rows = [];
    private readonly List<int> _pivots = [];

    /// <summary>An empty row space of vectors with <paramref name="bits"/> bits.</summary>
    public Gf2(int bits)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(bits, 1);
        _bits = bits;
        _words = (bits + 63) >> 6;
    }

    /// <summary>Dimension of the row space.</summary>
    public int Rank => _rows.Count;

    /// <summary>Adds a row (copied); returns false when it was already in the span.</summary>
    public bool Add(ReadOnlySpan<ulong> row)
    {
        if (row.Length != _words) throw new ArgumentException($"Expected {_words} words, got {row.Length}.", nameof(row));
        var v = row.ToArray();
        for (int r = 0; r < _rows.Count; r++)
        {
            int p = _pivots[r];
            if ((v[p >> 6] >> (p & 63) & 1) != 0) Xor(v, _rows[r]);
        }
        int pivot = LowestBit(v);
        if (pivot < 0) return false;
        // keep the form reduced: clear the new pivot from the older rows
        foreach (var other in _rows)
        {
            if ((other[pivot >> 6] >> (pivot & 63) & 1) != 0) Xor(other, v);
        }
        _rows.Add(v);
        _pivots.Add(pivot);
        return true;
    }

    /// <summary>True when <paramref name="v"/> lies in the row space.</summary>
    public bool Contains(ReadOnlySpan<ulong> v)
    {
        var w = v.ToArray();
        for (int r = 0; r < _rows.Count; r++)
        {
            int p = _pivots[r];
            if ((w[p >> 6] >> (p & 63) & 1) != 0) Xor(w, _rows[r]);
        }
        return LowestBit(w) < 0;
    }

    /// <summary>
    /// A basis of the null space {v : row . v = 0 (mod 2) for every row}: one vector per free column f,
    /// with bit f set and, for every row with pivot p, bit p equal to that row's bit f. Columns for which
    /// <paramref name="column"/> is false (padding bits that no row uses) are not taken as free columns.
    /// </summary>
    public List<ulong[]> NullSpace(Func<int, bool>? column = null)
    {
        var isPivot = new bool[_bits];
        foreach (int p in _pivots) isPivot[p] = true;
        var basis = new List<ulong[]>();
        for (int f = 0; f < _bits; f++)
        {
            if (isPivot[f] || (column is not null && !column(f))) continue;
            var v = new ulong[_words];
            v[f >> 6] |= 1UL << (f & 63);
            for (int r = 0; r < _rows.Count; r++)
            {
                if ((_rows[r][f >> 6] >> (f & 63) & 1) != 0)
                {
                    int p = _pivots[r];
                    v[p >> 6] |= 1UL << (p & 63);
                }
            }
            basis.Add(v);
        }
        return basis;
    }

    /// <summary>v ^= w.</summary>
    public static void Xor(Span<ulong> v, ReadOnlySpan<ulong> w)
    {
        for (int i = 0; i < v.Length; i++) v[i] ^= w[i];
    }

    /// <summary>Index of the lowest set bit, or -1.</summary>
    public static int LowestBit(ReadOnlySpan<ulong> v)
    {
        for (int i = 0; i < v.Length; i++)
        {
            if (v[i] != 0) return (i << 6) + BitOperations.TrailingZeroCount(v[i]);
        }
        return -1;
    }
}
