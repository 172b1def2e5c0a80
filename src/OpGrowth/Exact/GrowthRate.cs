namespace OpGrowth.Exact;

/// <summary>Fits of an exponential growth rate to OTOC data.</summary>
public static class GrowthRate
{
    /// <summary>
    /// Fits ln C(t) = lambda t + c, C(t) = 1 - F(t)/F(0), on the first contiguous run of times with
    /// <paramref name="low"/> &lt;= C &lt;= <paramref name="high"/> (the growth window before saturation:
    /// common practice). The ratio to the chaos bound lambda/(2 pi T) is reported at beta &gt; 0.
    /// </summary>
    /// <remarks>Source for the bound lambda_L &lt;= 2 pi T: Maldacena, Shenker and Stanford, JHEP 08 (2016) 106.
    /// Short-range 1D chains need not show an exponential regime (Khemani, Huse, Nahum, PRB 98, 144304 (2018)):
    /// read R^2 before trusting lambda.</remarks>
    public static OtocGrowthFit Fit(string probe, IReadOnlyList<double> times, IReadOnlyList<double> f, double beta, double low, double high)
    {
        ArgumentNullException.ThrowIfNull(times);
        ArgumentNullException.ThrowIfNull(f);
        double f0 = f.Count > 0 ? f[0] : double.NaN;
        var xs = new List<double>();
        var ys = new List<double>();
        bool started = false;
        for (int k = 0; k < times.Count; k++)
        {
            double c = 1 - f[k] / f0;
            bool inside = times[k] > 0 && c >= low && c <= high && double.IsFinite(c);
            if (inside)
            {
                started = true;
                xs.Add(times[k]);
                ys.Add(Math.Log(c));
            }
            else if (started && c > high)
            {
                break;
            }
        }
        if (xs.Count < 3)
        {
            return new OtocGrowthFit(probe, double.NaN, double.NaN, xs.Count > 0 ? xs[0] : double.NaN, xs.Count > 0 ? xs[^1] : double.NaN, xs.Count, double.NaN, double.NaN);
        }
        int n = xs.Count;
        double mx = xs.Average(), my = ys.Average();
        double sxx = 0, sxy = 0, syy = 0;
        for (int i = 0; i < n; i++)
        {
            sxx += (xs[i] - mx) * (xs[i] - mx);
            sxy += (xs[i] - mx) * (ys[i] - my);
            syy += (ys[i] - my) * (ys[i] - my);
        }
        double slope = sxy / sxx;
        double ssr = 0;
        for (int i = 0; i < n; i++)
        {
            double r = ys[i] - (my + slope * (xs[i] - mx));
            ssr += r * r;
        }
        double se = n > 2 ? Math.Sqrt(ssr / (n - 2) / sxx) : double.NaN;
        double r2 = syy > 0 ? 1 - ssr / syy : 1;
        double ratio = beta > 0 ? slope * beta / (2 * Math.PI) : double.NaN;
        return new OtocGrowthFit(probe, slope, se, xs[0], xs[^1], n, r2, ratio);
    }
}
