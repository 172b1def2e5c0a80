namespace OpGrowth.Diagnosis;

/// <summary>What one test of the diagnosis battery says about scrambling.</summary>
public enum TestOutcome
{
    /// <summary>The figure is on the scrambling side of the test's threshold.</summary>
    Scrambles,

    /// <summary>The figure is on the non-scrambling side of the threshold.</summary>
    Fails,

    /// <summary>The figure is too close to the threshold or too uncertain, or the evidence is contradictory.</summary>
    Inconclusive,

    /// <summary>The test did not run (not applicable, skipped, too little data, or over its budget); the reason says which.</summary>
    NotRun,
}
