namespace OpGrowth.Krylov;

/// <summary>
/// From Lanczos coefficients to dynamics: autocorrelation C(t) and Krylov complexity K(t) on the Krylov
/// chain, with the computed b_1..b_N continued beyond N by a fitted asymptotic form. The continuation
/// start is stated, and the whole calculation is repeated with the continuation starting a few n earlier
/// (the fitted form replacing the last computed coefficients) to show how much the result depends on it.
/// </summary>
/// <remarks>Source: Krylov complexity, Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019).</remarks>
public static class KrylovDynamics
{
    /// <summary>Evenly spaced times 0..tMax (count points, count &gt;= 2).</summary>
    public static double[] Grid(double tMax, int count)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(count, 2);
        if (!(tMax > 0) || !double.IsFinite(tMax)) throw new ArgumentOutOfRangeException(nameof(tMax), tMax, "expected a positive finite time");
        var t = new double[count];
        for (int i = 0; i < count; i++) t[i] = tMax * i / (count - 1);
        return t;
    }

    /// <summary>
    /// Continued coefficient sequence: computed b_n for n &lt; start, the fit (clamped at 0) from start on.
    /// </summary>
    public static Func<int, double> Continue(IReadOnlyList<double> b, GrowthFit fit, int start)
    {
        ArgumentNullException.ThrowIfNull(b);
        ArgumentNullException.ThrowIfNull(fit);
        if (start < 2 || start > b.Count + 1) throw new ArgumentOutOfRangeException(nameof(start), start, $"expected 2..{b.Count + 1}");
        var known = b.Take(start - 1).ToArray();
        return n => n <= known.Length ? known[n - 1] : Math.Max(0, fit.Evaluate(n));
    }

    /// <summary>
    /// Computes C(t), K(t) with b continued by <paramref name="fit"/> from <paramref name="continuationStart"/>
    /// (default: one past the last computed coefficient), and again from <paramref name="sensitivityShift"/>
    /// coefficients earlier.
    /// </summary>
    public static KrylovDynamicsResult Compute(IReadOnlyList<double> b, GrowthFit fit, IReadOnlyList<double> times,
        int? continuationStart = null, int sensitivityShift = 4, int maxChain = 2_000_000, long maxWork = 20_000_000_000)
    {
        ArgumentNullException.ThrowIfNull(b);
        ArgumentNullException.ThrowIfNull(fit);
        int start = continuationStart ?? b.Count + 1;
        int alt = Math.Max(2, start - Math.Max(1, sensitivityShift));
        var main = KrylovChain.Evolve(Continue(b, fit, start), times, maxChain, maxWork, tailFrom: start);
        var other = KrylovChain.Evolve(Continue(b, fit, alt), times, maxChain, maxWork);
        double dc = 0, dk = 0;
        int common = Math.Min(main.Times.Count, other.Times.Count);
        for (int i = 0; i < common; i++)
        {
            dc = Math.Max(dc, Math.Abs(main.Autocorrelation[i] - other.Autocorrelation[i]));
            dk = Math.Max(dk, Math.Abs(main.Complexity[i] - other.Complexity[i]) / Math.Max(main.Complexity[i], 1));
        }
        double? reach = null;
        for (int i = 0; i < main.Times.Count && reach is null; i++)
        {
            if (main.TailWeight![i] > KrylovDynamicsResult.ContinuationWeight) reach = main.Times[i];
        }
        return new KrylovDynamicsResult
        {
            ContinuationTime = reach,
            Main = main,
            Alternative = other,
            ContinuationStart = start,
            SensitivityStart = alt,
            Continuation = fit,
            MaxAutocorrelationChange = dc,
            MaxRelativeComplexityChange = dk,
        };
    }
}
