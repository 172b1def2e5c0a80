using System.Globalization;

namespace OpGrowth.Sweeps;

/// <summary>
/// Which scaling law the data prefer and by how much: both fits, the difference of their information
/// criteria (Delta = AIC(linear) - AIC(log): positive favours ln N), Akaike weights
/// w_i = exp(-AIC_i/2) / sum_j exp(-AIC_j/2), and a verdict on the Kass-Raftery scale applied to |Delta|
/// (0-2 not worth more than a mention, 2-6 positive, 6-10 strong, above 10 very strong).
/// With two parameters in each law, Delta AIC = Delta BIC.
/// The scale is only calibrated when the laws describe the data, so the evidence is capped:
/// <list type="bullet">
/// <item>fewer than <see cref="MinSizesForEvidence"/> sizes (one degree of freedom per fit or none left to test it): at most "weak";</item>
/// <item>no error estimates on the points (unweighted fits, nothing to test the fits against): at most "weak";</item>
/// <item>neither law describes the data (chi^2 probability below <see cref="GoodnessLevel"/> for both): no preference at all,
/// since a lower AIC among two wrong laws is not evidence for either; one law failing alone caps the other at "weak"
/// when it is itself a poor fit.</item>
/// </list>
/// Source: K. P. Burnham, D. R. Anderson, Model Selection and Multimodel Inference, Springer 2002 (Akaike weights);
/// R. E. Kass, A. E. Raftery, J. Am. Stat. Assoc. 90, 773 (1995) (evidence scale); chi^2 goodness-of-fit test
/// (W. T. Eadie et al., Statistical Methods in Experimental Physics, North-Holland 1971); the 1% level and the
/// four-size minimum are common practice.
/// </summary>
public sealed record FitComparison
{
    /// <summary>Sizes needed before the comparison may claim more than weak evidence.</summary>
    public const int MinSizesForEvidence = 4;

    /// <summary>A law whose chi^2 probability (weighted fit) is below this does not describe the data.</summary>
    public const double GoodnessLevel = 0.01;

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

    /// <summary>chi^2 probability of the log fit (NaN for an unweighted fit or no degree of freedom).</summary>
    public double LogProbability { get; init; }

    /// <summary>chi^2 probability of the linear fit (NaN for an unweighted fit or no degree of freedom).</summary>
    public double LinearProbability { get; init; }

    /// <summary>"log", "linear" or "neither" (|Delta| &lt; 2, or neither law describes the data).</summary>
    public required string Preferred { get; init; }

    /// <summary>"not distinguishable", "none" (neither law fits), "weak", "positive", "strong" or "very strong".</summary>
    public required string Strength { get; init; }

    /// <summary>Why the strength was capped below what |Delta AIC| alone would say (null when it was not).</summary>
    public string? Caveat { get; init; }

    /// <summary>One sentence for reports.</summary>
    public required string Verdict { get; init; }

    /// <summary>chi^2 probability P(chi^2 &gt;= observed) of a weighted fit; NaN when it cannot be computed.</summary>
    public static double Probability(ScalingFit f)
    {
        ArgumentNullException.ThrowIfNull(f);
        if (!f.Weighted || f.DegreesOfFreedom < 1 || !double.IsFinite(f.ChiSquared)) return double.NaN;
        return 1 - MathNet.Numerics.Distributions.ChiSquared.CDF(f.DegreesOfFreedom, f.ChiSquared);
    }

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
        double pLog = Probability(log), pLin = Probability(lin);
        string strength = ad < 2 ? "not distinguishable" : ad < 6 ? "positive" : ad < 10 ? "strong" : "very strong";
        string preferred = ad < 2 ? "neither" : d > 0 ? "log" : "linear";
        var ci = CultureInfo.InvariantCulture;
        string chi = string.Create(ci, $"chi2/dof = {Reporting.NumberFormat.Number(log.ReducedChiSquared, 2)} for ln N and {Reporting.NumberFormat.Number(lin.ReducedChiSquared, 2)} for linear");
        string? caveat = null;
        bool logFails = pLog < GoodnessLevel, linFails = pLin < GoodnessLevel;
        if (log.Weighted && logFails && linFails)
        {
            caveat = $"neither law describes the data within their errors ({chi})";
            preferred = "neither";
            strength = "none";
        }
        else if (preferred != "neither")
        {
            bool winnerFails = preferred == "log" ? logFails : linFails;
            if (n.Count < MinSizesForEvidence) caveat = $"only {n.Count} sizes (one degree of freedom per fit)";
            else if (!log.Weighted) caveat = "the points carry no error estimates, so neither fit can be tested";
            else if (winnerFails) caveat = $"the preferred law does not describe the data within their errors either ({chi})";
            if (caveat is not null && strength is "positive" or "strong" or "very strong") strength = "weak";
        }
        string Law(string l) => l == "log" ? "t* = a + b ln N (fast scrambling)" : "t* = a + N/v (local, ballistic)";
        double wPreferred = (preferred == "log" ? wLog : wLin) / sum;
        string weight = wPreferred > 0.99 ? "> 0.99" : Reporting.NumberFormat.Number(wPreferred, 2);
        string verdict = preferred == "neither"
            ? (strength == "none"
                ? $"the data prefer neither law: {caveat}; Delta AIC = {d.ToString("0.0", ci)} between two laws that do not fit is not evidence"
                : $"the data do not separate ln N from linear growth (Delta AIC = {d.ToString("0.0", ci)}, weights {Reporting.NumberFormat.Number(wLog / sum, 2)} / {Reporting.NumberFormat.Number(wLin / sum, 2)})")
            : $"the data prefer {Law(preferred)}: {strength} evidence, Delta AIC = {d.ToString("0.0", ci)}, Akaike weight {weight}" + (caveat is null ? "" : $"; {caveat}, so no stronger claim");
        return new FitComparison
        {
            Log = log,
            Linear = lin,
            DeltaAic = d,
            DeltaBic = dBic,
            LogWeight = wLog / sum,
            LinearWeight = wLin / sum,
            LogProbability = pLog,
            LinearProbability = pLin,
            Preferred = preferred,
            Strength = strength,
            Caveat = caveat,
            Verdict = verdict,
        };
    }
}
