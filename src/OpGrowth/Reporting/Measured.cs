namespace OpGrowth.Reporting;

/// <summary>
/// A number as it may appear in a report: value, uncertainty, what it is (definition) and, where it came from a
/// fit or a time range, the window. There is deliberately no way to format the value alone: every printed number
/// carries its uncertainty and its definition or window.
/// </summary>
/// <remarks>
/// <see cref="Uncertainty"/> is a one-standard-deviation style spread (or the spread across the budget series;
/// the definition should say which). Zero means exact (a count, a closed form); NaN means it could not be
/// estimated, which the report prints as such.
/// </remarks>
public sealed record Measured
{
    public Measured(double value, double uncertainty, string definition, FitWindow? window = null, string unit = "")
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(definition);
        if (uncertainty < 0) throw new ArgumentOutOfRangeException(nameof(uncertainty), uncertainty, "expected a non-negative uncertainty (or NaN if not estimated)");
        Value = value;
        Uncertainty = uncertainty;
        Definition = definition;
        Window = window;
        Unit = unit ?? "";
    }

    /// <summary>An exact number (uncertainty zero), e.g. a count or a closed-form value.</summary>
    public static Measured Exact(double value, string definition, string unit = "") => new(value, 0, definition, null, unit);

    public double Value { get; }
    public double Uncertainty { get; }
    public string Definition { get; }
    public FitWindow? Window { get; }
    public string Unit { get; }

    /// <summary>True when the uncertainty is zero.</summary>
    public bool IsExact => Uncertainty == 0;

    /// <summary>The number: "1.23 ± 0.06 unit" (exact numbers: "0.75 unit" to 6 significant digits).</summary>
    public string FormatValue()
    {
        string n = IsExact ? NumberFormat.Number(Value, 6) : NumberFormat.ValueWithUncertainty(Value, Uncertainty);
        return Unit.Length == 0 ? n : n + " " + Unit;
    }

    /// <summary>What the number is and where: "definition; t in [a, b]".</summary>
    public string FormatContext() => Window is { } w ? Definition + "; " + w : Definition;

    /// <summary>"1.23 ± 0.06 unit (definition; t in [a, b])".</summary>
    public override string ToString() => FormatValue() + " (" + FormatContext() + ")";
}
