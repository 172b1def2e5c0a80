namespace OpGrowth.Krylov;

/// <summary>All growth fits of one coefficient sequence over one window, ranked by AIC.</summary>
public sealed record GrowthAnalysis
{
    /// <summary>Fits ranked best first (smallest AIC).</summary>
    public required IReadOnlyList<GrowthFit> Fits { get; init; }

    /// <summary>The best class.</summary>
    public GrowthFit Best => Fits[0];

    /// <summary>AIC of the runner-up minus AIC of the best (&gt; 10 is commonly read as decisive: common practice).</summary>
    public double DeltaAic => Fits.Count > 1 ? Fits[1].Aic - Fits[0].Aic : double.PositiveInfinity;

    /// <summary>Slope alpha of the linear fit over the window.</summary>
    public required double Alpha { get; init; }

    /// <summary>Standard error of alpha.</summary>
    public required double AlphaError { get; init; }

    /// <summary>
    /// Upper bound on the infinite-temperature Lyapunov exponent, lambda_L &lt;= 2 alpha (Parker et al. 2019),
    /// with alpha the linear slope over the window. For sub-linear classes the true asymptotic bound is
    /// smaller (alpha tends to 0); this is the bound the data over the window support.
    /// </summary>
    public double LyapunovBound => 2 * Alpha;

    /// <summary>
    /// True when the bound 2 alpha says something: the best class grows linearly (linear or n/ln n) and the
    /// slope is positive. For sqrt n or bounded growth the slope tends to 0 (no exponential growth to bound),
    /// and a negative slope bounds nothing.
    /// </summary>
    public bool BoundApplies => Best.Class is GrowthClass.Linear or GrowthClass.LinearOverLog && Alpha > 0;

    /// <summary>First n of the fit window.</summary>
    public required int WindowStart { get; init; }

    /// <summary>Last n of the fit window.</summary>
    public required int WindowEnd { get; init; }

    /// <summary>One line for summaries.</summary>
    public string Summary => FormattableString.Invariant(
        $"best growth class {GrowthClassNames.Of(Best.Class)} ({Best.Formula}, rms residual {Best.RmsResidual:G3}, delta AIC to the next class {DeltaAic:F1}) over n = {WindowStart}..{WindowEnd}; linear slope alpha = {Reporting.NumberFormat.ValueWithUncertainty(Alpha, AlphaError)}")
        + (BoundApplies
            ? $", so lambda_L <= 2 alpha = {Reporting.NumberFormat.ValueWithUncertainty(LyapunovBound, 2 * AlphaError)}"
            : $"; no bound on lambda_L from it ({(Alpha > 0 ? "the best class does not grow linearly" : "the slope is not positive")})");
}
