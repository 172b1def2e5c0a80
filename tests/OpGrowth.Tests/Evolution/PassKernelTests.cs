using OpGrowth.Evolution;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Evolution;

/// <summary>
/// The pass kernels changed for speed and memory (accumulator growth, two-stage prefetch merge, parallel top-M
/// boundary, compaction into the source buffer) against plain references: a dictionary in insertion order, a full
/// sort, and the same work at one and two threads.
/// </summary>
public class PassKernelTests
{
    [Fact]
    public void PassAccumulator_ManyKeysAndRepeats_SumsAndOrderMatchDictionary_CapacityWithinAQuarter()
    {
        // Reference: a Dictionary summing the same contributions in the same order (exact: each key's sum is formed
        // in the same order in both). Insertion order per partition is the order of first appearance.
        var rng = new Random(11);
        var acc = new PassAccumulator<Pauli64>(6);
        var reference = new Dictionary<Pauli64, double>();
        var firstSeen = new List<Pauli64>();
        var pool = new Pauli64[60000];
        for (int i = 0; i < pool.Length; i++) pool[i] = new Pauli64((ulong)rng.NextInt64(), (ulong)rng.NextInt64());
        for (int i = 0; i < 400000; i++)
        {
            var k = pool[rng.Next(pool.Length)];
            double v = rng.NextDouble() - 0.5;
            acc.Add(k, v);
            if (reference.TryGetValue(k, out double s)) reference[k] = s + v;
            else
            {
                reference[k] = v;
                firstSeen.Add(k);
            }
        }
        Assert.Equal(reference.Count, acc.Count);
        foreach (var part in acc.Parts)
        {
            for (int i = 0; i < part.Count; i++) Assert.Equal(reference[part.Entries[i].Key], part.Entries[i].Val);
            // Growth by a quarter (at least 16 entries): never more than 25% unused beyond the first 16.
            Assert.True(part.Entries.Length <= Math.Max(16, part.Count + part.Count / 4 + 16), $"capacity {part.Entries.Length} for {part.Count}");
        }
        int shift = acc.Shift;
        var byPartition = firstSeen.GroupBy(k => (int)(k.Hash64 >> shift)).ToDictionary(g => g.Key, g => g.ToList());
        for (int p = 0; p < acc.Parts.Length; p++)
        {
            var expected = byPartition.TryGetValue(p, out var l) ? l : [];
            Assert.Equal(expected, acc.Parts[p].Entries.Take(acc.Parts[p].Count).Select(e => e.Key));
        }
    }

    [Fact]
    public void PassEmitter_ChunkChains_ReturnEveryGroupsContributionsInEmissionOrder_AcrossReuseAndPoolGrowth()
    {
        // Reference: the emitted sequence filtered by group (top hash bits, as EmitBuffer groups partitions), in
        // order. Three blocks of different sizes reuse the emitter; the second outgrows the initial pool. Keys are
        // drawn from a small pool too, so one group receives long runs (the burst the chunked design is for).
        var rng = new Random(17);
        var emitter = new PassEmitter<Pauli64>();
        const int partitionBits = 10;
        emitter.Reset(64 - partitionBits);
        int groupBits = partitionBits - EmitBuffer<Pauli64>.PartitionsPerGroupBits;
        Assert.Equal(1 << groupBits, emitter.Groups);
        var keys = new Pauli64[5000];
        for (int i = 0; i < keys.Length; i++) keys[i] = new Pauli64((ulong)rng.NextInt64(), (ulong)rng.NextInt64());
        int largest = 0;
        foreach (int count in new[] { 3000, 200000, 777 })
        {
            largest = Math.Max(largest, count);
            emitter.Clear();
            var emitted = new List<(Pauli64 Key, double Value)>();
            for (int i = 0; i < count; i++)
            {
                var k = i % 3 == 0 ? keys[0] : keys[rng.Next(keys.Length)];
                double v = rng.NextDouble();
                emitter.Emit(k, v);
                emitted.Add((k, v));
            }
            Assert.Equal(count, emitter.Count);
            var byGroup = emitted.ToLookup(e => (int)(e.Key.Hash64 >> (64 - groupBits)));
            for (int g = 0; g < emitter.Groups; g++)
            {
                var got = new List<(Pauli64, double)>();
                for (int c = emitter.Head[g]; c >= 0; c = emitter.Next[c])
                {
                    int n = c == emitter.Tail[g] ? emitter.TailFill[g] : PassEmitter<Pauli64>.ChunkSize;
                    for (int i = 0; i < n; i++)
                    {
                        var e = emitter.Pool[c * PassEmitter<Pauli64>.ChunkSize + i];
                        Assert.Equal(e.Key.Hash64, e.Hash);
                        got.Add((e.Key, e.Value));
                    }
                }
                Assert.Equal(byGroup[g].ToList(), got);
            }
            // The pool holds the largest block so far plus at most one partly filled chunk per group, with the
            // slack of growth by half.
            Assert.True(emitter.Pool.Length <= (largest + emitter.Groups * PassEmitter<Pauli64>.ChunkSize) * 3 / 2 + 64 * PassEmitter<Pauli64>.ChunkSize,
                $"pool {emitter.Pool.Length} for {largest}");
        }
    }

    [Fact]
    public void Compactor_TopMWithManyTies_OneAndTwoThreadsKeepTheSameStringsInStorageOrder()
    {
        // Reference: sort by |c| descending with ties broken by storage order (partition, then insertion), take M,
        // and write the survivors in storage order. Magnitudes from a set of six values, so the cut falls inside a
        // large tie group; 100k strings spread over 256 partitions reach the parallel paths.
        var rng = new Random(5);
        var acc = new PassAccumulator<Pauli64>(8);
        double[] levels = [1.0, 0.5, 0.25, 0.125, 0.0625, 1.0 / 3];
        for (int i = 0; i < 100000; i++)
        {
            double c = levels[rng.Next(levels.Length)] * (rng.Next(2) == 0 ? -1 : 1);
            acc.Add(new Pauli64((ulong)rng.NextInt64(), (ulong)rng.NextInt64()), c);
        }
        var storage = acc.Parts.SelectMany(p => p.Entries.Take(p.Count)).Select((e, i) => (e.Key, e.Val, Index: i)).ToList();
        const int m = 41234;
        var keep = storage.OrderByDescending(e => Math.Abs(e.Val)).ThenBy(e => e.Index).Take(m).ToHashSet();
        var expected = storage.Where(keep.Contains).ToList();
        double dropped = storage.Where(e => !keep.Contains(e)).Sum(e => e.Val * e.Val);
        foreach (int threads in new[] { 1, 2 })
        {
            var dest = new OperatorBuffer<Pauli64>();
            var stats = new Compactor<Pauli64>(threads).Compact(acc, new CompactRule(0, int.MaxValue, m, null), dest);
            Assert.Equal(m, dest.Count);
            Assert.Equal(expected.Select(e => e.Key), dest.KeySpan.ToArray());
            Assert.Equal(expected.Select(e => e.Val), dest.CoeffSpan.ToArray());
            Assert.Equal(Math.Abs(expected.Min(e => Math.Abs(e.Val))), stats.CutMagnitude);
            // Sums over 10^5 terms in a different order than LINQ's: agree to rounding (1e-9 relative).
            Assert.Equal(dropped, stats.DeletedWeight, dropped * 1e-9);
        }
    }

    [Fact]
    public void Compactor_IntoItsOwnSourceBuffer_GivesTheSameOperatorAsIntoAFreshBuffer()
    {
        // The engine now compacts into the buffer the pass read from. Reference: the same accumulator compacted into
        // a fresh buffer; the source buffer starts with unrelated content of a different length.
        var rng = new Random(3);
        var acc = new PassAccumulator<Pauli64>(5);
        for (int i = 0; i < 30000; i++) acc.Add(new Pauli64((ulong)rng.NextInt64(), (ulong)rng.NextInt64()), rng.NextDouble() - 0.5);
        var fresh = new OperatorBuffer<Pauli64>();
        var a = new Compactor<Pauli64>(2).Compact(acc, new CompactRule(1e-3, int.MaxValue, 20000, null), fresh);
        var reused = new OperatorBuffer<Pauli64>();
        reused.CopyFrom(Enumerable.Range(0, 25000).Select(i => new Pauli64((ulong)i, 0)).ToArray(), new double[25000]);
        var b = new Compactor<Pauli64>(2).Compact(acc, new CompactRule(1e-3, int.MaxValue, 20000, null), reused);
        Assert.Equal(a, b);
        Assert.Equal(fresh.KeySpan.ToArray(), reused.KeySpan.ToArray());
        Assert.Equal(fresh.CoeffSpan.ToArray(), reused.CoeffSpan.ToArray());
    }

    [Fact]
    public void TrotterPasses_OneVersusTwoThreads_SameOperatorBitForBit()
    {
        // Determinism contract of the pass (merge order, parallel top-M boundary): the operator after several truncated
        // Trotter steps is the same array, bit for bit, at 1 and 2 threads (top-M cut active in every pass).
        int n = 40;
        var h = EvolutionTestKit.MixedFieldIsing(n);
        var problem = new EvolutionProblem { N = n, Hamiltonian = h, Initial = EvolutionProblem.Probe(PauliString.Single(n, 20, 'Z')) };
        (ulong Sum, int Count) Go(int threads)
        {
            var options = new EvolutionOptions
            {
                Method = IntegrationMethod.Trotter2,
                Dt = 0.1,
                Time = 100,
                Threads = threads,
                Truncation = new TruncationPolicy { MaxStrings = 50000, MemoryBytes = 2L << 30 },
            };
            var budget = OperatorEvolution.ResolveBudgets(problem, options, out _)[0];
            var engine = new EvolutionEngine<Pauli64>(problem, options, budget, 0, null);
            engine.Start();
            for (int s = 0; s < 14; s++) engine.Step(1);
            return (engine.OperatorChecksum(), engine.StringCount);
        }
        var one = Go(1);
        var two = Go(2);
        Assert.Equal(50000, one.Count); // the budget is full: every pass cuts
        Assert.Equal(one.Sum, two.Sum);
        Assert.Equal(one.Count, two.Count);
    }
}
