using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Pauli;

/// <summary>
/// The per-site window tables (<see cref="SiteWindows{T}"/>) and the step driver's commutator kernel
/// (<see cref="CommutatorKernel{T}"/>) against two outside routes: the general-form Pauli algebra
/// (<see cref="PauliString.Commutator"/>, dense strings with their phases) decides which terms anticommute
/// and what each contribution is; the term-by-term loop fixes the order, which the tables must keep
/// exactly (the b_n are bit-identical only if every string's contributions are summed in the same order).
/// Random Hamiltonians of local terms 1 to 8 sites wide (so some sites exceed the widest table and fall
/// back), on every key width, with windows that cross word boundaries.
/// </summary>
public class SiteWindowsTests
{
    private sealed record Case(int N, (PauliString Term, double Coefficient)[] Terms, PauliString[] Strings);

    private static Case RandomCase(int n, int seed, int strings = 300)
    {
        var rng = new Random(seed);
        var terms = new List<(PauliString, double)>();
        var seen = new HashSet<PauliString>();
        int count = rng.Next(n, 4 * n);
        int wide = Math.Max(1, n / 8);
        while (terms.Count < count)
        {
            // Mostly short terms (a chain's), a few 7 or 8 sites wide: the sites those touch are wider than a
            // table's 6 and fall back to the term-by-term loop; the others keep a table.
            int width = terms.Count < wide ? rng.Next(7, 9) : rng.Next(1, 4);
            width = Math.Min(width, n);
            int first = rng.Next(0, n - width + 1);
            var b = new PauliString.Builder(n);
            b.Set(first, "XYZ"[rng.Next(3)]);
            b.Set(first + width - 1, "XYZ"[rng.Next(3)]);
            for (int j = first + 1; j < first + width - 1; j++) b.Set(j, "IXYZ"[rng.Next(4)]);
            var t = b.Build();
            if (seen.Add(t)) terms.Add((t, Math.Round(rng.NextDouble() * 4 - 2, 3)));
        }
        var ops = new PauliString[strings];
        for (int s = 0; s < strings; s++)
        {
            var b = new PauliString.Builder(n);
            double density = rng.NextDouble();
            for (int j = 0; j < n; j++)
            {
                if (rng.NextDouble() < density) b.Set(j, "XYZ"[rng.Next(3)]);
            }
            ops[s] = b.Build();
        }
        return new Case(n, [.. terms], ops);
    }

    private struct Collect(List<int> into) : ITermVisitor
    {
        public void Visit(int term) => into.Add(term);
    }

    private static void CheckVisits<T>(Case c) where T : unmanaged, IPauliKey<T>
    {
        var h = new CompiledHamiltonian<T>(c.N, [.. c.Terms.Select(t => (T.From(t.Term), t.Coefficient))]);
        var sites = new int[T.Capacity];
        var byTerm = new SiteWindows<T>(h.Keys, h.SiteStart, h.SiteTerms, c.N, maxWidth: 0);
        Assert.Equal(0, byTerm.Covered);
        Assert.InRange(h.Windows.Covered, 1, c.N - 1);   // both paths are exercised
        foreach (var s in c.Strings)
        {
            var key = T.From(s);
            var fast = new List<int>();
            var slow = new List<int>();
            var fc = new Collect(fast);
            var sc = new Collect(slow);
            LiouvilleTerms.ForEachAnticommuting(h.Keys, h.SiteStart, h.SiteTerms, h.Windows, key, sites, ref fc);
            LiouvilleTerms.ForEachAnticommuting(h.Keys, h.SiteStart, h.SiteTerms, byTerm, key, sites, ref sc);
            Assert.Equal(slow, fast);
            // The general form: exactly the anticommuting terms, each once.
            var expected = Enumerable.Range(0, c.Terms.Length).Where(t => !c.Terms[t].Term.CommutesWith(s)).ToHashSet();
            Assert.Equal(expected.Count, fast.Count);
            Assert.True(expected.SetEquals(fast));
        }
    }

    [Theory]
    [InlineData(12, 1)]
    [InlineData(32, 2)]
    [InlineData(31, 3)]
    public void Tables_VisitTheTermByTermLoopsTerms_InItsOrder_ChainKey32(int n, int seed) => CheckVisits<ChainKey32>(RandomCase(n, seed));

    [Theory]
    [InlineData(40, 4)]
    [InlineData(48, 5)]
    public void Tables_VisitTheTermByTermLoopsTerms_InItsOrder_ChainKey48(int n, int seed) => CheckVisits<ChainKey48>(RandomCase(n, seed));

    [Theory]
    [InlineData(9, 6)]
    [InlineData(64, 7)]
    public void Tables_VisitTheTermByTermLoopsTerms_InItsOrder_Pauli64(int n, int seed) => CheckVisits<Pauli64>(RandomCase(n, seed));

    [Theory]
    [InlineData(100, 8)]
    [InlineData(128, 9)]
    public void Tables_VisitTheTermByTermLoopsTerms_InItsOrder_Pauli128(int n, int seed) => CheckVisits<Pauli128>(RandomCase(n, seed));

    [Theory]
    [InlineData(256, 10)]
    [InlineData(190, 11)]
    public void Tables_VisitTheTermByTermLoopsTerms_InItsOrder_Wide(int n, int seed) => CheckVisits<PauliWide<Words4>>(RandomCase(n, seed, 100));

    [Fact]
    public void Tables_AreSharedAcrossTheInteriorOfAUniformChain()
    {
        // Mixed-field Ising chain on 40 sites: every interior site has the same three terms in the same window.
        int n = 40;
        var terms = new List<(Pauli64, double)>();
        for (int j = 0; j < n; j++)
        {
            terms.Add((Pauli64.From(PauliString.Parse($"X_{j}", n)), 1.05));
            terms.Add((Pauli64.From(PauliString.Parse($"Z_{j}", n)), 0.5));
            if (j + 1 < n) terms.Add((Pauli64.From(PauliString.Parse($"Z_{j} Z_{j + 1}", n)), 1.0));
        }
        var h = new CompiledHamiltonian<Pauli64>(n, [.. terms]);
        Assert.Equal(n, h.Windows.Covered);
        // Window of three sites: 64 entries per table; the two ends differ from the interior.
        Assert.True(h.Windows.Masks.Length <= 3 * 64, $"{h.Windows.Masks.Length} entries");
    }

    /// <summary>The same contributions in every stream, in the same order: keys, value bits and hashes.</summary>
    private static void AssertSameStreams<T>(EmitBuffer<T> expected, EmitBuffer<T> actual) where T : unmanaged, IPauliKey<T>
    {
        Assert.Equal(expected.Counts, actual.Counts);
        for (int g = 0; g < expected.Groups; g++)
        {
            for (int e = 0; e < expected.Counts[g]; e++)
            {
                var a = expected.Streams[g][e];
                var b = actual.Streams[g][e];
                Assert.True(a.Key.Equals(b.Key), $"group {g} entry {e}: key");
                Assert.Equal(BitConverter.DoubleToInt64Bits(a.Value), BitConverter.DoubleToInt64Bits(b.Value));
                Assert.Equal(a.Hash, b.Hash);
            }
        }
    }

    private static unsafe void CheckKernel<T>(Case c, int groupBits) where T : unmanaged, IPauliKey<T>
    {
        var h = new CompiledHamiltonian<T>(c.N, [.. c.Terms.Select(t => (T.From(t.Term), t.Coefficient))]);
        var map = new CommutatorMap<T>(h, 0.75);
        var rng = new Random(c.N + groupBits);
        var items = new KeyValue<T>[c.Strings.Length];
        for (int i = 0; i < items.Length; i++)
        {
            items[i].Key = T.From(c.Strings[i]);
            items[i].Value = Math.Round(rng.NextDouble() * 2 - 1, 4);
        }
        var shared = new EmitBuffer<T>();
        var kernel = new EmitBuffer<T>();
        shared.ResetInterleaved(64 - 8, groupBits);
        kernel.ResetInterleaved(64 - 8, groupBits);
        foreach (var kv in items) map.Apply(kv.Key, kv.Value, shared);
        fixed (KeyValue<T>* p = items)
        {
            // Two calls, so the second appends after the first's contributions.
            Assert.True(CommutatorKernel<T>.Produce(map, p, 0, items.Length / 3, kernel));
            Assert.True(CommutatorKernel<T>.Produce(map, p, items.Length / 3, items.Length, kernel));
        }
        AssertSameStreams(shared, kernel);
        // The general form: the contributions of each string are 0.75 * i [h_t P_t, c S] = 0.75 * i * c * h_t * (+-2i) P3.
        var expected = new Dictionary<PauliString, double>();
        for (int i = 0; i < items.Length; i++)
        {
            foreach (var (term, ht) in c.Terms)
            {
                if (!PauliString.Commutator(term, c.Strings[i], out var coef, out var product)) continue;
                var v = System.Numerics.Complex.ImaginaryOne * coef * (0.75 * ht * items[i].Value);
                Assert.True(Math.Abs(v.Imaginary) < 1e-15);
                expected[product!] = expected.GetValueOrDefault(product!) + v.Real;
            }
        }
        var got = new Dictionary<PauliString, double>();
        for (int g = 0; g < kernel.Groups; g++)
        {
            for (int e = 0; e < kernel.Counts[g]; e++)
            {
                var s = kernel.Streams[g][e].Key.ToPauliString(c.N);
                got[s] = got.GetValueOrDefault(s) + kernel.Streams[g][e].Value;
            }
        }
        Assert.Equal(expected.Count, got.Count);
        foreach (var (s, v) in expected) Assert.Equal(v, got[s], 1e-12);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    [InlineData(2)]
    public void Kernel_EmitsTheSharedLoopsContributions_BitForBit_ChainKey32(int groupBits) => CheckKernel<ChainKey32>(RandomCase(30, 20 + groupBits), groupBits);

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    public void Kernel_EmitsTheSharedLoopsContributions_BitForBit_Pauli128(int groupBits) => CheckKernel<Pauli128>(RandomCase(110, 30 + groupBits), groupBits);

    [Fact]
    public void Kernel_EmitsTheSharedLoopsContributions_BitForBit_ChainKey48() => CheckKernel<ChainKey48>(RandomCase(47, 40), 1);

    /// <summary>The mirror-pair basis through the kernel: the same streams as the basis's own map (shared loop and its class sink).</summary>
    private static unsafe void CheckPairKernel<T>(Case c, int groupBits) where T : unmanaged, IPauliKey<T>
    {
        var h = new CompiledHamiltonian<T>(c.N, [.. c.Terms.Select(t => (T.From(t.Term), t.Coefficient))]);
        var basis = new ReflectionBasis<T>(h);
        var rng = new Random(c.N);
        var items = new KeyValue<T>[c.Strings.Length];
        for (int i = 0; i < items.Length; i++)
        {
            // Representatives, as the basis stores them; some symmetric ones (palindromes) among them.
            var key = i % 7 == 0 ? Palindrome<T>(c.Strings[i]) : T.From(c.Strings[i]);
            items[i].Key = basis.Canonical(key, out _);
            items[i].Value = Math.Round(rng.NextDouble() * 2 - 1, 4);
        }
        var shared = new EmitBuffer<T>();
        var kernel = new EmitBuffer<T>();
        shared.ResetInterleaved(64 - 8, groupBits);
        kernel.ResetInterleaved(64 - 8, groupBits);
        foreach (var kv in items) basis.Apply(kv.Key, kv.Value, shared);
        fixed (KeyValue<T>* p = items)
        {
            Assert.True(CommutatorKernel<T>.Produce(h, p, 0, items.Length, kernel, new ReflectionBasis<T>.PairClass(basis)));
        }
        AssertSameStreams(shared, kernel);
    }

    private static T Palindrome<T>(PauliString s) where T : unmanaged, IPauliKey<T>
    {
        var b = new PauliString.Builder(s.N);
        for (int j = 0; j < s.N / 2; j++)
        {
            char letter = "IXZY"[T.From(s).LetterCode(j)];
            if (letter == 'I') continue;
            b.Set(j, letter);
            b.Set(s.N - 1 - j, letter);
        }
        return T.From(b.Build());
    }

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    public void PairKernel_EmitsTheMirrorBasisContributions_BitForBit_ChainKey32(int groupBits) => CheckPairKernel<ChainKey32>(RandomCase(31, 50 + groupBits), groupBits);

    [Fact]
    public void PairKernel_EmitsTheMirrorBasisContributions_BitForBit_ChainKey48() => CheckPairKernel<ChainKey48>(RandomCase(41, 60), 1);
}
