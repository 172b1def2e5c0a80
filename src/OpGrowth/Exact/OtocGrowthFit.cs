namespace OpGrowth.Exact;

/// <summary>Exponential fit ln C(t) = lambda t + c with C = 1 - F(t)/F(0) on a stated window.</summary>
/// <param name="Probe">Which OTOC.</param>
/// <param name="Lambda">Fitted growth rate (NaN when fewer than three points fall in the window).</param>
/// <param name="LambdaError">Standard error of the slope from the regression residuals.</param>
/// <param name="WindowStart">First time used.</param>
/// <param name="WindowEnd">Last time used.</param>
/// <param name="Points">Points in the window.</param>
/// <param name="RSquared">Coefficient of determination of the straight line (a low value: no exponential regime).</param>
/// <param name="BoundRatio">lambda / (2 pi T) = lambda beta / (2 pi) (chaos bound: &lt;= 1); NaN at beta = 0.</param>
public sealed record OtocGrowthFit(string Probe, double Lambda, double LambdaError, double WindowStart, double WindowEnd, int Points, double RSquared, double BoundRatio);
