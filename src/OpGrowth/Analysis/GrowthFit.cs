namespace OpGrowth.Analysis;

/// <summary>A growth fit on a stated window.</summary>
public sealed record GrowthFit
{
    /// <summary>What was fitted, e.g. "ln(n(t) - n(0)) vs t".</summary>
    public required string Quantity { get; init; }

    /// <summary>Rate: the exponent lambda (exponential) or dn/dt (linear); null when unavailable.</summary>
    public double? Rate { get; init; }

    /// <summary>Standard error of the rate.</summary>
    public double? RateError { get; init; }

    /// <summary>R^2 of the fit in its own variables.</summary>
    public double? RSquared { get; init; }

    /// <summary>Residual sum of squares measured on n(t) itself (to compare exponential and linear).</summary>
    public double? SizeResidual { get; init; }

    /// <summary>Window start (time).</summary>
    public double? WindowStart { get; init; }

    /// <summary>Window end (time).</summary>
    public double? WindowEnd { get; init; }

    /// <summary>Points in the window.</summary>
    public int Points { get; init; }

    /// <summary>The rule that chose the window.</summary>
    public required string Window { get; init; }

    /// <summary>Why there is no value, if there is none.</summary>
    public string? Note { get; init; }
}
