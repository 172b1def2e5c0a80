namespace OpGrowth.Diagnosis;

/// <summary>What one test of the diagnosis battery says about scrambling.</summary>
public enum TestOutcome
{
    /// <summary>The figure is on the scrambling side of the test's threshold.</summary>
    Scrambles,

    /// <summary>The figure is on the non-scrambling side of the threshold.</summary>
    Fails,

    /// <summary>The figure is too close to the threshold, too uncertain, or the test does not apply.</summary>
    Inconclusive,
}
