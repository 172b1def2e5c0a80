namespace OpGrowth.Reporting;

/// <summary>A fitted Lanczos growth law sampled at <see cref="N"/>, with the class name and its rate.</summary>
public sealed record GrowthCurve(string ClassName, double[] N, double[] B)
{
    /// <summary>The fitted rate (e.g. the slope alpha of b_n ~ alpha n) with its uncertainty and n window.</summary>
    public Measured? Rate { get; init; }
}
