using System.Globalization;

namespace OpGrowth.Sweeps;

/// <summary>t* measured at one smaller member of the model's family (averaged over disorder seeds when the model has them).</summary>
/// <param name="N">Size of the member.</param>
/// <param name="TStar">Mean t* over the seeds.</param>
/// <param name="Error">Error of the mean (bootstrap over seeds, or the sampling error of a clean model), location error included.</param>
/// <param name="Spread">Seed-to-seed standard deviation (null for a clean model).</param>
/// <param name="Seeds">Seeds averaged.</param>
/// <param name="HalfDistance">Distance from the probe within which half of the member's sites lie (short-range models).</param>
/// <param name="FrontArrival">Arrival time of the front at <paramref name="HalfDistance"/> (short-range models).</param>
public sealed record ScramblingTimeMember(int N, double TStar, double Error, double? Spread, int Seeds, double? HalfDistance = null, double? FrontArrival = null);

/// <summary>One scaling law's prediction at the model's N.</summary>
/// <param name="Law">"log" (t* = a + b ln N) or "linear" (t* = a + N/v).</param>
/// <param name="Value">Predicted t*.</param>
/// <param name="Error">One standard error from the fit covariance.</param>
/// <param name="Weight">Akaike weight of the law.</param>
/// <param name="Fit">The fit.</param>
public sealed record ScramblingTimeLawPrediction(string Law, double Value, double Error, double Weight, ScalingFit Fit);

/// <summary>
/// The scrambling time at the model's own N as a run states it, labelled by route: "measured" (exact engine, or a
/// converged Pauli budget series), "predicted" (from smaller members, with the front for short-range models or the
/// two scaling laws for all-to-all ones), or "bound" (what the converged data exclude).
/// </summary>
public sealed record ScramblingTimeStatement
{
    /// <summary>"measured", "predicted" or "bound".</summary>
    public required string Route { get; init; }

    /// <summary>Size the statement is about.</summary>
    public int N { get; init; }

    /// <summary>t* (null for a bound).</summary>
    public double? Value { get; init; }

    /// <summary>One standard uncertainty of <see cref="Value"/>.</summary>
    public double? Uncertainty { get; init; }

    /// <summary>Lower end of the stated band (value - 2 sigma; the bound itself for route "bound").</summary>
    public double? Low { get; init; }

    /// <summary>Upper end of the stated band (value + 2 sigma; null for a lower bound).</summary>
    public double? High { get; init; }

    /// <summary>The method in a few words (e.g. "exact engine, random-sign probe").</summary>
    public required string Method { get; init; }

    /// <summary>What the statement rests on, with its numbers.</summary>
    public required string Basis { get; init; }

    /// <summary>The two scaling laws' predictions (all-to-all route), both shown when the data cannot choose.</summary>
    public IReadOnlyList<ScramblingTimeLawPrediction> Laws { get; init; } = [];

    /// <summary>The smaller members the prediction uses.</summary>
    public IReadOnlyList<ScramblingTimeMember> Members { get; init; } = [];

    /// <summary>Other routes' figures for comparison (e.g. the bound that the evolution supports).</summary>
    public IReadOnlyList<string> Also { get; init; } = [];

    /// <summary>Estimated or measured cost of the route's exact-engine work, in words.</summary>
    public string? Cost { get; init; }

    /// <summary>A measured or predicted statement with value, one-sigma uncertainty and the 2-sigma band.</summary>
    public static ScramblingTimeStatement Banded(string route, int n, double value, double sigma, string method, string basis) => new()
    {
        Route = route,
        N = n,
        Value = value,
        Uncertainty = sigma,
        Low = value - 2 * sigma,
        High = value + 2 * sigma,
        Method = method,
        Basis = basis,
    };

    /// <summary>One line for the console: "t* at N = 24: 7.4 +- 0.2 (predicted: ...)".</summary>
    public string Text()
    {
        var ci = CultureInfo.InvariantCulture;
        if (Route == "bound" || Value is null)
            return Low is double lb ? $"t* at N = {N}: > {lb.ToString("0.##", ci)} (bound: {Method})" : $"t* at N = {N}: not quoted ({Method})";
        string v = Uncertainty is double u && u > 0 ? Reporting.NumberFormat.ValueWithUncertainty(Value.Value, u) : Value.Value.ToString("0.###", ci);
        // The band's ends to the value's decimals ("6.31..6.70", not "6.31..6.7").
        string fmt = Uncertainty is double su && su > 0 && Reporting.NumberFormat.RoundUncertainty(su).Decimals is int d && d is >= 0 and <= 6 ? "F" + d.ToString(ci) : "0.##";
        string band = Low is double lo && High is double hi ? $", band {lo.ToString(fmt, ci)}..{hi.ToString(fmt, ci)}" : "";
        return $"t* at N = {N}: {v}{band} ({Route}: {Method})";
    }
}
