using Microsoft.Extensions.Logging;
using OpGrowth.Pipeline;

namespace OpGrowth.Ensembles;

/// <summary>Options of <see cref="EnsembleRun.Execute"/>.</summary>
public sealed record EnsembleRunOptions
{
    /// <summary>A circuit file (random circuit) or a model file / shipped model name (its Brownian counterpart).</summary>
    public required string Input { get; init; }

    /// <summary>Parameter overrides (NAME -> VALUE), as from --set.</summary>
    public IReadOnlyDictionary<string, string> Overrides { get; init; } = new Dictionary<string, string>();

    /// <summary>Report folder (null: ./opgrowth-report/&lt;name&gt;-circuit or -brownian).</summary>
    public string? OutputFolder { get; init; }

    /// <summary>Samples: quick 200, standard 1000, thorough 4000 (unless <see cref="Samples"/> is set).</summary>
    public RunEffort Effort { get; init; } = RunEffort.Standard;

    /// <summary>Samples (null: the effort's).</summary>
    public int? Samples { get; init; }

    public long Seed { get; init; } = 1;

    public int Threads { get; init; } = Environment.ProcessorCount;

    /// <summary>Brownian: final time (null: the effort's evolution time, as in <c>opgrowth run</c>). Circuits: ignored (the file's layers).</summary>
    public double? Time { get; init; }

    /// <summary>Brownian: noise time tau (rates 4 J_a^2 tau).</summary>
    public double NoiseTime { get; init; } = 1;

    /// <summary>Brownian: "auto" (size chain where exact, else trajectories), "trajectories" or "size-chain".</summary>
    public string Method { get; init; } = "auto";

    /// <summary>Sizes for t*(N) (empty: none).</summary>
    public IReadOnlyList<int> SweepSizes { get; init; } = [];

    /// <summary>A static run of the same model at the same N to put beside the Brownian counterpart (null: none).</summary>
    public StaticComparison? Static { get; init; }

    public ILogger? Logger { get; init; }

    /// <summary>Samples of an effort.</summary>
    public int SamplesFor() => Samples ?? Effort switch { RunEffort.Quick => 200, RunEffort.Thorough => 4000, _ => 1000 };
}

/// <summary>The static model's series, from <c>opgrowth run</c>, for the side-by-side figures.</summary>
/// <param name="Label">Legend text.</param>
/// <param name="Times">Record times.</param>
/// <param name="MeanSize">Mean size n(t) (truncated evolution).</param>
/// <param name="Figures">The static run's derived figures.</param>
/// <param name="DiscardedWeight">Weight the static evolution discarded by its end.</param>
public sealed record StaticComparison(string Label, double[] Times, double[] MeanSize, OpGrowth.Analysis.ScramblingFigures Figures, double DiscardedWeight);
