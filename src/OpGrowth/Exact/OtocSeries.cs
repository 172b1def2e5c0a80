namespace OpGrowth.Exact;

/// <summary>A time series with its uncertainty (standard error over random states; zero for dense traces).</summary>
public sealed record OtocSeries(string Probe, double[] Values, double[] Errors);
