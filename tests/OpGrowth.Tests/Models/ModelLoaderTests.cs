using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Models;

/// <summary>Each construct of the model-file format, on small inline files.</summary>
public class ModelLoaderTests
{
    private const string Head = "name = \"t\"\ndescription = \"test\"\n";

    private static Model Parse(string body, params (string K, string V)[] set)
        => ModelLoader.Parse(Head + body, "t.toml", set.ToDictionary(x => x.K, x => x.V));

    private static Dictionary<string, double> Terms(Model m) => m.Hamiltonian.Terms.ToDictionary(t => t.String.ToString(), t => t.Coefficient);

    [Fact]
    public void Parse_ExplicitSitesAndExpressions_PlacesEachGroup()
    {
        var m = Parse("""
            [parameters]
            N = 5
            h = "2*J"
            J = 0.5
            [lattice]
            kind = "chain"
            sites = "N"
            [[term]]
            pauli = "XZ"
            sites = [[0, 2], ["N-2", "N-1"]]
            coupling = "h/2"
            [[term]]
            pauli = "Y"
            sites = [1, "floor(N/2)+1"]
            coupling = -1
            """);
        var t = Terms(m);
        Assert.Equal(4, t.Count);
        Assert.Equal(0.5, t["X_0 Z_2"]);
        Assert.Equal(0.5, t["X_3 Z_4"]);
        Assert.Equal(-1, t["Y_1"]);
        Assert.Equal(-1, t["Y_3"]);
        Assert.Equal(["N", "h", "J"], m.Parameters.Keys);
        Assert.Equal(1.0, m.Parameters["h"]);
    }

    [Fact]
    public void Parse_PairsAtDistance_OnRing()
    {
        var m = Parse("""
            [lattice]
            kind = "ring"
            sites = 6
            [[term]]
            pauli = "ZZ"
            on = "pairs"
            distance = 2
            coupling = 1
            """);
        Assert.Equal(6, m.Hamiltonian.Terms.Count); // (0,2),(0,4),(1,3),(1,5),(2,4),(3,5)
        Assert.True(m.IsTranslationInvariant);
    }

    [Fact]
    public void Parse_LadderPlaquettes_FourBodyTerms()
    {
        var m = Parse("""
            [lattice]
            kind = "ladder"
            length = 3
            [[term]]
            pauli = "XXXX"
            on = "plaquettes"
            coupling = 1
            [[term]]
            pauli = "ZZ"
            on = "bonds"
            coupling = 0.5
            """);
        Assert.Equal(2 + 7, m.Hamiltonian.Terms.Count);
        Assert.Equal(4, m.Hamiltonian.Locality);
        Assert.Contains(m.Hamiltonian.Terms, t => t.String.ToString() == "X_0 X_1 X_2 X_3");
    }

    [Fact]
    public void Parse_EdgeListLattice_BondsFollowTheList()
    {
        var m = Parse("""
            [lattice]
            kind = "edges"
            sites = 4
            edges = [[0, 1], [1, 2], [1, 3]]
            [[term]]
            pauli = ["XX", "YY"]
            on = "bonds"
            coupling = 1
            """);
        Assert.Equal(6, m.Hamiltonian.Terms.Count);
        Assert.Equal(2, m.Lattice.Distance(0, 3));
        Assert.Equal(PauliString.Single(4, 1, 'Z'), m.Probes[0]); // default probe: Z on the central site
    }

    [Fact]
    public void Parse_ExplicitMajoranaPairs_GiveHermitianQuadraticTerms()
    {
        // i chi_1 chi_2 = i (Y_0)(X_0 Z_1) = i (i Z_0)... : check against the dense product instead of by hand.
        var m = Parse("""
            [lattice]
            kind = "chain"
            sites = 3
            [[term]]
            majorana = [[1, 2], [3, 4]]
            coupling = 0.7
            """);
        Assert.Equal(SizeMeasure.Majoranas, m.SizeMeasure);
        var dense = Dense.Of(3, m.Hamiltonian.Terms);
        var chi = Enumerable.Range(0, 6).Select(k => Dense.Of(JordanWigner.Majorana(3, k).String)).ToArray();
        var expected = (chi[1] * chi[2] + chi[3] * chi[4]) * new System.Numerics.Complex(0, 0.7);
        Assert.True((dense - expected).FrobeniusNorm() < 1e-12); // exact up to rounding
        Assert.Equal(PauliString.Single(3, 0, 'Z'), m.Probes[0]); // default Majorana probe chi_0
    }

    [Fact]
    public void Parse_ProbesInEveryForm()
    {
        var m = Parse("""
            probes = ["Z_0", "X3 Y_4", "Z_{N-1}", "chi_3", "IXIIII"]
            [parameters]
            N = 6
            [lattice]
            kind = "chain"
            sites = "N"
            [[term]]
            pauli = "Z"
            on = "sites"
            coupling = 1
            """);
        Assert.Equal(["Z_0", "X_3 Y_4", "Z_5", "X_0 Y_1", "X_1"], m.Probes.Select(p => p.ToString()));
    }

    [Fact]
    public void Parse_Drive_WithPeriodAndRandomAngles()
    {
        var m = Parse("""
            period = 0.5
            [lattice]
            kind = "chain"
            sites = 4
            [[layer]]
            rotations = [ { pauli = "ZZ", on = "bonds", angle = 1.0 } ]
            [[layer]]
            rotations = [ { pauli = "X", on = "sites", angle = "uniform(0, 1)", seed = 4 } ]
            """);
        Assert.NotNull(m.Drive);
        Assert.Equal(0.5, m.Drive!.Period);
        Assert.Equal([3, 4], m.Drive.Layers.Select(l => l.Count));
        Assert.True(m.IsDisordered);
        Assert.Equal([4L], m.Seeds);
        // Informational Hamiltonian: angle / (2 T) = 1.0 for each ZZ bond.
        Assert.Equal(1.0, Terms(m)["Z_0 Z_1"]);
    }

    [Fact]
    public void Parse_ZeroCoupling_DropsTheTerm()
    {
        var m = Parse("""
            [parameters]
            h = 0.5
            [lattice]
            kind = "chain"
            sites = 4
            [[term]]
            pauli = "ZZ"
            on = "bonds"
            coupling = 1
            [[term]]
            pauli = "Z"
            on = "sites"
            coupling = "h"
            """, ("h", "0"));
        Assert.Equal(3, m.Hamiltonian.Terms.Count);
        Assert.Equal(0.0, m.Parameters["h"]);
    }

    [Fact]
    public void Parse_SameSeedTwice_GivesTheSameDraws()
    {
        var m = Parse("""
            [lattice]
            kind = "chain"
            sites = 5
            [[term]]
            pauli = "X"
            on = "sites"
            coupling = "normal(0, 1)"
            seed = 9
            [[term]]
            pauli = "Z"
            on = "sites"
            coupling = "normal(0, 1)"
            seed = 9
            """);
        var t = Terms(m);
        for (int i = 0; i < 5; i++) Assert.Equal(t[$"X_{i}"], t[$"Z_{i}"]);
        Assert.Equal([9L], m.Seeds);
    }

    [Fact]
    public void Parse_DeclaredSymmetries_AreVerified()
    {
        var m = Parse("""
            symmetries = ["total-z", "spin-flip", "reflection", "translation", "time-reversal"]
            [lattice]
            kind = "ring"
            sites = 6
            [[term]]
            pauli = ["XX", "YY", "ZZ"]
            on = "bonds"
            coupling = 1
            """);
        Assert.Equal(5, m.Symmetries.Count);
        var ex = Assert.Throws<InputException>(() => Parse("""
            symmetries = ["time-reversal"]
            [lattice]
            kind = "chain"
            sites = 3
            [[term]]
            pauli = "XY"
            on = "bonds"
            coupling = 1
            """));
        Assert.Contains("odd number of Y", ex.Message);
        Assert.Equal(3, ex.Line);
    }

    [Fact]
    public void Overrides_UnknownAndMalformed_AreOneLineInputErrors()
    {
        const string body = "[parameters]\nN = 4\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = 1\n";
        var unknown = Assert.Throws<InputException>(() => Parse(body, ("M", "3")));
        Assert.Contains("found --set M=3, but the model has no parameter 'M'", unknown.Message);
        Assert.Equal(3, unknown.Line);
        var bad = Assert.Throws<InputException>(() => Parse(body, ("N", "4*")));
        Assert.Contains("(from --set)", bad.Message);
        var huge = Assert.Throws<InputException>(() => Parse(body, ("N", "1e400")));
        Assert.Contains("finite", huge.Message);
        Assert.Throws<InputException>(() => ModelLoader.ParseOverrides(["N"], "f.toml"));
        Assert.Throws<InputException>(() => ModelLoader.ParseOverrides(["N="], "f.toml"));
        Assert.Throws<InputException>(() => ModelLoader.ParseOverrides(["2x=1"], "f.toml"));
        var twice = Assert.Throws<InputException>(() => ModelLoader.ParseOverrides(["N=1", "N=2"], "f.toml"));
        Assert.StartsWith("f.toml: found --set N=... twice", twice.Message);
        Assert.Equal("h*2", ModelLoader.ParseOverrides([" h = h*2 "])["h"]);
    }

    [Fact]
    public void Load_MissingFile_IsInputError()
    {
        var ex = Assert.Throws<InputException>(() => ModelLoader.Load("/nonexistent/model.toml"));
        Assert.StartsWith("/nonexistent/model.toml: found no such", ex.Message);
    }

    [Fact]
    public void Resolve_ShippedNameVariants()
    {
        string a = ShippedModels.Resolve("mixed-field-ising");
        Assert.Equal(a, ShippedModels.Resolve("mixed-field-ising.toml"));
        Assert.Equal(ShippedModels.Resolve("demo/tilted-chain"), ShippedModels.Resolve("tilted-chain"));
        Assert.Equal(ShippedModels.Resolve("demo/tilted-chain"), ShippedModels.Resolve("demo-tilted-chain")); // declared name
        var ex = Assert.Throws<InputException>(() => ShippedModels.Resolve("mixed-field-isign"));
        Assert.Contains("did you mean 'mixed-field-ising'", ex.Message);
    }
}
