using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>
/// One thread's output of a map pass: contributions appended in emission order to one stream per
/// partition group (a run of four consecutive target partitions, chosen by the top bits of the
/// string's hash). Group g is merged by thread g mod owners. Appends are sequential, so producing
/// costs a few nanoseconds per contribution; the merge then takes one group at a time, so the group's
/// partition tables stay in cache while all of the block's contributions to them are summed (radix
/// partitioning: the random accesses of the merge land in a few hundred kilobytes instead of the whole
/// table). Reused across blocks and passes: steady state allocates nothing.
/// </summary>
public sealed class EmitBuffer<T> where T : unmanaged, IPauliKey<T>
{
    internal Entry[][] Streams;
    internal int[] Counts;
    private int _groupShift;
    private int _groupMask;

    /// <summary>Partitions per group (log2): four partitions of about 2048 strings each, a few hundred kilobytes.</summary>
    internal const int PartitionsPerGroupBits = 2;

    /// <summary>Scratch for support sites, sized to the key capacity.</summary>
    public int[] Sites { get; } = new int[T.Capacity];

    /// <summary>General-purpose scratch for maps (e.g. branching in grouped rotations).</summary>
    public T[] ScratchKeys { get; } = new T[256];

    /// <summary>General-purpose scratch for maps.</summary>
    public double[] ScratchValues { get; } = new double[256];

    internal EmitBuffer()
    {
        Streams = [];
        Counts = [];
    }

    /// <summary>Number of partition groups (streams); group g is merged by owner g mod owners.</summary>
    internal int Groups => Streams.Length;

    /// <summary>Prepares for a pass into a target with the given partition shift (the owner count no longer changes the streams).</summary>
    internal void Reset(int shift, int owners)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(owners, 1);
        int partitionBits = 64 - shift;
        int groupBits = Math.Max(0, partitionBits - PartitionsPerGroupBits);
        _groupShift = groupBits == 0 ? 0 : 64 - groupBits;
        _groupMask = (1 << groupBits) - 1;
        Size(groupBits);
    }

    /// <summary>
    /// Prepares for a pass in which stream g takes the partitions p with p mod 2^<paramref name="groupBits"/> = g
    /// (the low bits of the partition index): each stream's partitions are spread evenly over the target's memory.
    /// </summary>
    internal void ResetInterleaved(int partitionShift, int groupBits)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(groupBits);
        _groupShift = partitionShift;
        _groupMask = (1 << groupBits) - 1;
        Size(groupBits);
    }

    /// <summary>One stream per group (2^<paramref name="groupBits"/>), kept from the last pass when the count is the same; counts cleared.</summary>
    private void Size(int groupBits)
    {
        int groups = 1 << groupBits;
        if (Streams.Length != groups)
        {
            Streams = new Entry[groups][];
            int initial = Math.Max(16, 4096 >> groupBits);
            for (int i = 0; i < groups; i++) Streams[i] = NewStream(initial);
            Counts = new int[groups];
        }
        Array.Clear(Counts);
    }

    /// <summary>Emits one contribution to the target.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Emit(in T key, double value)
    {
        ulong h = key.Hash64;
        int u = _groupMask == 0 ? 0 : (int)(h >> _groupShift) & _groupMask;
        int c = Counts[u];
        var arr = Streams[u];
        if (c == arr.Length) arr = Grow(u);
        ref var e = ref arr[c];
        e.Key = key;
        e.Value = value;
        e.Hash = h;
        Counts[u] = c + 1;
    }

    private Entry[] Grow(int u)
    {
        var old = Streams[u];
        var grown = NewStream(old.Length * 2);
        old.AsSpan().CopyTo(grown);
        Streams[u] = grown;
        return grown;
    }

    /// <summary>A stream array on the pinned heap, so a kernel may write it through a pointer (<see cref="StreamPointer"/>).</summary>
    private static Entry[] NewStream(int length) => GC.AllocateUninitializedArray<Entry>(length, pinned: true);

    /// <summary>Shift and mask that take a hash to its stream: u = (hash &gt;&gt; GroupShift) &amp; GroupMask.</summary>
    internal int GroupShift => _groupShift;

    /// <inheritdoc cref="GroupShift"/>
    internal int GroupMask => _groupMask;

    /// <summary>Grows stream u until it has room for <paramref name="room"/> more contributions after its count.</summary>
    internal void EnsureRoom(int u, int room)
    {
        while (Streams[u].Length - Counts[u] < room) Grow(u);
    }

    /// <summary>Address of stream u's first entry (the arrays are pinned; valid until the stream grows).</summary>
    internal unsafe Entry* StreamPointer(int u) => (Entry*)Unsafe.AsPointer(ref System.Runtime.InteropServices.MemoryMarshal.GetArrayDataReference(Streams[u]));

    internal struct Entry
    {
        public T Key;
        public double Value;
        public ulong Hash;
    }

    /// <summary>
    /// Merges the owner's groups (g = owner, owner + owners, ...) of every buffer into a target, one
    /// group at a time and the buffers in slice order within a group, so each string's contributions
    /// are summed in input order at any thread count. The target is a struct so the JIT specialises
    /// the loop for each accumulator.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal static void MergeGroups<TTarget>(EmitBuffer<T>[] buffers, int buffersUsed, int owner, int owners, TTarget target)
        where TTarget : struct, IGroupTarget<T>
    {
        const int ahead = 12;
        int groups = buffers[0].Groups;
        for (int g = owner; g < groups; g += owners)
        {
            for (int b = 0; b < buffersUsed; b++)
            {
                var entries = buffers[b].Streams[g];
                int c = buffers[b].Counts[g];
                for (int i = 0; i < c; i++)
                {
                    if (i + ahead < c) target.Prefetch(entries[i + ahead].Hash);
                    ref var e = ref entries[i];
                    target.Add(e.Key, e.Value, e.Hash);
                }
            }
        }
    }
}

/// <summary>A partitioned accumulator as seen by <see cref="EmitBuffer{T}.MergeGroups"/>.</summary>
internal interface IGroupTarget<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Hints the CPU to fetch the home slot of a hash that will be added soon.</summary>
    void Prefetch(ulong hash);

    /// <summary>Adds one contribution with its precomputed hash.</summary>
    void Add(in T key, double value, ulong hash);
}
