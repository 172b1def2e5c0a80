namespace OpGrowth.Krylov;

/// <summary>
/// Truncated recursion at several string budgets: each Krylov vector keeps its top-M strings, the run is
/// repeated for every M, and the spread of each b_n across budgets is reported as its uncertainty
/// (truncation error has no closed form; its budget dependence is the measurable part).
/// </summary>
public static class TruncatedLanczos
{
    /// <summary>
    /// Runs <paramref name="runAtBudget"/> for every budget (ascending; 0 means exact) and combines them.
    /// Works with every representation: pass a closure over the plain, infinite-chain or extensive entry.
    /// </summary>
    public static LanczosEstimate Run(Func<long, LanczosResult> runAtBudget, IReadOnlyList<long> budgets)
    {
        ArgumentNullException.ThrowIfNull(runAtBudget);
        ArgumentNullException.ThrowIfNull(budgets);
        if (budgets.Count == 0) throw new ArgumentException("At least one budget is needed.", nameof(budgets));
        // 0 (exact) sorts last: it is the best reference.
        var sorted = budgets.Distinct().OrderBy(m => m == 0 ? long.MaxValue : m).ToArray();
        var runs = sorted.Select(runAtBudget).ToArray();
        return Combine(sorted, runs);
    }

    /// <summary>Combines finished runs (budgets in the same order as the runs, best last).</summary>
    public static LanczosEstimate Combine(IReadOnlyList<long> budgets, IReadOnlyList<LanczosResult> runs)
    {
        ArgumentNullException.ThrowIfNull(budgets);
        ArgumentNullException.ThrowIfNull(runs);
        if (budgets.Count != runs.Count || runs.Count == 0) throw new ArgumentException("One run per budget is needed.", nameof(runs));
        var reference = runs[^1];
        var b = reference.B.ToArray();
        var u = new double[b.Length];
        bool exactOnly = runs.Count == 1 && reference.IsExact;
        for (int n = 0; n < b.Length; n++)
        {
            if (exactOnly)
            {
                u[n] = 0;
                continue;
            }
            int seen = 0;
            double spread = 0;
            for (int i = 0; i < runs.Count - 1; i++)
            {
                if (runs[i].B.Count <= n) continue;
                seen++;
                spread = Math.Max(spread, Math.Abs(runs[i].B[n] - b[n]));
            }
            // The reference step itself exact (no string dropped up to n): no truncation uncertainty.
            bool refExactSoFar = reference.Steps.Take(n + 1).All(s => s.DiscardedWeight == 0);
            u[n] = seen > 0 ? spread : refExactSoFar ? 0 : double.NaN;
        }
        return new LanczosEstimate { B = b, Uncertainty = u, Budgets = budgets.ToArray(), Runs = runs.ToArray() };
    }

    /// <summary>An exact run as an estimate (uncertainty 0).</summary>
    public static LanczosEstimate FromExact(LanczosResult exact)
    {
        ArgumentNullException.ThrowIfNull(exact);
        return Combine([exact.MaxStrings], [exact]);
    }
}
