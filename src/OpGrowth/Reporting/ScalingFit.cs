namespace OpGrowth.Reporting;

/// <summary>
/// A fit of t*(N): <see cref="ScalingForm.Logarithmic"/> t* = A + B ln N, or <see cref="ScalingForm.Ballistic"/>
/// t* = A + N / B (B is the velocity v). <see cref="ReducedChiSquare"/> is shown in the legend when given.
/// </summary>
public sealed record ScalingFit(ScalingForm Form, double A, double AUncertainty, double B, double BUncertainty)
{
    public double? ReducedChiSquare { get; init; }

    /// <summary>The fitted t* at size <paramref name="n"/>.</summary>
    public double Evaluate(double n) => Form == ScalingForm.Logarithmic ? A + B * Math.Log(n) : A + n / B;
}
