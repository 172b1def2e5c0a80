namespace OpGrowth.Analysis;

/// <summary>The lattice facts the scrambling figures need: a graph distance between sites and whether the lattice is one-dimensional.</summary>
/// <param name="N">Number of sites.</param>
/// <param name="Distance">Graph distance between two sites.</param>
/// <param name="IsOneDimensional">Chains and rings: mean size then grows linearly, not exponentially.</param>
/// <param name="Kind">Lattice name for reports.</param>
public sealed record LatticeGeometry(int N, Func<int, int, int> Distance, bool IsOneDimensional, string Kind = "lattice")
{
    /// <summary>An open chain 0 - 1 - ... - N-1.</summary>
    public static LatticeGeometry Chain(int n) => new(n, (i, j) => Math.Abs(i - j), true, "chain");

    /// <summary>A ring (periodic chain).</summary>
    public static LatticeGeometry Ring(int n) => new(n, (i, j) => Math.Min(Math.Abs(i - j), n - Math.Abs(i - j)), true, "ring");

    /// <summary>All-to-all: every pair at distance 1 (no front to follow).</summary>
    public static LatticeGeometry AllToAll(int n) => new(n, (i, j) => i == j ? 0 : 1, false, "all-to-all");
}
