namespace OpGrowth.Reporting;

/// <summary>Scrambling time t* at each system size N with its uncertainty, and up to two fits.</summary>
public sealed record ScramblingTimeSeries(double[] Sizes, double[] ScramblingTimes, double[] Uncertainties)
{
    public ScalingFit? Logarithmic { get; init; }

    public ScalingFit? Ballistic { get; init; }

    public string TimeLabel { get; init; } = "t* (1/energy)";

    public string SizeLabel { get; init; } = "system size N (qubits)";
}
