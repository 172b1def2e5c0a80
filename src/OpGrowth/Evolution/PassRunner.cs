using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// Runs one linear map over an operator into a <see cref="PassAccumulator{T}"/>, on several threads
/// without locks, with the same determinism contract as <see cref="PauliMapper"/>: input is cut
/// into blocks, each block into one contiguous slice per thread, each thread emits into its own
/// partitioned buffer, and each target partition is merged by one thread reading the buffers in
/// slice order. Every string's contributions are therefore summed in input order at any thread
/// count (bit-identical results at 1 and 2 threads).
/// Unlike <see cref="PauliMapper"/> it keeps its emit buffers between passes (no reallocation in the
/// step loop), checks a memory limit between blocks and honours cancellation between blocks.
/// </summary>
internal sealed class PassRunner<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Smallest block of input strings.</summary>
    public const int MinBlock = 8192;

    /// <summary>
    /// Contributions buffered per block (all threads). Large blocks make each partition's table
    /// L2-resident while it is merged (a block must emit about as many contributions as the table
    /// holds, or every update misses the cache); the block size does not change any result.
    /// </summary>
    public const long TargetBlockEmissions = 1 << 21;

    private double _emitPerInput = 4;

    /// <summary>Safety factor on the emissions per input when a pass runs under a byte limit (bounds the emit buffers' growth).</summary>
    private const double EmissionSafety = 4;

    /// <summary>Contributions per input string in the last pass (sets the block size; checkpointed so a resumed run blocks the same way).</summary>
    public double EmitPerInput
    {
        get => _emitPerInput;
        set => _emitPerInput = value;
    }

    private readonly int _threads;
    private PassEmitter<T>[] _buffers = [];

    /// <summary>Wall-clock ticks (<see cref="System.Diagnostics.Stopwatch"/>) spent producing and merging contributions (diagnostics for the benchmarks).</summary>
    internal long ProduceTicks, MergeTicks;

    public PassRunner(int threads)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(threads, 1);
        _threads = threads;
    }

    /// <summary>Threads used.</summary>
    public int Threads => _threads;

    /// <summary>Bytes held by the emit buffers.</summary>
    public long BufferBytes
    {
        get
        {
            long b = 0;
            foreach (var buf in _buffers) b += buf.AllocatedBytes;
            return b;
        }
    }

    /// <summary>
    /// Accumulates map(source) into <paramref name="target"/>. Returns false, leaving the target
    /// partially filled, when the target's arrays grow beyond <paramref name="byteLimit"/> bytes (the second
    /// overload also stops when the target holds more distinct strings than its count limit).
    /// </summary>
    public bool Run<TMap>(T[] keys, double[] coeffs, int count, TMap map, PassAccumulator<T> target, long byteLimit, CancellationToken ct)
        where TMap : struct, IPassMap<T>
        => Run(keys, coeffs, count, map, target, byteLimit, ct, out _);

    /// <summary>As above; <paramref name="emitted"/> counts the contributions emitted (independent of the thread count).</summary>
    public bool Run<TMap>(T[] keys, double[] coeffs, int count, TMap map, PassAccumulator<T> target, long byteLimit, CancellationToken ct, out long emitted, int[]? stop = null, long countLimit = long.MaxValue)
        where TMap : struct, IPassMap<T>
    {
        emitted = 0;
        if (count == 0) return true;
        int threads = Math.Min(_threads, Math.Max(1, count / 1024));
        EnsureBuffers();
        foreach (var buf in _buffers) buf.Reset(target.Shift);
        var options = new ParallelOptions { MaxDegreeOfParallelism = threads, CancellationToken = ct };
        int checkEvery = 1;
        int block = 0;
        // Block size from the previous pass's emissions per input; never so large that one block could
        // overshoot the byte limit by much (the limit is checked between blocks).
        long perEntry = Unsafe.SizeOf<PassAccumulator<T>.Entry>() + 16;
        long byBytes = Math.Max(1024, byteLimit / 4 / perEntry);
        // The emissions per input of this pass are known only afterwards; a young operator can emit several times
        // more than the last pass did, so under a byte limit the block is planned for four times the estimate.
        double perInput = Math.Max(1.0, _emitPerInput) * (byteLimit < long.MaxValue / 2 ? EmissionSafety : 1);
        int blockSize = (int)Math.Clamp(Math.Min(TargetBlockEmissions, byBytes) / perInput, 1024, 1 << 16);
        // Each thread's buffer holds at most its share of the memory budget; a block that would emit more is
        // redone in halves (block boundaries do not change any result: contributions merge in input order).
        long entryCap = Math.Max(2L * GroupRotationMap<T>.StringEmissionCap, MemoryBudget.BufferReservePerThread / (2 * Unsafe.SizeOf<PassEmitter<T>.Entry>()));
        var overflow = new int[1];
        for (int b0 = 0; b0 < count; block++)
        {
            ct.ThrowIfCancellationRequested();
            int b1 = Math.Min(count, b0 + blockSize);
            overflow[0] = 0;
            long t0 = System.Diagnostics.Stopwatch.GetTimestamp();
            if (threads == 1 || b1 - b0 < 1024)
            {
                Produce(keys, coeffs, b0, b1, map, _buffers[0], stop, entryCap, overflow);
                for (int t = 1; t < threads; t++) _buffers[t].Clear();
            }
            else
            {
                int start = b0, len = b1 - b0;
                var buffers = _buffers;
                Parallel.For(0, threads, options, t =>
                {
                    int s = start + (int)((long)len * t / threads);
                    int e = start + (int)((long)len * (t + 1) / threads);
                    Produce(keys, coeffs, s, e, map, buffers[t], stop, entryCap, overflow);
                });
            }
            long t1 = System.Diagnostics.Stopwatch.GetTimestamp();
            ProduceTicks += t1 - t0;
            if (stop is not null && Volatile.Read(ref stop[0]) != 0) return false;
            if (overflow[0] != 0 && b1 - b0 > 1)
            {
                blockSize = Math.Max(1, (b1 - b0) / 2);
                continue;
            }
            for (int t = 0; t < threads; t++) emitted += _buffers[t].Count;
            Merge(target, threads, options);
            MergeTicks += System.Diagnostics.Stopwatch.GetTimestamp() - t1;
            if (block % checkEvery == 0 && (target.AllocatedBytes > byteLimit || target.Count > countLimit)) return false;
            b0 = b1;
        }
        _emitPerInput = Math.Max(1.0, emitted / (double)count);
        return true;
    }

    private void EnsureBuffers()
    {
        if (_buffers.Length == _threads) return;
        _buffers = new PassEmitter<T>[_threads];
        for (int t = 0; t < _threads; t++) _buffers[t] = new PassEmitter<T>();
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Produce<TMap>(T[] keys, double[] coeffs, int start, int end, TMap map, PassEmitter<T> sink, int[]? stop, long entryCap, int[] overflow)
        where TMap : struct, IPassMap<T>
    {
        sink.Clear();
        for (int i = start; i < end; i++)
        {
            map.Apply(keys[i], coeffs[i], sink);
            if ((i & 15) != 0) continue;
            if (stop is not null && Volatile.Read(ref stop[0]) != 0) return;
            if (Volatile.Read(ref overflow[0]) != 0) return;
            if (i > start && sink.Count > entryCap)
            {
                Volatile.Write(ref overflow[0], 1);
                return;
            }
        }
    }


    private void Merge(PassAccumulator<T> target, int threads, ParallelOptions options)
    {
        var buffers = _buffers;
        if (threads == 1)
        {
            MergeOwner(buffers, threads, target, 0);
            return;
        }
        // Each owner thread merges the partition groups it owns (g % threads), reading the buffers in slice order.
        Parallel.For(0, threads, options, u => MergeOwner(buffers, threads, target, u));
    }

    /// <summary>
    /// Merges the owner's partition groups (g = owner, owner + threads, ...) of every buffer, one group at a
    /// time and the buffers in slice order within a group (each string's contributions are summed in input
    /// order at any thread count, as in <see cref="EmitBuffer{T}.MergeGroups"/>).
    /// </summary>
    private static void MergeOwner(PassEmitter<T>[] buffers, int threads, PassAccumulator<T> target, int owner)
    {
        var parts = target.Parts;
        int shift = target.Shift;
        int groups = buffers[0].Groups;
        for (int g = owner; g < groups; g += threads)
        {
            for (int b = 0; b < threads; b++) MergeStream(buffers[b], g, parts, shift);
        }
    }

    /// <summary>Slot prefetch distance of <see cref="MergeStream"/> (contributions ahead; less than a chunk).</summary>
    private const int SlotAhead = 16;

    /// <summary>Entry prefetch distance of <see cref="MergeStream"/>: the slot line asked for at <see cref="SlotAhead"/> has arrived by then.</summary>
    private const int EntryAhead = 8;

    /// <summary>
    /// Adds one group's stream of contributions in order (its chunks in chain order), with a two-stage software
    /// prefetch. A block emits far fewer contributions per partition group than the group's table holds (at 10^6
    /// strings a few thousand against about 10^4, at 10^7 a few hundred), so the tables are not cache-resident
    /// while they are merged and every update needs two lines from memory, the slot and then the entry it names.
    /// Asking for the slot line SlotAhead contributions ahead and for the entry line EntryAhead ahead (reading the
    /// slot that has arrived meanwhile) keeps many misses in flight instead of two dependent ones per update. The
    /// look-ahead crosses at most into the next chunk. Prefetches are hints: the order of the additions, and so
    /// every sum, is unchanged.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void MergeStream(PassEmitter<T> buffer, int g, PassAccumulator<T>.Part[] parts, int shift)
    {
        const int size = PassEmitter<T>.ChunkSize;
        var pool = buffer.Pool;
        var next = buffer.Next;
        int tail = buffer.Tail[g];
        int tailFill = buffer.TailFill[g];
        int c = buffer.Head[g];
        if (c < 0) return;
        int first = Math.Min(SlotAhead, c == tail ? tailFill : size);
        for (int j = 0; j < first; j++)
        {
            ulong h = pool[(c << PassEmitter<T>.ChunkBits) + j].Hash;
            parts[(int)(h >> shift)].Prefetch(h);
        }
        while (c >= 0)
        {
            int nc = next[c];
            int n = c == tail ? tailFill : size;
            int nn = nc < 0 ? 0 : nc == tail ? tailFill : size;
            int baseC = c << PassEmitter<T>.ChunkBits;
            int baseN = nc << PassEmitter<T>.ChunkBits;
            for (int i = 0; i < n; i++)
            {
                int a = i + SlotAhead;
                if (a < n)
                {
                    ulong hs = pool[baseC + a].Hash;
                    parts[(int)(hs >> shift)].Prefetch(hs);
                }
                else if (a - n < nn)
                {
                    ulong hs = pool[baseN + a - n].Hash;
                    parts[(int)(hs >> shift)].Prefetch(hs);
                }
                int b = i + EntryAhead;
                if (b < n)
                {
                    ulong he = pool[baseC + b].Hash;
                    parts[(int)(he >> shift)].PrefetchEntry(he);
                }
                else if (b - n < nn)
                {
                    ulong he = pool[baseN + b - n].Hash;
                    parts[(int)(he >> shift)].PrefetchEntry(he);
                }
                ref var e = ref pool[baseC + i];
                parts[(int)(e.Hash >> shift)].Add(e.Key, e.Value, e.Hash);
            }
            c = nc;
        }
    }
}
