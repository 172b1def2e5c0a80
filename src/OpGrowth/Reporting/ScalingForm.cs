namespace OpGrowth.Reporting;

/// <summary>Form of a scrambling-time fit across system sizes.</summary>
public enum ScalingForm
{
    /// <summary>t* = a + b ln N (fast scrambling; b ~ 1/lambda).</summary>
    Logarithmic,

    /// <summary>t* = a + N / v (local, ballistic spreading; B is v).</summary>
    Ballistic,
}
