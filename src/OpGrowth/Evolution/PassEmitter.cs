using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// A linear map applied by <see cref="PassRunner{T}"/>: for one input string with coefficient c, emit the
/// (string, coefficient) contributions of its image into a <see cref="PassEmitter{T}"/>, in a fixed order.
/// </summary>
internal interface IPassMap<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Emits the image of coefficient * key.</summary>
    void Apply(in T key, double coefficient, PassEmitter<T> sink);
}

/// <summary>
/// One thread's output of a pass block: contributions in emission order, one stream per partition group (four
/// consecutive target partitions, by the top bits of the string's hash), as in <see cref="EmitBuffer{T}"/>, but
/// every stream is a chain of fixed 256-entry chunks taken from one pool. Why: the input of a pass is in partition
/// order, so the contributions of a block that leave a string in place (the bulk of them) all go to the few
/// groups its slice covers. With one growable array per group, every group's array grew over the blocks to the
/// largest such burst (measured at 10^6 strings on 2 threads: 164 bytes per kept string, more than the operator
/// and the accumulator together). A pool holds what one block emitted plus at most one partly filled chunk per
/// group. Reused across blocks and passes: steady state allocates nothing.
/// </summary>
internal sealed class PassEmitter<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>
    /// log2 of the entries per chunk. 256 (12 KiB for 128-qubit keys): with 64 the pass ran about 10% slower at 10^6
    /// strings on 2 threads (more chunk changes while emitting and merging); the slack is at most one chunk per group.
    /// </summary>
    internal const int ChunkBits = 8;

    /// <summary>Entries per chunk.</summary>
    internal const int ChunkSize = 1 << ChunkBits;

    /// <summary>Chunks of all streams (chunk c holds entries c * ChunkSize ...).</summary>
    internal Entry[] Pool = new Entry[64 * ChunkSize];

    /// <summary>Next chunk of the same stream, or -1.</summary>
    internal int[] Next = new int[64];

    /// <summary>First chunk of each group's stream, or -1.</summary>
    internal int[] Head = [];

    /// <summary>Last chunk of each group's stream, or -1.</summary>
    internal int[] Tail = [];

    /// <summary>Entries in each group's last chunk (ChunkSize when the stream is empty, so the first emission takes a chunk).</summary>
    internal int[] TailFill = [];

    private int _chunks;
    private int _groupShift;

    /// <summary>Contributions emitted since the last <see cref="Clear"/>.</summary>
    internal long Count;

    /// <summary>Scratch for support sites, sized to the key capacity.</summary>
    public int[] Sites { get; } = new int[T.Capacity];

    /// <summary>Number of partition groups (streams).</summary>
    internal int Groups => Head.Length;

    /// <summary>Bytes held (pool and chunk links).</summary>
    internal long AllocatedBytes => (long)Pool.Length * Unsafe.SizeOf<Entry>() + (long)Next.Length * 4 + 12L * Head.Length;

    /// <summary>Prepares for a pass into a target with the given partition shift (same grouping as <see cref="EmitBuffer{T}"/>).</summary>
    internal void Reset(int shift)
    {
        int partitionBits = 64 - shift;
        int groupBits = Math.Max(0, partitionBits - EmitBuffer<T>.PartitionsPerGroupBits);
        int groups = 1 << groupBits;
        _groupShift = groupBits == 0 ? 0 : 64 - groupBits;
        if (Head.Length != groups)
        {
            Head = new int[groups];
            Tail = new int[groups];
            TailFill = new int[groups];
        }
        Clear();
    }

    /// <summary>Empties every stream (keeps the pool).</summary>
    internal void Clear()
    {
        Array.Fill(Head, -1);
        Array.Fill(Tail, -1);
        Array.Fill(TailFill, ChunkSize);
        _chunks = 0;
        Count = 0;
    }

    /// <summary>Emits one contribution.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Emit(in T key, double value)
    {
        ulong h = key.Hash64;
        int u = _groupShift == 0 ? 0 : (int)(h >> _groupShift);
        int f = TailFill[u];
        if (f == ChunkSize) f = NewChunk(u);
        ref var e = ref Pool[(Tail[u] << ChunkBits) + f];
        e.Key = key;
        e.Value = value;
        e.Hash = h;
        TailFill[u] = f + 1;
        Count++;
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private int NewChunk(int u)
    {
        int c = _chunks++;
        if (c >= Next.Length)
        {
            // Grow by half: the pool settles at the largest block a thread emits (bounded by the runner's byte cap).
            int chunks = Next.Length + Math.Max(64, Next.Length >> 1);
            Array.Resize(ref Next, chunks);
            Array.Resize(ref Pool, chunks << ChunkBits);
        }
        Next[c] = -1;
        int t = Tail[u];
        if (t >= 0) Next[t] = c;
        else Head[u] = c;
        Tail[u] = c;
        TailFill[u] = 0;
        return 0;
    }

    /// <summary>One buffered contribution with its hash (computed once, used for the group, the partition and the slot).</summary>
    internal struct Entry
    {
        public T Key;
        public double Value;
        public ulong Hash;
    }
}
