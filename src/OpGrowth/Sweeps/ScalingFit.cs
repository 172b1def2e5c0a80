using MathNet.Numerics.LinearAlgebra;

namespace OpGrowth.Sweeps;

/// <summary>
/// A weighted least-squares fit of the scrambling time against system size, by one of the two laws
/// that tell fast scramblers from local dynamics:
/// <list type="bullet">
/// <item>"log": t*(N) = a + b ln N (fast scrambling; b ~ 1/lambda);</item>
/// <item>"linear": t*(N) = a + N / v (ballistic spreading; for an operator at one end of a chain and
/// the half-saturation definition v ~ 2 v_B).</item>
/// </list>
/// Weights are 1/sigma_i^2 with sigma_i the total uncertainty of each t* (statistical, truncation and
/// grid added in quadrature). When no point carries an uncertainty the fit is unweighted and the
/// residual variance is estimated from the data. Parameter errors come from the covariance
/// (X^T W X)^-1 and are scaled by sqrt(chi^2/dof) when that exceeds 1 (common practice: the spread of
/// the data then exceeds the quoted errors).
/// Information criteria for Gaussian errors, constants dropped: AIC = chi^2 + 2k and BIC = chi^2 + k ln n
/// with known sigma; with estimated variance n ln(RSS/n) + 2(k+1) and n ln(RSS/n) + (k+1) ln n.
/// Source: H. Akaike, IEEE Trans. Autom. Control 19, 716 (1974); G. Schwarz, Ann. Stat. 6, 461 (1978).
/// </summary>
public sealed record ScalingFit
{
    /// <summary>"log" or "linear".</summary>
    public required string Law { get; init; }

    /// <summary>Formula in words.</summary>
    public required string Formula { get; init; }

    /// <summary>Intercept a.</summary>
    public double A { get; init; }

    /// <summary>Error of a.</summary>
    public double AError { get; init; }

    /// <summary>Slope: b of the log law, or 1/v of the linear law.</summary>
    public double Slope { get; init; }

    /// <summary>Error of the slope.</summary>
    public double SlopeError { get; init; }

    /// <summary>Velocity v = 1/slope of the linear law (null for the log law or a non-positive slope).</summary>
    public double? V { get; init; }

    /// <summary>Error of v (propagated: sigma_slope / slope^2).</summary>
    public double? VError { get; init; }

    /// <summary>Correlation of a and the slope.</summary>
    public double Correlation { get; init; }

    /// <summary>Weighted residual sum chi^2 (or the plain residual sum of squares for an unweighted fit).</summary>
    public double ChiSquared { get; init; }

    /// <summary>Degrees of freedom n - 2.</summary>
    public int DegreesOfFreedom { get; init; }

    /// <summary>chi^2 / dof (NaN when dof = 0).</summary>
    public double ReducedChiSquared { get; init; }

    /// <summary>True when weights came from the quoted uncertainties.</summary>
    public bool Weighted { get; init; }

    /// <summary>Akaike information criterion.</summary>
    public double Aic { get; init; }

    /// <summary>Bayesian (Schwarz) information criterion.</summary>
    public double Bic { get; init; }

    /// <summary>Sizes fitted.</summary>
    public required IReadOnlyList<double> N { get; init; }

    /// <summary>Fitted t* values.</summary>
    public required IReadOnlyList<double> Y { get; init; }

    /// <summary>Residuals y - fit.</summary>
    public required IReadOnlyList<double> Residuals { get; init; }

    /// <summary>Residuals divided by their uncertainty (NaN when unweighted).</summary>
    public required IReadOnlyList<double> Pulls { get; init; }

    /// <summary>The fitted law at N.</summary>
    public double Evaluate(double n) => A + Slope * Regressor(Law, n);

    /// <summary>Standard error of the fitted law at N from the parameter covariance (errors and their correlation).</summary>
    public double PredictionError(double n)
    {
        double f = Regressor(Law, n);
        double v = AError * AError + f * f * SlopeError * SlopeError + 2 * f * Correlation * AError * SlopeError;
        return Math.Sqrt(Math.Max(0, v));
    }

    /// <summary>The regressor of a law: ln N or N.</summary>
    public static double Regressor(string law, double n) => law == "log" ? Math.Log(n) : n;

    /// <summary>
    /// Fits t* = a + slope * f(N) with f = ln (law "log") or identity (law "linear"). <paramref name="sigma"/>
    /// entries of 0 or NaN count as unknown; if any is unknown the fit is unweighted.
    /// </summary>
    public static ScalingFit Fit(string law, IReadOnlyList<double> n, IReadOnlyList<double> y, IReadOnlyList<double> sigma)
    {
        if (law is not ("log" or "linear")) throw new ArgumentException($"Unknown law '{law}'; expected log or linear.", nameof(law));
        int m = n.Count;
        if (m < 3 || y.Count != m || sigma.Count != m) throw new ArgumentException("A scaling fit needs at least three sizes with matching values and errors.", nameof(n));
        bool weighted = sigma.All(s => double.IsFinite(s) && s > 0);
        var x = Matrix<double>.Build.Dense(m, 2);
        var b = Vector<double>.Build.Dense(m);
        for (int i = 0; i < m; i++)
        {
            double w = weighted ? 1 / sigma[i] : 1;
            x[i, 0] = w;
            x[i, 1] = w * Regressor(law, n[i]);
            b[i] = w * y[i];
        }
        var p = x.QR().Solve(b);
        var cov = (x.TransposeThisAndMultiply(x)).Inverse();
        var residuals = new double[m];
        var pulls = new double[m];
        double chi2 = 0;
        for (int i = 0; i < m; i++)
        {
            residuals[i] = y[i] - (p[0] + p[1] * Regressor(law, n[i]));
            pulls[i] = weighted ? residuals[i] / sigma[i] : double.NaN;
            chi2 += weighted ? pulls[i] * pulls[i] : residuals[i] * residuals[i];
        }
        int dof = m - 2;
        double red = dof > 0 ? chi2 / dof : double.NaN;
        // Unweighted: the covariance needs the residual variance; weighted: scale only when the data scatter more than quoted.
        double scale = weighted ? (dof > 0 && red > 1 ? red : 1) : (dof > 0 ? red : double.NaN);
        double errA = Math.Sqrt(cov[0, 0] * scale), errS = Math.Sqrt(cov[1, 1] * scale);
        double corr = cov[0, 1] / Math.Sqrt(cov[0, 0] * cov[1, 1]);
        const int k = 2;
        double aic, bic;
        if (weighted)
        {
            aic = chi2 + 2 * k;
            bic = chi2 + k * Math.Log(m);
        }
        else
        {
            double rss = Math.Max(chi2, 1e-300);
            aic = m * Math.Log(rss / m) + 2 * (k + 1);
            bic = m * Math.Log(rss / m) + (k + 1) * Math.Log(m);
        }
        double? v = law == "linear" && p[1] > 0 ? 1 / p[1] : null;
        double? vErr = v is null ? null : errS / (p[1] * p[1]);
        return new ScalingFit
        {
            Law = law,
            Formula = law == "log" ? "t* = a + b ln N" : "t* = a + N / v",
            A = p[0],
            AError = errA,
            Slope = p[1],
            SlopeError = errS,
            V = v,
            VError = vErr,
            Correlation = corr,
            ChiSquared = chi2,
            DegreesOfFreedom = dof,
            ReducedChiSquared = red,
            Weighted = weighted,
            Aic = aic,
            Bic = bic,
            N = n.ToArray(),
            Y = y.ToArray(),
            Residuals = residuals,
            Pulls = pulls,
        };
    }
}
