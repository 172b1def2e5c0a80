using System.Globalization;

namespace OpGrowth.Reporting;

/// <summary>
/// Number formatting for reports, tables and figure labels (invariant culture, ASCII minus, "±").
/// </summary>
/// <remarks>
/// Value-with-uncertainty rounding follows the Particle Data Group convention: look at the three leading digits
/// of the uncertainty; 100-354 keeps two significant digits, 355-949 keeps one, 950-999 rounds up to 1000 and
/// keeps two; the value is rounded to the same decimal place.
/// Source: Particle Data Group, "Review of Particle Physics", introduction, rounding of reported errors (from memory).
/// Numbers whose magnitude is at least 1e5 or below 1e-3 are written with a shared exponent: "(1.23 ± 0.06)e-5".
/// </remarks>
public static class NumberFormat
{
    private static readonly CultureInfo s_inv = CultureInfo.InvariantCulture;
    private const double SciHigh = 1e5, SciLow = 1e-3;

    /// <summary>
    /// "value ± uncertainty" with the uncertainty rounded to one or two significant digits (see remarks) and the
    /// value rounded to the same place. Zero uncertainty prints the value to 6 significant digits with "± 0";
    /// a NaN or infinite uncertainty prints "(uncertainty not estimated)"; a NaN value prints "n/a".
    /// </summary>
    public static string ValueWithUncertainty(double value, double uncertainty)
    {
        if (double.IsNaN(value)) return "n/a";
        if (double.IsInfinity(value)) return value > 0 ? "inf" : "-inf";
        if (double.IsNaN(uncertainty) || double.IsInfinity(uncertainty))
            return Number(value, 4) + " (uncertainty not estimated)";
        if (uncertainty < 0) throw new ArgumentOutOfRangeException(nameof(uncertainty), uncertainty, "expected a non-negative uncertainty");
        if (uncertainty == 0) return Number(value, 6) + " ± 0";

        (double u, int decimals) = RoundUncertainty(uncertainty);
        double magnitude = Math.Max(Math.Abs(value), u);
        if (magnitude >= SciHigh || magnitude < SciLow)
        {
            // Shared exponent from the larger of |value| and the rounded uncertainty.
            int exp = (int)Math.Floor(Math.Log10(magnitude));
            double scale = Math.Pow(10, exp);
            int d = Math.Max(0, decimals + exp);
            return "(" + Fixed(value / scale, d) + " ± " + Fixed(u / scale, d) + ")e" + exp.ToString(s_inv);
        }
        if (decimals >= 0) return Fixed(value, decimals) + " ± " + Fixed(u, decimals);
        // Uncertainty at or above 10: round both to tens, hundreds, ... and print as integers.
        double step = Math.Pow(10, -decimals);
        return Fixed(Math.Round(value / step, MidpointRounding.AwayFromZero) * step, 0) + " ± " + Fixed(u, 0);
    }

    /// <summary>
    /// Rounds an uncertainty by the rule in the remarks; returns the rounded value and the number of decimals it
    /// has (negative when rounding to tens or more).
    /// </summary>
    internal static (double Rounded, int Decimals) RoundUncertainty(double uncertainty)
    {
        int e = (int)Math.Floor(Math.Log10(uncertainty));
        double lead3 = Math.Round(uncertainty / Math.Pow(10, e - 2), MidpointRounding.AwayFromZero);
        if (lead3 >= 1000) { e++; lead3 = Math.Round(lead3 / 10, MidpointRounding.AwayFromZero); }
        int sig;
        if (lead3 <= 354) sig = 2;
        else if (lead3 <= 949) sig = 1;
        else { e++; sig = 2; lead3 = 100; }           // 950..999: round up to 1000, keep two digits ("1.0")
        int decimals = sig - 1 - e;
        double rounded = Math.Round(lead3 / Math.Pow(10, 3 - sig), MidpointRounding.AwayFromZero) * Math.Pow(10, e - sig + 1);
        return (rounded, decimals);
    }

    /// <summary>
    /// A plain number with at most <paramref name="significant"/> significant digits, trailing zeros removed
    /// ("0.5", "2.5", "1200", "1.5e-6"); exponent form below 1e-3 and at or above 1e6 in magnitude.
    /// </summary>
    public static string Number(double x, int significant = 4)
    {
        if (significant < 1 || significant > 17) throw new ArgumentOutOfRangeException(nameof(significant), significant, "expected 1..17");
        if (double.IsNaN(x)) return "n/a";
        if (double.IsInfinity(x)) return x > 0 ? "inf" : "-inf";
        if (x == 0) return "0";
        double a = Math.Abs(x);
        int e = (int)Math.Floor(Math.Log10(a));
        if (a < SciLow || a >= 1e6)
        {
            double mantissa = x / Math.Pow(10, e);
            string m = TrimZeros(Fixed(mantissa, significant - 1));
            if (m is "10" or "-10") { m = x < 0 ? "-1" : "1"; e++; }   // 9.9996e-4 rounds up to 1e-3
            return m + "e" + e.ToString(s_inv);
        }
        int decimals = Math.Max(0, significant - 1 - e);
        return TrimZeros(Fixed(x, decimals));
    }

    /// <summary>A window as "[a, b]" with <see cref="Number(double, int)"/> for each end.</summary>
    public static string Window(double start, double end, int significant = 4)
        => "[" + Number(start, significant) + ", " + Number(end, significant) + "]";

    /// <summary>A count with an exponent when large: 950 -> "950", 100000 -> "1e5", 250000 -> "2.5e5".</summary>
    public static string Count(long n)
    {
        if (Math.Abs(n) < 10_000) return n.ToString(s_inv);
        int e = (int)Math.Floor(Math.Log10(Math.Abs((double)n)));
        double m = n / Math.Pow(10, e);
        return TrimZeros(Fixed(m, 2)) + "e" + e.ToString(s_inv);
    }

    /// <summary>A duration for timing tables: "850 ms", "12.3 s", "4 min 05 s", "2 h 03 min".</summary>
    public static string Duration(TimeSpan t)
    {
        double s = t.TotalSeconds;
        if (s < 0) throw new ArgumentOutOfRangeException(nameof(t), t, "expected a non-negative duration");
        if (s < 1) return Math.Round(t.TotalMilliseconds).ToString(s_inv) + " ms";
        if (s < 60) return Number(s, 3) + " s";
        if (s < 3600) return string.Create(s_inv, $"{(int)(s / 60)} min {(int)(s % 60):00} s");
        return string.Create(s_inv, $"{(int)(s / 3600)} h {(int)(s % 3600 / 60):00} min");
    }

    /// <summary>Fixed-point formatting that never prints "-0".</summary>
    internal static string Fixed(double x, int decimals)
    {
        string s = x.ToString("F" + decimals.ToString(s_inv), s_inv);
        if (s[0] == '-' && s.AsSpan(1).IndexOfAnyExcept("0.") < 0) s = s[1..];
        return s;
    }

    private static string TrimZeros(string s)
    {
        if (!s.Contains('.', StringComparison.Ordinal)) return s;
        s = s.TrimEnd('0');
        return s.EndsWith('.') ? s[..^1] : s;
    }
}
