namespace OpGrowth.Krylov;

/// <summary>Settings for turning coefficients into physics (fits, dynamics, spectrum).</summary>
public sealed record KrylovAnalysisOptions
{
    /// <summary>First n of the growth-fit window (null: <see cref="LanczosGrowth.DefaultWindow"/>).</summary>
    public int? FitFrom { get; init; }

    /// <summary>Last n of the growth-fit window (null: the last trusted coefficient).</summary>
    public int? FitTo { get; init; }

    /// <summary>Class used for the continuation (null: the best fit).</summary>
    public GrowthClass? ContinuationClass { get; init; }

    /// <summary>First n taken from the fit (null: one past the last trusted coefficient).</summary>
    public int? ContinueFrom { get; init; }

    /// <summary>How many n earlier the sensitivity run starts the continuation.</summary>
    public int SensitivityShift { get; init; } = 4;

    /// <summary>
    /// Largest time (null: the smaller of 10 / b_1, about ten short-time scales, and three times the time the
    /// Krylov wave needs to cross the trusted coefficients, sum_n 1/(2 b_n); beyond that the result is mostly
    /// the continuation).
    /// </summary>
    public double? TMax { get; init; }

    /// <summary>Number of time points from 0 to TMax.</summary>
    public int TimePoints { get; init; } = 201;

    /// <summary>Levels of the continued fraction for the spectral function (computed plus continued).</summary>
    public int SpectrumDepth { get; init; } = 2000;

    /// <summary>Frequency points of the spectral function (0 turns it off).</summary>
    public int SpectrumPoints { get; init; } = 401;

    /// <summary>Largest Krylov-chain length for the dynamics.</summary>
    public int MaxChain { get; init; } = 2_000_000;

    /// <summary>Largest integration work (chain sites times Chebyshev terms, summed), about a minute of one core at 2e10.</summary>
    public long MaxWork { get; init; } = 20_000_000_000;
}
