using System.Numerics;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Pauli;

/// <summary>
/// Sparse operators and the commutator workhorse against dense matrices (MathNet), closed forms
/// derived by hand, and the determinism promise. Dense tolerance 1e-11: sums of a few hundred
/// O(1) products in double precision.
/// </summary>
public class OperatorTests
{
    private const double DenseTol = 1e-11;

    internal static Hamiltonian RandomHamiltonian(Random rng, int n, int terms, int maxWeight)
    {
        var list = new List<PauliTerm>();
        for (int t = 0; t < terms; t++)
        {
            var b = new PauliString.Builder(n);
            int w = 1 + rng.Next(maxWeight);
            int start = rng.Next(n);
            for (int i = 0; i < w; i++) b.Set((start + i * (1 + rng.Next(2))) % n, "XYZ"[rng.Next(3)]);
            list.Add(new PauliTerm(b.Build(), rng.NextDouble() * 2 - 1));
        }
        return new Hamiltonian(n, list);
    }

    internal static List<PauliTerm> RandomOperatorTerms(Random rng, int n, int count)
    {
        var list = new List<PauliTerm>();
        for (int i = 0; i < count; i++) list.Add(new PauliTerm(PauliStringTests.Random(rng, n), rng.NextDouble() * 2 - 1));
        return list;
    }

    [Theory]
    [InlineData(4, 11)]
    [InlineData(6, 12)]
    [InlineData(8, 13)]
    public void Commutator_RandomModel_MatchesDenseIHOMinusOH(int n, int seed)
    {
        var rng = new Random(seed);
        var h = RandomHamiltonian(rng, n, 3 * n, 3);
        var terms = RandomOperatorTerms(rng, n, 12);
        var o = PauliOperator<Pauli64>.FromTerms(n, terms);
        var r = Liouvillian.Commutator(h.Compile<Pauli64>(), o, threads: 2);

        var dh = Dense.Of(n, h.Terms);
        var dO = Dense.Of(n, o.ToTerms());
        var expected = Complex.ImaginaryOne * (dh * dO - dO * dh);
        var actual = Dense.Of(n, r.ToTerms());
        Assert.True((expected - actual).FrobeniusNorm() < DenseTol * Math.Max(1, expected.FrobeniusNorm()));
        // Hermiticity: i[H,O] is Hermitian for Hermitian H, O (real coefficients by construction).
        Assert.True((expected - expected.ConjugateTranspose()).FrobeniusNorm() < DenseTol);
        // Norm and inner product against Tr(A^dagger B)/2^N.
        Assert.Equal(Dense.Inner(expected, expected).Real, r.NormSquared(), 9);
        Assert.Equal(Dense.Inner(dO, expected).Real, PauliOperator<Pauli64>.Inner(o, r), 9);
    }

    [Fact]
    public void Commutator_WideKeys_AgreeWithNarrowKeys()
    {
        var rng = new Random(5);
        int n = 7;
        var h = RandomHamiltonian(rng, n, 20, 3);
        var terms = RandomOperatorTerms(rng, n, 30);
        var a = ToMap(Liouvillian.Commutator(h.Compile<Pauli64>(), PauliOperator<Pauli64>.FromTerms(n, terms)).ToTerms());
        var b = ToMap(Liouvillian.Commutator(h.Compile<Pauli128>(), PauliOperator<Pauli128>.FromTerms(n, terms)).ToTerms());
        var c = ToMap(Liouvillian.Commutator(h.Compile<PauliWide<Words16>>(), PauliOperator<PauliWide<Words16>>.FromTerms(n, terms)).ToTerms());
        Assert.Equal(a, b);
        Assert.Equal(a, c);

        static Dictionary<string, double> ToMap(IEnumerable<PauliTerm> t) => t.ToDictionary(x => x.String.ToDenseString(), x => x.Coefficient);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(0.5)]
    [InlineData(1.7)]
    public void Commutator_MixedFieldIsingBulkX_HasNormTwoSqrtTwoPlusHSquared(double hField)
    {
        // Hand derivation: H = sum Z_j Z_{j+1} + g sum X_j + h sum Z_j. In the bulk, X_j anticommutes
        // with Z_{j-1}Z_j, Z_j Z_{j+1} and Z_j only; each gives one distinct string with |coefficient|
        // 2 * (1, 1, h), so ||i[H, X_j]|| = sqrt(4 + 4 + 4h^2) = 2 sqrt(2 + h^2).
        int n = 9;
        var h = MixedFieldIsing(n, 1.0, 1.05, hField);
        var o = PauliOperator<Pauli64>.Single(PauliString.Single(n, 4, 'X'));
        var r = Liouvillian.Commutator(h.Compile<Pauli64>(), o);
        Assert.Equal(2 * Math.Sqrt(2 + hField * hField), r.Norm(), 13);
    }

    [Fact]
    public void Commutator_XXChainZ_HasNormTwo()
    {
        // Hand derivation: H = (1/2) sum (X_j X_{j+1} + Y_j Y_{j+1}); Z_j anticommutes with the four
        // bonds touching it, each giving a distinct string (X Y, Y X on either bond) with
        // |coefficient| 2 * 1/2 = 1, so ||i[H, Z_j]|| = sqrt(4) = 2.
        int n = 9;
        var terms = new List<PauliTerm>();
        for (int j = 0; j + 1 < n; j++)
        {
            terms.Add(new PauliTerm(PauliString.Parse($"X_{j} X_{j + 1}", n), 0.5));
            terms.Add(new PauliTerm(PauliString.Parse($"Y_{j} Y_{j + 1}", n), 0.5));
        }
        var r = Liouvillian.Commutator(new Hamiltonian(n, terms).Compile<Pauli64>(), PauliOperator<Pauli64>.Single(PauliString.Single(n, 4, 'Z')));
        Assert.Equal(4, r.Count);
        Assert.Equal(2.0, r.Norm(), 14);
    }

    [Fact]
    public void Commutator_OneAndTwoThreads_AreBitIdentical()
    {
        int n = 64;
        var h = MixedFieldIsing(n, 1.0, 1.05, 0.5).Compile<Pauli64>();
        var o = GrowOperator(h, n, 17);
        Assert.True(o.Count > 10_000);
        var r1 = Liouvillian.Commutator(h, o, threads: 1);
        var r2 = Liouvillian.Commutator(h, o, threads: 2);
        Assert.Equal(r1.Count, r2.Count);
        Assert.True(r1.Keys.SequenceEqual(r2.Keys));
        for (int i = 0; i < r1.Count; i++) Assert.Equal(BitConverter.DoubleToInt64Bits(r1.Coefficients[i]), BitConverter.DoubleToInt64Bits(r2.Coefficients[i]));
    }

    [Fact]
    public void Accumulator_ManyContributions_MatchDictionaryReference()
    {
        var rng = new Random(3);
        int n = 20;
        var acc = new PauliAccumulator<Pauli64>(n, 5);
        var reference = new Dictionary<PauliString, double>();
        for (int i = 0; i < 50_000; i++)
        {
            var s = PauliString.Single(n, rng.Next(n), "XYZ"[rng.Next(3)]);
            if (rng.Next(3) == 0) s = PauliString.Multiply(s, PauliString.Single(n, rng.Next(n), 'Z'), out _);
            double v = rng.Next(-3, 4);
            acc.Add(Pauli64.From(s), v);
            reference[s] = reference.GetValueOrDefault(s) + v;
        }
        var o = acc.ToOperator();
        var expected = reference.Where(kv => kv.Value != 0).ToDictionary(kv => kv.Key, kv => kv.Value);
        Assert.Equal(expected.Count, o.Count);
        foreach (var t in o.ToTerms()) Assert.Equal(expected[t.String], t.Coefficient);
    }

    [Fact]
    public void Truncation_EachPolicy_ReturnsExactlyTheDroppedWeight()
    {
        int n = 64;
        var h = MixedFieldIsing(n, 1.0, 1.05, 0.5).Compile<Pauli64>();
        var o = GrowOperator(h, n, 15);
        double before = o.NormSquared();

        var a = o.Clone();
        var ra = Truncation.DropBelow(a, 1e-1 * Math.Sqrt(before / o.Count));
        Assert.Equal(before, a.NormSquared() + ra.DiscardedWeight, 9);
        Assert.All(a.Coefficients.ToArray(), c => Assert.True(Math.Abs(c) >= 1e-1 * Math.Sqrt(before / o.Count)));

        var b = o.Clone();
        var rb = Truncation.KeepTop(b, 1000);
        Assert.Equal(1000, b.Count);
        Assert.Equal(before, b.NormSquared() + rb.DiscardedWeight, 9);
        double minKept = b.Coefficients.ToArray().Min(Math.Abs);
        var sorted = o.Coefficients.ToArray().Select(Math.Abs).OrderByDescending(x => x).ToArray();
        Assert.Equal(sorted[999], minKept);

        var c = o.Clone();
        var rc = Truncation.CapSize(c, 4);
        Assert.All(c.Keys.ToArray(), k => Assert.True(k.Weight <= 4));
        Assert.Equal(before, c.NormSquared() + rc.DiscardedWeight, 9);
        Assert.Equal(o.Count - c.Count, rc.DroppedStrings);
    }

    internal static Hamiltonian MixedFieldIsing(int n, double j, double g, double h)
    {
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) terms.Add(new PauliTerm(PauliString.Parse($"Z_{i} Z_{i + 1}", n), j));
        for (int i = 0; i < n; i++)
        {
            terms.Add(new PauliTerm(PauliString.Single(n, i, 'X'), g));
            terms.Add(new PauliTerm(PauliString.Single(n, i, 'Z'), h));
        }
        return new Hamiltonian(n, terms);
    }

    /// <summary>Repeated normalised commutators from Z at the centre: a realistic operator for tests and benchmarks.</summary>
    internal static PauliOperator<Pauli64> GrowOperator(CompiledHamiltonian<Pauli64> h, int n, int steps)
    {
        var o = PauliOperator<Pauli64>.Single(PauliString.Single(n, n / 2, 'Z'));
        for (int s = 0; s < steps; s++)
        {
            o = Liouvillian.Commutator(h, o, threads: 2);
            o.Scale(1 / o.Norm());
        }
        return o;
    }
}
