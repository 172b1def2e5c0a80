using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics.X86;

namespace OpGrowth.Pauli;

/// <summary>
/// Sums (string, coefficient) contributions. The table is split into 2^bits partitions by the
/// top bits of the string's hash; each partition is an open-addressing table (linear probing,
/// load &lt;= 0.7) of (key, value) pairs stored inline, so a lookup costs one cache miss, and the
/// merge prefetches the home slot of entries a few places ahead. The all-zero key marks an empty
/// slot; the identity string is summed in a separate field. Partitions let threads merge without
/// locks (each partition has one owner) and keep each table small.
/// Memory while accumulating: (sizeof(T) + 8) / load, i.e. 34 to 69 bytes per string for N &lt;= 64.
/// </summary>
public sealed class PauliAccumulator<T> where T : unmanaged, IPauliKey<T>
{
    internal readonly Partition[] Parts;
    internal readonly int Shift;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>log2 of the partition count.</summary>
    public int PartitionBits { get; }

    /// <summary>Creates an accumulator with 2^<paramref name="partitionBits"/> partitions, presized for <paramref name="expectedStrings"/>.</summary>
    public PauliAccumulator(int n, int partitionBits, long expectedStrings = 0)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(partitionBits, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(partitionBits, 16);
        N = n;
        PartitionBits = partitionBits;
        Shift = 64 - partitionBits;
        Parts = new Partition[1 << partitionBits];
        long perPart = expectedStrings >> partitionBits;
        int cap = 16;
        while (cap < 1 << 28 && cap * 0.7 < perPart) cap <<= 1;
        for (int i = 0; i < Parts.Length; i++) Parts[i] = new Partition(cap);
    }

    /// <summary>
    /// Partition bits for an expected number of distinct strings: aims at about 2048 strings per
    /// partition. Depends only on the size, never on the thread count, so results are
    /// bit-identical at any thread count.
    /// </summary>
    public static int BitsFor(long expectedStrings)
    {
        int bits = 0;
        while (bits < 14 && (expectedStrings >> bits) > 2048) bits++;
        return Math.Max(bits, 4);
    }

    /// <summary>An accumulator sized for an expected number of distinct strings.</summary>
    public static PauliAccumulator<T> For(int n, long expectedStrings) => new(n, BitsFor(expectedStrings), expectedStrings);

    /// <summary>Number of distinct strings so far (including cancelled ones not yet compacted).</summary>
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

    /// <summary>Bytes currently held by the tables.</summary>
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
    /// Compacts into an operator (partition order, slot order within a partition; deterministic),
    /// dropping strings whose coefficients cancelled to exactly zero. The accumulator is cleared.
    /// With <paramref name="threads"/> &gt; 1 the partitions are counted and copied in parallel (each to
    /// its own precomputed offset, so the result is the same at any thread count).
    /// </summary>
    public PauliOperator<T> ToOperator(int threads = 1)
    {
        var counts = new int[Parts.Length];
        var options = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, threads) };
        bool parallel = threads > 1 && Parts.Length >= 16;
        if (parallel) Parallel.For(0, Parts.Length, options, i => counts[i] = Parts[i].CountNonZero());
        else for (int i = 0; i < Parts.Length; i++) counts[i] = Parts[i].CountNonZero();
        long total = 0;
        var offsets = new int[Parts.Length];
        for (int i = 0; i < Parts.Length; i++)
        {
            if (total + counts[i] > Array.MaxLength) throw new InsufficientMemoryException($"More than {Array.MaxLength} strings exceed one array's capacity.");
            offsets[i] = (int)total;
            total += counts[i];
        }
        var keys = GC.AllocateUninitializedArray<T>((int)total);
        var vals = GC.AllocateUninitializedArray<double>((int)total);
        if (parallel)
        {
            Parallel.For(0, Parts.Length, options, i =>
            {
                Parts[i].CopyTo(keys, vals, offsets[i]);
                Parts[i].Release();
            });
        }
        else
        {
            for (int i = 0; i < Parts.Length; i++)
            {
                Parts[i].CopyTo(keys, vals, offsets[i]);
                Parts[i].Release();
            }
        }
        return new PauliOperator<T>(N, keys, vals, (int)total);
    }

    /// <summary>A (key, value) slot; the all-zero key means empty.</summary>
    internal struct Slot
    {
        public T Key;
        public double Value;
    }

    /// <summary>One partition: an inline open-addressing table plus the identity's coefficient.</summary>
    internal sealed class Partition
    {
        private Slot[] _table;
        private int _mask;
        private int _limit;
        private bool _hasIdentity;
        private double _identity;

        public int Count;

        public Partition(int capacity)
        {
            _table = new Slot[capacity];
            _mask = capacity - 1;
            _limit = (int)(capacity * 0.7);
        }

        public long AllocatedBytes => (long)_table.Length * Unsafe.SizeOf<Slot>();

        /// <summary>Hints the CPU to fetch the home slot of a hash that will be added soon.</summary>
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public unsafe void Prefetch(ulong h)
        {
            if (Sse.IsSupported)
            {
                fixed (Slot* p = &_table[(int)h & _mask]) Sse.Prefetch0(p);
            }
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Add(in T key, double value, ulong h)
        {
            var table = _table;
            int mask = _mask;
            int i = (int)h & mask;
            while (true)
            {
                ref Slot s = ref table[i];
                // Empty test first: the identity (all-zero key) must never match an empty slot.
                if (s.Key.Equals(default))
                {
                    Insert(key, value, i);
                    return;
                }
                if (s.Key.Equals(key))
                {
                    s.Value += value;
                    return;
                }
                i = (i + 1) & mask;
            }
        }

        private void Insert(in T key, double value, int i)
        {
            if (key.Equals(default))
            {
                // Only reached for the identity: the all-zero key is the empty marker.
                if (!_hasIdentity) Count++;
                _hasIdentity = true;
                _identity += value;
                return;
            }
            _table[i].Key = key;
            _table[i].Value = value;
            if (++Count > _limit) Grow();
        }

        private void Grow()
        {
            var old = _table;
            var table = new Slot[old.Length * 2];
            int mask = table.Length - 1;
            foreach (ref readonly var s in old.AsSpan())
            {
                if (s.Key.Equals(default)) continue;
                int i = (int)s.Key.Hash64 & mask;
                while (!table[i].Key.Equals(default)) i = (i + 1) & mask;
                table[i] = s;
            }
            _table = table;
            _mask = mask;
            _limit = (int)(table.Length * 0.7);
        }

        public int CountNonZero()
        {
            int c = _hasIdentity && _identity != 0 ? 1 : 0;
            foreach (ref readonly var s in _table.AsSpan())
            {
                if (s.Value != 0 && !s.Key.Equals(default)) c++;
            }
            return c;
        }

        public int CopyTo(T[] keys, double[] vals, int w)
        {
            if (_hasIdentity && _identity != 0)
            {
                keys[w] = default;
                vals[w] = _identity;
                w++;
            }
            foreach (ref readonly var s in _table.AsSpan())
            {
                if (s.Value == 0 || s.Key.Equals(default)) continue;
                keys[w] = s.Key;
                vals[w] = s.Value;
                w++;
            }
            return w;
        }

        public void Release()
        {
            _table = new Slot[16];
            _mask = 15;
            _limit = 11;
            Count = 0;
            _hasIdentity = false;
            _identity = 0;
        }
    }
}
