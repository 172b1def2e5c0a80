namespace OpGrowth.Sweeps;

/// <summary>
/// Bootstrap standard error of a mean over disorder seeds: resample the seeds with replacement
/// <see cref="Resamples"/> times, take the mean of each resample, report the standard deviation of
/// those means. The random stream is fixed (SplitMix64 from <see cref="Seed"/>), so the same data
/// always give the same error.
/// Source: B. Efron, "Bootstrap methods: another look at the jackknife", Ann. Stat. 7, 1 (1979).
/// </summary>
public static class Bootstrap
{
    /// <summary>Resamples per estimate (common practice: 10^3-10^4 for a standard error).</summary>
    public const int Resamples = 2000;

    /// <summary>Fixed seed of the resampling stream.</summary>
    public const ulong Seed = 0x5EED_0F_0A7_5C7AUL;

    /// <summary>Standard error of the mean of <paramref name="values"/>; null for fewer than two values.</summary>
    public static double? StandardError(IReadOnlyList<double> values, int resamples = Resamples, ulong seed = Seed)
    {
        int n = values.Count;
        if (n < 2) return null;
        ulong state = seed;
        var means = new double[resamples];
        for (int r = 0; r < resamples; r++)
        {
            double s = 0;
            for (int i = 0; i < n; i++) s += values[(int)(Next(ref state) % (ulong)n)];
            means[r] = s / n;
        }
        double m = means.Average();
        double ss = 0;
        foreach (double x in means) ss += (x - m) * (x - m);
        return Math.Sqrt(ss / (resamples - 1));
    }

    // Source: G. L. Steele, D. Lea, C. H. Flood, OOPSLA 2014 (SplitMix64).
    private static ulong Next(ref ulong s)
    {
        ulong z = s += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }
}
