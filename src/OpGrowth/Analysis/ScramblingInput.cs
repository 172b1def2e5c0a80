namespace OpGrowth.Analysis;

/// <summary>Time series the scrambling figures are derived from (any engine can fill it).</summary>
public sealed record ScramblingInput
{
    /// <summary>Number of qubits.</summary>
    public required int N { get; init; }

    /// <summary>Recorded times, increasing.</summary>
    public required double[] Times { get; init; }

    /// <summary>Mean size n(t) (qubit count of non-identity sites).</summary>
    public required double[] MeanSize { get; init; }

    /// <summary>Site weights rho_j(t) per recorded time (normalised; 3/4 when scrambled).</summary>
    public required double[][] SiteWeights { get; init; }

    /// <summary>Sites of the initial operator (the front is measured from them).</summary>
    public required int[] ProbeSites { get; init; }

    /// <summary>Lattice distances; null: treated as a chain.</summary>
    public LatticeGeometry? Geometry { get; init; }

    /// <summary>Mean Majorana size per recorded time (fermionic models), or null.</summary>
    public double[]? MeanMajoranaSize { get; init; }
}
