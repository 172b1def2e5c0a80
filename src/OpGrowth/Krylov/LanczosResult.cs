namespace OpGrowth.Krylov;

/// <summary>Outcome of one Lanczos run: the coefficients b_1..b_n and how they were obtained.</summary>
public sealed record LanczosResult
{
    /// <summary>b_1..b_n (index 0 holds b_1).</summary>
    public required IReadOnlyList<double> B { get; init; }

    /// <summary>One record per computed step.</summary>
    public required IReadOnlyList<LanczosStep> Steps { get; init; }

    /// <summary>Why the run ended.</summary>
    public required LanczosStopReason StopReason { get; init; }

    /// <summary>One sentence on why the run ended (for logs and summaries).</summary>
    public required string StopMessage { get; init; }

    /// <summary>String budget per vector (0 = exact).</summary>
    public required long MaxStrings { get; init; }

    /// <summary>Re-orthogonalization used.</summary>
    public required Reorthogonalization Reorthogonalize { get; init; }

    /// <summary>Bytes held by kept vectors for re-orthogonalization at the end (0 without).</summary>
    public required long ReorthogonalizationBytes { get; init; }

    /// <summary>Largest accounted bytes over all steps.</summary>
    public required long PeakAccountedBytes { get; init; }

    /// <summary>Largest managed-heap size observed after any step (GC), in bytes.</summary>
    public required long PeakManagedBytes { get; init; }

    /// <summary>Total wall time in seconds.</summary>
    public required double Seconds { get; init; }

    /// <summary>Which representation was used (plain, infinite chain, translation classes ...).</summary>
    public required string Representation { get; init; }

    /// <summary>Number of sites of the system the strings live on.</summary>
    public required int Sites { get; init; }

    /// <summary>Sum over steps of the discarded weight.</summary>
    public double TotalDiscardedWeight => Steps.Sum(s => s.DiscardedWeight);

    /// <summary>True when no truncation was applied.</summary>
    public bool IsExact => Steps.All(s => s.DiscardedWeight == 0);

    /// <summary>
    /// Infinite-chain mode: the largest n for which b_n is verified free of boundary effects
    /// (null in other modes).
    /// </summary>
    public int? VerifiedDepth { get; init; }

    /// <summary>Infinite-chain and translation modes: notes from the run-time checks (empty when all passed).</summary>
    public IReadOnlyList<string> Warnings { get; init; } = [];
}
