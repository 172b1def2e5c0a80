namespace OpGrowth.Diagnosis;

/// <summary>An ordinary least-squares straight line y = Slope x + Intercept with its statistics.</summary>
/// <param name="Slope">Slope.</param>
/// <param name="SlopeError">Standard error of the slope from the residuals (NaN with fewer than 3 points).</param>
/// <param name="Intercept">Intercept.</param>
/// <param name="RSquared">Coefficient of determination (1 for a perfect line; NaN when y is constant... then 1).</param>
/// <param name="Rss">Residual sum of squares.</param>
/// <param name="Points">Points used.</param>
public sealed record LineFit(double Slope, double SlopeError, double Intercept, double RSquared, double Rss, int Points)
{
    /// <summary>Fits y against x (at least two points with distinct x; otherwise NaN figures).</summary>
    public static LineFit Of(IReadOnlyList<double> x, IReadOnlyList<double> y)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        int n = Math.Min(x.Count, y.Count);
        if (n < 2) return new LineFit(double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, n);
        double mx = 0, my = 0;
        for (int i = 0; i < n; i++)
        {
            mx += x[i];
            my += y[i];
        }
        mx /= n;
        my /= n;
        double sxx = 0, sxy = 0, syy = 0;
        for (int i = 0; i < n; i++)
        {
            sxx += (x[i] - mx) * (x[i] - mx);
            sxy += (x[i] - mx) * (y[i] - my);
            syy += (y[i] - my) * (y[i] - my);
        }
        if (sxx == 0) return new LineFit(double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, n);
        double slope = sxy / sxx;
        double icpt = my - slope * mx;
        double rss = 0;
        for (int i = 0; i < n; i++)
        {
            double r = y[i] - (icpt + slope * x[i]);
            rss += r * r;
        }
        double se = n > 2 ? Math.Sqrt(rss / (n - 2) / sxx) : double.NaN;
        double r2 = syy > 0 ? 1 - rss / syy : 1;
        return new LineFit(slope, se, icpt, r2, rss, n);
    }
}
