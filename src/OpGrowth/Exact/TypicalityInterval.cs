using MathNet.Numerics.Distributions;

namespace OpGrowth.Exact;

/// <summary>
/// Error bars of a mean over a few random states (quantum typicality): the half-width of a Student-t interval
/// with <c>samples - 1</c> degrees of freedom and <see cref="Coverage"/> coverage, in units of the standard error.
/// With 4 states the factor is 1.20 (a Gaussian one-sigma bar would cover only about 61%); it tends to 1 for many states.
/// Source: W. S. Gosset ("Student"), Biometrika 6, 1 (1908); quantiles from MathNet.Numerics.
/// </summary>
public static class TypicalityInterval
{
    /// <summary>Coverage of the reported interval: 68.27%, that of a Gaussian one-sigma bar.</summary>
    public const double Coverage = 0.682689492137086;

    /// <summary>Half-width of the interval in standard errors for a mean over <paramref name="samples"/> states (samples &gt;= 2).</summary>
    public static double Factor(int samples)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(samples, 2);
        return StudentT.InvCDF(0, 1, samples - 1, 0.5 + Coverage / 2);
    }
}
