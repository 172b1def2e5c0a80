using System.Diagnostics;
using System.Numerics.Tensors;
using System.Runtime.InteropServices;
using Microsoft.Extensions.Logging;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

internal static partial class LanczosEngine
{
    /// <summary>
    /// Process footprint per accounted byte on the unmanaged route: the vectors and the step table live in
    /// unmanaged blocks that are freed the moment they die, so only the runtime, the emit buffers and a
    /// transient coefficient copy for the norm come on top. Measured (mixed-field Ising, Z, infinite chain):
    /// peak resident set / peak accounted bytes = 1.005 at depth 38 with reflection (14.21 GiB / 14.14 GiB)
    /// and about 1.07 at depth 29 (0.39 GiB / 0.36 GiB, where the runtime's own ~60 MB weighs most); 1.1
    /// leaves room.
    /// </summary>
    internal const double UnmanagedOverhead = 1.1;


    /// <summary>Inputs per commutator chunk at least; memory and cancellation are checked between chunks.</summary>
    private const int MinExactChunk = 1 << 20;

    /// <summary>
    /// The exact recursion (no truncation, no re-orthogonalization) with the vectors and the step's table in
    /// unmanaged memory. Per step: the table is presized as the managed route presizes its accumulator,
    /// i[H, O_{n-1}] is accumulated into it (chunks, then the scaled O_{n-2}, which is freed at once), the
    /// table is compacted in place into O_n's storage, b_n = ||A_n|| is taken over the compacted
    /// coefficients, and scaling and the support extent share one pass. Every floating-point operation and
    /// its order are those of the managed route, so the b_n agree bit for bit with it.
    /// Peak memory: table + O_{n-1} + O_{n-2} + emit buffers; a vector is never held twice.
    /// </summary>
    private static LanczosResult RunExact<T, TBasis>(TBasis basis, PauliOperator<T> o0, LanczosOptions opt, string representation, int sites,
        Action<LanczosStep, PauliOperator<T>?>? onStep, bool stepOperators)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        var log = opt.Logger;
        var total = Stopwatch.StartNew();
        var b = new List<double>();
        var steps = new List<LanczosStep>();
        long peakAccounted = 0, peakManaged = 0;

        var first = o0.Clone();
        double norm0 = Math.Sqrt(KrylovVectors.NormSquared(first, basis));
        if (norm0 == 0 || !double.IsFinite(norm0)) throw new ArgumentException("The probe operator has zero norm.", nameof(o0));
        first.Scale(1 / norm0);
        var cur = SlotVector<T>.From(first);
        SlotVector<T>? prev = null;
        var driver = new StepDriver<T>();
        using var pool = new PagePool();
        double coupling = 0;            // b_{n-1}
        double growth = 8;              // prior growth ratio of string count per step until measured (as the managed route)
        double workDone = 0;
        var stop = LanczosStopReason.DepthReached;
        string stopMessage = $"all {opt.Depth} coefficients computed";
        int slotBytes = SlotVector<T>.BytesPerString;
        try
        {
            for (int n = 1; n <= opt.Depth; n++)
            {
                if (opt.Cancellation.IsCancellationRequested)
                {
                    stop = LanczosStopReason.Cancelled;
                    stopMessage = $"cancelled before step {n}";
                    break;
                }
                var sw = Stopwatch.StartNew();
                var cpu0 = Process.GetCurrentProcess().TotalProcessorTime;
                // The same prediction as the managed route: it sets the table's partitions and capacities, hence the order.
                long predicted = (long)Math.Ceiling(cur.Count * growth * 1.1);
                var items = cur;
                double products = ProductsPerInput(basis, cur.Count, i => (items.Items[i].Key, items.Items[i].Value));
                if (LimitReached(opt, n, predicted, workDone, cur.Count, products) is { } limit)
                {
                    stop = LanczosStopReason.StringLimit;
                    stopMessage = limit;
                    break;
                }
                workDone += cur.Count * products;
                long emitAllowance = Math.Max(driver.BufferBytes, StepDriver<T>.BufferBound(opt.Threads, cur.Count, products));
                long held = cur.Bytes + (prev?.Bytes ?? 0) + emitAllowance;
                long tableBytes = StepTable<T>.PresizedBytes(predicted);
                long predictedBytes = held + tableBytes;
                if (Footprint(predictedBytes) > opt.MemoryBudgetBytes)
                {
                    stop = LanczosStopReason.MemoryBudget;
                    stopMessage = $"memory budget: step {n} would need about {Gib(predictedBytes)} (a table of {Gib(tableBytes)} for about {predicted:N0} strings at {slotBytes} B per slot, plus {Gib(held)} held; times {UnmanagedOverhead} for the process: {Gib(Footprint(predictedBytes))}) > budget {Gib(opt.MemoryBudgetBytes)}";
                    break;
                }

                var table = new StepTable<T>(o0.N, predicted, pool);
                SlotVector<T> a;
                long accounted, accCount, accBytes;
                try
                {
                    bool completed = true;
                    int chunk = Math.Max(MinExactChunk, cur.Count / 16);
                    for (int s0 = 0; s0 < cur.Count; s0 += chunk)
                    {
                        int s1 = (int)Math.Min(cur.Count, (long)s0 + chunk);
                        driver.Map(cur, s0, s1, basis, table, opt.Threads);
                        if (Footprint(held + table.AllocatedBytes) > opt.MemoryBudgetBytes)
                        {
                            stop = LanczosStopReason.MemoryBudget;
                            stopMessage = $"memory budget: step {n} exceeded {Gib(opt.MemoryBudgetBytes)} while accumulating ({table.Count:N0} strings after {s1:N0} of {cur.Count:N0} inputs); the step was abandoned";
                            completed = false;
                            break;
                        }
                        if (opt.Cancellation.IsCancellationRequested)
                        {
                            stop = LanczosStopReason.Cancelled;
                            stopMessage = $"cancelled during step {n}";
                            completed = false;
                            break;
                        }
                    }
                    if (!completed) break;
                    if (prev is not null)
                    {
                        driver.AddScaled(prev, coupling, table, opt.Threads);
                        prev.Dispose();
                        prev = null;
                    }
                    accCount = table.Count;
                    accBytes = table.AllocatedBytes;
                    accounted = held + accBytes;
                    a = table.Compact(opt.Threads, keepSpare: true);
                }
                finally
                {
                    table.Dispose();
                }
                if (accCount > 0 && cur.Count > 0) growth = Math.Max(1.0, (double)accCount / cur.Count);

                double bn;
                try
                {
                    bn = Math.Sqrt(NormSquared(a, basis, opt.Threads));
                    a.TrimExcess();
                }
                catch
                {
                    a.Dispose();
                    throw;
                }
                if (!double.IsFinite(bn))
                {
                    a.Dispose();
                    throw new ArithmeticException($"b_{n} is not finite.");
                }
                if (b.Count > 0 && bn <= opt.ClosureTolerance * b[0] || bn == 0)
                {
                    a.Dispose();
                    stop = LanczosStopReason.KrylovSpaceClosed;
                    stopMessage = $"Krylov space closed: b_{n} = {bn:G3} vanishes (below {opt.ClosureTolerance:G2} b_1)";
                    break;
                }
                var (lo, hi, span) = ScaleAndExtent(a, 1 / bn, opt.Threads);
                b.Add(bn);
                prev = cur;
                cur = a;
                coupling = bn;
                if (a.Count >= 1 << 20)
                {
                    // Large steps: the emit buffers are regrown by the next step (cheap next to it), and the
                    // managed heap gives its free memory back, so the process holds little besides the vectors.
                    driver.Release();
                    GC.Collect(2, GCCollectionMode.Aggressive, blocking: true, compacting: true);
                }
                long managed = GC.GetTotalMemory(false);
                peakManaged = Math.Max(peakManaged, managed);
                peakAccounted = Math.Max(peakAccounted, accounted);
                var step = new LanczosStep
                {
                    N = n,
                    B = bn,
                    StringsBeforeTruncation = a.Count,
                    Strings = a.Count,
                    DiscardedWeight = 0,
                    Seconds = sw.Elapsed.TotalSeconds,
                    CpuSeconds = (Process.GetCurrentProcess().TotalProcessorTime - cpu0).TotalSeconds,
                    AccountedBytes = accounted,
                    AccumulatorBytesPerString = accCount > 0 ? (double)accBytes / accCount : 0,
                    SupportFirst = lo,
                    SupportLast = hi,
                    MaxSpan = span,
                };
                steps.Add(step);
                log?.LogDebug("lanczos step {N}: b = {B:F10}, {Strings:N0} strings, {Sec:F2} s ({Cpu:F1} s CPU), {Mem} accounted ({Table} table, {Reused} of it reused pages so far), {Managed} managed",
                    n, bn, a.Count, step.Seconds, step.CpuSeconds, Gib(accounted), Gib(accBytes), Gib(pool.ReusedBytes), Gib(managed));
                onStep?.Invoke(step, stepOperators ? a.ToOperator() : null);
            }
        }
        finally
        {
            cur.Dispose();
            prev?.Dispose();
            driver.Dispose();
        }

        return new LanczosResult
        {
            B = b,
            Steps = steps,
            StopReason = stop,
            StopMessage = stopMessage,
            MaxStrings = 0,
            Reorthogonalize = Reorthogonalization.None,
            ReorthogonalizationBytes = 0,
            PeakAccountedBytes = peakAccounted,
            PeakManagedBytes = peakManaged,
            Seconds = total.Elapsed.TotalSeconds,
            Representation = representation,
            Sites = sites,
        };
    }

    /// <summary>
    /// One whole step without limits (for benchmarks): A = i[H, cur] + coupling * prev accumulated in a table
    /// presized for <paramref name="predicted"/> strings and compacted; the caller takes the norm and scales.
    /// </summary>
    internal static SlotVector<T> ExactStep<T, TBasis>(StepDriver<T> driver, TBasis basis, SlotVector<T> cur, SlotVector<T>? prev, double coupling, long predicted, int threads)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        using var table = new StepTable<T>(cur.N, predicted);
        driver.Map(cur, 0, cur.Count, basis, table, threads);
        if (prev is not null) driver.AddScaled(prev, coupling, table, threads);
        return table.Compact(threads);
    }

    /// <summary>Expected footprint for a number of accounted bytes (compared with the budget, as the managed route does).</summary>
    internal static long Footprint(long accountedBytes) => (long)(accountedBytes * UnmanagedOverhead);

    /// <summary>
    /// (A|A) in the representation: unweighted, the sum of squares of the coefficients as one contiguous
    /// array, exactly as <see cref="KrylovVectors.NormSquared"/> sums them; weighted, w c c in storage order.
    /// </summary>
    internal static double NormSquared<T, TBasis>(SlotVector<T> a, in TBasis basis, int threads = 1)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        var items = a.Items;
        if (!basis.IsWeighted)
        {
            // One contiguous copy of the coefficients (TensorPrimitives sums in an order that depends only on
            // the length, not on the address: measured, same bits at all eight alignments of a double). The
            // copy goes into the vector's spare tail when it has one (the rest of the step table: pages
            // already touched, where fresh memory would be faulted in page by page), else into unmanaged
            // memory freed at once; the copy is split over the threads, the sum is one serial pass.
            var spare = a.SpareDoubles;
            unsafe
            {
                double* c = null;
                try
                {
                    Span<double> span;
                    if (spare.Length >= items.Length)
                    {
                        span = spare[..items.Length];
                    }
                    else
                    {
                        c = (double*)NativeMemory.Alloc((nuint)Math.Max(1, items.Length), sizeof(double));
                        span = new Span<double>(c, items.Length);
                    }
                    CopyValues(a, span, threads);
                    return TensorPrimitives.SumOfSquares(span);
                }
                finally
                {
                    if (c != null) NativeMemory.Free(c);
                }
            }
        }
        double s = 0;
        for (int i = 0; i < items.Length; i++) s += basis.Weight(items[i].Key) * items[i].Value * items[i].Value;
        return s;
    }

    /// <summary>Copies the coefficients of <paramref name="a"/> into <paramref name="target"/> (one slice per thread).</summary>
    private static unsafe void CopyValues<T>(SlotVector<T> a, Span<double> target, int threads)
        where T : unmanaged, IPauliKey<T>
    {
        int n = a.Count;
        threads = Math.Max(1, Math.Min(threads, n / (1 << 16)));
        var src = a.Pointer;
        fixed (double* dst0 = target)
        {
            var dst = dst0;
            void Part(int t)
            {
                int s = (int)((long)n * t / threads), e = (int)((long)n * (t + 1) / threads);
                for (int i = s; i < e; i++) dst[i] = src[i].Value;
            }
            if (threads == 1) Part(0);
            else Parallel.For(0, threads, new ParallelOptions { MaxDegreeOfParallelism = threads }, Part);
        }
    }

    /// <summary>Multiplies every coefficient by <paramref name="factor"/> and measures the support (lowest and highest site, largest span).</summary>
    internal static (int First, int Last, int MaxSpan) ScaleAndExtent<T>(SlotVector<T> a, double factor, int threads)
        where T : unmanaged, IPauliKey<T>
    {
        int n = a.Count;
        threads = Math.Max(1, Math.Min(threads, n / (1 << 16)));
        var lo = new int[threads];
        var hi = new int[threads];
        var span = new int[threads];
        void Part(int t)
        {
            var items = a.Items;
            int s = (int)((long)n * t / threads), e = (int)((long)n * (t + 1) / threads);
            int l = int.MaxValue, h = -1, sp = 0;
            for (int i = s; i < e; i++)
            {
                ref var it = ref items[i];
                it.Value *= factor;
                int f = it.Key.FirstSite;
                if (f < 0) continue;
                int last = it.Key.LastSite;
                if (f < l) l = f;
                if (last > h) h = last;
                if (last - f + 1 > sp) sp = last - f + 1;
            }
            lo[t] = l;
            hi[t] = h;
            span[t] = sp;
        }
        if (threads == 1) Part(0);
        else Parallel.For(0, threads, new ParallelOptions { MaxDegreeOfParallelism = threads }, Part);
        int lo0 = lo.Min(), hi0 = hi.Max(), span0 = span.Max();
        return hi0 < 0 ? (-1, -1, 0) : (lo0, hi0, span0);
    }
}
