namespace OpGrowth.Analysis;

/// <summary>Choices behind the derived figures (each one is stated in the results).</summary>
public sealed record ScramblingAnalysisOptions
{
    /// <summary>Front threshold as a fraction of the scrambled site weight 3/4 (default 0.5, i.e. rho_j = 0.375).</summary>
    public double FrontFraction { get; init; } = 0.5;

    /// <summary>Fractions of 3/4 used for the threshold sensitivity of v_B.</summary>
    public double[] SensitivityFractions { get; init; } = [0.25, 0.5, 0.75];

    /// <summary>Growth window, lower end: the excess mean size n(t) - n(0) at least this (past the t^2 onset).</summary>
    public double GrowthMinExcess { get; init; } = 0.5;

    /// <summary>Growth window, upper end: at most this fraction of the saturation excess 3N/4 - n(0).</summary>
    public double GrowthMaxFraction { get; init; } = 0.3;

    /// <summary>OTOC window: the averaged squared commutator between these fractions of its saturation value 2.</summary>
    public double OtocMinFraction { get; init; } = 0.01;

    /// <summary>Upper end of the OTOC window (fraction of 2).</summary>
    public double OtocMaxFraction { get; init; } = 0.3;

    /// <summary>Fewest points a fit may use.</summary>
    public int MinFitPoints { get; init; } = 4;
}
