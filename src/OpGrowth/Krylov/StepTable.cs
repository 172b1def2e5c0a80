using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics.X86;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// The accumulator of one exact Lanczos step, A_n = i[H, O_{n-1}] + b~_{n-1} O_{n-2}, in unmanaged memory.
/// </summary>
/// <remarks>
/// Same layout rules as <see cref="PauliAccumulator{T}"/>: 2^bits partitions chosen by the top bits of the
/// string's hash (<see cref="PauliAccumulator{T}.BitsFor"/>), each an open-addressing table with linear
/// probing from hash &amp; mask, load at most 0.7, doubled (re-inserted in slot order) when full, the all-zero
/// key as the empty mark and the identity summed apart. Given the same contributions in the same order it
/// therefore puts every string in the same slot, compacts to the same order and sums every string's
/// contributions in the same order: the vectors and b_n are bit for bit those of the managed accumulator.
/// What differs is where the memory lives: all partitions start in one block (partition p at p * capacity),
/// and <see cref="Compact"/> moves the surviving strings to the front of that block and shrinks it, so the
/// step's result is the table's own memory, never a second copy.
/// </remarks>
internal sealed unsafe class StepTable<T> : IDisposable where T : unmanaged, IPauliKey<T>
{
    /// <summary>One partition's table; 64 bytes so two threads never share a cache line of bookkeeping.</summary>
    [StructLayout(LayoutKind.Sequential, Size = 64)]
    internal struct Part
    {
        public KeyValue<T>* Table;
        public int Mask;
        public int Limit;
        public int Count;
        public bool Own;          // the table is a separate block (after growing), not a range of the shared one
        public bool HasIdentity;
        public double Identity;
    }

    internal readonly Part[] Parts;
    internal readonly int Shift;
    private KeyValue<T>* _block;
    private readonly int _capacity0;
    private readonly PagePool _pool;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>
    /// A table presized for <paramref name="expectedStrings"/> (partitions and capacities as
    /// <see cref="PauliAccumulator{T}.For"/>); its block comes from <paramref name="pool"/> when given (pages
    /// freed by earlier steps, else <see cref="PagePool.None"/>), and the vector it compacts into returns it there.
    /// </summary>
    public StepTable(int n, long expectedStrings, PagePool? pool = null)
    {
        N = n;
        int bits = PauliAccumulator<T>.BitsFor(expectedStrings);
        Shift = 64 - bits;
        Parts = new Part[1 << bits];
        _capacity0 = Capacity(expectedStrings);
        _pool = pool ?? PagePool.None;
        long bytes = (long)Parts.Length * _capacity0 * sizeof(KeyValue<T>);
        _block = (KeyValue<T>*)_pool.AllocateZeroed(bytes);
        LargePages.Advise(_block, bytes);
        for (int p = 0; p < Parts.Length; p++)
        {
            Parts[p].Table = _block + (long)p * _capacity0;
            Parts[p].Mask = _capacity0 - 1;
            Parts[p].Limit = (int)(_capacity0 * 0.7);
        }
    }

    /// <summary>Slots per partition for an expected string count (as the managed accumulator).</summary>
    private static int Capacity(long expectedStrings)
    {
        long perPart = expectedStrings >> PauliAccumulator<T>.BitsFor(expectedStrings);
        int cap = 16;
        while (cap < 1 << 28 && cap * 0.7 < perPart) cap <<= 1;
        return cap;
    }

    /// <summary>Bytes a table presized for <paramref name="expectedStrings"/> takes before any partition grows.</summary>
    public static long PresizedBytes(long expectedStrings)
        => ((long)1 << PauliAccumulator<T>.BitsFor(expectedStrings)) * Capacity(expectedStrings) * sizeof(KeyValue<T>);

    /// <summary>Distinct strings so far (including cancelled ones not yet compacted).</summary>
    public long Count
    {
        get
        {
            long c = 0;
            foreach (ref readonly var p in Parts.AsSpan()) c += p.Count;
            return c;
        }
    }

    /// <summary>Bytes held by the tables.</summary>
    public long AllocatedBytes
    {
        get
        {
            long b = _block == null ? 0 : (long)Parts.Length * _capacity0 * sizeof(KeyValue<T>);
            foreach (ref readonly var p in Parts.AsSpan())
            {
                if (p.Own) b += (long)(p.Mask + 1) * sizeof(KeyValue<T>);
            }
            return b;
        }
    }

    /// <summary>Hints the CPU to fetch the home slot of a hash that will be added soon.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static void Prefetch(ref Part part, ulong h)
    {
        if (Sse.IsSupported) Sse.Prefetch0(part.Table + ((int)h & part.Mask));
    }

    /// <summary>Adds one contribution with its hash to its partition (only the partition's owner thread may call this).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static void Add(ref Part part, in T key, double value, ulong h)
    {
        var table = part.Table;
        int mask = part.Mask;
        int i = (int)h & mask;
        while (true)
        {
            ref var s = ref table[i];
            // Empty test first: the identity (all-zero key) must never match an empty slot.
            if (s.Key.Equals(default))
            {
                Insert(ref part, key, value, i);
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

    /// <summary>Adds one contribution (computes the hash).</summary>
    public void Add(in T key, double value)
    {
        ulong h = key.Hash64;
        Add(ref Parts[(int)(h >> Shift)], key, value, h);
    }

    private static void Insert(ref Part part, in T key, double value, int i)
    {
        if (key.Equals(default))
        {
            if (!part.HasIdentity) part.Count++;
            part.HasIdentity = true;
            part.Identity += value;
            return;
        }
        part.Table[i].Key = key;
        part.Table[i].Value = value;
        if (++part.Count > part.Limit) Grow(ref part);
    }

    private static void Grow(ref Part part)
    {
        var old = part.Table;
        int oldCap = part.Mask + 1;
        int cap = oldCap * 2;
        int mask = cap - 1;
        var table = (KeyValue<T>*)NativeMemory.AllocZeroed((nuint)cap, (nuint)sizeof(KeyValue<T>));
        for (int r = 0; r < oldCap; r++)
        {
            ref var s = ref old[r];
            if (s.Key.Equals(default)) continue;
            int i = (int)s.Key.Hash64 & mask;
            while (!table[i].Key.Equals(default)) i = (i + 1) & mask;
            table[i] = s;
        }
        if (part.Own) NativeMemory.Free(old);
        part.Table = table;
        part.Own = true;
        part.Mask = mask;
        part.Limit = (int)(cap * 0.7);
    }

    /// <summary>
    /// Turns the table into the step's vector: partition order, slot order within a partition (the identity
    /// first), strings whose coefficients cancelled to exactly zero dropped; the same order as
    /// <see cref="PauliAccumulator{T}.ToOperator"/>. Each partition is first compacted within its own range
    /// (in parallel), then the runs are moved down to the front of the block, which is shrunk to fit. Only
    /// if partitions grew so much that a run would overtake a range not yet moved is a new block used.
    /// The table is empty afterwards.
    /// </summary>
    /// <remarks>
    /// With <paramref name="keepSpare"/> the block is not shrunk: the vector keeps the table's tail as
    /// scratch (<see cref="SlotVector{T}.SpareDoubles"/>, pages already touched) until its
    /// <see cref="SlotVector{T}.TrimExcess"/>.
    /// </remarks>
    public SlotVector<T> Compact(int threads, bool keepSpare = false)
    {
        int parts = Parts.Length;
        var counts = new int[parts];
        if (threads > 1 && parts >= 16)
        {
            var options = new ParallelOptions { MaxDegreeOfParallelism = threads };
            Parallel.For(0, threads, options, t =>
            {
                int p0 = (int)((long)parts * t / threads), p1 = (int)((long)parts * (t + 1) / threads);
                for (int p = p0; p < p1; p++) counts[p] = CompactPart(ref Parts[p]);
            });
        }
        else
        {
            for (int p = 0; p < parts; p++) counts[p] = CompactPart(ref Parts[p]);
        }
        long total = 0;
        bool inPlace = true;
        for (int p = 0; p < parts; p++)
        {
            total += counts[p];
            // Run p goes to [total - counts[p], total): it must end before range p + 1 starts.
            if (total > (long)(p + 1) * _capacity0) inPlace = false;
        }
        if (total > Array.MaxLength) throw new InsufficientMemoryException($"More than {Array.MaxLength} strings exceed one vector's capacity.");
        int size = sizeof(KeyValue<T>);
        var dst = inPlace ? _block : (KeyValue<T>*)NativeMemory.Alloc((nuint)Math.Max(1, total), (nuint)size);
        long w = 0;
        for (int p = 0; p < parts; p++)
        {
            ref var part = ref Parts[p];
            int c = counts[p];
            if (c > 0 && part.Table != dst + w) Buffer.MemoryCopy(part.Table, dst + w, (long)c * size, (long)c * size);
            if (part.Own) NativeMemory.Free(part.Table);
            part = default;
            w += c;
        }
        long spare = 0;
        if (inPlace && keepSpare)
        {
            spare = (long)parts * _capacity0 * size - total * size;
        }
        else if (inPlace)
        {
            // Shrinking gives the tail pages back (a large block is its own mapping), or to the pool.
            dst = (KeyValue<T>*)_pool.Shrink(dst, Math.Max(1, total) * size);
        }
        else
        {
            _pool.Release(_block);
        }
        _block = null;
        return new SlotVector<T>(N, dst, (int)total, spare, _pool);
    }

    /// <summary>Moves the partition's surviving strings to the front of its own table (the identity first); returns how many.</summary>
    private static int CompactPart(ref Part part)
    {
        var t = part.Table;
        int cap = part.Mask + 1;
        int w = 0;
        for (int r = 0; r < cap; r++)
        {
            ref var s = ref t[r];
            if (s.Value == 0 || s.Key.Equals(default)) continue;
            if (w != r) t[w] = s;
            w++;
        }
        if (part.HasIdentity && part.Identity != 0)
        {
            // w <= Count <= Limit < capacity, so there is room for one more.
            long bytes = (long)w * sizeof(KeyValue<T>);
            Buffer.MemoryCopy(t, t + 1, bytes + sizeof(KeyValue<T>), bytes);
            t[0].Key = default;
            t[0].Value = part.Identity;
            w++;
        }
        return w;
    }

    public void Dispose()
    {
        Free();
        GC.SuppressFinalize(this);
    }

    ~StepTable() => Free();

    private void Free()
    {
        if (Parts is null) return;
        for (int p = 0; p < Parts.Length; p++)
        {
            if (Parts[p].Own && Parts[p].Table != null) NativeMemory.Free(Parts[p].Table);
            Parts[p] = default;
        }
        if (_block != null) _pool.Release(_block);
        _block = null;
    }

    /// <summary>The table as seen by <see cref="EmitBuffer{T}.MergeGroups"/>.</summary>
    internal readonly struct Target(Part[] parts, int shift) : IGroupTarget<T>
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Prefetch(ulong hash) => StepTable<T>.Prefetch(ref parts[(int)(hash >> shift)], hash);

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Add(in T key, double value, ulong hash) => StepTable<T>.Add(ref parts[(int)(hash >> shift)], key, value, hash);
    }
}
