namespace OpGrowth.Diagnosis;

/// <summary>
/// Every threshold the battery compares a figure with, in one place, each with its source. Reference
/// values from papers are cited; rules of thumb are marked "common practice" (they are choices, stated
/// in every verdict, not results).
/// </summary>
public static class DiagnosisThresholds
{
    /// <summary>
    /// Mean gap ratio of Poisson levels, 2 ln 2 - 1. Source: Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013).
    /// </summary>
    public static readonly double PoissonRatio = 2 * Math.Log(2) - 1;

    /// <summary>Large-dimension GOE mean gap ratio. Source: Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013).</summary>
    public const double GoeRatio = 0.5307;

    /// <summary>Large-dimension GUE mean gap ratio. Source: Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013).</summary>
    public const double GueRatio = 0.5996;

    /// <summary>&lt;r&gt; must lie this many error bars from the Poisson/Wigner-Dyson midpoint to take a side (common practice).</summary>
    public const double LevelSigmas = 3.0;

    /// <summary>Fewest gap ratios for a level-statistics verdict (common practice: below this the error bar itself is unreliable).</summary>
    public const int MinimumGaps = 100;

    /// <summary>
    /// A Lanczos growth class is preferred only when the runner-up of a different kind trails by at least this
    /// much AIC (common practice: Burnham and Anderson, Model Selection and Multimodel Inference (2002), read
    /// delta AIC &lt; 2 as "both supported").
    /// </summary>
    public const double LanczosDeltaAic = 2.0;

    /// <summary>Late-time mean size at or above this fraction of the random-operator value 3N/4 counts as saturated (common practice).</summary>
    public const double SaturatedFraction = 0.8;

    /// <summary>A size plateau at or below this fraction of 3N/4 is "far below" saturation (common practice).</summary>
    public const double FarBelowFraction = 0.6;

    /// <summary>Growth of the mean size over the last quarter of the run, as a fraction of 3N/4, below which the size has stopped growing (common practice).</summary>
    public const double StalledGrowthFraction = 0.05;

    /// <summary>An autocorrelation within this distance of the Mazur bound has decayed as far as conservation laws allow (common practice).</summary>
    public const double DecayTolerance = 0.05;

    /// <summary>An autocorrelation plateau this far above the Mazur bound is a memory the known conservation laws do not explain (common practice).</summary>
    public const double PlateauExcess = 0.15;

    /// <summary>A Mazur bound at or above this value makes conservation laws the leading reason an autocorrelation does not decay (common practice).</summary>
    public const double MazurSignificant = 0.1;

    /// <summary>A connected single-site autocorrelation whose late-time plateau is at least this (normalised to 1 at t = 0) is frozen (common practice).</summary>
    public const double FrozenPlateau = 0.5;

    /// <summary>
    /// A frozen plateau counts as long-range order (a symmetry-broken phase), not glass-like freezing, when the
    /// lattice-pattern order of the probe's letter is at least this fraction of the plateau (common practice:
    /// order then accounts for most of the memory; a glass freezes in a random pattern with no lattice order).
    /// </summary>
    public const double OrderShare = 0.5;

    /// <summary>Front threshold on the site weight rho_j, as a fraction of the scrambled value 3/4 (common practice; conventions: a fixed fraction of 3/4).</summary>
    public const double FrontFraction = 0.25;

    /// <summary>v_B must exceed this many standard errors to count as a ballistic front (common practice).</summary>
    public const double VelocitySigmas = 3.0;

    /// <summary>A front that never passes this distance from the probe during the run is "no front" (common practice).</summary>
    public const int StalledFrontDistance = 1;

    /// <summary>A stopped front counts as localization only if truncation discarded at most this weight (common practice: a top-M budget also stops fronts).</summary>
    public const double FrontMaxDiscarded = 0.1;

    /// <summary>An exponential OTOC regime needs at least this many points in the fit window (common practice).</summary>
    public const int ExponentialMinPoints = 5;

    /// <summary>... and a straight line of ln C against t with at least this R^2 (common practice).</summary>
    public const double ExponentialMinRSquared = 0.95;
}
