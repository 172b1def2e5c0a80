namespace OpGrowth.Krylov;

/// <summary>
/// Classifies the growth of Lanczos coefficients: fits b_n = A f(n) + c with f = n, n/ln n, sqrt n, and a
/// constant, over a window that skips the non-universal first coefficients, and ranks them by AIC.
/// </summary>
/// <remarks>
/// Source: universal operator growth hypothesis, Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019):
/// chaotic b_n ~ alpha n (1D: ~ A n/ln n), integrable ~ sqrt n, free bounded; lambda_L &lt;= 2 alpha.
/// AIC for least squares: Akaike, IEEE Trans. Autom. Control 19, 716 (1974).
/// </remarks>
public static class LanczosGrowth
{
    /// <summary>
    /// Default window: from n = max(3, ceil(N/3)) to N (the first coefficients depend on microscopic
    /// details; starting at a third of the depth is common practice), at least 4 points when N allows.
    /// </summary>
    public static (int Start, int End) DefaultWindow(int count)
    {
        int end = count;
        int start = Math.Max(3, (int)Math.Ceiling(count / 3.0));
        if (end - start + 1 < 4) start = Math.Max(2, end - 3);
        return (Math.Max(2, Math.Min(start, end)), end);
    }

    /// <summary>Fits all classes on b_n (b[0] = b_1) over n = start..end (1-based, inclusive; start &gt;= 2).</summary>
    public static GrowthAnalysis Fit(IReadOnlyList<double> b, int? windowStart = null, int? windowEnd = null)
    {
        ArgumentNullException.ThrowIfNull(b);
        if (b.Count < 3) throw new ArgumentException($"At least 3 coefficients are needed for a growth fit; got {b.Count}.", nameof(b));
        var (ds, de) = DefaultWindow(b.Count);
        int start = windowStart ?? ds, end = windowEnd ?? de;
        if (start < 2 || end > b.Count || end - start + 1 < 3)
            throw new ArgumentOutOfRangeException(nameof(windowStart), $"fit window n = {start}..{end} is invalid; expected 2 <= start, end <= {b.Count}, at least 3 points");
        var fits = new List<GrowthFit>();
        foreach (GrowthClass c in Enum.GetValues<GrowthClass>()) fits.Add(FitOne(b, c, start, end));
        var linear = fits.First(f => f.Class == GrowthClass.Linear);
        fits.Sort((x, y) => x.Aic.CompareTo(y.Aic));
        return new GrowthAnalysis { Fits = fits, Alpha = linear.A, AlphaError = linear.AError, WindowStart = start, WindowEnd = end };
    }

    /// <summary>Least-squares fit of one class (closed-form normal equations, 1 or 2 parameters).</summary>
    public static GrowthFit FitOne(IReadOnlyList<double> b, GrowthClass c, int start, int end)
    {
        int m = end - start + 1;
        double a = 0, aErr = 0, off, offErr, rss = 0;
        if (c == GrowthClass.Bounded)
        {
            double s = 0;
            for (int n = start; n <= end; n++) s += b[n - 1];
            off = s / m;
            for (int n = start; n <= end; n++) rss += Sq(b[n - 1] - off);
            offErr = m > 1 ? Math.Sqrt(rss / (m - 1) / m) : 0;
        }
        else
        {
            // Centred normal equations (better conditioned than raw sums).
            double fm = 0, ym = 0;
            for (int n = start; n <= end; n++)
            {
                fm += GrowthFit.Basis(c, n);
                ym += b[n - 1];
            }
            fm /= m;
            ym /= m;
            double sff = 0, sfy = 0;
            for (int n = start; n <= end; n++)
            {
                double df = GrowthFit.Basis(c, n) - fm;
                sff += df * df;
                sfy += df * (b[n - 1] - ym);
            }
            a = sfy / sff;
            off = ym - a * fm;
            for (int n = start; n <= end; n++) rss += Sq(b[n - 1] - (a * GrowthFit.Basis(c, n) + off));
            double s2 = m > 2 ? rss / (m - 2) : 0;
            aErr = Math.Sqrt(s2 / sff);
            offErr = Math.Sqrt(s2 * (1.0 / m + fm * fm / sff));
        }
        int k = c == GrowthClass.Bounded ? 1 : 2;
        // Floor on RSS: an exact fit (e.g. b_n = 2 sqrt n) would give ln 0; 1e-28 relative is below rounding.
        double scale = 0;
        for (int n = start; n <= end; n++) scale += Sq(b[n - 1]);
        double floor = 1e-28 * Math.Max(scale, 1e-300);
        double aic = m * Math.Log(Math.Max(rss, floor) / m) + 2 * k;
        return new GrowthFit { Class = c, A = a, AError = aErr, C = off, CError = offErr, WindowStart = start, WindowEnd = end, Rss = rss, Aic = aic };
    }

    private static double Sq(double x) => x * x;
}
