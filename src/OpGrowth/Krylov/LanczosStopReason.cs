namespace OpGrowth.Krylov;

/// <summary>Why a Lanczos run ended.</summary>
public enum LanczosStopReason
{
    /// <summary>All requested coefficients were computed.</summary>
    DepthReached,

    /// <summary>The next step would not fit in the memory budget; the coefficients so far are kept.</summary>
    MemoryBudget,

    /// <summary>b_n vanished: the Krylov space is closed (finite operator space).</summary>
    KrylovSpaceClosed,

    /// <summary>The run was cancelled; the coefficients so far are kept.</summary>
    Cancelled,

    /// <summary>The operator outgrew the representable window (translation-canonical mode).</summary>
    WindowExceeded,

    /// <summary>The next Krylov vector would hold more strings than <see cref="LanczosOptions.StopAtStrings"/> allows (no truncation); the coefficients so far are kept.</summary>
    StringLimit,
}
