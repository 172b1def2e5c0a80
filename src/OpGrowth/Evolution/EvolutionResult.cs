using OpGrowth.Analysis;

namespace OpGrowth.Evolution;

/// <summary>The outcome of an evolution: every rung's series, the derived figures and their ladder convergence.</summary>
public sealed class EvolutionResult
{
    /// <summary>Model name.</summary>
    public required string Model { get; init; }

    /// <summary>Number of qubits.</summary>
    public int N { get; init; }

    /// <summary>The initial operator, as written.</summary>
    public required string Initial { get; init; }

    /// <summary>Sites of the initial operator.</summary>
    public required int[] ProbeSites { get; init; }

    /// <summary>"hamiltonian" or "periodic drive".</summary>
    public required string Dynamics { get; init; }

    /// <summary>Integrator used ("exact layers" for drives).</summary>
    public required string Method { get; init; }

    /// <summary>Commuting groups per Trotter step, or rotation blocks per period.</summary>
    public int Groups { get; init; }

    /// <summary>Size measure(s) recorded.</summary>
    public required string SizeMeasure { get; init; }

    /// <summary>Rungs of the ladder, full budget first (one rung without a ladder).</summary>
    public required IReadOnlyList<EvolutionSeries> Rungs { get; init; }

    /// <summary>Derived figures per rung, full budget first.</summary>
    public required IReadOnlyList<ScramblingFigures> Figures { get; init; }

    /// <summary>How each figure moved across the ladder (empty without a ladder).</summary>
    public IReadOnlyList<FigureConvergence> Convergence { get; init; } = [];

    /// <summary>True when every rung reached the final time.</summary>
    public bool Completed { get; init; }

    /// <summary>Why the run stopped early, if it did.</summary>
    public string? StopReason { get; init; }

    /// <summary>True when the run stopped because it could not fit its memory budget.</summary>
    public bool ResourceLimited { get; init; }

    /// <summary>What the truncation rules bias, in words.</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>Wall seconds of this session, all rungs.</summary>
    public double WallSeconds { get; init; }

    /// <summary>The full-budget rung.</summary>
    public EvolutionSeries Main => Rungs[0];
}
