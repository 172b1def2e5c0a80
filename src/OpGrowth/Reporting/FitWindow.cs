namespace OpGrowth.Reporting;

/// <summary>
/// The range of an independent variable a number was obtained on, e.g. the time window of a fit
/// (<c>t in [0.5, 2.5]</c>) or the range of Lanczos indices (<c>n in [5, 30]</c>).
/// </summary>
public readonly record struct FitWindow
{
    public FitWindow(double start, double end, string variable = "t")
    {
        if (double.IsNaN(start) || double.IsNaN(end)) throw new ArgumentException("A window needs numeric ends; found NaN.");
        if (end < start) throw new ArgumentException($"Window end {end} is before its start {start}; expected start <= end.");
        ArgumentException.ThrowIfNullOrWhiteSpace(variable);
        Start = start;
        End = end;
        Variable = variable;
    }

    public double Start { get; }
    public double End { get; }
    public string Variable { get; }

    /// <summary>"[t0, t1]".</summary>
    public string Range => NumberFormat.Window(Start, End);

    /// <summary>"t in [t0, t1]".</summary>
    public override string ToString() => Variable + " in " + Range;
}
