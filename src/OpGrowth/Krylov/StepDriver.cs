using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Feeds a step table: the commutator of a stored vector (or a scaled copy of one) in blocks of input
/// strings. One thread: the contributions of a small block go to one stream (a few tens of kilobytes, still
/// in the first-level cache) and are then added to the table in emission order, the home slot of each one
/// prefetched a dozen entries ahead. Several threads: each block is cut into one contiguous slice per thread,
/// each thread appends its contributions to one stream per owner (the top bits of the hash choose the owner,
/// a contiguous range of partitions), then owner u adds the streams of all threads in slice order into its
/// partitions. Every string's contributions are therefore summed in input order, and every partition
/// receives its strings in input order, at any thread count and any block size: the result is bit-identical
/// to feeding the table one contribution at a time, as the managed accumulator is fed.
/// </summary>
internal sealed unsafe class StepDriver<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Input strings in the first block of a pass (it measures the contributions per input).</summary>
    private const int FirstBlock = 1 << 12;

    /// <summary>Largest block of input strings.</summary>
    private const int MaxBlock = 1 << 21;

    /// <summary>Contributions per block with one thread (a few tens of kilobytes: the stream stays in the first-level cache).</summary>
    internal const long SingleBlockEmissions = 1 << 11;

    /// <summary>Contributions per thread and block with several threads (the streams stay in the second-level cache).</summary>
    internal const long BlockEmissions = 1 << 15;

    private EmitBuffer<T>[] _buffers = [];

    /// <summary>Bytes the emit buffers hold now.</summary>
    public long BufferBytes
    {
        get
        {
            long b = 0;
            foreach (var buf in _buffers)
            {
                foreach (var s in buf.Streams) b += (long)s.Length * Unsafe.SizeOf<EmitBuffer<T>.Entry>();
            }
            return b;
        }
    }

    /// <summary>Upper bound on the emit buffers' bytes for a pass over strings that emit <paramref name="perInput"/> each.</summary>
    public static long BufferBound(int threads, long inputs, double perInput)
    {
        double p = Math.Max(1.0, perInput);
        long block = Math.Max(FirstBlock, (long)Math.Ceiling(threads * BlockEmissions / p));
        long emissions = (long)Math.Ceiling(Math.Min(inputs, block) * p);
        // Streams grow by doubling: up to twice the block's contributions, plus their initial sizes.
        return (emissions * 2 + (long)threads * threads * 1024) * Unsafe.SizeOf<EmitBuffer<T>.Entry>();
    }

    /// <summary>Drops the emit buffers.</summary>
    public void Release() => _buffers = [];

    /// <summary>Accumulates map(strings start..end of <paramref name="source"/>) into <paramref name="target"/>.</summary>
    public void Map<TMap>(SlotVector<T> source, int start, int end, TMap map, StepTable<T> target, int threads)
        where TMap : struct, IPauliMap<T>
        => Run(source, start, end, new MapProducer<TMap>(map), target, threads);

    /// <summary>Accumulates a * <paramref name="source"/> into <paramref name="target"/> (each string added as a * c, in storage order).</summary>
    public void AddScaled(SlotVector<T> source, double a, StepTable<T> target, int threads)
        => Run(source, 0, source.Count, new ScaledProducer(a), target, threads);

    private void Run<TProducer>(SlotVector<T> source, int start, int end, TProducer producer, StepTable<T> target, int threads)
        where TProducer : struct, IProducer
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(threads, 1);
        int n = end - start;
        if (n <= 0) return;
        threads = Math.Min(threads, Math.Max(1, n / 256));
        threads = Math.Min(threads, target.Parts.Length / (1 << EmitBuffer<T>.PartitionsPerGroupBits));
        threads = Math.Max(1, threads);
        if (_buffers.Length < threads)
        {
            var more = new EmitBuffer<T>[threads];
            for (int t = 0; t < threads; t++) more[t] = t < _buffers.Length ? _buffers[t] : new EmitBuffer<T>();
            _buffers = more;
        }
        var buffers = _buffers;
        // One stream per owner (the smallest power of two of groups >= threads, by the top bits of the hash):
        // a thread's streams are written and read sequentially, and group g (a contiguous range of partitions)
        // is merged by thread g mod threads only. One thread: one stream, drained every small block while it
        // is still in the first-level cache, so the contributions go to the table in emission order with
        // prefetching and without a round trip through memory.
        int groupBits = 0;
        while ((1 << groupBits) < threads) groupBits++;
        int fakeShift = 64 - (groupBits + EmitBuffer<T>.PartitionsPerGroupBits);
        for (int t = 0; t < threads; t++) buffers[t].Reset(fakeShift, threads);
        var items = source.Pointer;
        var options = new ParallelOptions { MaxDegreeOfParallelism = threads };
        long wanted = threads == 1 ? SingleBlockEmissions : threads * BlockEmissions;
        int blockSize = threads == 1 ? 16 : FirstBlock;
        for (int b0 = start, b1; b0 < end; b0 = b1)
        {
            b1 = (int)Math.Min(end, (long)b0 + blockSize);
            if (threads == 1)
            {
                buffers[0].Counts[0] = 0;
                producer.Produce(items, b0, b1, buffers[0]);
                Merge(buffers, 1, 0, 1, target);
            }
            else
            {
                int s0 = b0, len = b1 - b0, used = threads;
                Parallel.For(0, used, options, t =>
                {
                    int s = s0 + (int)((long)len * t / used);
                    int e = s0 + (int)((long)len * (t + 1) / used);
                    Array.Clear(buffers[t].Counts);
                    producer.Produce(source.Pointer, s, e, buffers[t]);
                });
                Parallel.For(0, used, options, u => Merge(buffers, used, u, used, target));
            }
            long emitted = 0;
            for (int t = 0; t < threads; t++)
            {
                foreach (int c in buffers[t].Counts) emitted += c;
            }
            double perInput = Math.Max(1.0, emitted / (double)(b1 - b0));
            blockSize = (int)Math.Clamp(wanted / perInput, 16, MaxBlock);
        }
    }

    /// <summary>Prefetch distance of the merge, in contributions.</summary>
    private const int Ahead = 16;

    /// <summary>
    /// Adds the owner's groups (g = owner, owner + owners, ...) of every buffer into the table, one group at a
    /// time and the buffers in slice order within a group, prefetching the home slot a fixed distance ahead.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Merge(EmitBuffer<T>[] buffers, int used, int owner, int owners, StepTable<T> target)
    {
        var parts = target.Parts;
        int shift = target.Shift;
        int ahead = Ahead;
        int groups = buffers[0].Groups;
        for (int g = owner; g < groups; g += owners)
        {
            for (int b = 0; b < used; b++)
            {
                var entries = buffers[b].Streams[g];
                int c = buffers[b].Counts[g];
                int pre = Math.Min(ahead, c);
                for (int i = 0; i < pre; i++)
                {
                    ulong h = entries[i].Hash;
                    StepTable<T>.Prefetch(ref parts[(int)(h >> shift)], h);
                }
                for (int i = 0; i < c; i++)
                {
                    if (i + ahead < c)
                    {
                        ulong hp = entries[i + ahead].Hash;
                        StepTable<T>.Prefetch(ref parts[(int)(hp >> shift)], hp);
                    }
                    ref var e = ref entries[i];
                    StepTable<T>.Add(ref parts[(int)(e.Hash >> shift)], e.Key, e.Value, e.Hash);
                }
            }
        }
    }

    private interface IProducer
    {
        void Produce(KeyValue<T>* items, int start, int end, EmitBuffer<T> sink);
    }

    private readonly struct MapProducer<TMap>(TMap map) : IProducer where TMap : struct, IPauliMap<T>
    {
        private readonly TMap _map = map;

        [MethodImpl(MethodImplOptions.AggressiveOptimization)]
        public void Produce(KeyValue<T>* items, int start, int end, EmitBuffer<T> sink)
        {
            for (int i = start; i < end; i++) _map.Apply(items[i].Key, items[i].Value, sink);
        }
    }

    private readonly struct ScaledProducer(double a) : IProducer
    {
        public void Produce(KeyValue<T>* items, int start, int end, EmitBuffer<T> sink)
        {
            for (int i = start; i < end; i++) sink.Emit(items[i].Key, a * items[i].Value);
        }
    }
}
