namespace OpGrowth.Krylov;

/// <summary>
/// Lanczos coefficients with uncertainties: from one exact run (uncertainty 0), or from runs at two or more
/// string budgets, b_n taken from the largest budget and its uncertainty the spread max_i |b_n(M_i) - b_n(M_max)|.
/// </summary>
public sealed record LanczosEstimate
{
    /// <summary>b_1..b_n (from the exact run or the largest budget).</summary>
    public required IReadOnlyList<double> B { get; init; }

    /// <summary>Uncertainty of each b_n (0 when exact; NaN where fewer than two budgets reached n).</summary>
    public required IReadOnlyList<double> Uncertainty { get; init; }

    /// <summary>Budgets in increasing order (0 = exact).</summary>
    public required IReadOnlyList<long> Budgets { get; init; }

    /// <summary>One run per budget, same order.</summary>
    public required IReadOnlyList<LanczosResult> Runs { get; init; }

    /// <summary>The run the coefficients come from.</summary>
    public LanczosResult Reference => Runs[^1];

    /// <summary>True when no truncation was applied.</summary>
    public bool IsExact => Budgets.Count == 1 && Budgets[0] == 0;
}
