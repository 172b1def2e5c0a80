namespace OpGrowth.Exact;

/// <summary>A time series with its uncertainty (standard error over random states; zero for dense traces).</summary>
public sealed record OtocSeries(string Probe, double[] Values, double[] Errors);

/// <summary>Site-resolved OTOCs against X_j, Y_j, Z_j, their letter average and the site weight.</summary>
/// <param name="Site">Site j.</param>
/// <param name="X">F(t) against X_j.</param>
/// <param name="Y">F(t) against Y_j.</param>
/// <param name="Z">F(t) against Z_j.</param>
/// <param name="Mean">Letter average Fbar_j(t).</param>
/// <param name="Weight">At infinite temperature the site weight rho_j(t) = (3/4)(1 - Fbar_j(t)) (conventions.md); at finite temperature the same combination of the regularised OTOCs.</param>
public sealed record SiteOtoc(int Site, OtocSeries X, OtocSeries Y, OtocSeries Z, OtocSeries Mean, OtocSeries Weight);

/// <summary>Exponential fit ln C(t) = lambda t + c with C = 1 - F(t)/F(0) on a stated window.</summary>
/// <param name="Probe">Which OTOC.</param>
/// <param name="Lambda">Fitted growth rate (NaN when fewer than three points fall in the window).</param>
/// <param name="LambdaError">Standard error of the slope from the regression residuals.</param>
/// <param name="WindowStart">First time used.</param>
/// <param name="WindowEnd">Last time used.</param>
/// <param name="Points">Points in the window.</param>
/// <param name="RSquared">Coefficient of determination of the straight line (a low value: no exponential regime).</param>
/// <param name="BoundRatio">lambda / (2 pi T) = lambda beta / (2 pi) (chaos bound: &lt;= 1); NaN at beta = 0.</param>
public sealed record GrowthFit(string Probe, double Lambda, double LambdaError, double WindowStart, double WindowEnd, int Points, double RSquared, double BoundRatio);

/// <summary>Work and resources of a run.</summary>
public sealed record OtocCost(long RealTimePropagations, long ImaginaryTimePropagations, long MatrixVectorProducts, double WallSeconds, long PeakWorkingSetBytes, double PropagationErrorBound);

/// <summary>
/// Result of an exact OTOC run: all series share <see cref="Times"/>. F(t) = Tr(W(t) V W(t) V)/2^N at
/// beta = 0, the regularised OTOC at beta &gt; 0. Typicality values carry the standard error over random
/// states (or, with one sample, the a-priori Haar estimate sqrt((1 - F^2)/(d + 1)), d = dimension of the
/// random part); dense values carry zero error.
/// </summary>
public sealed record ExactOtocResult
{
    public required int N { get; init; }
    public required string Operator { get; init; }
    public required double Beta { get; init; }
    public required string Method { get; init; }
    public required int Samples { get; init; }
    public required string ErrorKind { get; init; }
    public required double[] Times { get; init; }

    /// <summary>Autocorrelation (W|W(t)) = Tr(W(t) W)/2^N at beta = 0; Tr(rho^{1/2} W(t) rho^{1/2} W) at beta &gt; 0.</summary>
    public required OtocSeries Autocorrelation { get; init; }

    /// <summary>Site-resolved OTOCs (one entry per requested site).</summary>
    public required IReadOnlyList<SiteOtoc> Sites { get; init; }

    /// <summary>OTOCs against the further probes.</summary>
    public required IReadOnlyList<OtocSeries> Probes { get; init; }

    /// <summary>
    /// Mean operator size n(t) = (3/4) sum_x (1 - Fbar_x(t)) (OTOC-size identity, check-values.md); only
    /// at beta = 0 with every site resolved, otherwise null.
    /// </summary>
    public OtocSeries? MeanSize { get; init; }

    /// <summary>Growth-rate fits (one per probe, and per site letter average).</summary>
    public required IReadOnlyList<GrowthFit> Fits { get; init; }

    /// <summary>Work done.</summary>
    public required OtocCost Cost { get; init; }

    /// <summary>Notes and warnings (e.g. about the error estimate or the fit).</summary>
    public required IReadOnlyList<string> Notes { get; init; }
}
