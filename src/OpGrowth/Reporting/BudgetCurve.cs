namespace OpGrowth.Reporting;

/// <summary>A curve from one run of the budget series (a run with a smaller string budget).</summary>
public sealed record BudgetCurve(long Budget, double[] Times, double[] Values);
