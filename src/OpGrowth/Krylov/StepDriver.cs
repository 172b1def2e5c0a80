using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Feeds a step table: the commutator of a stored vector (or a scaled copy of one) in blocks of input
/// strings. One thread: the contributions of a small block go to one stream (a few tens of kilobytes, still
/// in the first-level cache) and are then added to the table in emission order, the home slot of each one
/// prefetched 32 entries ahead. Several threads: a pipeline without barriers. The input is cut into
/// small contiguous chunks, taken in order by whichever thread is free and produced into a ring of emit
/// buffers, one stream per owner (partitions interleaved: with two owners, owner u holds every partition p
/// with p mod 2 = u); each owner adds its streams of chunk 0, 1, 2, ... in chunk order, whichever thread
/// produced them. Every string's contributions are therefore summed in input order, and every partition
/// receives its strings in input order, at any thread count and any chunk size: the result is bit-identical
/// to feeding the table one contribution at a time, as the managed accumulator is fed.
/// </summary>
internal sealed unsafe class StepDriver<T> : IDisposable where T : unmanaged, IPauliKey<T>
{
    /// <summary>Input strings in the first block or chunk of a pass (it measures the contributions per input).</summary>
    private const int FirstBlock = 16;

    /// <summary>Largest block of input strings.</summary>
    private const int MaxBlock = 1 << 21;

    /// <summary>Contributions per block with one thread (a few tens of kilobytes: the stream stays in the first-level cache).</summary>
    internal const long SingleBlockEmissions = 1 << 11;

    private EmitBuffer<T>[] _buffers = [];
    private Crew? _crew;

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
        long wanted = threads == 1 ? SingleBlockEmissions : ChunkEmissions;
        int buffers = threads == 1 ? 1 : threads * SlotsPerThread;
        // A block is sized by the contributions per input measured on the previous one: allow four times the
        // average for its strings, at least FirstBlock inputs, never more than the pass's inputs.
        long emissions = (long)Math.Ceiling(Math.Min(inputs * p, 4 * Math.Max(wanted, FirstBlock * p)));
        // Streams grow by doubling: up to twice a block's contributions, plus their initial sizes.
        return buffers * (emissions * 2 + 4096L) * Unsafe.SizeOf<EmitBuffer<T>.Entry>();
    }

    /// <summary>Drops the emit buffers (the next pass regrows them); the pipeline's threads stay parked.</summary>
    public void Release() => _buffers = [];

    /// <summary>Drops the emit buffers and stops the pipeline's threads.</summary>
    public void Dispose()
    {
        Release();
        _crew?.Dispose();
        _crew = null;
    }

    /// <summary>Input strings in the next block: about <paramref name="wanted"/> contributions at the last measured rate.</summary>
    private static int NextBlock(long wanted, double perInput) => (int)Math.Clamp(wanted / perInput, FirstBlock, MaxBlock);

    /// <summary>Contributions per input string of a block (at least 1, so an empty block does not blow up the next).</summary>
    private static double PerInput(long emitted, int inputs) => Math.Max(1.0, emitted / (double)inputs);

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
        if (threads == 1) RunSingle(source, start, end, producer, target);
        else RunPipeline(source, start, end, producer, target, threads);
    }

    /// <summary>
    /// One thread: one stream, drained every small block while it is still in the first-level cache, so the
    /// contributions go to the table in emission order with prefetching and without a round trip through memory.
    /// </summary>
    private void RunSingle<TProducer>(SlotVector<T> source, int start, int end, TProducer producer, StepTable<T> target)
        where TProducer : struct, IProducer
    {
        if (_buffers.Length < 1) _buffers = [new EmitBuffer<T>()];
        var buffer = _buffers[0];
        buffer.ResetInterleaved(target.Shift, 0);
        var items = source.Pointer;
        int blockSize = FirstBlock;
        for (int b0 = start, b1; b0 < end; b0 = b1)
        {
            b1 = (int)Math.Min(end, (long)b0 + blockSize);
            buffer.Counts[0] = 0;
            producer.Produce(items, b0, b1, buffer);
            Merge(buffer, 0, 1, target);
            blockSize = NextBlock(SingleBlockEmissions, PerInput(buffer.Counts[0], b1 - b0));
        }
    }

    /// <summary>
    /// Several threads: a pipeline of small chunks through a ring of emit buffers, with no barrier between
    /// chunks. Any thread that is free claims the next chunk of input strings (contiguous, in input order) and
    /// produces its contributions into the chunk's ring slot, one stream per owner; owner u adds its streams of
    /// chunk 0, 1, 2, ... strictly in chunk order into its own partitions, whichever thread produced them. So
    /// every partition receives its strings in input order, as with one thread, whatever the chunk sizes or the
    /// thread that produced them. A slot is claimed again only after every owner has added it; a thread that
    /// can neither add nor produce spins briefly.
    /// </summary>
    private void RunPipeline<TProducer>(SlotVector<T> source, int start, int end, TProducer producer, StepTable<T> target, int threads)
        where TProducer : struct, IProducer
    {
        int slots = threads * SlotsPerThread;
        if (_buffers.Length < slots)
        {
            var more = new EmitBuffer<T>[slots];
            for (int t = 0; t < slots; t++) more[t] = t < _buffers.Length ? _buffers[t] : new EmitBuffer<T>();
            _buffers = more;
        }
        // One stream per owner: the smallest power of two of groups >= threads; group g takes the partitions
        // p = g mod groups and is added by owner g mod threads only. Interleaved, not contiguous: the front of a
        // table reuses pages already held and the rest faults fresh pages in, which with contiguous halves made
        // one owner's additions a quarter slower than the other's.
        int groupBits = 0;
        while ((1 << groupBits) < threads) groupBits++;
        for (int r = 0; r < slots; r++) _buffers[r].ResetInterleaved(target.Shift, groupBits);
        if (_crew is null || _crew.Size != threads)
        {
            _crew?.Dispose();
            _crew = new Crew(threads);
        }
        var run = new PipelineRun(_buffers, slots, threads, start, end, source.Pointer);
        _crew.Run(owner => run.Work(owner, producer, target));
    }

    /// <summary>Emit buffers per thread in the pipeline's ring.</summary>
    internal const int SlotsPerThread = 4;

    /// <summary>Contributions per chunk of the pipeline (about a hundred kilobytes: produced and added while in the second-level cache).</summary>
    internal const long ChunkEmissions = 1 << 12;

    /// <summary>The shared state of one pipelined pass.</summary>
    private sealed class PipelineRun(EmitBuffer<T>[] ring, int slots, int owners, int start, int end, KeyValue<T>* items)
    {
        /// <summary>Longs between two counters (a cache line apart, so the threads do not write to one line).</summary>
        private const int Pad = 16;

        // Claim state, under the lock.
        private readonly Lock _claim = new();
        private int _pos = start;
        private long _claimed;
        private double _perInput = ChunkEmissions / (double)FirstBlock;
        // _ready[r * Pad] = k + 1 once chunk k is produced into slot r; _merged[u * Pad] = chunks owner u has added.
        private readonly long[] _ready = new long[slots * Pad];
        private readonly long[] _merged = new long[owners * Pad];
        private volatile bool _failed;

        [MethodImpl(MethodImplOptions.AggressiveOptimization)]
        public void Work<TProducer>(int owner, TProducer producer, StepTable<T> target) where TProducer : struct, IProducer
        {
            try
            {
                var spin = new SpinWait();
                while (!_failed)
                {
                    long k = _merged[owner * Pad];
                    int r = (int)(k % slots);
                    if (Volatile.Read(ref _ready[r * Pad]) == k + 1)
                    {
                        Merge(ring[r], owner, owners, target);
                        Volatile.Write(ref _merged[owner * Pad], k + 1);
                        spin.Reset();
                        continue;
                    }
                    long claimed;
                    int s, e;
                    lock (_claim)
                    {
                        claimed = _claimed;
                        s = _pos;
                        e = s;
                        if (s < end && claimed - MinMerged() < slots)
                        {
                            e = (int)Math.Min(end, s + (long)NextBlock(ChunkEmissions, _perInput));
                            _pos = e;
                            _claimed = claimed + 1;
                        }
                    }
                    if (e > s)
                    {
                        int rc = (int)(claimed % slots);
                        var buffer = ring[rc];
                        Array.Clear(buffer.Counts);
                        producer.Produce(items, s, e, buffer);
                        long emitted = 0;
                        foreach (int c in buffer.Counts) emitted += c;
                        _perInput = PerInput(emitted, e - s);
                        Volatile.Write(ref _ready[rc * Pad], claimed + 1);
                        spin.Reset();
                        continue;
                    }
                    if (s >= end && k == claimed) return;
                    spin.SpinOnce(sleep1Threshold: -1);
                }
            }
            catch
            {
                _failed = true;
                throw;
            }
        }

        private long MinMerged()
        {
            long m = long.MaxValue;
            for (int u = 0; u < owners; u++) m = Math.Min(m, Volatile.Read(ref _merged[u * Pad]));
            return m;
        }
    }

    /// <summary>
    /// Dedicated threads for the pipeline: all members must run at once (a member that waited for a pool thread
    /// would stall the others), so they are threads of their own, parked between passes. Member 0 is the caller.
    /// </summary>
    private sealed class Crew : IDisposable
    {
        private readonly Thread[] _threads;
        private readonly SemaphoreSlim[] _go;
        private readonly CountdownEvent _done;
        private readonly Exception?[] _errors;
        private Action<int>? _job;
        private volatile bool _stop;

        public Crew(int size)
        {
            Size = size;
            _threads = new Thread[size - 1];
            _go = new SemaphoreSlim[size - 1];
            _errors = new Exception?[size];
            _done = new CountdownEvent(size - 1);
            for (int i = 0; i < _threads.Length; i++)
            {
                int member = i + 1;
                _go[i] = new SemaphoreSlim(0);
                _threads[i] = new Thread(() => Loop(member)) { IsBackground = true, Name = $"opgrowth-step-{member}" };
                _threads[i].Start();
            }
        }

        public int Size { get; }

        private void Loop(int member)
        {
            var go = _go[member - 1];
            while (true)
            {
                go.Wait();
                if (_stop) return;
                try
                {
                    _job!(member);
                }
                catch (Exception e)
                {
                    _errors[member] = e;
                }
                finally
                {
                    _done.Signal();
                }
            }
        }

        /// <summary>Runs job(0..Size-1) at once, member 0 on the calling thread; rethrows the first failure.</summary>
        public void Run(Action<int> job)
        {
            Array.Clear(_errors);
            _job = job;
            _done.Reset(_threads.Length);
            foreach (var go in _go) go.Release();
            try
            {
                job(0);
            }
            catch (Exception e)
            {
                _errors[0] = e;
            }
            _done.Wait();
            _job = null;
            foreach (var e in _errors)
            {
                if (e is not null) System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(e);
            }
        }

        public void Dispose()
        {
            _stop = true;
            foreach (var go in _go) go.Release();
            foreach (var t in _threads) t.Join();
            foreach (var go in _go) go.Dispose();
            _done.Dispose();
        }
    }

    /// <summary>Prefetch distance of the merge, in contributions (32 was 3-5 % faster than 16 to b_29 at 1 and 2 threads on the 2-core VM, nine alternated pairs).</summary>
    private const int Ahead = 32;

    /// <summary>
    /// Adds the owner's streams of one buffer (groups g = owner, owner + owners, ...) into the table in emission
    /// order, prefetching the home slot a fixed distance ahead.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Merge(EmitBuffer<T> buffer, int owner, int owners, StepTable<T> target)
    {
        var parts = target.Parts;
        int shift = target.Shift;
        int ahead = Ahead;
        int groups = buffer.Groups;
        for (int g = owner; g < groups; g += owners)
        {
            var entries = buffer.Streams[g];
            int c = buffer.Counts[g];
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
            // The plain and mirror-pair bases' commutator has its own loop (same contributions, same order, same bits).
            if (typeof(TMap) == typeof(PlainBasis<T>)
                && CommutatorKernel<T>.Produce(Unsafe.As<TMap, PlainBasis<T>>(ref Unsafe.AsRef(in _map)).Map, items, start, end, sink))
                return;
            if (typeof(TMap) == typeof(ReflectionBasis<T>))
            {
                var basis = Unsafe.As<TMap, ReflectionBasis<T>>(ref Unsafe.AsRef(in _map));
                if (CommutatorKernel<T>.Produce(basis.Hamiltonian, items, start, end, sink, new ReflectionBasis<T>.PairClass(basis)))
                    return;
            }
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
