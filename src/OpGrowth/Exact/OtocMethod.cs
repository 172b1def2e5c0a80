namespace OpGrowth.Exact;

/// <summary>How <see cref="ExactOtoc"/> evaluates traces.</summary>
public enum OtocMethod
{
    /// <summary>Dense diagonalisation for N &lt;= 8, typicality above.</summary>
    Auto,

    /// <summary>Exact traces from the full eigendecomposition (N &lt;= 10).</summary>
    Dense,

    /// <summary>Quantum typicality with random states (any N the memory allows).</summary>
    Typicality,
}
