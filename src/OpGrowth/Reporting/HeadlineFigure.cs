namespace OpGrowth.Reporting;

/// <summary>
/// A headline number of the report (v_B, t*, growth rate, ...): the value with its uncertainty and definition or
/// window, and whether the budget series says it is converged. <see cref="Note"/> is optional extra text
/// (e.g. which budget disagreed).
/// </summary>
public sealed record HeadlineFigure(string Name, Measured Value, bool Converged)
{
    public string? Note { get; init; }
}
