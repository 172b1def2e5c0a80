namespace OpGrowth.Krylov;

/// <summary>
/// A least-squares fit of b_n = A f(n) + c over a window of n (or b_n = c for <see cref="GrowthClass.Bounded"/>),
/// with f(n) = n, n/ln n or sqrt(n).
/// </summary>
public sealed record GrowthFit
{
    /// <summary>The growth class fitted.</summary>
    public required GrowthClass Class { get; init; }

    /// <summary>Amplitude A (0 for the bounded class).</summary>
    public required double A { get; init; }

    /// <summary>Standard error of A from the least-squares covariance (residual variance times (X^T X)^-1).</summary>
    public required double AError { get; init; }

    /// <summary>Offset c.</summary>
    public required double C { get; init; }

    /// <summary>Standard error of c.</summary>
    public required double CError { get; init; }

    /// <summary>First n of the window.</summary>
    public required int WindowStart { get; init; }

    /// <summary>Last n of the window.</summary>
    public required int WindowEnd { get; init; }

    /// <summary>Residual sum of squares.</summary>
    public required double Rss { get; init; }

    /// <summary>Akaike information criterion for Gaussian residuals, m ln(RSS/m) + 2k (smaller is better).</summary>
    public required double Aic { get; init; }

    /// <summary>Root-mean-square residual.</summary>
    public double RmsResidual => Math.Sqrt(Rss / (WindowEnd - WindowStart + 1));

    /// <summary>Number of fitted parameters.</summary>
    public int Parameters => Class == GrowthClass.Bounded ? 1 : 2;

    /// <summary>The fitted form with four significant digits, e.g. "b_n = 0.4012 n + 1.23" or "b_n = 1.505 n/ln(n) - 0.9379".</summary>
    public string Formula => Class switch
    {
        GrowthClass.Linear => FormattableString.Invariant($"b_n = {A:G4} n") + Offset(C),
        GrowthClass.LinearOverLog => FormattableString.Invariant($"b_n = {A:G4} n/ln(n)") + Offset(C),
        GrowthClass.SquareRoot => FormattableString.Invariant($"b_n = {A:G4} sqrt(n)") + Offset(C),
        _ => FormattableString.Invariant($"b_n = {C:G4}"),
    };

    private static string Offset(double c) => c < 0 ? FormattableString.Invariant($" - {-c:G4}") : FormattableString.Invariant($" + {c:G4}");

    /// <summary>Evaluates the fitted form at n (n &gt;= 2 for the n/ln n class).</summary>
    public double Evaluate(double n) => A * Basis(Class, n) + C;

    /// <summary>Local slope db/dn of the fitted form at n.</summary>
    public double SlopeAt(double n) => Class switch
    {
        GrowthClass.Linear => A,
        GrowthClass.LinearOverLog => A * (Math.Log(n) - 1) / (Math.Log(n) * Math.Log(n)),
        GrowthClass.SquareRoot => A / (2 * Math.Sqrt(n)),
        _ => 0,
    };

    /// <summary>The basis function f(n) of a class.</summary>
    public static double Basis(GrowthClass c, double n) => c switch
    {
        GrowthClass.Linear => n,
        GrowthClass.LinearOverLog => n / Math.Log(n),
        GrowthClass.SquareRoot => Math.Sqrt(n),
        _ => 0,
    };
}
