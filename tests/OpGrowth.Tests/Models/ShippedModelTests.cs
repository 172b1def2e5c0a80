using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Models;

public class ShippedModelTests
{
    /// <summary>
    /// File and code evaluate the same formulas, possibly in a different order (e.g. J/sqrt(N) vs
    /// sqrt(6)*J/M^1.5/4): agreement to a few ulps; 1e-13 relative is far above rounding, far below any real difference.
    /// </summary>
    private const double RelTol = 1e-13;

    [Theory]
    [MemberData(nameof(ModelTestFiles.ShippedNames), MemberType = typeof(ModelTestFiles))]
    public void Load_ShippedModel_ParsesAndBuilds(string name)
    {
        var m = ModelLoader.Load(ShippedModels.Resolve(name));
        Assert.False(string.IsNullOrWhiteSpace(m.Description));
        Assert.True(m.N >= 2);
        Assert.NotEmpty(m.Probes);
        Assert.All(m.Probes, p => Assert.Equal(m.N, p.N));
        Assert.True(m.IsDriven || m.Hamiltonian.Terms.Count > 0);
        Assert.All(m.Hamiltonian.Terms, t => Assert.True(double.IsFinite(t.Coefficient) && t.Coefficient != 0));
        if (m.IsDisordered) Assert.NotEmpty(m.Seeds);
        if (name.StartsWith("demo/", StringComparison.Ordinal)) Assert.Equal(24, m.N);
    }

    [Fact]
    public void ShippedModels_IncludeEveryFamilyAndTheDemoSet()
    {
        var names = ShippedModels.Files.Select(ShippedModels.NameOf).ToHashSet();
        foreach (var n in new[]
        {
            "mixed-field-ising", "transverse-field-ising", "xxz", "heisenberg-all-to-all", "square-ising", "kicked-ising", "syk4",
            "xx-random-field", "ising-glass", "power-law-ising", "demo/tilted-chain", "demo/tilted-square", "demo/xxz-chain", "demo/disordered-xx",
            "demo/glass-cluster", "demo/heisenberg-cluster",
        })
        {
            Assert.Contains(n, names);
        }
    }

    internal static void AssertSameTerms(Hamiltonian expected, Hamiltonian actual)
    {
        Assert.Equal(expected.N, actual.N);
        Assert.Equal(expected.Terms.Count, actual.Terms.Count);
        var map = actual.Terms.ToDictionary(t => t.String, t => t.Coefficient);
        foreach (var t in expected.Terms)
        {
            Assert.True(map.TryGetValue(t.String, out double c), $"missing term {t.String}");
            Assert.True(Math.Abs(c - t.Coefficient) <= RelTol * Math.Max(1, Math.Abs(t.Coefficient)), $"{t.String}: file {c:R}, code {t.Coefficient:R}");
        }
    }

    private static Model Load(string name, params (string K, string V)[] set)
        => ModelLoader.Load(ShippedModels.Resolve(name), set.ToDictionary(x => x.K, x => x.V));

    [Fact]
    public void PowerLawIsing_FileEqualsCode() => AssertSameTerms(Families.PowerLawIsing(16, 1.0, 1.5, 1.05, 0.5), Load("power-law-ising").Hamiltonian);

    [Fact]
    public void MixedFieldIsing_FileEqualsCode() => AssertSameTerms(Families.MixedFieldIsing(20, 1.0, 1.05, 0.5), Load("mixed-field-ising").Hamiltonian);

    [Fact]
    public void MixedFieldIsing_WithOverrides_FileEqualsCode()
        => AssertSameTerms(Families.MixedFieldIsing(9, 0.7, 1.05, -0.25), Load("mixed-field-ising", ("N", "9"), ("J", "0.7"), ("h", "-J/2.8")).Hamiltonian);

    [Fact]
    public void TransverseFieldIsing_FileEqualsCode() => AssertSameTerms(Families.TransverseFieldIsing(20, 1.0, 1.0), Load("transverse-field-ising").Hamiltonian);

    [Fact]
    public void Xxz_Clean_FileEqualsCode() => AssertSameTerms(Families.Xxz(20, 1.0, 1.0, 0.0, 1), Load("xxz").Hamiltonian);

    [Fact]
    public void Xxz_Disordered_FileEqualsCode()
        => AssertSameTerms(Families.Xxz(16, 1.0, 0.5, 8.0, 42), Load("xxz", ("N", "16"), ("Delta", "0.5"), ("W", "8"), ("seed", "42")).Hamiltonian);

    [Fact]
    public void XxRandomField_FileEqualsCode() => AssertSameTerms(Families.XxRandomField(20, 1.0, 5.0, 3), Load("xx-random-field").Hamiltonian);

    [Fact]
    public void HeisenbergAllToAll_FileEqualsCode() => AssertSameTerms(Families.HeisenbergAllToAll(12, 1.0, 7), Load("heisenberg-all-to-all").Hamiltonian);

    [Fact]
    public void IsingGlass_FileEqualsCode() => AssertSameTerms(Families.IsingGlass(12, 1.0, 0.1, 5), Load("ising-glass").Hamiltonian);

    [Fact]
    public void SquareIsing_FileEqualsCode() => AssertSameTerms(Families.SquareIsing(4, 4, 1.0, 1.05, 0.5), Load("square-ising").Hamiltonian);

    [Fact]
    public void Syk_FileEqualsCode() => AssertSameTerms(Families.Syk(10, 4, 1.0, 11), Load("syk4").Hamiltonian);

    [Fact]
    public void Demo_FilesEqualCode()
    {
        AssertSameTerms(Families.MixedFieldIsing(24), Load("demo/tilted-chain").Hamiltonian);
        AssertSameTerms(Families.SquareIsing(4, 6), Load("demo/tilted-square").Hamiltonian);
        AssertSameTerms(Families.Xxz(24, 1.0, 0.5), Load("demo/xxz-chain").Hamiltonian);
        AssertSameTerms(Families.XxRandomField(24, 1.0, 4.0, 2024), Load("demo/disordered-xx").Hamiltonian);
        AssertSameTerms(Families.IsingGlass(24, 1.0, 0.1, 2024), Load("demo/glass-cluster").Hamiltonian);
        AssertSameTerms(Families.HeisenbergAllToAll(24, 1.0, 2024), Load("demo/heisenberg-cluster").Hamiltonian);
    }

    [Fact]
    public void KickedIsing_FileEqualsCode_LayerByLayer()
    {
        var m = Load("kicked-ising");
        var code = Families.KickedIsing(20);
        Assert.NotNull(m.Drive);
        Assert.Equal(code.Period, m.Drive!.Period);
        Assert.Equal(code.Layers.Count, m.Drive.Layers.Count);
        for (int l = 0; l < code.Layers.Count; l++)
        {
            Assert.Equal(code.Layers[l].Count, m.Drive.Layers[l].Count);
            for (int r = 0; r < code.Layers[l].Count; r++)
            {
                Assert.Equal(code.Layers[l][r].Generator, m.Drive.Layers[l][r].Generator);
                Assert.Equal(code.Layers[l][r].Angle, m.Drive.Layers[l][r].Angle, 14);
            }
        }
        // The informational Hamiltonian is the period average: angle / (2 T) per generator.
        AssertSameTerms(new Hamiltonian(20, code.Layers.SelectMany(l => l).Select(r => new PauliTerm(r.Generator, r.Angle / 2))), m.Hamiltonian);
    }

    [Fact]
    public void Syk_RecordsMajoranaSizeMeasureAndFourBodyTerms()
    {
        var m = Load("syk4");
        Assert.Equal(SizeMeasure.Majoranas, m.SizeMeasure);
        Assert.Equal(20, m.MajoranaCount);
        Assert.Equal(4845, m.Hamiltonian.Terms.Count); // C(20, 4)
        Assert.All(m.Hamiltonian.Terms, t => Assert.Equal(4, JordanWigner.MajoranaWeight(t.String)));
        Assert.Equal(1, m.SizeOf(m.Probes[0])); // chi_0
    }

    [Fact]
    public void HeisenbergAllToAll_NormIsExtensive()
    {
        // Variance J^2/N per pair, 3 strings per pair: E||H||^2 = 3 (N-1)/2 J^2, so ||H||^2/N -> 3/2 (law of large numbers).
        var m = Load("heisenberg-all-to-all", ("N", "60"));
        double perSite = m.Hamiltonian.FrobeniusNormSquared / m.N;
        double expected = 1.5 * 59.0 / 60.0;
        // 1770 independent squared Gaussians: relative std of the mean sqrt(2/1770) = 3.4 %; allow 4 sigma.
        Assert.InRange(perSite, expected * (1 - 0.14), expected * (1 + 0.14));
    }

    [Fact]
    public void ModelOf_CodeBuiltFamily_HasDefaultsAndFlags()
    {
        var m = Model.Of(Families.MixedFieldIsing(8, periodic: true), Lattice.Chain(8, periodic: true), "mfi");
        Assert.True(m.IsTranslationInvariant);
        Assert.Equal(PauliString.Single(8, 4, 'Z'), m.Probes[0]);
        var s = Model.Of(Families.Syk(4), Lattice.AllToAll(4), sizeMeasure: SizeMeasure.Majoranas, disordered: true);
        Assert.Equal(8, s.MajoranaCount);
        Assert.False(s.IsTranslationInvariant);
        Assert.Throws<ArgumentException>(() => Model.Of(Families.MixedFieldIsing(8), Lattice.Chain(6)));
    }

    [Fact]
    public void Flags_DisorderTranslationAndSeeds()
    {
        var clean = Load("mixed-field-ising");
        Assert.False(clean.IsDisordered);
        Assert.True(clean.IsTranslationInvariant);
        Assert.Empty(clean.Seeds);
        var dirty = Load("xx-random-field");
        Assert.True(dirty.IsDisordered);
        Assert.False(dirty.IsTranslationInvariant);
        Assert.Equal([3L], dirty.Seeds);
        Assert.False(Load("xxz").IsDisordered); // W = 0: the random term draws only zeros
        Assert.False(Load("heisenberg-all-to-all").IsTranslationInvariant);
    }
}
