namespace OpGrowth.Krylov;

/// <summary>Asymptotic growth classes of Lanczos coefficients (Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019)).</summary>
public enum GrowthClass
{
    /// <summary>b_n = alpha n + c: chaotic (beyond one dimension).</summary>
    Linear,

    /// <summary>b_n = A n / ln n + c: chaotic in one dimension.</summary>
    LinearOverLog,

    /// <summary>b_n = A sqrt(n) + c: typical of interacting integrable systems.</summary>
    SquareRoot,

    /// <summary>b_n = c: free (non-interacting) systems.</summary>
    Bounded,
}
