using OpGrowth.Analysis;

namespace OpGrowth.Evolution;

/// <summary>The outcome of an evolution: the series of every budget, the derived figures and how they moved across budgets.</summary>
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

    /// <summary>One series per budget of the budget series, full budget first (one without a series).</summary>
    public required IReadOnlyList<EvolutionSeries> Runs { get; init; }

    /// <summary>Derived figures per budget, full budget first.</summary>
    public required IReadOnlyList<ScramblingFigures> Figures { get; init; }

    /// <summary>How each figure moved across the budgets (empty with a single budget).</summary>
    public IReadOnlyList<FigureConvergence> Convergence { get; init; } = [];

    /// <summary>True when the run at every budget reached the final time.</summary>
    public bool Completed { get; init; }

    /// <summary>Why the run stopped early, if it did.</summary>
    public string? StopReason { get; init; }

    /// <summary>True when the run stopped because it could not fit its memory budget.</summary>
    public bool ResourceLimited { get; init; }

    /// <summary>What the truncation rules bias, in words.</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>Wall seconds of this session, all budgets.</summary>
    public double WallSeconds { get; init; }

    /// <summary>The run at the full budget.</summary>
    public EvolutionSeries Main => Runs[0];
}
