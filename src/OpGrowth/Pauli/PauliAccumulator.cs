using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>
/// Sums (string, coefficient) contributions. The table is split into 2^bits partitions by the
/// top bits of the string's hash; each partition is an open-addressing index (linear probing,
/// load &lt;= 1/2) over dense key/value arrays in insertion order. Partitions let threads merge
/// without locks (each partition has one owner) and keep each table small enough for cache.
/// Memory while accumulating: sizeof(T) + 8 bytes dense, plus 8 to 16 bytes of index per string.
/// </summary>
public sealed class PauliAccumulator<T> where T : unmanaged, IPauliKey<T>
{
    internal readonly Partition[] Parts;
    internal readonly int Shift;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>log2 of the partition count.</summary>
    public int PartitionBits { get; }

    /// <summary>Creates an accumulator with 2^<paramref name="partitionBits"/> partitions.</summary>
    public PauliAccumulator(int n, int partitionBits)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(partitionBits, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(partitionBits, 16);
        N = n;
        PartitionBits = partitionBits;
        Shift = 64 - partitionBits;
        Parts = new Partition[1 << partitionBits];
        for (int i = 0; i < Parts.Length; i++) Parts[i] = new Partition();
    }

    /// <summary>
    /// Partition bits for an expected number of distinct strings: aims at about 4096 strings per
    /// partition (a table of ~100 KiB, L2-resident). Depends only on the size, never on thread count,
    /// so results are bit-identical at any thread count.
    /// </summary>
    public static int BitsFor(long expectedStrings)
    {
        int bits = 0;
        while (bits < 14 && (expectedStrings >> bits) > 4096) bits++;
        return Math.Max(bits, 4);
    }

    /// <summary>Number of distinct strings so far.</summary>
    public long Count
    {
        get
        {
            long c = 0;
            foreach (var p in Parts) c += p.Count;
            return c;
        }
    }

    /// <summary>Adds one contribution.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Add(in T key, double value)
    {
        ulong h = key.Hash64;
        Parts[(int)(h >> Shift)].Add(key, value, h);
    }

    /// <summary>Adds a scaled operator: this += a * O.</summary>
    public void AddScaled(PauliOperator<T> o, double a)
    {
        var k = o.Keys;
        var c = o.Coefficients;
        for (int i = 0; i < k.Length; i++) Add(k[i], a * c[i]);
    }

    /// <summary>Bytes currently held (dense arrays and indexes).</summary>
    public long AllocatedBytes
    {
        get
        {
            long b = 0;
            foreach (var p in Parts) b += p.AllocatedBytes;
            return b;
        }
    }

    /// <summary>
    /// Compacts into an operator (partition order, insertion order within a partition), dropping
    /// strings whose coefficients cancelled to exactly zero. The accumulator is cleared.
    /// </summary>
    public PauliOperator<T> ToOperator()
    {
        long total = 0;
        foreach (var p in Parts)
        {
            for (int i = 0; i < p.Count; i++) if (p.Vals[i] != 0) total++;
        }
        if (total > Array.MaxLength) throw new InsufficientMemoryException($"{total} strings exceed one array's capacity.");
        var keys = GC.AllocateUninitializedArray<T>((int)total);
        var vals = GC.AllocateUninitializedArray<double>((int)total);
        int w = 0;
        foreach (var p in Parts)
        {
            for (int i = 0; i < p.Count; i++)
            {
                if (p.Vals[i] == 0) continue;
                keys[w] = p.Keys[i];
                vals[w] = p.Vals[i];
                w++;
            }
            p.Release();
        }
        return new PauliOperator<T>(N, keys, vals, w);
    }

    /// <summary>One partition: dense arrays plus an open-addressing index.</summary>
    internal sealed class Partition
    {
        public T[] Keys = [];
        public double[] Vals = [];
        public int Count;
        private int[] _slots = new int[16];
        private int _mask = 15;

        public long AllocatedBytes => (long)Keys.Length * Unsafe.SizeOf<T>() + (long)Vals.Length * 8 + (long)_slots.Length * 4;

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Add(in T key, double value, ulong h)
        {
            int[] slots = _slots;
            int mask = _mask;
            int i = (int)h & mask;
            while (true)
            {
                int s = slots[i];
                if (s == 0) break;
                if (Keys[s - 1].Equals(key))
                {
                    Vals[s - 1] += value;
                    return;
                }
                i = (i + 1) & mask;
            }
            Insert(key, value, i);
        }

        private void Insert(in T key, double value, int slot)
        {
            if (Count == Keys.Length)
            {
                int cap = Math.Max(16, Keys.Length * 2);
                Array.Resize(ref Keys, cap);
                Array.Resize(ref Vals, cap);
            }
            Keys[Count] = key;
            Vals[Count] = value;
            _slots[slot] = ++Count;
            if (2 * Count > _mask + 1) Rehash((_mask + 1) * 2);
        }

        private void Rehash(int size)
        {
            var slots = new int[size];
            int mask = size - 1;
            for (int e = 0; e < Count; e++)
            {
                int i = (int)Keys[e].Hash64 & mask;
                while (slots[i] != 0) i = (i + 1) & mask;
                slots[i] = e + 1;
            }
            _slots = slots;
            _mask = mask;
        }

        public void Release()
        {
            Keys = [];
            Vals = [];
            Count = 0;
            _slots = new int[16];
            _mask = 15;
        }
    }
}
