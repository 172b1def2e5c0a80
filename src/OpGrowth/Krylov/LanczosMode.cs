namespace OpGrowth.Krylov;

/// <summary>Which recursion a model run uses.</summary>
public enum LanczosMode
{
    /// <summary>The finite system exactly as the model defines it, no truncation.</summary>
    Exact,

    /// <summary>The finite system, each Krylov vector truncated to its top-M strings, at two or more budgets.</summary>
    Truncated,

    /// <summary>Infinite-chain values for a local operator of a translation-invariant chain (exact, or truncated when budgets are given).</summary>
    InfiniteChain,

    /// <summary>The translation sum of the probe (momentum zero), one representative per translation class (exact, or truncated when budgets are given).</summary>
    Extensive,
}
