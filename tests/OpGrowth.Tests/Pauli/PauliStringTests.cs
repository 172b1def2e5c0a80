using System.Numerics;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Pauli;

/// <summary>
/// Pauli-string algebra against the independent dense route (MathNet Kronecker products of the
/// 2x2 Pauli matrices, Reference/Dense.cs). Exact arithmetic on small integers and +-1, +-i: the
/// tolerance 1e-12 only absorbs rounding in the dense products.
/// </summary>
public class PauliStringTests
{
    private const double Tol = 1e-12;

    internal static PauliString Random(Random rng, int n)
    {
        var b = new PauliString.Builder(n);
        for (int j = 0; j < n; j++) b.Set(j, "IXYZ"[rng.Next(4)]);
        return b.Build();
    }

    [Theory]
    [InlineData(1)]
    [InlineData(3)]
    [InlineData(6)]
    public void Multiply_RandomStrings_MatchesDenseProductWithPhase(int n)
    {
        var rng = new Random(100 + n);
        for (int trial = 0; trial < 40; trial++)
        {
            var a = Random(rng, n);
            var b = Random(rng, n);
            var p = PauliString.Multiply(a, b, out int k);
            var expected = Dense.Of(a) * Dense.Of(b);
            var actual = Dense.Of(p) * PauliString.IPower(k);
            Assert.True((expected - actual).FrobeniusNorm() < Tol, $"{a.ToDenseString()} * {b.ToDenseString()}");
        }
    }

    [Fact]
    public void Multiply_AllKeyWidths_AgreeWithGeneralForm()
    {
        var rng = new Random(7);
        foreach (int n in new[] { 5, 64, 100, 128, 200, 700, 1024 })
        {
            for (int trial = 0; trial < 20; trial++)
            {
                var a = Random(rng, n);
                var b = Random(rng, n);
                var p = PauliString.Multiply(a, b, out int k);
                bool anti = !a.CommutesWith(b);
                if (n <= 64) Check<Pauli64>(a, b, p, k, anti, n);
                if (n <= 128) Check<Pauli128>(a, b, p, k, anti, n);
                if (n <= 256) Check<PauliWide<Words4>>(a, b, p, k, anti, n);
                if (n <= 512) Check<PauliWide<Words8>>(a, b, p, k, anti, n);
                Check<PauliWide<Words16>>(a, b, p, k, anti, n);
            }
        }

        static void Check<T>(PauliString a, PauliString b, PauliString p, int k, bool anti, int n) where T : unmanaged, IPauliKey<T>
        {
            var ka = T.From(a);
            var kb = T.From(b);
            var kp = T.Multiply(ka, kb, out int k2);
            Assert.Equal(k, k2);
            Assert.Equal(p, kp.ToPauliString(n));
            Assert.Equal(anti, T.Anticommute(ka, kb));
            Assert.Equal(a.Weight, ka.Weight);
            Assert.Equal(a.FirstSite, ka.FirstSite);
            Assert.Equal(a.LastSite, ka.LastSite);
            Span<int> sites = stackalloc int[T.Capacity];
            int m = T.SupportSites(ka, sites);
            Assert.Equal(a.Support(), sites[..m].ToArray());
            for (int j = 0; j < n; j += 7) Assert.Equal(a[j] != 'I', ka.HasSite(j));
        }
    }

    [Theory]
    [InlineData(2)]
    [InlineData(5)]
    public void CommutesWith_RandomStrings_MatchesDenseCommutator(int n)
    {
        var rng = new Random(200 + n);
        for (int trial = 0; trial < 60; trial++)
        {
            var a = Random(rng, n);
            var b = Random(rng, n);
            var da = Dense.Of(a);
            var db = Dense.Of(b);
            double comm = (da * db - db * da).FrobeniusNorm();
            Assert.Equal(comm < Tol, a.CommutesWith(b));
            if (PauliString.Commutator(a, b, out Complex c, out var p))
            {
                Assert.True((da * db - db * da - Dense.Of(p!) * c).FrobeniusNorm() < Tol);
                Assert.Equal(2.0, c.Magnitude, 12);
            }
        }
    }

    [Theory]
    [InlineData("Z_3 X_4", 6, "IIIZXI")]
    [InlineData("Y_0", 1, "Y")]
    [InlineData("X0*Z2", 3, "XIZ")]
    [InlineData("I", 4, "IIII")]
    public void Parse_SiteIndexedForm_GivesDenseForm(string text, int n, string dense)
    {
        var s = PauliString.Parse(text, n);
        Assert.Equal(dense, s.ToDenseString());
        Assert.Equal(s, PauliString.Parse(dense, n));
        Assert.Equal(s, PauliString.Parse(s.ToString(), n));
    }

    [Theory]
    [InlineData("Q_1", 4, "not a Pauli factor")]
    [InlineData("Z_9", 4, "out of range")]
    [InlineData("Z_1 X_1", 4, "appears twice")]
    [InlineData("Z_a", 4, "no valid site index")]
    [InlineData("IZX", 4, "dense string")]
    public void TryParse_BadText_SaysWhatWasFoundAndExpected(string text, int n, string fragment)
    {
        Assert.False(PauliString.TryParse(text, n, out _, out string? error));
        Assert.Contains(fragment, error);
    }

    [Fact]
    public void SupportAndWeight_WideString_AreConsistent()
    {
        var s = PauliString.Parse("X_3 Y_64 Z_700 X_1023", 1024);
        Assert.Equal(4, s.Weight);
        Assert.Equal(3, s.FirstSite);
        Assert.Equal(1023, s.LastSite);
        Assert.Equal(new[] { 3, 64, 700, 1023 }, s.Support());
        Assert.Equal("X_3 Y_64 Z_700 X_1023", s.ToString());
    }
}
