namespace OpGrowth.Pauli;

/// <summary>
/// Drives a string-by-string linear map over an operator on several threads without locks.
/// Input is processed in blocks; each block is cut into one contiguous slice per thread, each
/// thread emits into its own partitioned buffer, then each target partition is merged by one
/// thread, reading the thread buffers in slice order. Every string's contributions are therefore
/// summed in input order whatever the thread count: results are bit-identical at 1 and 2 threads.
/// </summary>
public static class PauliMapper
{
    /// <summary>Input strings per block: bounds the buffered contributions (memory) per pass.</summary>
    public const int BlockSize = 1 << 15;

    /// <summary>Accumulates map(O) into <paramref name="target"/>.</summary>
    public static void Run<T, TMap>(PauliOperator<T> source, TMap map, PauliAccumulator<T> target, int threads)
        where T : unmanaged, IPauliKey<T>
        where TMap : struct, IPauliMap<T>
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(threads, 1);
        int n = source.Count;
        if (n == 0) return;
        threads = Math.Min(threads, Math.Max(1, n / 256));
        var buffers = new EmitBuffer<T>[threads];
        for (int t = 0; t < threads; t++) buffers[t] = new EmitBuffer<T>(target.PartitionBits);
        var keys = source.KeyArray;
        var coeffs = source.CoefficientArray;
        var options = new ParallelOptions { MaxDegreeOfParallelism = threads };
        for (int b0 = 0; b0 < n; b0 += BlockSize)
        {
            int b1 = Math.Min(n, b0 + BlockSize);
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
            Merge(buffers, target, threads, options);
        }
    }

    private static void Produce<T, TMap>(T[] keys, double[] coeffs, int start, int end, TMap map, EmitBuffer<T> sink)
        where T : unmanaged, IPauliKey<T>
        where TMap : struct, IPauliMap<T>
    {
        sink.Clear();
        for (int i = start; i < end; i++) map.Apply(keys[i], coeffs[i], sink);
    }

    private static void Merge<T>(EmitBuffer<T>[] buffers, PauliAccumulator<T> target, int threads, ParallelOptions options)
        where T : unmanaged, IPauliKey<T>
    {
        int parts = target.Parts.Length;
        if (threads == 1)
        {
            for (int p = 0; p < parts; p++) MergePartition(buffers, target.Parts[p], p);
            return;
        }
        // Partitions are handed out in fixed stripes so each has exactly one writer.
        Parallel.For(0, threads, options, t =>
        {
            for (int p = t; p < parts; p += threads) MergePartition(buffers, target.Parts[p], p);
        });
    }

    private static void MergePartition<T>(EmitBuffer<T>[] buffers, PauliAccumulator<T>.Partition part, int p)
        where T : unmanaged, IPauliKey<T>
    {
        foreach (var buf in buffers)
        {
            var entries = buf.Entries[p];
            int c = buf.Counts[p];
            for (int i = 0; i < c; i++)
            {
                ref var e = ref entries[i];
                part.Add(e.Key, e.Value, e.Hash);
            }
        }
    }
}
