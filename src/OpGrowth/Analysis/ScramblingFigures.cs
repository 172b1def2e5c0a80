namespace OpGrowth.Analysis;

/// <summary>All derived figures of one run.</summary>
public sealed record ScramblingFigures
{
    /// <summary>Butterfly velocity (null on lattices without at least four distinct distances).</summary>
    public ButterflyVelocity? Butterfly { get; init; }

    /// <summary>Why there is no butterfly velocity, if there is none.</summary>
    public string? ButterflyNote { get; init; }

    /// <summary>Growth rates and saturation.</summary>
    public required GrowthRates Growth { get; init; }

    /// <summary>Scrambling time from the qubit size.</summary>
    public required ScramblingTime ScramblingTime { get; init; }

    /// <summary>Scrambling time from the Majorana size (fermionic models), or null.</summary>
    public ScramblingTime? MajoranaScramblingTime { get; init; }

    /// <summary>Growth and saturation of the Majorana size (fermionic models; random operator: N of 2N Majoranas), or null.</summary>
    public GrowthRates? MajoranaGrowth { get; init; }
}
