using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Evolution;
using OpGrowth.Pauli;
using static OpGrowth.Tests.Evolution.EvolutionTestKit;

namespace OpGrowth.Tests.Evolution;

/// <summary>The building blocks against simple independent references.</summary>
public class KernelTests
{
    [Fact]
    public void Compactor_TopM_KeepsExactlyTheLargestAndBooksTheRest()
    {
        // Reference: a full sort of |c| (plain LINQ), ties impossible with random doubles.
        var rng = new Random(7);
        var acc = new PassAccumulator<Pauli64>(5);
        var all = new List<(Pauli64 K, double C)>();
        for (int i = 0; i < 20000; i++)
        {
            var k = new Pauli64((ulong)rng.NextInt64(), (ulong)rng.NextInt64());
            double c = (rng.NextDouble() - 0.5) * Math.Exp(-10 * rng.NextDouble());
            acc.Add(k, c);
            all.Add((k, c));
        }
        var dest = new OperatorBuffer<Pauli64>();
        var stats = new Compactor<Pauli64>(2).Compact(acc, new CompactRule(0, int.MaxValue, 1234, null), dest);
        var expected = all.OrderByDescending(e => Math.Abs(e.C)).Take(1234).Select(e => e.K).ToHashSet();
        Assert.Equal(1234, dest.Count);
        Assert.True(dest.KeySpan.ToArray().All(expected.Contains));
        double dropped = all.OrderByDescending(e => Math.Abs(e.C)).Skip(1234).Sum(e => e.C * e.C);
        Assert.Equal(dropped, stats.DeletedWeight, 12);
        Assert.Equal(all.OrderByDescending(e => Math.Abs(e.C)).ElementAt(1233).C, stats.CutMagnitude * Math.Sign(all.OrderByDescending(e => Math.Abs(e.C)).ElementAt(1233).C), 15);
    }

    [Fact]
    public void Compactor_ThresholdSizeCapAndDamping_BookWeights()
    {
        int n = 8;
        var acc = new PassAccumulator<Pauli64>(4);
        var strings = new[] { "ZIIIIIII", "ZZIIIIII", "ZZZZIIII", "ZZZZZZII", "XXXXXXXX" };
        var coeffs = new[] { 0.5, 0.4, 1e-5, 0.3, 0.2 };
        for (int i = 0; i < strings.Length; i++) acc.Add(Pauli64.From(PauliString.Parse(strings[i], n)), coeffs[i]);
        var damp = new double[n + 1];
        for (int k = 0; k <= n; k++) damp[k] = Math.Exp(-0.5 * Math.Max(0, k - 2));
        var dest = new OperatorBuffer<Pauli64>();
        var st = new Compactor<Pauli64>(1).Compact(acc, new CompactRule(1e-3, 6, long.MaxValue, damp), dest);
        // Kept: size 1 (0.5), size 2 (0.4), size 6 damped by e^{-2} (0.3 e^{-2}); dropped: the tiny one (after
        // damping e^{-1}) and the size-8 string.
        Assert.Equal(3, dest.Count);
        double d6 = 0.3 * Math.Exp(-2), d4 = 1e-5 * Math.Exp(-1), d8 = 0.2 * Math.Exp(-3);
        Assert.Equal(0.25 + 0.16 + d6 * d6, st.KeptWeight, 15);
        Assert.Equal(d4 * d4 + d8 * d8, st.DeletedWeight, 15);
        Assert.Equal(0.09 - d6 * d6 + 1e-10 - d4 * d4 + 0.04 - d8 * d8, st.DampedWeight, 15);
    }

    [Fact]
    public void MajoranaCount_MatchesDenseJordanWignerProducts()
    {
        // Independent route: build the 2N Majoranas densely (g_{2j} = X..X Z_j, g_{2j+1} = X..X Y_j) and,
        // for each Pauli string, find the subset of Majoranas whose product is proportional to it.
        int n = 4;
        var maj = new List<Matrix<Complex>>();
        for (int j = 0; j < n; j++)
        {
            foreach (char l in "ZY")
            {
                var b = new PauliString.Builder(n);
                for (int k = 0; k < j; k++) b.Set(k, 'X');
                b.Set(j, l);
                maj.Add(DenseOf(n, [new PauliTerm(b.Build(), 1)]));
            }
        }
        var subsetOf = new Dictionary<string, int>();
        int d = 1 << n;
        for (int mask = 0; mask < 1 << (2 * n); mask++)
        {
            var m = Matrix<Complex>.Build.DenseIdentity(d);
            for (int a = 0; a < 2 * n; a++) if ((mask >> a & 1) != 0) m *= maj[a];
            // Decompose m: it is a phase times one Pauli string; find it by its nonzero pattern.
            for (int code = 0; code < 1 << (2 * n); code++)
            {
                var b = new PauliString.Builder(n);
                for (int j = 0; j < n; j++) b.Set(j, "IXYZ"[(code >> (2 * j)) & 3]);
                var s = b.Build();
                var p = DenseOf(n, [new PauliTerm(s, 1)]);
                var tr = (p * m).Trace() / d;
                if (tr.Magnitude > 0.5)
                {
                    subsetOf[s.ToDenseString()] = BitOperations.PopCount((uint)mask);
                    break;
                }
            }
        }
        Assert.Equal(1 << (2 * n), subsetOf.Count);
        foreach (var (dense, count) in subsetOf)
        {
            var s = PauliString.Parse(dense, n);
            Assert.Equal(count, OpGrowth.Models.JordanWigner.MajoranaWeight(s.X, s.Z, n));
        }
    }

    [Fact]
    public void MajoranaCount_WideKeys_CarriesParityAcrossWords()
    {
        // Z at site 100 carries the X-string on sites 0..99: 2 * 100 + 1 Majoranas.
        int n = 130;
        var z = PauliString.Single(n, 100, 'Z');
        Assert.Equal(201, OpGrowth.Models.JordanWigner.MajoranaWeight(z.X, z.Z, n));
        var zz = new PauliString.Builder(n).Set(63, 'Z').Set(64, 'Z').Build();
        Assert.Equal(2, OpGrowth.Models.JordanWigner.MajoranaWeight(zz.X, zz.Z, n));
    }

    [Fact]
    public void SplittingSchedule_MergedSegment_KeepsTotalTimePerGroup()
    {
        // Each group must receive exactly dt per step in total (sum of fractions), for both orders.
        foreach (var m in new[] { IntegrationMethod.Trotter2, IntegrationMethod.Trotter4 })
        {
            var seg = SplittingSchedule.Segment(m, 3, 5);
            for (int g = 0; g < 3; g++) Assert.Equal(5.0, seg.Where(s => s.Group == g).Sum(s => s.Fraction), 12);
            Assert.Equal(5, seg.Sum(s => s.StepEnds));
            for (int i = 1; i < seg.Count; i++) Assert.NotEqual(seg[i - 1].Group, seg[i].Group);
        }
    }

    [Fact]
    public void MemoryBudget_Parse_ReadsUnitsAndRejectsGarbage()
    {
        Assert.Equal(8L << 30, MemoryBudget.Parse("8GiB"));
        Assert.Equal(512L << 20, MemoryBudget.Parse("512MiB"));
        Assert.Equal(2_000_000_000L, MemoryBudget.Parse("2GB"));
        Assert.Equal(1500L, MemoryBudget.Parse("1500"));
        var ex = Assert.Throws<OpGrowth.IO.InputException>(() => MemoryBudget.Parse("8 parsecs"));
        Assert.Contains("expected", ex.Message);
    }
}
