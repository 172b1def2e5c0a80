using Microsoft.Extensions.Logging;

namespace OpGrowth.Exact;

/// <summary>Settings of <see cref="LevelStatistics.Analyze(OpGrowth.Pauli.Hamiltonian, LevelStatisticsOptions?)"/>.</summary>
public sealed record LevelStatisticsOptions
{
    /// <summary>Symmetries the model declares (names as in model files: "total-z", "reflection", "spin-flip", others are reported as unresolved).</summary>
    public IReadOnlyList<string> DeclaredSymmetries { get; init; } = [];

    /// <summary>Symmetries to resolve; null = every supported symmetry that H is detected to have.</summary>
    public IReadOnlyList<string>? Resolve { get; init; }

    /// <summary>
    /// Site permutations (involutions) to test as spatial symmetries of H; each one that maps H onto itself
    /// is resolved when it commutes with the ones already taken and is not their product. Null: the chain
    /// reflection j -&gt; N-1-j only. For a rectangle use <see cref="SitePermutation.RectangleMirrors"/>.
    /// </summary>
    public IReadOnlyList<SitePermutation>? SpatialCandidates { get; init; }

    /// <summary>
    /// One more involution to test (e.g. <see cref="SitePermutation.RectangleDiagonal"/>) that need not commute
    /// with the mirrors but maps them onto each other: it splits the sectors it maps onto themselves and
    /// pairs the others (see <see cref="SymmetrySector"/>).
    /// </summary>
    public SitePermutation? SwapCandidate { get; init; }

    /// <summary>Fraction of each sector's levels kept around the middle of its spectrum (common practice: drop the edges, where the density of states is low).</summary>
    public double CentralFraction { get; init; } = 0.8;

    /// <summary>Sectors smaller than this are skipped (too few gaps to matter).</summary>
    public int MinimumSectorDimension { get; init; } = 32;

    /// <summary>Largest sector dimension diagonalised (memory ~ 8 d^2 bytes, time ~ d^3).</summary>
    public int MaximumSectorDimension { get; init; } = 12_000;

    /// <summary>Threads for the dense reduction.</summary>
    public int Threads { get; init; }

    /// <summary>Use LAPACK when the system library is present.</summary>
    public bool UseNative { get; init; } = true;

    /// <summary>Progress log (optional).</summary>
    public ILogger? Logger { get; init; }
}
