using System.Globalization;

namespace OpGrowth.Sweeps;

/// <summary>
/// Which scaling law the data prefer and by how much: both fits, the difference of their information
/// criteria (Delta = AIC(linear) - AIC(log): positive favours ln N), Akaike weights
/// w_i = exp(-AIC_i/2) / sum_j exp(-AIC_j/2), and a verdict on the Kass-Raftery scale applied to |Delta|
/// (0-2 not worth more than a mention, 2-6 positive, 6-10 strong, above 10 very strong).
/// With two parameters in each law, Delta AIC = Delta BIC.
/// Source: K. P. Burnham, D. R. Anderson, Model Selection and Multimodel Inference, Springer 2002 (Akaike weights);
/// R. E. Kass, A. E. Raftery, J. Am. Stat. Assoc. 90, 773 (1995) (evidence scale).
/// </summary>
public sealed record FitComparison
{
    /// <summary>t* = a + b ln N.</summary>
    public required ScalingFit Log { get; init; }

    /// <summary>t* = a + N / v.</summary>
    public required ScalingFit Linear { get; init; }

    /// <summary>AIC(linear) - AIC(log): positive favours ln N, negative favours linear.</summary>
    public double DeltaAic { get; init; }

    /// <summary>BIC(linear) - BIC(log).</summary>
    public double DeltaBic { get; init; }

    /// <summary>Akaike weight of the log law (probability-like share of support).</summary>
    public double LogWeight { get; init; }

    /// <summary>Akaike weight of the linear law.</summary>
    public double LinearWeight { get; init; }

    /// <summary>"log", "linear" or "neither" (|Delta| &lt; 2).</summary>
    public required string Preferred { get; init; }

    /// <summary>"not distinguishable", "positive", "strong" or "very strong".</summary>
    public required string Strength { get; init; }

    /// <summary>One sentence for reports.</summary>
    public required string Verdict { get; init; }

    /// <summary>Fits both laws and compares them.</summary>
    public static FitComparison Compare(IReadOnlyList<double> n, IReadOnlyList<double> y, IReadOnlyList<double> sigma)
    {
        var log = ScalingFit.Fit("log", n, y, sigma);
        var lin = ScalingFit.Fit("linear", n, y, sigma);
        double d = lin.Aic - log.Aic;
        double dBic = lin.Bic - log.Bic;
        double lo = Math.Min(lin.Aic, log.Aic);
        double wLog = Math.Exp(-(log.Aic - lo) / 2), wLin = Math.Exp(-(lin.Aic - lo) / 2);
        double sum = wLog + wLin;
        double ad = Math.Abs(d);
        string strength = ad < 2 ? "not distinguishable" : ad < 6 ? "positive" : ad < 10 ? "strong" : "very strong";
        string preferred = ad < 2 ? "neither" : d > 0 ? "log" : "linear";
        var ci = CultureInfo.InvariantCulture;
        string verdict = preferred == "neither"
            ? $"the data do not separate ln N from linear growth (Delta AIC = {d.ToString("0.0", ci)}, weights {wLog / sum:0.00} / {wLin / sum:0.00})"
            : $"the data prefer {(preferred == "log" ? "t* = a + b ln N (fast scrambling)" : "t* = a + N/v (local, ballistic)")}: {strength} evidence, Delta AIC = {d.ToString("0.0", ci)}, Akaike weight {(preferred == "log" ? wLog : wLin) / sum:0.000}";
        return new FitComparison
        {
            Log = log,
            Linear = lin,
            DeltaAic = d,
            DeltaBic = dBic,
            LogWeight = wLog / sum,
            LinearWeight = wLin / sum,
            Preferred = preferred,
            Strength = strength,
            Verdict = verdict,
        };
    }
}
