namespace OpGrowth.Evolution;

/// <summary>
/// Observables of O(t) at one recorded time. Distributions, site weights and OTOCs are normalised
/// by the kept norm ||O(t)||^2 (conventions: P_k = sum_{size(S)=k} c_S^2 / ||O||^2); the
/// autocorrelation is the raw (O(0)|O(t)) with ||O(0)|| = 1.
/// </summary>
public sealed record EvolutionRecord
{
    /// <summary>Time t (periods times the period for drives).</summary>
    public double Time { get; init; }

    /// <summary>Step (or period) index.</summary>
    public long Step { get; init; }

    /// <summary>||O(t)||^2 = sum c^2 of the kept strings (1 minus the discarded weight, up to interference).</summary>
    public double NormSquared { get; init; }

    /// <summary>Number of strings held.</summary>
    public int Strings { get; init; }

    /// <summary>Weight discarded since the previous record.</summary>
    public double DiscardedWeight { get; init; }

    /// <summary>Weight discarded since t = 0.</summary>
    public double DiscardedTotal { get; init; }

    /// <summary>Autocorrelation (O(0)|O(t)).</summary>
    public double Autocorrelation { get; init; }

    /// <summary>Mean size n(t) = sum_k k P_k(t).</summary>
    public double MeanSize { get; init; }

    /// <summary>Size distribution P_k(t), k = 0..N.</summary>
    public double[] SizeDistribution { get; init; } = [];

    /// <summary>Site weights rho_j(t) = sum over strings non-identity at j of c^2 (normalised); 3/4 when scrambled.</summary>
    public double[] SiteWeights { get; init; } = [];

    /// <summary>OTOC F = sum_S c_S^2 e_S(V) / ||O||^2 against V = X_j.</summary>
    public double[] OtocX { get; init; } = [];

    /// <summary>OTOC against V = Y_j.</summary>
    public double[] OtocY { get; init; } = [];

    /// <summary>OTOC against V = Z_j.</summary>
    public double[] OtocZ { get; init; } = [];

    /// <summary>OTOC averaged over V in {X_j, Y_j, Z_j}: 1 - (4/3) rho_j.</summary>
    public double[] OtocMean { get; init; } = [];

    /// <summary>Weight whose rightmost non-identity site is j (the right front).</summary>
    public double[] RightEdge { get; init; } = [];

    /// <summary>Weight whose leftmost non-identity site is j (the left front).</summary>
    public double[] LeftEdge { get; init; } = [];

    /// <summary>Mean Majorana size (fermionic models; Jordan-Wigner with X strings), or null.</summary>
    public double? MeanMajoranaSize { get; init; }

    /// <summary>Majorana size distribution, 0..2N, or null.</summary>
    public double[]? MajoranaSizeDistribution { get; init; }

    /// <summary>|c| of the weakest string kept by the last top-M cut (0 when no cut was needed).</summary>
    public double CutMagnitude { get; init; }
}
