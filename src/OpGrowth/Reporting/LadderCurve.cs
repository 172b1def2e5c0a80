namespace OpGrowth.Reporting;

/// <summary>A curve from one rung of the convergence ladder (a run with a smaller string budget).</summary>
public sealed record LadderCurve(long Budget, double[] Times, double[] Values);
