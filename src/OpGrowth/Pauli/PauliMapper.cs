namespace OpGrowth.Pauli;

/// <summary>
/// Drives a string-by-string linear map over an operator on several threads without locks.
/// Input is processed in blocks; each block is cut into one contiguous slice per thread; each
/// thread appends its contributions to one stream per owner (target partitions are dealt to the
/// threads round-robin, partition p to thread p mod T); then each owner inserts the streams of
/// all threads, in slice order, into its own partitions. Every string's contributions are
/// therefore summed in input order whatever the thread count: results are bit-identical at 1 and
/// 2 threads (the partition count depends on the data size only).
/// </summary>
public static class PauliMapper
{
    /// <summary>Input strings per block: bounds the buffered contributions (memory) per pass.</summary>
    public const int BlockSize = 1 << 14;

    /// <summary>Prefetch distance of the merge: far enough ahead to hide a memory miss, short enough to stay in L1.</summary>
    private const int Ahead = 12;

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
        for (int b0 = 0; b0 < n; b0 += BlockSize)
        {
            int b1 = Math.Min(n, b0 + BlockSize);
            if (threads == 1)
            {
                Produce(keys, coeffs, b0, b1, map, buffers[0]);
                MergeOwner(buffers, target, 0);
                continue;
            }
            int start = b0, len = b1 - b0;
            Parallel.For(0, threads, options, t =>
            {
                int s = start + (int)((long)len * t / threads);
                int e = start + (int)((long)len * (t + 1) / threads);
                Produce(keys, coeffs, s, e, map, buffers[t]);
            });
            Parallel.For(0, threads, options, u => MergeOwner(buffers, target, u));
        }
    }

    private static void Produce<T, TMap>(T[] keys, double[] coeffs, int start, int end, TMap map, EmitBuffer<T> sink)
        where T : unmanaged, IPauliKey<T>
        where TMap : struct, IPauliMap<T>
    {
        Array.Clear(sink.Counts);
        for (int i = start; i < end; i++) map.Apply(keys[i], coeffs[i], sink);
    }

    private static void MergeOwner<T>(EmitBuffer<T>[] buffers, PauliAccumulator<T> target, int owner)
        where T : unmanaged, IPauliKey<T>
    {
        var parts = target.Parts;
        int shift = target.Shift;
        foreach (var buf in buffers)
        {
            var entries = buf.Streams[owner];
            int c = buf.Counts[owner];
            for (int i = 0; i < c; i++)
            {
                if (i + Ahead < c)
                {
                    ulong ha = entries[i + Ahead].Hash;
                    parts[(int)(ha >> shift)].Prefetch(ha);
                }
                ref var e = ref entries[i];
                parts[(int)(e.Hash >> shift)].Add(e.Key, e.Value, e.Hash);
            }
        }
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
