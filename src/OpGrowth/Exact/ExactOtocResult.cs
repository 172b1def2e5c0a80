namespace OpGrowth.Exact;

/// <summary>
/// Result of an exact OTOC run: all series share <see cref="Times"/>. F(t) = Tr(W(t) V W(t) V)/2^N at
/// beta = 0, the regularised OTOC at beta &gt; 0. Typicality values carry the half-width of the 68% Student-t
/// interval over the random states (<see cref="TypicalityInterval"/>; or, with one sample, the a-priori Haar
/// estimate sqrt((1 - F^2)/(d + 1)), d = dimension of the random part); dense values carry zero error.
/// <see cref="ErrorKind"/> says which, with the number of states and the coverage.
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

    /// <summary>How <see cref="MeanSize"/> was obtained: "site-resolved OTOCs", "random-sign probe" or "none".</summary>
    public string MeanSizeMethod { get; init; } = "none";

    /// <summary>Growth-rate fits (one per probe, and per site letter average).</summary>
    public required IReadOnlyList<OtocGrowthFit> Fits { get; init; }

    /// <summary>Work done.</summary>
    public required OtocCost Cost { get; init; }

    /// <summary>Notes and warnings (e.g. about the error estimate or the fit).</summary>
    public required IReadOnlyList<string> Notes { get; init; }
}
