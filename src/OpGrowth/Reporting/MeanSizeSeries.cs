namespace OpGrowth.Reporting;

/// <summary>
/// Mean operator size n(t) with its saturation value (3N/4 for qubits), optionally the scrambling time t*
/// (drawn with its uncertainty band and the half-saturation level that defines it) and the curves of smaller budgets.
/// </summary>
public sealed record MeanSizeSeries(double[] Times, double[] MeanSize, double Saturation)
{
    /// <summary>Per-point uncertainty of n(t) (e.g. the spread across budgets), drawn as a band.</summary>
    public double[]? Uncertainty { get; init; }

    /// <summary>t* with its uncertainty; its definition is printed in the legend.</summary>
    public Measured? ScramblingTime { get; init; }

    /// <summary>The level that defines t* (default half the saturation value).</summary>
    public double? ScramblingLevel { get; init; }

    /// <summary>Curves at smaller budgets of the budget series.</summary>
    public IReadOnlyList<BudgetCurve> Budgets { get; init; } = [];

    /// <summary>Time after which the budget-series (ladder) curves part (null: they agree throughout or there is no series).</summary>
    public double? PartTime { get; init; }
    /// <summary>Budget of the main run, for the legend (e.g. 1e6 strings).</summary>
    public long? Budget { get; init; }

    public string SizeUnit { get; init; } = "qubits";

    public string TimeLabel { get; init; } = AxisText.Time;

    /// <summary>Text of the t* level's legend entry.</summary>
    public string ScramblingLevelLabel { get; init; } = "3N/8";

    /// <summary>Text of the saturation line's legend entry.</summary>
    public string SaturationLabel { get; init; } = "saturation 3N/4";
}
