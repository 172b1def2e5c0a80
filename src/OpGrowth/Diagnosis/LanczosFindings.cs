namespace OpGrowth.Diagnosis;

/// <summary>Lanczos coefficients of one probe and their growth class (test 2).</summary>
public sealed record LanczosProbeFindings
{
    /// <summary>The probe.</summary>
    public required string Probe { get; init; }

    /// <summary>How the coefficients were computed ("infinite chain, exact", "finite system, top-M truncation (M = ...)").</summary>
    public required string Mode { get; init; }

    /// <summary>b_1..b_n as computed.</summary>
    public required IReadOnlyList<double> B { get; init; }

    /// <summary>Uncertainty of each b_n (0 exact; budget spread when truncated; NaN unknown).</summary>
    public required IReadOnlyList<double> Uncertainty { get; init; }

    /// <summary>Number of leading coefficients used in the fit (trusted ones).</summary>
    public required int Used { get; init; }

    /// <summary>Kind of growth: "linear" (n or n/ln n), "sqrt", "bounded", or "undecided".</summary>
    public required string Kind { get; init; }

    /// <summary>Best-fitting form, e.g. "b_n = 0.38 n + 3.6" (null when no fit).</summary>
    public string? BestFormula { get; init; }

    /// <summary>AIC gap between the best fit and the best fit of a different kind (larger: clearer).</summary>
    public double DeltaAic { get; init; }

    /// <summary>Slope alpha of a straight-line fit over the window.</summary>
    public double Alpha { get; init; }

    /// <summary>Standard error of alpha.</summary>
    public double AlphaError { get; init; }

    /// <summary>First n of the fit window.</summary>
    public int WindowStart { get; init; }

    /// <summary>Last n of the fit window.</summary>
    public int WindowEnd { get; init; }

    /// <summary>Why the recursion stopped.</summary>
    public string StopMessage { get; init; } = string.Empty;

    /// <summary>Weight discarded by truncation, summed over steps of the largest budget.</summary>
    public double DiscardedWeight { get; init; }

    /// <summary>Wall time in seconds.</summary>
    public double Seconds { get; init; }
}

/// <summary>What test 2 (Lanczos growth) measured.</summary>
/// <param name="Probes">One entry per probe.</param>
public sealed record LanczosFindings(IReadOnlyList<LanczosProbeFindings> Probes);
