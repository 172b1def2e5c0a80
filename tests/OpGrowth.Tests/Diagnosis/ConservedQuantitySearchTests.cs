using OpGrowth.Diagnosis;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Diagnosis;

/// <summary>
/// Conserved-quantity search and Mazur bound. Sources: Mazur, Physica 43, 533 (1969); Suzuki,
/// Physica 51, 277 (1971). The conserved charges used below are textbook facts: the XXZ chain
/// conserves total Z (U(1) symmetry) and every H conserves itself.
/// </summary>
public class ConservedQuantitySearchTests
{
    private static Hamiltonian Chain(int n, bool periodic, Func<int, int, IEnumerable<(string Pair, double C)>> bond, Func<int, IEnumerable<(char L, double C)>> site)
    {
        var terms = new List<PauliTerm>();
        int bonds = periodic ? n : n - 1;
        for (int i = 0; i < bonds; i++)
        {
            int j = (i + 1) % n;
            foreach (var (pair, c) in bond(i, j))
            {
                var b = new PauliString.Builder(n);
                b.Set(i, pair[0]);
                b.Set(j, pair[1]);
                terms.Add(new PauliTerm(b.Build(), c));
            }
        }
        for (int i = 0; i < n; i++)
        {
            foreach (var (l, c) in site(i)) terms.Add(new PauliTerm(PauliString.Single(n, i, l), c));
        }
        return new Hamiltonian(n, terms);
    }

    private static Hamiltonian MixedFieldIsing(int n, bool periodic, double j, double g, double h)
        => Chain(n, periodic, (_, _) => [("ZZ", j)], _ => [('X', g), ('Z', h)]);

    [Fact]
    public void Run_XxzChain_FindsHamiltonianAndTotalZ()
    {
        var h = Chain(8, false, (_, _) => [("XX", 1.0), ("YY", 1.0), ("ZZ", 0.6)], _ => []);
        var r = ConservedQuantitySearch.Run(h, new ConservedSearchOptions(MaxWeight: 2));
        Assert.True(r.ContainsHamiltonian);
        Assert.Contains("total Z", r.Recognised);
        Assert.DoesNotContain("total X", r.Recognised);
    }

    [Fact]
    public void Run_MixedFieldIsing_FindsOnlyTheHamiltonianUpToWeightTwo()
    {
        var h = MixedFieldIsing(8, false, 1.0, 1.05, 0.5);
        var r = ConservedQuantitySearch.Run(h, new ConservedSearchOptions(MaxWeight: 2));
        Assert.Equal(1, r.NullDimension);
        Assert.Equal(["H"], r.Recognised);
        Assert.Equal(0, r.Unexplained);
        Assert.True(r.SmallestNonZero > 1e-4, $"gap {r.SmallestNonZero}");
    }

    [Fact]
    public void MazurBound_MixedFieldIsingRing_EqualsHandDerivedValue()
    {
        // Hand derivation: on a ring of N sites with Q = H, (H|H) = N (J^2 + g^2 + h^2) and
        // (H|Z_j) = h, so the bound on (Z_j(t)|Z_j) is h^2 / (N (J^2 + g^2 + h^2)).
        int n = 8;
        double j = 1.0, g = 1.05, hf = 0.5;
        var h = MixedFieldIsing(n, true, j, g, hf);
        var r = ConservedQuantitySearch.Run(h, new ConservedSearchOptions(MaxWeight: 2));
        Assert.Equal(["H"], r.Recognised);
        var probe = new[] { new PauliTerm(PauliString.Single(n, 3, 'Z'), 1.0) };
        double bound = ConservedQuantitySearch.MazurBound(r.Operators.Select(o => o.Terms), probe);
        Assert.Equal(hf * hf / (n * (j * j + g * g + hf * hf)), bound, 10);
    }

    [Fact]
    public void MazurBound_TotalZAlone_IsOneOverN()
    {
        // Q = sum_j Z_j: (Q|Z_j)^2 / ((Q|Q)(Z_j|Z_j)) = 1 / N (check-values: free chains).
        int n = 10;
        var q = Enumerable.Range(0, n).Select(i => new PauliTerm(PauliString.Single(n, i, 'Z'), 1.0)).ToArray();
        double bound = ConservedQuantitySearch.MazurBound([q], [new PauliTerm(PauliString.Single(n, 4, 'Z'), 1.0)]);
        Assert.Equal(1.0 / n, bound, 14);
    }

    [Fact]
    public void EnumerateStrings_CountsAllWeightsUpToK()
    {
        // 3 C(n,1) + 9 C(n,2) + 27 C(n,3) for n = 6: 18 + 135 + 540.
        Assert.Equal(18 + 135 + 540, ConservedQuantitySearch.EnumerateStrings(6, 3).Count);
    }

    [Fact]
    public void Run_XxzChain_ExplainsEverythingUpToWeightTwo()
    {
        // Up to weight 2 the open XXZ chain conserves H, total Z and the weight-2 part of (total Z)^2
        // (a function of total Z); nothing else (its next local charge has weight 3).
        var h = Chain(8, false, (_, _) => [("XX", 1.0), ("YY", 1.0), ("ZZ", 0.5)], _ => []);
        var r = ConservedQuantitySearch.Run(h, new ConservedSearchOptions(MaxWeight: 2));
        Assert.Equal(["H", "total Z", "total Z^2"], r.Recognised);
        Assert.Equal(0, r.Unexplained);
    }

    [Fact]
    public void Run_RandomHeisenbergCluster_FindsTotalSpinAndItsProducts()
    {
        // SU(2): total X, Y, Z are conserved, and so are the weight-2 parts of their six products.
        var h = Families.HeisenbergAllToAll(6, seed: 4);
        var r = ConservedQuantitySearch.Run(h, new ConservedSearchOptions(MaxWeight: 2));
        Assert.Contains("H", r.Recognised);
        Assert.Contains("total X", r.Recognised);
        Assert.Contains("total Y", r.Recognised);
        Assert.Contains("total Z", r.Recognised);
        Assert.Equal(0, r.Unexplained);
    }

    public static IEnumerable<object[]> HamiltonianModels()
        => ShippedModels.Files.Select(ShippedModels.NameOf).Where(n => !n.Contains("kicked", StringComparison.Ordinal)).Select(n => new object[] { n });

    [Theory]
    [MemberData(nameof(HamiltonianModels))]
    public void Run_EveryShippedHamiltonianModel_FindsH(string name)
    {
        // Every H commutes with itself; the search space must hold H, so k is raised to H's locality
        // (the SYK model's four-Majorana terms are Pauli strings of weight up to N: there the cluster is cut
        // to N = 4, 255 strings, to keep the dense Gram matrix small).
        string path = ShippedModels.Resolve(name);
        var loaded = ModelLoader.Load(path);
        var member = FamilyMembers.FromFile(path, null, loaded);
        var small = member(6, 0) ?? loaded;
        if (small.Hamiltonian.Locality > 3) small = member(4, 0) ?? small;
        int k = Math.Max(2, small.Hamiltonian.Locality);
        var r = ConservedQuantitySearch.Run(small.Hamiltonian, new ConservedSearchOptions(MaxWeight: k));
        Assert.True(r.ContainsHamiltonian, $"{name} at N = {small.N}: H not found ({string.Join(", ", r.Recognised)})");
        Assert.Equal("H", r.Recognised[0]);
    }
}
