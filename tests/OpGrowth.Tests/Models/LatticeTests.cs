using OpGrowth.Models;

namespace OpGrowth.Tests.Models;

public class LatticeTests
{
    [Fact]
    public void Chain_And_Ring_DistancesAndBonds()
    {
        var c = Lattice.Chain(6);
        Assert.Equal(5, c.Edges.Count);
        Assert.Equal(5, c.Distance(0, 5));
        Assert.True(c.IsOneDimensional);
        Assert.Equal(3, c.Center);
        var r = Lattice.Chain(6, periodic: true);
        Assert.Equal("ring", r.Kind);
        Assert.Equal(6, r.Edges.Count);
        Assert.Equal((5, 0), r.Edges[^1]);
        Assert.Equal(1, r.Distance(0, 5));
        Assert.Equal(3, r.Diameter);
    }

    [Fact]
    public void Square_EdgesPlaquettesAndManhattanDistance()
    {
        var s = Lattice.Square(4, 6);
        Assert.Equal(24, s.N);
        Assert.Equal(3 * 6 + 4 * 5, s.Edges.Count);
        Assert.Equal(3 * 5, s.Plaquettes.Count);
        Assert.Equal([0, 1, 5, 4], s.Plaquettes[0]);
        Assert.Equal(3 + 5, s.Distance(0, 23));
        Assert.Equal(8, s.Diameter);
        var p = Lattice.Square(4, 4, periodic: true);
        Assert.Equal(32, p.Edges.Count);
        Assert.Equal(2 + 2, p.Distance(0, 10));
        Assert.Equal(1, p.Distance(0, 3));
    }

    [Fact]
    public void Ladder_GraphDistanceByBreadthFirstSearch()
    {
        var l = Lattice.Ladder(5);
        Assert.Equal(10, l.N);
        Assert.Equal(5 + 2 * 4, l.Edges.Count);
        Assert.Equal(4, l.Plaquettes.Count);
        Assert.Equal(5, l.Distance(0, 9)); // 4 along a leg + 1 rung
        Assert.Equal(1, l.Distance(0, 1));
        Assert.Equal((2, 1), l.Coordinate(5));
    }

    [Fact]
    public void AllToAll_And_Edges()
    {
        var a = Lattice.AllToAll(5);
        Assert.Equal(10, a.Edges.Count);
        Assert.Equal(1, a.Distance(0, 4));
        Assert.Equal(0, a.Distance(2, 2));
        var e = Lattice.FromEdges(4, [(0, 1), (1, 2), (1, 3)]);
        Assert.True(e.IsConnected);
        Assert.Equal(2, e.Distance(2, 3));
        Assert.Equal(1, e.Center);
        Assert.False(Lattice.FromEdges(4, [(0, 1), (2, 3)]).IsConnected);
    }
}
