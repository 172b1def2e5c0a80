using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Symmetry;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Symmetry;

/// <summary>
/// The symmetry sectors found from the terms must split the spectrum without losing or doubling a level:
/// the union of the sector spectra, each counted with its multiplicity, equals the spectrum of the dense
/// 2^N x 2^N matrix (MathNet Hermitian eigensolver, the independent route). Tolerance 1e-9 of the spectral
/// scale: both are double-precision eigensolvers of well-conditioned Hermitian matrices.
/// </summary>
public class SectorSpaceTests(Xunit.Abstractions.ITestOutputHelper output)
{
    private static Model Load(string toml) => ModelLoader.Parse(toml, "test.toml");

    internal static double[] DenseSpectrum(Hamiltonian h)
    {
        var m = Dense.Of(h.N, h.Terms);
        return m.Evd(Symmetricity.Hermitian).EigenValues.Select(z => z.Real).OrderBy(x => x).ToArray();
    }

    /// <summary>Every sector's levels repeated by its multiplicity (and by 2 for the S^z &lt; 0 half under SU(2)).</summary>
    internal static (double[] Levels, SymmetryAnalysis Analysis, IReadOnlyList<SymmetryBlock> Blocks) SectorSpectrum(Model model)
    {
        var a = SymmetryDiscovery.Analyze(model.Hamiltonian, model.Lattice, model.SizeMeasure == SizeMeasure.Majoranas);
        var blocks = SectorSpace.Enumerate(a.N, a.ResolveTotalZ, a.Abelian, a.Swap, a.HalfFillingFlip, a.Real, a.SpinRotation ? a.N / 2 : int.MaxValue);
        var masks = SectorSpace.Masks(a.Rotated);
        var all = new List<double>();
        foreach (var b in blocks)
        {
            var block = b.Block(masks);
            int d = b.Dimension;
            for (int i = 0; i < d; i++)
            {
                for (int j = 0; j < d; j++)
                {
                    var diff = block[(long)i * d + j] - Complex.Conjugate(block[(long)j * d + i]);
                    Assert.True(diff.Magnitude < 1e-12, $"block {b.Label} is not Hermitian at ({i}, {j})");
                }
            }
            var ev = SectorLevels.Eigenvalues(block, d, 1);
            int mult = b.Multiplicity * (a.SpinRotation && 2 * b.DownSpins < a.N ? 2 : 1);
            for (int k = 0; k < mult; k++) all.AddRange(ev);
        }
        all.Sort();
        return ([.. all], a, blocks);
    }

    private void AssertSameSpectrum(string toml)
    {
        var model = Load(toml);
        var (levels, a, blocks) = SectorSpectrum(model);
        var dense = DenseSpectrum(model.Hamiltonian);
        output.WriteLine($"{model.Name}: resolved {string.Join("; ", a.Resolved)}; unresolved {string.Join("; ", a.Unresolved)}; {blocks.Count} blocks, largest {blocks.Max(b => b.Dimension)}");
        Assert.Equal(dense.Length, levels.Length);
        double scale = dense.Max(Math.Abs) + 1;
        for (int i = 0; i < dense.Length; i++) Assert.True(Math.Abs(dense[i] - levels[i]) < 1e-9 * scale, $"level {i}: dense {dense[i]}, sectors {levels[i]}");
    }

    private const string Header = "name = \"t\"\ndescription = \"test\"\n";

    [Fact]
    public void TiltedIsingRing_TranslationAndReflection_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nN = 8\n[lattice]\nkind = \"ring\"\nsites = \"N\"\n"
            + "[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 0.9045\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = 0.809\n");

    [Fact]
    public void XxzRing_TotalZMomentaReflectionFlip_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nN = 8\n[lattice]\nkind = \"ring\"\nsites = \"N\"\n"
            + "[[term]]\npauli = [\"XX\", \"YY\"]\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 0.5\n[[term]]\npauli = [\"XX\", \"YY\"]\non = \"pairs\"\ndistance = 2\ncoupling = 0.4\n");

    [Fact]
    public void HeisenbergRing_SpinRotation_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nN = 8\n[lattice]\nkind = \"ring\"\nsites = \"N\"\n"
            + "[[term]]\npauli = [\"XX\", \"YY\", \"ZZ\"]\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = [\"XX\", \"YY\", \"ZZ\"]\non = \"pairs\"\ndistance = 2\ncoupling = 0.5\n");

    [Fact]
    public void XyzChainInXField_ParitiesFound_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nN = 7\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n"
            + "[[term]]\npauli = \"XX\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"YY\"\non = \"bonds\"\ncoupling = 0.75\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 0.5\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 0.4\n");

    [Fact]
    public void XyzChain_TwoGlobalParities_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nN = 8\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n"
            + "[[term]]\npauli = \"XX\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"YY\"\non = \"bonds\"\ncoupling = 0.75\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 0.5\n");

    [Fact]
    public void PeriodicLadder_TranslationLegExchangeAndMirror_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nL = 4\n[lattice]\nkind = \"ladder\"\nlength = \"L\"\nperiodic = true\n"
            + "[[term]]\npauli = \"ZZ\"\non = \"legs\"\ncoupling = 1\n[[term]]\npauli = \"ZZ\"\non = \"rungs\"\ncoupling = 0.5\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 1.05\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = 0.5\n");

    [Fact]
    public void Torus3x3_TwoTranslationsAndInversion_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nL = 3\n[lattice]\nkind = \"square\"\nwidth = \"L\"\nheight = \"L\"\nperiodic = true\n"
            + "[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 1.05\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = 0.5\n");

    [Fact]
    public void OpenSquare3x3_MirrorsAndDiagonal_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nL = 3\n[lattice]\nkind = \"square\"\nwidth = \"L\"\nheight = \"L\"\n"
            + "[[term]]\npauli = [\"XX\", \"YY\"]\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 0.3\n");

    [Fact]
    public void ComplexChiralRing_NoTimeReversal_UnionEqualsDense()
    {
        // Dzyaloshinskii-Moriya-like XY - YX hopping plus a Z field and ZZ: H has an odd number of Y in the
        // hopping terms, but an even number of X... rotated real by the letter map; the union still holds.
        AssertSameSpectrum(Header + "[parameters]\nN = 7\n[lattice]\nkind = \"ring\"\nsites = \"N\"\n"
            + "[[term]]\npauli = \"XY\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"YX\"\non = \"bonds\"\ncoupling = -1\n[[term]]\npauli = \"ZZ\"\non = \"pairs\"\ndistance = 2\ncoupling = 0.6\n[[term]]\npauli = \"XZY\"\non = \"segments\"\ncoupling = 0.3\n");
    }

    [Fact]
    public void MajoranaSyk_FermionParity_UnionEqualsDense()
        => AssertSameSpectrum(Header + "[parameters]\nN = 5\n[lattice]\nkind = \"all-to-all\"\nsites = \"N\"\n"
            + "[[term]]\nmajorana = 4\ncoupling = \"normal(0, 0.1)\"\nseed = 3\n");

    [Fact]
    public void XxzRing_DiscoversExpectedSymmetries()
    {
        var model = Load(Header + "[parameters]\nN = 8\n[lattice]\nkind = \"ring\"\nsites = \"N\"\n"
            + "[[term]]\npauli = [\"XX\", \"YY\"]\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 0.5\n");
        var a = SymmetryDiscovery.Analyze(model.Hamiltonian, model.Lattice);
        Assert.Equal(['Z'], a.ConservedTotals);
        Assert.True(a.ResolveTotalZ);
        Assert.Contains(a.Abelian, g => g.Name == "T");
        Assert.NotNull(a.Swap);
        Assert.NotNull(a.HalfFillingFlip);
        Assert.Empty(a.Unresolved);
        Assert.True(a.Real);
    }

    [Fact]
    public void XFieldXxChain_TotalXIsRotatedToZ()
    {
        // H = sum (Y_i Y_{i+1} + Z_i Z_{i+1}) + h sum X_i conserves total X only.
        var model = Load(Header + "[parameters]\nN = 8\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n"
            + "[[term]]\npauli = [\"YY\", \"ZZ\"]\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"XX\"\non = \"pairs\"\ndistance = 2\ncoupling = 0.4\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 0.3\n");
        var a = SymmetryDiscovery.Analyze(model.Hamiltonian, model.Lattice);
        Assert.Equal(['X'], a.ConservedTotals);
        Assert.True(a.ResolveTotalZ);
        Assert.False(a.Rotation.IsIdentity);
        AssertSameSpectrum(Header + "[parameters]\nN = 8\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n"
            + "[[term]]\npauli = [\"YY\", \"ZZ\"]\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"XX\"\non = \"pairs\"\ndistance = 2\ncoupling = 0.4\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 0.3\n");
    }

    [Fact]
    public void CommutingIsing_EveryZIsConserved()
    {
        var model = Load(Header + "[parameters]\nN = 10\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n"
            + "[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = \"uniform(-1, 1)\"\nseed = 2\n");
        var a = SymmetryDiscovery.Analyze(model.Hamiltonian, model.Lattice);
        Assert.True(a.Commuting);
        Assert.Equal(10, a.ConservedStrings.Count);
        Assert.All(a.ConservedStrings, s => Assert.Equal(1, s.Weight));
    }

    [Fact]
    public void UniformAllToAllIsing_PermutationGuardReportsUnresolved()
    {
        // Every site is equivalent: the site permutations (S_N) are symmetries that no sector resolves here.
        var model = Load(Header + "[parameters]\nN = 6\n[lattice]\nkind = \"all-to-all\"\nsites = \"N\"\n"
            + "[[term]]\npauli = \"ZZ\"\non = \"pairs\"\ncoupling = 0.3\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 1\n");
        var a = SymmetryDiscovery.Analyze(model.Hamiltonian, model.Lattice);
        Assert.Contains(a.Unresolved, u => u.Contains("site permutation", StringComparison.Ordinal));
    }

    [Fact]
    public void RandomRegularGraph_NoHiddenPermutation()
    {
        var model = Load(Header + "[lattice]\nkind = \"edges\"\nsites = 8\nedges = [[0,1],[1,2],[2,3],[3,4],[4,5],[5,6],[6,7],[7,0],[0,4],[1,6],[2,5],[3,7]]\n"
            + "[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = \"uniform(0.5, 1.5)\"\nseed = 1\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 1\n");
        var a = SymmetryDiscovery.Analyze(model.Hamiltonian, model.Lattice);
        Assert.DoesNotContain(a.Unresolved, u => u.Contains("site permutation", StringComparison.Ordinal));
    }
}
