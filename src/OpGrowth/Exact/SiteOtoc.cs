namespace OpGrowth.Exact;

/// <summary>Site-resolved OTOCs against X_j, Y_j, Z_j, their letter average and the site weight.</summary>
/// <param name="Site">Site j.</param>
/// <param name="X">F(t) against X_j.</param>
/// <param name="Y">F(t) against Y_j.</param>
/// <param name="Z">F(t) against Z_j.</param>
/// <param name="Mean">Letter average Fbar_j(t).</param>
/// <param name="Weight">At infinite temperature the site weight rho_j(t) = (3/4)(1 - Fbar_j(t)) (conventions.md); at finite temperature the same combination of the regularised OTOCs.</param>
public sealed record SiteOtoc(int Site, OtocSeries X, OtocSeries Y, OtocSeries Z, OtocSeries Mean, OtocSeries Weight);
