namespace OpGrowth.Krylov;

/// <summary>C(t) and K(t) from computed b_n continued by a fitted asymptotic form, with the sensitivity to where the continuation starts.</summary>
public sealed record KrylovDynamicsResult
{
    /// <summary>The chain dynamics with the continuation starting at <see cref="ContinuationStart"/>.</summary>
    public required KrylovChainResult Main { get; init; }

    /// <summary>The same with the continuation starting at <see cref="SensitivityStart"/> (earlier); null when not computed.</summary>
    public KrylovChainResult? Alternative { get; init; }

    /// <summary>First n taken from the fitted form (computed b_n are used below it).</summary>
    public required int ContinuationStart { get; init; }

    /// <summary>
    /// Weight on Krylov sites n &gt;= <see cref="ContinuationStart"/> (reachable only through fitted couplings) above
    /// which C(t) and K(t) count as coming from the continuation: 1e-3 (common practice).
    /// </summary>
    public const double ContinuationWeight = 1e-3;

    /// <summary>First time at which the weight beyond the computed coefficients exceeds <see cref="ContinuationWeight"/> (null: never within the times).</summary>
    public double? ContinuationTime { get; init; }

    /// <summary>The earlier start used for the sensitivity check.</summary>
    public required int SensitivityStart { get; init; }

    /// <summary>The fitted form used beyond the computed coefficients (null: none needed, b(n) supplied for all n).</summary>
    public GrowthFit? Continuation { get; init; }

    /// <summary>Largest |C_main(t) - C_alt(t)| over the times both reached.</summary>
    public double MaxAutocorrelationChange { get; init; }

    /// <summary>Largest |K_main(t) - K_alt(t)| / max(K_main(t), 1) over the times.</summary>
    public double MaxRelativeComplexityChange { get; init; }

    /// <summary>One line for summaries.</summary>
    public string Summary => Continuation is null
        ? "no continuation"
        : FormattableString.Invariant(
            $"b_n for n >= {ContinuationStart} from {Continuation.Formula}{(ContinuationTime is double tc ? $"; C(t) and K(t) rest on it from t = {tc:G3} on" : "")}; starting it at n = {SensitivityStart} instead changes C(t) by at most {MaxAutocorrelationChange:G3} and K(t) by at most {MaxRelativeComplexityChange:P2} (relative) over t = 0..{Main.Times[^1]:G4}");
}
