namespace OpGrowth.Analysis;

/// <summary>
/// Scrambling time t*: the first time the mean size reaches half its saturation value (3N/8 for
/// qubit size; N/2 for the Majorana size on 2N Majoranas), by linear interpolation between recorded
/// times. The grid uncertainty is the difference to a quadratic interpolation through three records.
/// </summary>
public sealed record ScramblingTime
{
    /// <summary>The level that defines t*.</summary>
    public double Target { get; init; }

    /// <summary>t*, or null when the level was not reached.</summary>
    public double? Value { get; init; }

    /// <summary>Interpolation (time-grid) uncertainty.</summary>
    public double? GridUncertainty { get; init; }

    /// <summary>Recorded time before the crossing.</summary>
    public double? BracketLow { get; init; }

    /// <summary>Recorded time at or after the crossing.</summary>
    public double? BracketHigh { get; init; }

    /// <summary>The definition used.</summary>
    public required string Definition { get; init; }
}
