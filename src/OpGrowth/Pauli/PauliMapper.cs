namespace OpGrowth.Pauli;

/// <summary>
/// Drives a string-by-string linear map over an operator on several threads without locks.
/// Input is processed in blocks; each block is cut into one contiguous slice per thread; each
/// thread appends its contributions to one stream per partition group (see <see cref="EmitBuffer{T}"/>);
/// then group g is merged by thread g mod T, which reads the streams of all threads in slice order.
/// Every string's contributions are therefore summed in input order whatever the thread count:
/// results are bit-identical at 1 and 2 threads (the partition count depends on the data size only).
/// Blocks are sized so that one block emits about <see cref="TargetBlockEmissions"/> contributions:
/// enough that each group's tables, once fetched, absorb many updates while they are in cache.
/// The block size never changes a result.
/// </summary>
public static class PauliMapper
{
    /// <summary>Input strings in the first block of a pass (it measures the contributions per input).</summary>
    public const int BlockSize = 1 << 12;

    /// <summary>Most contributions buffered per block (all threads together) once the rate is known.</summary>
    public const long TargetBlockEmissions = 1 << 21;

    /// <summary>Contributions per block into a target small enough to stay in the last-level cache.</summary>
    private const long MinBlockEmissions = 1 << 18;

    /// <summary>Below this many bytes of tables the target stays in cache and small blocks are best.</summary>
    private const long SmallTargetBytes = 16L << 20;

    /// <summary>Largest block of input strings.</summary>
    private const int MaxBlock = 1 << 20;

    /// <summary>
    /// Upper bound on the contributions held in the emit buffers at once during a pass over
    /// <paramref name="inputs"/> strings that emit <paramref name="perInput"/> each (for memory accounting).
    /// </summary>
    public static long BufferedEmissionsBound(long inputs, double perInput)
    {
        double p = Math.Max(1.0, perInput);
        long block = Math.Max(BlockSize, (long)Math.Ceiling(TargetBlockEmissions / p));
        return (long)Math.Ceiling(Math.Min(inputs, block) * p);
    }

    /// <summary>Accumulates map(O) into <paramref name="target"/>.</summary>
    public static void Run<T, TMap>(PauliOperator<T> source, TMap map, PauliAccumulator<T> target, int threads)
        where T : unmanaged, IPauliKey<T>
        where TMap : struct, IPauliMap<T>
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(threads, 1);
        int n = source.Count;
        if (n == 0) return;
        threads = Math.Min(threads, Math.Max(1, n / 256));
        threads = Math.Min(threads, target.Parts.Length);
        var buffers = new EmitBuffer<T>[threads];
        for (int t = 0; t < threads; t++)
        {
            buffers[t] = BufferPool<T>.Rent();
            buffers[t].Reset(target.Shift, threads);
        }
        try
        {
            RunBlocks(source, map, target, threads, buffers);
        }
        finally
        {
            foreach (var b in buffers) BufferPool<T>.Return(b);
        }
    }

    private static void RunBlocks<T, TMap>(PauliOperator<T> source, TMap map, PauliAccumulator<T> target, int threads, EmitBuffer<T>[] buffers)
        where T : unmanaged, IPauliKey<T>
        where TMap : struct, IPauliMap<T>
    {
        int n = source.Count;
        var keys = source.KeyArray;
        var coeffs = source.CoefficientArray;
        var options = new ParallelOptions { MaxDegreeOfParallelism = threads };
        int blockSize = BlockSize;
        for (int b0 = 0, b1; b0 < n; b0 = b1)
        {
            b1 = (int)Math.Min(n, (long)b0 + blockSize);
            if (threads == 1)
            {
                Produce(keys, coeffs, b0, b1, map, buffers[0]);
            }
            else
            {
                int start = b0, len = b1 - b0;
                Parallel.For(0, threads, options, t =>
                {
                    int s = start + (int)((long)len * t / threads);
                    int e = start + (int)((long)len * (t + 1) / threads);
                    Produce(keys, coeffs, s, e, map, buffers[t]);
                });
            }
            long emitted = 0;
            foreach (var buf in buffers)
            {
                foreach (int c in buf.Counts) emitted += c;
            }
            if (threads == 1) MergeOwner(buffers, target, 0, 1);
            else Parallel.For(0, threads, options, u => MergeOwner(buffers, target, u, threads));
            // A target far larger than cache gets large blocks, so each group's tables, fetched once per
            // block, absorb many updates; a target that fits in cache gets small blocks, so the buffer
            // stays in cache too.
            double perInput = Math.Max(1.0, emitted / (double)(b1 - b0));
            long wanted = target.AllocatedBytes < SmallTargetBytes ? MinBlockEmissions : TargetBlockEmissions;
            blockSize = (int)Math.Clamp(wanted / perInput, BlockSize, MaxBlock);
        }
    }

    private static void Produce<T, TMap>(T[] keys, double[] coeffs, int start, int end, TMap map, EmitBuffer<T> sink)
        where T : unmanaged, IPauliKey<T>
        where TMap : struct, IPauliMap<T>
    {
        Array.Clear(sink.Counts);
        for (int i = start; i < end; i++) map.Apply(keys[i], coeffs[i], sink);
    }

    private static void MergeOwner<T>(EmitBuffer<T>[] buffers, PauliAccumulator<T> target, int owner, int owners)
        where T : unmanaged, IPauliKey<T>
        => EmitBuffer<T>.MergeGroups(buffers, buffers.Length, owner, owners, new AccumulatorTarget<T>(target.Parts, target.Shift));

    private readonly struct AccumulatorTarget<T>(PauliAccumulator<T>.Partition[] parts, int shift) : IGroupTarget<T>
        where T : unmanaged, IPauliKey<T>
    {
        [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
        public void Prefetch(ulong hash) => parts[(int)(hash >> shift)].Prefetch(hash);

        [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
        public void Add(in T key, double value, ulong hash) => parts[(int)(hash >> shift)].Add(key, value, hash);
    }

    /// <summary>Drops the pooled emit buffers (they hold up to a block's worth of contributions per thread).</summary>
    public static void ReleasePooledBuffers<T>() where T : unmanaged, IPauliKey<T> => BufferPool<T>.Clear();

    private static class BufferPool<T> where T : unmanaged, IPauliKey<T>
    {
        private static readonly System.Collections.Concurrent.ConcurrentBag<EmitBuffer<T>> Pool = [];

        public static EmitBuffer<T> Rent() => Pool.TryTake(out var b) ? b : new EmitBuffer<T>();

        public static void Return(EmitBuffer<T> b)
        {
            if (Pool.Count < 2 * Environment.ProcessorCount) Pool.Add(b);
        }

        public static void Clear() => Pool.Clear();
    }
}
