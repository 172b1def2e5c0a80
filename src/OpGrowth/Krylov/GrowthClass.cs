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

/// <summary>The names of <see cref="GrowthClass"/> in output and options (one spelling everywhere).</summary>
public static class GrowthClassNames
{
    /// <summary>Every name, in the order of the enum: "linear", "n-over-log-n", "sqrt", "bounded".</summary>
    public static readonly IReadOnlyList<string> All = ["linear", "n-over-log-n", "sqrt", "bounded"];

    /// <summary>The name of a class as the options spell it.</summary>
    public static string Of(GrowthClass c) => All[(int)c];

    /// <summary>The class with a given name (case-insensitive), or null.</summary>
    public static GrowthClass? Parse(string? name)
    {
        for (int i = 0; i < All.Count; i++)
        {
            if (string.Equals(All[i], name, StringComparison.OrdinalIgnoreCase)) return (GrowthClass)i;
        }
        return null;
    }
}
