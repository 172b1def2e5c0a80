using System.Diagnostics;
using System.Runtime.CompilerServices;
using Microsoft.Extensions.Logging;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// The recursion loop, generic over the key width and the representation. One step is
/// A_n = i[H, O_{n-1}] + b~_{n-1} O_{n-2} accumulated in one accumulator (commutator in chunks, then the
/// scaled O_{n-2}), b_n = ||A_n||, O_n = A_n / b_n, optional truncation to the top-M strings.
/// </summary>
/// <remarks>
/// Source: recursion method, Viswanath and Mueller, "The Recursion Method" (Springer 1994); real-coefficient
/// form with L = [H, .] as in Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019).
/// Truncation: b_n is the norm of A_n before truncation; the kept part P A_n is renormalised to unit norm
/// and the next step uses b~_n = ||P A_n|| = b_n sqrt(1 - w_n) (w_n = discarded fraction), the exact
/// overlap -(O_{n-1}| i[H, O_n]) up to terms of order w, so A_{n+1} stays orthogonal to O_{n-1}.
/// </remarks>
internal static partial class LanczosEngine
{

    /// <summary>
    /// Process footprint per accounted byte: garbage awaiting collection, heap fragmentation and the
    /// runtime. Measured: peak resident set / peak accounted bytes = 1.16 (plain) and 1.30 (reflection
    /// reduction) for the depth-34 mixed-field Ising runs; the larger value is used.
    /// </summary>
    internal const double HeapOverhead = 1.3;

    /// <summary>Strings per commutator chunk at least; memory and cancellation are checked between chunks.</summary>
    private const int MinChunk = 1 << 20;

    /// <summary>
    /// Runs the recursion. <paramref name="onStep"/> gets each step's record and, when
    /// <paramref name="stepOperators"/> is set (or the run truncates or re-orthogonalizes), the new vector O_n.
    /// Exact runs without re-orthogonalization take the unmanaged-memory route (<see cref="RunExact"/>), which
    /// gives bit for bit the same b_n; <paramref name="managedRoute"/> forces the managed one (for comparison).
    /// </summary>
    public static LanczosResult Run<T, TBasis>(TBasis basis, PauliOperator<T> o0, LanczosOptions opt, string representation, int sites,
        Action<LanczosStep, PauliOperator<T>?>? onStep = null, bool stepOperators = false, bool managedRoute = false)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        opt.Validate();
        if (!managedRoute && opt.MaxStrings == 0 && opt.Reorthogonalize == Reorthogonalization.None)
            return RunExact(basis, o0, opt, representation, sites, onStep, stepOperators);
        var log = opt.Logger;
        var total = Stopwatch.StartNew();
        int perString = Unsafe.SizeOf<T>() + sizeof(double);
        int entryBytes = Unsafe.SizeOf<T>() + 16; // one emitted contribution: key, value, hash
        var b = new List<double>();
        var steps = new List<LanczosStep>();
        var kept = new List<HashSortedVector<T>>();
        bool reorth = opt.Reorthogonalize != Reorthogonalization.None;
        long peakAccounted = 0, peakManaged = 0;

        var cur = o0.Clone();
        double norm0 = Math.Sqrt(KrylovVectors.NormSquared(cur, basis));
        if (norm0 == 0 || !double.IsFinite(norm0)) throw new ArgumentException("The probe operator has zero norm.", nameof(o0));
        cur.Scale(1 / norm0);
        if (reorth)
        {
            cur = HashSortedVector<T>.Sort(cur).Sorted;
            kept.Add(HashSortedVector<T>.FromSorted(cur));
        }
        PauliOperator<T>? prev = null;
        double coupling = 0;            // b~_{n-1}
        double accBytesPerString = 48;  // prior until measured: (key + value) / load 0.35..0.7 = 34..69 B for N <= 64
        double growth = 8;              // prior growth ratio of string count per step until measured
        double workDone = 0;            // commutator products formed so far (for StopAtProducts)
        var stop = LanczosStopReason.DepthReached;
        string stopMessage = $"all {opt.Depth} coefficients computed";

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
            long predicted = (long)Math.Ceiling(cur.Count * growth * 1.1);
            // The map driver's emit buffers: one block of inputs times the products per input (sampled),
            // with up to 2x slack from doubling, plus their initial streams.
            double products = ProductsPerInput(basis, cur.Count, i => (cur.Keys[i], cur.Coefficients[i]));
            if (opt.MaxStrings == 0 && LimitReached(opt, n, predicted, workDone, cur.Count, products) is { } limit)
            {
                stop = LanczosStopReason.StringLimit;
                stopMessage = limit;
                break;
            }
            workDone += cur.Count * products;
            long emitAllowance = ((long)opt.Threads * opt.Threads * 1024 + PauliMapper.BufferedEmissionsBound(cur.Count, products) * 2) * entryBytes;
            long held = cur.AllocatedBytes + (prev?.AllocatedBytes ?? 0) + kept.Sum(v => v.Bytes) + emitAllowance;
            long predictedBytes = held + (long)(predicted * (accBytesPerString + perString));
            if (predictedBytes * HeapOverhead > opt.MemoryBudgetBytes)
            {
                stop = LanczosStopReason.MemoryBudget;
                stopMessage = $"memory budget: step {n} would need about {Gib(predictedBytes)} (about {predicted:N0} strings at {accBytesPerString + perString:F0} B each, plus {Gib(held)} held; times {HeapOverhead} for the heap: {Gib((long)(predictedBytes * HeapOverhead))}) > budget {Gib(opt.MemoryBudgetBytes)}";
                break;
            }

            var acc = PauliAccumulator<T>.For(o0.N, predicted);
            int stepIndex = n;
            bool completed = Accumulate(basis, cur, prev, coupling, acc, opt.Threads, done =>
            {
                if ((held + acc.AllocatedBytes) * HeapOverhead > opt.MemoryBudgetBytes)
                {
                    stop = LanczosStopReason.MemoryBudget;
                    stopMessage = $"memory budget: step {stepIndex} exceeded {Gib(opt.MemoryBudgetBytes)} while accumulating ({acc.Count:N0} strings after {done:N0} of {cur.Count:N0} inputs); the step was abandoned";
                    return false;
                }
                if (opt.Cancellation.IsCancellationRequested)
                {
                    stop = LanczosStopReason.Cancelled;
                    stopMessage = $"cancelled during step {stepIndex}";
                    return false;
                }
                return true;
            });
            if (!completed) break;
            long accCount = acc.Count;
            long accBytes = acc.AllocatedBytes;
            long accounted = held + accBytes + accCount * perString;
            if (accounted * HeapOverhead > opt.MemoryBudgetBytes)
            {
                stop = LanczosStopReason.MemoryBudget;
                stopMessage = $"memory budget: step {n} needs {Gib(accounted)} (times {HeapOverhead} for the heap) to compact {accCount:N0} strings > budget {Gib(opt.MemoryBudgetBytes)}; the step was abandoned";
                break;
            }
            if (accCount > 0) accBytesPerString = (double)accBytes / accCount;
            if (cur.Count > 0) growth = Math.Max(1.0, (double)accCount / cur.Count);
            var a = acc.ToOperator();
            acc = null;

            double? orthLoss = null;
            HashSortedVector<T>? aView = null;
            if (reorth)
            {
                (a, aView) = HashSortedVector<T>.Sort(a);
                double an = Math.Sqrt(KrylovVectors.NormSquared(a, basis));
                const int from = 0; // Partial: kept holds only the window
                var overlaps = new double[kept.Count];
                double worst = 0;
                for (int k = from; k < kept.Count; k++)
                {
                    overlaps[k] = HashSortedVector<T>.Inner(kept[k], aView, basis);
                    // In exact arithmetic every overlap vanishes (the recurrence makes A_n orthogonal to all
                    // earlier vectors); what is found measures rounding and truncation losses, relative to ||A_n||.
                    if (an > 0) worst = Math.Max(worst, Math.Abs(overlaps[k]) / an);
                }
                orthLoss = worst;
                var missing = new PauliAccumulator<T>(o0.N, 4);
                for (int k = from; k < kept.Count; k++)
                {
                    if (overlaps[k] != 0) HashSortedVector<T>.SubtractInto(aView, kept[k], overlaps[k], missing);
                }
                if (missing.Count > 0)
                {
                    var extra = missing.ToOperator();
                    var merged = Liouvillian.Combine(1.0, a, 1.0, extra);
                    (a, aView) = HashSortedVector<T>.Sort(merged);
                }
            }

            double bn = Math.Sqrt(KrylovVectors.NormSquared(a, basis));
            if (!double.IsFinite(bn)) throw new ArithmeticException($"b_{n} is not finite.");
            if (b.Count > 0 && bn <= opt.ClosureTolerance * b[0] || bn == 0)
            {
                stop = LanczosStopReason.KrylovSpaceClosed;
                stopMessage = $"Krylov space closed: b_{n} = {bn:G3} vanishes (below {opt.ClosureTolerance:G2} b_1)";
                break;
            }
            a.Scale(1 / bn);
            long before = a.Count;
            double discarded = 0;
            double keptNorm = 1;
            if (opt.MaxStrings > 0 && a.Count > opt.MaxStrings)
            {
                discarded = KrylovVectors.KeepTop(a, opt.MaxStrings, basis);
                keptNorm = Math.Sqrt(KrylovVectors.NormSquared(a, basis));
                a.Scale(1 / keptNorm);
                a.TrimExcess();
            }
            if (reorth)
            {
                kept.Add(HashSortedVector<T>.FromSorted(a));
                if (opt.Reorthogonalize == Reorthogonalization.Partial && kept.Count > opt.ReorthogonalizationWindow) kept.RemoveAt(0);
            }
            var (first, last, span) = KrylovVectors.Extent(a);
            b.Add(bn);
            prev = cur;
            cur = a;
            coupling = bn * keptNorm;
            if (held - emitAllowance + accBytes > 256L << 20) GC.Collect();
            long managed = GC.GetTotalMemory(false);
            peakManaged = Math.Max(peakManaged, managed);
            peakAccounted = Math.Max(peakAccounted, accounted);
            var step = new LanczosStep
            {
                N = n,
                B = bn,
                StringsBeforeTruncation = before,
                Strings = a.Count,
                DiscardedWeight = discarded,
                Seconds = sw.Elapsed.TotalSeconds,
                CpuSeconds = (Process.GetCurrentProcess().TotalProcessorTime - cpu0).TotalSeconds,
                AccountedBytes = accounted,
                AccumulatorBytesPerString = accBytesPerString,
                SupportFirst = first,
                SupportLast = last,
                MaxSpan = span,
                OrthogonalityLoss = orthLoss,
            };
            steps.Add(step);
            log?.LogDebug("lanczos step {N}: b = {B:F10}, {Strings:N0} strings ({Before:N0} before truncation), discarded {W:G3}, {Sec:F2} s ({Cpu:F1} s CPU), {Mem} accounted, {Managed} managed",
                n, bn, a.Count, before, discarded, step.Seconds, step.CpuSeconds, Gib(accounted), Gib(managed));
            onStep?.Invoke(step, a);
        }

        return new LanczosResult
        {
            B = b,
            Steps = steps,
            StopReason = stop,
            StopMessage = stopMessage,
            MaxStrings = opt.MaxStrings,
            Reorthogonalize = opt.Reorthogonalize,
            ReorthogonalizationBytes = kept.Sum(v => v.Bytes),
            PeakAccountedBytes = peakAccounted,
            PeakManagedBytes = peakManaged,
            Seconds = total.Elapsed.TotalSeconds,
            Representation = representation,
            Sites = sites,
        };
    }

    /// <summary>
    /// One step's accumulation, A_n = i[H, O_{n-1}] + coupling * O_{n-2}, into <paramref name="acc"/>: the
    /// commutator in chunks of the input (so memory and cancellation can be checked between chunks), then the
    /// scaled O_{n-2}. Returns false when <paramref name="afterChunk"/> (given the inputs done) asked to stop.
    /// </summary>
    internal static bool Accumulate<T, TBasis>(in TBasis basis, PauliOperator<T> cur, PauliOperator<T>? prev, double coupling,
        PauliAccumulator<T> acc, int threads, Func<int, bool> afterChunk)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        int chunk = Math.Max(MinChunk, cur.Count / 16);
        for (int s0 = 0; s0 < cur.Count; s0 += chunk)
        {
            int len = Math.Min(chunk, cur.Count - s0);
            var part = len == cur.Count ? cur : new PauliOperator<T>(cur.N, cur.Keys.Slice(s0, len).ToArray(), cur.Coefficients.Slice(s0, len).ToArray(), len);
            PauliMapper.Run(part, basis, acc, threads);
            if (!afterChunk(s0 + len)) return false;
        }
        if (prev is not null) acc.AddScaled(prev, coupling);
        return true;
    }

    /// <summary>
    /// Whether step <paramref name="n"/> would pass the run's string limit (about <paramref name="predicted"/>
    /// strings) or work limit (<paramref name="workDone"/> products so far plus <paramref name="inputs"/> times
    /// <paramref name="products"/>); the stop message, or null. Both routes stop on the same rule.
    /// </summary>
    private static string? LimitReached(LanczosOptions opt, int n, long predicted, double workDone, long inputs, double products)
    {
        if (n <= 1) return null;
        if (opt.StopAtStrings > 0 && predicted > opt.StopAtStrings)
            return FormattableString.Invariant($"string limit: step {n} would hold about {predicted:N0} strings, above the limit of {opt.StopAtStrings:N0}");
        if (opt.StopAtProducts > 0 && workDone + inputs * products > opt.StopAtProducts)
            return FormattableString.Invariant($"work limit: step {n} would bring the commutator products to about {Reporting.NumberFormat.Number(workDone + inputs * products, 3)} ({inputs:N0} strings times {products:F0} terms each), above the limit of {Reporting.NumberFormat.Number(opt.StopAtProducts, 3)} for the run");
        return null;
    }

    /// <summary>Mean number of contributions the map emits per input string, from up to 256 evenly spread inputs (<paramref name="item"/> gives input i).</summary>
    private static double ProductsPerInput<T, TBasis>(in TBasis basis, int count, Func<int, (T Key, double Value)> item)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        if (count == 0) return 0;
        var sink = new EmitBuffer<T>();
        sink.Reset(63, 1);
        int samples = Math.Min(256, count);
        long total = 0;
        for (int i = 0; i < samples; i++)
        {
            var (key, value) = item((int)((long)i * count / samples));
            Array.Clear(sink.Counts);
            basis.Apply(key, value, sink);
            total += sink.Counts[0];
        }
        return (double)total / samples;
    }

    internal static string Gib(long bytes) => bytes >= 1L << 30 ? $"{bytes / (double)(1L << 30):F2} GiB" : $"{bytes / (double)(1L << 20):F1} MiB";
}
