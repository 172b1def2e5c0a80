namespace OpGrowth.Krylov;

/// <summary>How new Krylov vectors are re-orthogonalized against earlier ones.</summary>
public enum Reorthogonalization
{
    /// <summary>Plain three-term recurrence; only O_{n-1} and O_{n-2} are held (least memory).</summary>
    None,

    /// <summary>Gram-Schmidt against every earlier vector (all kept, truncated to the string budget if one is set).</summary>
    Full,

    /// <summary>Gram-Schmidt against the most recent <see cref="LanczosOptions.ReorthogonalizationWindow"/> vectors only.</summary>
    Partial,
}
