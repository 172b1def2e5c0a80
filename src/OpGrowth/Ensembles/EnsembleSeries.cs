using OpGrowth.Analysis;

namespace OpGrowth.Ensembles;

/// <summary>
/// Ensemble-averaged operator growth of one probe: mean size with its sampling error, size distribution, site
/// weights rho_j (the Haar- or noise-averaged Pauli weight on strings with s_j != I) and, where kept, the weight
/// of each letter per site (from which the OTOC against X_j, Y_j, Z_j follows: F_V = 1 - 2 P(s_j anticommutes
/// with V)). Sampled series carry their sample count; the size-chain solution has <see cref="Samples"/> = 0
/// and an integration error instead.
/// </summary>
public sealed record EnsembleSeries
{
    /// <summary>"random circuit", "Brownian (trajectories)" or "Brownian (size chain)".</summary>
    public required string Kind { get; init; }

    /// <summary>Engine name for sweeps and results: "circuit" or "brownian".</summary>
    public required string Engine { get; init; }

    /// <summary>Name of the circuit or model.</summary>
    public required string Name { get; init; }

    /// <summary>How the averages were obtained, in one sentence (method, samples, seed).</summary>
    public string Method { get; init; } = "";

    public required int N { get; init; }

    /// <summary>Samples averaged (0: a deterministic solution).</summary>
    public long Samples { get; init; }

    /// <summary>Seed of the per-sample streams.</summary>
    public long Seed { get; init; }

    /// <summary>Record times (layers for circuits).</summary>
    public required double[] Times { get; init; }

    /// <summary>"layers" for circuits, "time" for Brownian models (1/energy of the model file).</summary>
    public required string TimeUnit { get; init; }

    public double[] MeanSize { get; init; } = [];

    /// <summary>Standard error of the mean size (sampling), or the integration error of the size chain.</summary>
    public double[] MeanSizeError { get; init; } = [];

    /// <summary>P_k(t): [record][k], k = 0..N.</summary>
    public double[][] SizeDistribution { get; init; } = [];

    /// <summary>rho_j(t): [record][site].</summary>
    public double[][] SiteWeights { get; init; } = [];

    /// <summary>Weight of the letters X, Z, Y per site: [letter][record][site] (null when not kept).</summary>
    public double[][][]? LetterWeights { get; init; }

    /// <summary>Batches for the jackknife (empty: none).</summary>
    public IReadOnlyList<EnsembleBatch> Batches { get; init; } = [];

    /// <summary>Mean position of the rightmost non-identity site (open-chain brickwork only).</summary>
    public double[]? RightEndMean { get; init; }

    /// <summary>Variance of that position across samples.</summary>
    public double[]? RightEndVariance { get; init; }

    /// <summary>Sites of the initial string.</summary>
    public required int[] ProbeSites { get; init; }

    /// <summary>Probe as text.</summary>
    public required string Probe { get; init; }

    /// <summary>Distances for the front.</summary>
    public required LatticeGeometry Geometry { get; init; }

    /// <summary>The input of the project's scrambling analysis.</summary>
    public ScramblingInput ToInput() => new()
    {
        N = N,
        Times = Times,
        MeanSize = MeanSize,
        SiteWeights = SiteWeights,
        ProbeSites = ProbeSites,
        Geometry = Geometry,
    };
}
