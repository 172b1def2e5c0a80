using OpGrowth.Krylov;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Krylov;

/// <summary>
/// The exact recursion's unmanaged route: the 8-byte chain key, the step table and its in-place compaction,
/// and the b_n, against the general Pauli-string form, the managed accumulator and the dense route.
/// </summary>
public class UnmanagedRouteTests
{
    private static PauliString RandomString(Random rng, int n)
    {
        var b = new PauliString.Builder(n);
        for (int j = 0; j < n; j++) b.Set(j, "IXYZ"[rng.Next(4)]);
        return b.Build();
    }

    [Fact]
    public void PackedKeys_RoundTripAndAgreeWithGeneralStrings()
    {
        // Reference: the general PauliString form (its product rule and commutation test); round trip of the
        // packed keys; the hash must equal Pauli64's for the same string, since the table order depends on it.
        CheckKey<ChainKey32>(new Random(181), [1, 7, 31, 32]);
        CheckKey<ChainKey48>(new Random(184), [1, 33, 40, 47, 48]);
    }

    private static void CheckKey<T>(Random rng, int[] sizes) where T : unmanaged, IPauliKey<T>
    {
        foreach (int n in sizes)
        {
            for (int trial = 0; trial < 400; trial++)
            {
                var a = RandomString(rng, n);
                var b = RandomString(rng, n);
                var ka = T.From(a);
                var kb = T.From(b);
                Assert.Equal(a, ka.ToPauliString(n));
                Assert.Equal(Pauli64.From(a).Hash64, ka.Hash64);
                Assert.Equal(ka, T.From(ka.ToPauliString(n)));
                var p = T.Multiply(ka, kb, out int phase);
                var q = PauliString.Multiply(a, b, out int refPhase);
                Assert.Equal(q, p.ToPauliString(n));
                Assert.Equal(refPhase & 3, phase);
                Assert.Equal(!a.CommutesWith(b), T.Anticommute(ka, kb));
                var sa = a.Support();
                Assert.Equal(sa.Length, ka.Weight);
                Assert.Equal(sa.Length == 0 ? -1 : sa[0], ka.FirstSite);
                Assert.Equal(sa.Length == 0 ? -1 : sa[^1], ka.LastSite);
                var sites = new int[64];
                int m = T.SupportSites(ka, sites);
                Assert.Equal(sa, sites[..m].ToArray());
                int site = rng.Next(n + 1);
                bool below = a.Support().Intersect(b.Support()).Any(j => j < site);
                Assert.Equal(below, T.OverlapBelow(ka, kb, site));
                Assert.Equal(a.Support().Intersect(b.Support()).Any(), T.Overlaps(ka, kb));
                for (int j = 0; j < n; j++) Assert.Equal(Pauli64.From(a).LetterCode(j), ka.LetterCode(j));
            }
        }
    }

    [Fact]
    public void PackedKeys_SitePermutationsMatchSixtyFourBitKey()
    {
        // Shift and mirror on the packed keys against the same operations on Pauli64 (KeyWordsTests checks those
        // against PauliString site by site).
        CheckPermutations<ChainKey32>(new Random(182), 32);
        CheckPermutations<ChainKey48>(new Random(185), 48);
    }

    private static void CheckPermutations<T>(Random rng, int capacity) where T : unmanaged, IPauliKey<T>
    {
        for (int trial = 0; trial < 300; trial++)
        {
            int n = rng.Next(2, capacity + 1);
            var s = RandomString(rng, n);
            var k = T.From(s);
            var w = Pauli64.From(s);
            int m = rng.Next(s.Support().DefaultIfEmpty(0).Max(), n);
            Assert.Equal(KeyWords<Pauli64>.Reflect(w, m).ToPauliString(n), KeyWords<T>.Reflect(k, m).ToPauliString(n));
            int first = Math.Max(0, k.FirstSite);
            int down = rng.Next(first + 1);
            Assert.Equal(KeyWords<Pauli64>.ShiftDown(w, down).ToPauliString(n), KeyWords<T>.ShiftDown(k, down).ToPauliString(n));
            int up = rng.Next(n - Math.Max(0, k.LastSite));
            Assert.Equal(KeyWords<Pauli64>.ShiftUp(w, up).ToPauliString(n), KeyWords<T>.ShiftUp(k, up).ToPauliString(n));
        }
    }

    [Fact]
    public void StoredPairs_TakeSixteenTwentyAndTwentyFourBytes()
    {
        // The bytes per stored string the documentation quotes.
        Assert.Equal(16, SlotVector<ChainKey32>.BytesPerString);
        Assert.Equal(20, SlotVector<ChainKey48>.BytesPerString);
        Assert.Equal(24, SlotVector<Pauli64>.BytesPerString);
    }

    /// <summary>The same contributions into the managed accumulator and the step table.</summary>
    private static void AssertSameCompaction<T>(int n, long presize, IReadOnlyList<(PauliString S, double C)> contributions, int threads)
        where T : unmanaged, IPauliKey<T>
    {
        var acc = PauliAccumulator<T>.For(n, presize);
        using var table = new StepTable<T>(n, presize);
        foreach (var (s, c) in contributions)
        {
            acc.Add(T.From(s), c);
            table.Add(T.From(s), c);
        }
        Assert.Equal(acc.Count, table.Count);
        var expected = acc.ToOperator();
        using var got = table.Compact(threads);
        Assert.Equal(expected.Count, got.Count);
        var items = got.Items;
        for (int i = 0; i < expected.Count; i++)
        {
            Assert.Equal(expected.Keys[i], items[i].Key);
            Assert.Equal(expected.Coefficients[i], items[i].Value);
        }
    }

    [Theory]
    [InlineData(30, 1)]
    [InlineData(30, 2)]
    [InlineData(20_000, 2)]
    public void StepTable_CompactsToTheManagedAccumulatorsOrder(long presize, int threads)
    {
        // Reference: PauliAccumulator (the managed route). Contributions with repeats, exact cancellations and
        // the identity; a presize of 30 for ~6,000 strings makes every partition grow (and the in-place
        // compaction fall back to a new block), 20,000 keeps the shared block.
        var rng = new Random(183);
        const int n = 24;
        var pool = Enumerable.Range(0, 6000).Select(_ => RandomString(rng, n)).ToArray();
        var list = new List<(PauliString, double)>();
        for (int i = 0; i < 20_000; i++) list.Add((pool[rng.Next(pool.Length)], rng.NextDouble() - 0.5));
        for (int i = 0; i < 300; i++)
        {
            list.Add((pool[i], 0.25));
            list.Add((pool[i], -0.25)); // cancels exactly if it was the only contribution
        }
        list.Add((PauliString.Identity(n), 0.5));
        AssertSameCompaction<ChainKey32>(n, presize, list, threads);
        AssertSameCompaction<ChainKey48>(n, presize, list, threads);
        AssertSameCompaction<Pauli64>(n, presize, list, threads);
    }

    [Theory]
    [InlineData(6, 31, "Z_2")]
    [InlineData(7, 32, "X_0 Y_3")]
    public void UnmanagedRoute_MatchesDenseLanczos(int n, int seed, string probe)
    {
        // Reference: dense matrices (Reference/Dense.cs, MathNet) with the recursion written out in the complex
        // form of conventions.md; 12 steps, tolerance 1e-10 (rounding differences are near 1e-13).
        const int depth = 12;
        var h = KrylovTestModels.Random2Local(n, seed);
        var p = PauliString.Parse(probe, n);
        var r = LanczosRecursion.Run(h, p, KrylovTestModels.Options(depth));
        var hm = Dense.Of(n, h.Terms);
        var cur = Dense.Of(p);
        cur /= Math.Sqrt(Dense.Inner(cur, cur).Real);
        MathNet.Numerics.LinearAlgebra.Matrix<System.Numerics.Complex>? prev = null;
        for (int k = 0; k < depth; k++)
        {
            var a = hm * cur - cur * hm;
            if (prev is not null) a -= prev * (System.Numerics.Complex)r.B[k - 1];
            double bn = Math.Sqrt(Dense.Inner(a, a).Real);
            Assert.True(Math.Abs(bn - r.B[k]) < 1e-10, $"b_{k + 1}: dense {bn} vs {r.B[k]}");
            prev = cur;
            cur = a / bn;
        }
    }

    [Fact]
    public void UnmanagedRoute_BitIdenticalToManagedRoute_PlainAndReflection_BothKeys()
    {
        // The unmanaged route promises the managed route's arithmetic in the managed route's order: same b_n to
        // the last bit, for the 8-byte key (chains up to 32 sites), the 12-byte key (33 to 48 sites) and the
        // 16-byte key, with and without the reflection reduction, at 1 and 2 threads.
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        const int depth = 18;
        foreach (int sites in new[] { 19, 41, 51 })
        {
            var h = cell.OpenChain(sites);
            var probe = PauliString.Single(sites, sites / 2, 'Z');
            foreach (int threads in new[] { 1, 2 })
            {
                var opt = KrylovTestModels.Options(depth) with { Threads = threads };
                var managed = PauliWidth.Dispatch<LanczosResult, Routes>(sites, new Routes(h, probe, opt, true, false));
                var fast = ChainWidth.Dispatch<LanczosResult, Routes>(sites, new Routes(h, probe, opt, false, false));
                Assert.Equal(managed.B, fast.B);
                var managedR = PauliWidth.Dispatch<LanczosResult, Routes>(sites, new Routes(h, probe, opt, true, true));
                var fastR = ChainWidth.Dispatch<LanczosResult, Routes>(sites, new Routes(h, probe, opt, false, true));
                Assert.Equal(managedR.B, fastR.B);
                for (int k = 0; k < depth; k++)
                {
                    Assert.Equal(managed.Steps[k].Strings, fast.Steps[k].Strings);
                    Assert.Equal(managed.Steps[k].SupportFirst, fast.Steps[k].SupportFirst);
                    Assert.Equal(managed.Steps[k].SupportLast, fast.Steps[k].SupportLast);
                }
            }
        }
    }

    [Fact]
    public void UnmanagedRoute_SameBitsAtOneToFourThreads()
    {
        // Determinism: depth 22 reaches ~3e5 strings (many chunks, every owner busy); 3 threads is the uneven
        // case (four partition groups over three owners).
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        var one = InfiniteChainLanczos.Run(cell, "Z", KrylovTestModels.Options(22) with { Threads = 1 });
        foreach (int threads in new[] { 2, 3, 4 })
        {
            var many = InfiniteChainLanczos.Run(cell, "Z", KrylovTestModels.Options(22) with { Threads = threads });
            Assert.Equal(one.B, many.B);
        }
    }

    /// <summary>The commutator map, failing on one chosen input string.</summary>
    private readonly struct FailingMap(PlainBasis<ChainKey32> inner, ChainKey32 poison) : IPauliMap<ChainKey32>
    {
        public void Apply(in ChainKey32 key, double coefficient, EmitBuffer<ChainKey32> sink)
        {
            if (key.Equals(poison)) throw new InvalidOperationException("poisoned input");
            inner.Apply(key, coefficient, sink);
        }
    }

    [Fact]
    public async Task StepDriver_FailureInAnyThread_EndsThePassWithTheError_DriverStillExact()
    {
        // A thread of the pipeline that throws must end the pass for all of them (no thread left waiting for
        // its chunks) with the original exception; the driver then runs the next pass as before: the table it
        // fills equals, bit for bit, the one filled with one thread (reference: the single-thread route).
        const int sites = 31, count = 40_000;
        var rng = new Random(2026);
        var keys = new HashSet<ChainKey32>();
        while (keys.Count < count) keys.Add(ChainKey32.From(RandomString(rng, sites)));
        var keyArray = keys.ToArray();
        var coeffs = keyArray.Select(_ => rng.NextDouble() - 0.5).ToArray();
        using var cur = SlotVector<ChainKey32>.From(new PauliOperator<ChainKey32>(sites, keyArray, coeffs, count));
        var h = KrylovTestModels.MixedIsing(1, 1.05, 0.5).OpenChain(sites).Compile<ChainKey32>();
        var basis = new PlainBasis<ChainKey32>(h);
        using var driver = new StepDriver<ChainKey32>();
        foreach (int at in new[] { 10, count / 2, count - 3 })
        {
            var poison = cur.Items[at].Key;
            // A fresh table each time (the failed pass leaves its table part-filled).
            using var table = new StepTable<ChainKey32>(sites, 20 * count);
            var pass = Task.Run(() => driver.Map(cur, 0, cur.Count, new FailingMap(basis, poison), table, 2));
            Assert.True(await Task.WhenAny(pass, Task.Delay(TimeSpan.FromSeconds(120))) == pass, $"the pass with a failure at input {at} did not end");
            await Assert.ThrowsAsync<InvalidOperationException>(() => pass);
        }
        using var t1 = new StepTable<ChainKey32>(sites, 20 * count);
        using var t2 = new StepTable<ChainKey32>(sites, 20 * count);
        using var single = new StepDriver<ChainKey32>();
        single.Map(cur, 0, cur.Count, basis, t1, 1);
        driver.Map(cur, 0, cur.Count, basis, t2, 2);
        using var a1 = t1.Compact(1);
        using var a2 = t2.Compact(2);
        Assert.True(a1.Count > count, $"{a1.Count} strings");
        Assert.Equal(a1.Count, a2.Count);
        for (int i = 0; i < a1.Count; i++)
        {
            Assert.Equal(a1.Items[i].Key, a2.Items[i].Key);
            Assert.Equal(a1.Items[i].Value, a2.Items[i].Value);
        }
    }

    [Fact]
    public void UnmanagedRoute_PooledTables_BitIdenticalToManagedRoute()
    {
        // From step 22 on the tables exceed PagePool.MinBytes, so later steps take the pages freed by earlier
        // ones (moved, then cleared); the b_n must still equal the managed route's to the last bit.
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        const int sites = 31, depth = 24;
        var h = cell.OpenChain(sites);
        var probe = PauliString.Single(sites, sites / 2, 'Z');
        var opt = KrylovTestModels.Options(depth) with { Threads = 2 };
        var managed = PauliWidth.Dispatch<LanczosResult, Routes>(sites, new Routes(h, probe, opt, true, false));
        var fast = ChainWidth.Dispatch<LanczosResult, Routes>(sites, new Routes(h, probe, opt, false, false));
        Assert.Equal(depth, fast.B.Count);
        Assert.True(fast.Steps[^1].Strings > 400_000, $"{fast.Steps[^1].Strings} strings: the last tables must be pooled");
        Assert.Equal(managed.B, fast.B);
    }

    [Fact]
    public unsafe void PagePool_ReusesFreedPagesCleared()
    {
        // A block is written, shrunk (its tail goes to the pool) and freed (the rest goes too); the next,
        // larger block must start with those pages, cleared, and be zero throughout.
        using var pool = new PagePool();
        const long mib = 1L << 20;
        var a = (byte*)pool.AllocateZeroed(16 * mib);
        new Span<byte>(a, (int)(16 * mib)).Fill(0xAB);
        a = (byte*)pool.Shrink(a, 6 * mib - 100);
        pool.Release(a);
        var b = (byte*)pool.AllocateZeroed(32 * mib);
        try
        {
            if (pool.Enabled)
            {
                Assert.Equal(16 * mib, pool.ReusedBytes);
                Assert.Equal(0, pool.PooledBytes);
            }
            var span = new Span<byte>(b, (int)(32 * mib));
            Assert.Equal(-1, span.IndexOfAnyExcept((byte)0));
            span.Fill(1); // the whole block is writable
        }
        finally
        {
            pool.Release(b);
        }
        var small = pool.AllocateZeroed(1024); // below MinBytes: the ordinary allocator
        pool.Release(small);
    }

    private readonly struct Routes(Hamiltonian h, PauliString probe, LanczosOptions options, bool managed, bool reflect) : IWidthFunc<LanczosResult>
    {
        public LanczosResult Invoke<T>() where T : unmanaged, IPauliKey<T>
        {
            var hc = h.Compile<T>();
            if (reflect)
            {
                var basis = new ReflectionBasis<T>(hc);
                var o0 = new PauliOperator<T>(h.N, [basis.Canonical(T.From(probe), out _)], [1.0], 1);
                return LanczosEngine.Run(basis, o0, options, "test", h.N, managedRoute: managed);
            }
            return LanczosEngine.Run(new PlainBasis<T>(hc), PauliOperator<T>.Single(probe), options, "test", h.N, managedRoute: managed);
        }
    }
}
