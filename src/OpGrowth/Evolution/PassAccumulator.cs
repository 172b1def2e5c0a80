using System.Numerics;
using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// The evolution engine's accumulator: the same partitioned open-addressing design as
/// <see cref="PauliAccumulator{T}"/> (partition = top hash bits, linear probing at load &lt;= 1/2,
/// dense key/value arrays in insertion order), but <see cref="Clear"/> keeps every array, so a run
/// that applies thousands of passes allocates only while its operator is still growing. This is
/// what makes the memory of a run predictable (the budget check reads <see cref="AllocatedBytes"/>)
/// and keeps the garbage collector out of the step loop.
/// </summary>
internal sealed class PassAccumulator<T> where T : unmanaged, IPauliKey<T>
{
    internal readonly Part[] Parts;

    /// <summary>log2 of the partition count.</summary>
    public int PartitionBits { get; }

    internal readonly int Shift;

    /// <param name="partitionBits">log2 of the partition count.</param>
    /// <param name="expectedCount">
    /// Distinct strings expected (0: unknown). The partitions are presized for it, so an accumulator made for an
    /// operator of known size does not reach that size through a series of resized arrays (garbage that the
    /// collector may hold for a while). Capacity only: no result depends on it.
    /// </param>
    public PassAccumulator(int partitionBits, long expectedCount = 0)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(partitionBits, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(partitionBits, 16);
        ArgumentOutOfRangeException.ThrowIfNegative(expectedCount);
        PartitionBits = partitionBits;
        Shift = 64 - partitionBits;
        Parts = new Part[1 << partitionBits];
        int perPart = (int)Math.Min(1 << 26, Math.Max(16, expectedCount >> partitionBits));
        for (int i = 0; i < Parts.Length; i++) Parts[i] = new Part(perPart);
    }

    /// <summary>Distinct strings held.</summary>
    public long Count
    {
        get
        {
            long c = 0;
            foreach (var p in Parts) c += p.Count;
            return c;
        }
    }

    /// <summary>Bytes held by the arrays (capacity).</summary>
    public long AllocatedBytes
    {
        get
        {
            long b = 0;
            foreach (var p in Parts) b += p.AllocatedBytes;
            return b;
        }
    }

    /// <summary>Bytes one stored entry costs at worst: key + value at array capacity up to 1.25 times the count, plus 4 slots of 4 bytes.</summary>
    public static int WorstBytesPerEntry => (5 * Unsafe.SizeOf<Entry>() + 3) / 4 + 16;

    /// <summary>Forgets the content, keeps the capacity.</summary>
    public void Clear()
    {
        foreach (var p in Parts) p.Clear();
    }

    /// <summary>Adds one contribution.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Add(in T key, double value)
    {
        ulong h = key.Hash64;
        Parts[(int)(h >> Shift)].Add(key, value, h);
    }

    /// <summary>this += a * O.</summary>
    public void AddScaled(PauliOperator<T> o, double a)
    {
        var k = o.Keys;
        var c = o.Coefficients;
        for (int i = 0; i < k.Length; i++) Add(k[i], a * c[i]);
    }

    /// <summary>Partition bits for an expected number of strings: about 4096 strings per partition (L2-sized tables).</summary>
    public static int BitsFor(long expectedStrings)
    {
        int bits = 4;
        while (bits < 16 && (expectedStrings >> bits) > 4096) bits++;
        return bits;
    }

    /// <summary>A key and its accumulated value, stored together (one cache line touched per update).</summary>
    internal struct Entry
    {
        public T Key;
        public double Val;
    }

    internal sealed class Part
    {
        public Entry[] Entries;
        public int Count;
        private int[] _slots;
        private int _mask;

        public Part(int capacity = 16)
        {
            Entries = new Entry[capacity];
            int slots = (int)BitOperations.RoundUpToPowerOf2((uint)(2 * capacity));
            _slots = new int[slots];
            _mask = slots - 1;
        }

        public long AllocatedBytes => (long)Entries.Length * Unsafe.SizeOf<Entry>() + (long)_slots.Length * 4;

        public void Clear()
        {
            if (Count == 0) return;
            Array.Clear(_slots);
            Count = 0;
        }

        /// <summary>Hints the cache line of the slot a hash probes first.</summary>
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public unsafe void Prefetch(ulong h)
        {
            if (System.Runtime.Intrinsics.X86.Sse.IsSupported)
            {
                fixed (int* p = &_slots[(int)h & _mask]) System.Runtime.Intrinsics.X86.Sse.Prefetch0(p);
            }
        }

        /// <summary>
        /// Hints the cache line of the entry the first probed slot points to (call after <see cref="Prefetch"/>
        /// had time to bring the slot in). The second half of a two-stage prefetch: without it every update of
        /// a table that is not cache-resident waits for the entry's line after the slot's.
        /// </summary>
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public unsafe void PrefetchEntry(ulong h)
        {
            if (System.Runtime.Intrinsics.X86.Sse.IsSupported)
            {
                int s = _slots[(int)h & _mask];
                var entries = Entries;
                if ((uint)(s - 1) < (uint)entries.Length)
                {
                    fixed (Entry* p = &entries[s - 1]) System.Runtime.Intrinsics.X86.Sse.Prefetch0(p);
                }
            }
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Add(in T key, double value, ulong h)
        {
            int[] slots = _slots;
            int mask = _mask;
            Entry[] entries = Entries;
            int i = (int)h & mask;
            while (true)
            {
                int s = slots[i];
                if (s == 0) break;
                ref Entry e = ref entries[s - 1];
                if (e.Key.Equals(key))
                {
                    e.Val += value;
                    return;
                }
                i = (i + 1) & mask;
            }
            Insert(key, value, i);
        }

        private void Insert(in T key, double value, int slot)
        {
            if (Count == Entries.Length) Grow();
            ref Entry e = ref Entries[Count];
            e.Key = key;
            e.Val = value;
            _slots[slot] = ++Count;
            if (2 * Count > _mask + 1) Rehash((_mask + 1) * 2);
        }

        /// <summary>
        /// Grows the entry array by a quarter (not by doubling): the arrays are kept across passes, so their
        /// capacity is the largest image a partition has held plus at most 25% (doubling left up to 100%, on
        /// average about 40%, of the largest memory item of a pass unused). Partition and insertion order, and
        /// with them all results, do not depend on the capacity.
        /// </summary>
        [MethodImpl(MethodImplOptions.NoInlining)]
        private void Grow() => Array.Resize(ref Entries, Entries.Length + Math.Max(16, Entries.Length >> 2));

        private void Rehash(int size)
        {
            var slots = new int[size];
            int mask = size - 1;
            for (int e = 0; e < Count; e++)
            {
                int i = (int)Entries[e].Key.Hash64 & mask;
                while (slots[i] != 0) i = (i + 1) & mask;
                slots[i] = e + 1;
            }
            _slots = slots;
            _mask = mask;
        }
    }
}
