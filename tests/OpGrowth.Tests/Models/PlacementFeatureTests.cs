using OpGrowth.Diagnosis;
using OpGrowth.Models;

namespace OpGrowth.Tests.Models;

/// <summary>
/// Model files as users write them: couplings that depend on the placement (site index, distance,
/// coordinates), ladders with separate legs and rungs, squares with separate horizontal and vertical bonds,
/// runs of consecutive sites, a named size parameter, and smaller members of a family. Expected numbers are
/// worked out by hand beside each check.
/// </summary>
public class PlacementFeatureTests
{
    private const string Head = "name = \"t\"\ndescription = \"test\"\n";

    private static Model Parse(string body, params (string K, string V)[] set)
        => ModelLoader.Parse(Head + body, "t.toml", set.ToDictionary(x => x.K, x => x.V));

    private static Dictionary<string, double> Terms(Model m) => m.Hamiltonian.Terms.ToDictionary(t => t.String.ToString(), t => t.Coefficient);

    [Fact]
    public void StaggeredField_UsesTheSiteIndex()
    {
        var t = Terms(Parse("[parameters]\nN = 4\nh = 0.5\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = \"h*(-1)^i\"\n"));
        Assert.Equal(0.5, t["Z_0"]);
        Assert.Equal(-0.5, t["Z_1"]);
        Assert.Equal(0.5, t["Z_2"]);
        Assert.Equal(-0.5, t["Z_3"]);
    }

    [Fact]
    public void PowerLawPairs_UseTheGraphDistance()
    {
        // J / d^alpha on a chain of 5 sites: 10 pairs, pair (0, 3) at distance 3 gets 1/27 for alpha = 3.
        var t = Terms(Parse("[parameters]\nN = 5\nalpha = 3\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n[[term]]\npauli = \"ZZ\"\non = \"pairs\"\ncoupling = \"1/d^alpha\"\n"));
        Assert.Equal(10, t.Count);
        Assert.Equal(1.0, t["Z_0 Z_1"], 15);
        Assert.Equal(1.0 / 27, t["Z_0 Z_3"], 15);
        Assert.Equal(1.0 / 64, t["Z_0 Z_4"], 15);
    }

    [Fact]
    public void RingChordDistance_HaldaneShastryCouplings()
    {
        // On a ring of 6 sites the distance d of (0, 3) is 3 and sin(pi d / N) = 1: coupling (pi/6)^2.
        var t = Terms(Parse("[parameters]\nN = 6\n[lattice]\nkind = \"ring\"\nsites = \"N\"\n[[term]]\npauli = \"ZZ\"\non = \"pairs\"\ncoupling = \"1 / ((N/pi) * sin(pi * d / N))^2\"\n"));
        Assert.Equal(Math.Pow(Math.PI / 6, 2), t["Z_0 Z_3"], 14);
        Assert.Equal(t["Z_0 Z_1"], t["Z_0 Z_5"], 14); // the shorter way round
    }

    [Fact]
    public void EuclideanDistanceAndCoordinates_OnASquare()
    {
        // 3x3 open square: the pair (0, 4) = (0,0)-(1,1) has r = sqrt 2 and graph distance 2; x and y are the
        // coordinates of the first site.
        var t = Terms(Parse("[lattice]\nkind = \"square\"\nwidth = 3\nheight = 3\n[[term]]\npauli = \"XX\"\non = \"pairs\"\ncoupling = \"1/r^2\"\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = \"x + 10*y + 1\"\n"));
        Assert.Equal(0.5, t["X_0 X_4"], 14);
        Assert.Equal(1.0 / 8, t["X_0 X_8"], 14);
        Assert.Equal(1 + 2 + 10, t["Z_5"]); // site 5 = (2, 1)
    }

    [Fact]
    public void LadderLegsAndRungs_AreSeparate()
    {
        // length 3: 3 rungs (2x, 2x+1) and 4 leg bonds.
        var m = Parse("[lattice]\nkind = \"ladder\"\nlength = 3\n[[term]]\npauli = \"ZZ\"\non = \"legs\"\ncoupling = 1\n[[term]]\npauli = \"XX\"\non = \"rungs\"\ncoupling = 0.5\n");
        var t = Terms(m);
        Assert.Equal(4, t.Keys.Count(k => k.StartsWith('Z')));
        Assert.Equal(3, t.Keys.Count(k => k.StartsWith('X')));
        Assert.Equal(0.5, t["X_0 X_1"]);
        Assert.Equal(1, t["Z_1 Z_3"]);
    }

    [Fact]
    public void SquareHorizontalAndVertical_AreSeparate()
    {
        // 3 wide, 2 high: 4 horizontal bonds, 3 vertical ones.
        var t = Terms(Parse("[lattice]\nkind = \"square\"\nwidth = 3\nheight = 2\n[[term]]\npauli = \"ZZ\"\non = \"horizontal\"\ncoupling = 1\n[[term]]\npauli = \"XX\"\non = \"vertical\"\ncoupling = 2\n"));
        Assert.Equal(4, t.Keys.Count(k => k.StartsWith('Z')));
        Assert.Equal(3, t.Keys.Count(k => k.StartsWith('X')));
        Assert.Equal(2, t["X_1 X_4"]);
    }

    [Fact]
    public void Segments_PlaceRunsOfConsecutiveSites()
    {
        var open = Terms(Parse("[lattice]\nkind = \"chain\"\nsites = 5\n[[term]]\npauli = \"ZXZ\"\non = \"segments\"\ncoupling = 1\n"));
        Assert.Equal(3, open.Count);
        var ring = Terms(Parse("[lattice]\nkind = \"ring\"\nsites = 5\n[[term]]\npauli = \"ZXZ\"\non = \"segments\"\ncoupling = 1\n"));
        Assert.Equal(5, ring.Count);
        Assert.True(ring.ContainsKey("Z_0 Z_3 X_4") || ring.ContainsKey("X_4 Z_0 Z_3") || ring.Keys.Any(k => k.Contains("X_4", StringComparison.Ordinal)));
    }

    [Fact]
    public void ReservedParameterName_IsAnError()
    {
        var ex = Assert.Throws<OpGrowth.IO.InputException>(() => Parse("[parameters]\nd = 2\n[lattice]\nkind = \"chain\"\nsites = 3\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = 1\n"));
        Assert.Contains("placement", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void SizeKey_NamesTheSizeParameter()
    {
        var m = Parse("size = \"L\"\n[parameters]\nL = 4\n[lattice]\nkind = \"ladder\"\nlength = \"L\"\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n");
        Assert.Equal(["L"], m.SizeParameters);
        var byLattice = Parse("[parameters]\nLx = 4\nLy = 3\n[lattice]\nkind = \"square\"\nwidth = \"Lx\"\nheight = \"Ly\"\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n");
        Assert.Equal(["Lx", "Ly"], byLattice.SizeParameters);
    }

    [Fact]
    public void FamilyMembers_SquareShrinksAlongOneDirection_EdgeListHasNone()
    {
        string dir = Path.Combine(Path.GetTempPath(), "opgrowth-members-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        try
        {
            string square = Path.Combine(dir, "square.toml");
            File.WriteAllText(square, Head + "[parameters]\nLx = 4\nLy = 4\n[lattice]\nkind = \"square\"\nwidth = \"Lx\"\nheight = \"Ly\"\nperiodic = true\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"X\"\non = \"sites\"\ncoupling = 1\n");
            var m = ModelLoader.Load(square);
            var small = FamilyMembers.FromFile(square, null, m)(12, 0)!;
            Assert.Equal(12, small.N);
            Assert.Equal(4, Math.Max(small.Lattice.Width, small.Lattice.Height)); // 4 x 3: one direction shrunk
            string edges = Path.Combine(dir, "graph.toml");
            File.WriteAllText(edges, Head + "[lattice]\nkind = \"edges\"\nsites = 6\nedges = [[0,1],[1,2],[2,3],[3,4],[4,5]]\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n");
            var g = ModelLoader.Load(edges);
            Assert.Null(FamilyMembers.FromFile(edges, null, g)(4, 0));
            Assert.Same(g, FamilyMembers.FromFile(edges, null, g)(6, 0));
        }
        finally
        {
            Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void SmallerMember_DropsATermThatPlacesNothing_WithANote()
    {
        // distance-3 couplings do not fit on 3 sites: an error as written, a dropped term (with a note) when shrinking.
        string text = Head + "[parameters]\nN = 8\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n[[term]]\npauli = \"ZZ\"\non = \"bonds\"\ncoupling = 1\n[[term]]\npauli = \"XX\"\non = \"pairs\"\ndistance = 3\ncoupling = 0.5\n";
        Assert.Throws<OpGrowth.IO.InputException>(() => ModelLoader.Parse(text, "t.toml", new Dictionary<string, string> { ["N"] = "3" }));
        var m = ModelLoader.Parse(text, "t.toml", new Dictionary<string, string> { ["N"] = "3" }, lenient: true);
        Assert.Single(m.LoadNotes);
        Assert.All(m.Hamiltonian.Terms, t => Assert.Equal(2, t.String.Weight));
    }
}
