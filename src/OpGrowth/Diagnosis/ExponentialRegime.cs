namespace OpGrowth.Diagnosis;

/// <summary>
/// Whether a growing quantity C(t) (a squared commutator 1 - F/F(0), or an excess operator size) has an
/// exponential regime: on the window where C lies between <paramref name="Low"/> and <paramref name="High"/>
/// (before saturation), ln C is fitted against t (exponential) and against ln t (power law); the regime
/// is exponential when the first line is straight (R^2 &gt;= 0.95), has at least five points, grows, and
/// fits better than the power law (common practice). A short-time t^2 onset is a power law, not chaos.
/// </summary>
/// <param name="Rate">Fitted growth rate lambda (NaN when the window is too short).</param>
/// <param name="RateError">Standard error of lambda.</param>
/// <param name="RSquared">R^2 of ln C against t.</param>
/// <param name="PowerRSquared">R^2 of ln C against ln t.</param>
/// <param name="WindowStart">First time in the window.</param>
/// <param name="WindowEnd">Last time in the window.</param>
/// <param name="Points">Points in the window.</param>
/// <param name="Low">Lower end of the window on C.</param>
/// <param name="High">Upper end of the window on C.</param>
public sealed record ExponentialRegime(double Rate, double RateError, double RSquared, double PowerRSquared, double WindowStart, double WindowEnd, int Points, double Low, double High)
{
    /// <summary>True when the data show a clean exponential regime (see the type remarks).</summary>
    public bool IsExponential =>
        Points >= DiagnosisThresholds.ExponentialMinPoints
        && RSquared >= DiagnosisThresholds.ExponentialMinRSquared
        && Rate > 0
        && (double.IsNaN(RateError) || Rate > 3 * RateError)
        && !(PowerRSquared > RSquared);

    /// <summary>Finds the window (first contiguous run of Low &lt;= C &lt;= High at t &gt; 0) and fits both forms.</summary>
    public static ExponentialRegime Fit(IReadOnlyList<double> times, IReadOnlyList<double> c, double low = 1e-3, double high = 0.3)
    {
        ArgumentNullException.ThrowIfNull(times);
        ArgumentNullException.ThrowIfNull(c);
        var ts = new List<double>();
        var ys = new List<double>();
        bool started = false;
        for (int k = 0; k < Math.Min(times.Count, c.Count); k++)
        {
            double v = c[k];
            bool inside = times[k] > 0 && double.IsFinite(v) && v >= low && v <= high;
            if (inside)
            {
                started = true;
                ts.Add(times[k]);
                ys.Add(Math.Log(v));
            }
            else if (started)
            {
                break;
            }
        }
        if (ts.Count < 3) return new ExponentialRegime(double.NaN, double.NaN, double.NaN, double.NaN, ts.FirstOrDefault(double.NaN), ts.LastOrDefault(double.NaN), ts.Count, low, high);
        var exp = LineFit.Of(ts, ys);
        var pow = LineFit.Of(ts.Select(t => Math.Log(t)).ToArray(), ys);
        return new ExponentialRegime(exp.Slope, exp.SlopeError, exp.RSquared, pow.RSquared, ts[0], ts[^1], ts.Count, low, high);
    }
}
