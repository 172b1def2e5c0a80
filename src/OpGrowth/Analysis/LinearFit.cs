namespace OpGrowth.Analysis;

/// <summary>
/// Ordinary least squares y = Intercept + Slope x with standard errors from the residual variance
/// (s^2 = RSS / (n - 2); se(slope) = s / sqrt(Sxx)).
/// </summary>
public readonly record struct LinearFit(double Slope, double SlopeError, double Intercept, double InterceptError, int Points, double RSquared, double ResidualSumOfSquares)
{
    /// <summary>Fits n &gt;= 2 points (errors are NaN for exactly 2).</summary>
    public static LinearFit Fit(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        int n = x.Length;
        if (n != y.Length) throw new ArgumentException("x and y differ in length.", nameof(y));
        if (n < 2) throw new ArgumentException("A line needs at least two points.", nameof(x));
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
            double dx = x[i] - mx, dy = y[i] - my;
            sxx += dx * dx;
            sxy += dx * dy;
            syy += dy * dy;
        }
        double slope = sxx > 0 ? sxy / sxx : double.NaN;
        double intercept = my - slope * mx;
        double rss = 0;
        for (int i = 0; i < n; i++)
        {
            double r = y[i] - (intercept + slope * x[i]);
            rss += r * r;
        }
        double s2 = n > 2 ? rss / (n - 2) : double.NaN;
        double seSlope = Math.Sqrt(s2 / sxx);
        double seIntercept = Math.Sqrt(s2 * (1.0 / n + mx * mx / sxx));
        double r2 = syy > 0 ? 1 - rss / syy : 1;
        return new LinearFit(slope, seSlope, intercept, seIntercept, n, r2, rss);
    }
}
