namespace OpGrowth.Analysis;

/// <summary>
/// How one derived figure moved across the budget series. <see cref="Values"/> are ordered from
/// the full budget down (budget, budget/2, budget/4). The truncation uncertainty is the movement
/// between the two largest budgets; a figure is converged when that movement is within the
/// tolerance (relative) of its value.
/// </summary>
public sealed record FigureConvergence
{
    public required string Figure { get; init; }

    /// <summary>Values from the full budget down (null where unavailable).</summary>
    public required double?[] Values { get; init; }

    /// <summary>|f(budget) - f(budget/2)|: the truncation uncertainty.</summary>
    public double? Movement { get; init; }

    /// <summary>|f(budget/2) - f(budget/4)| when three budgets ran.</summary>
    public double? PreviousMovement { get; init; }

    /// <summary>Movement / |f(budget)|.</summary>
    public double? RelativeMovement { get; init; }

    /// <summary>True when the relative movement is within tolerance.</summary>
    public bool Converged { get; init; }

    /// <summary>Explanation when not converged.</summary>
    public string? Note { get; init; }
}
