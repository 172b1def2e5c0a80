namespace OpGrowth.Reporting;

/// <summary>Lanczos coefficients b_1..b_M (<see cref="B"/>[0] is b_1) with their spread across budgets.</summary>
public sealed record LanczosSeries(double[] B)
{
    /// <summary>Per-coefficient spread across string budgets, drawn as error bars.</summary>
    public double[]? Spread { get; init; }

    public GrowthCurve? Fit { get; init; }
}
