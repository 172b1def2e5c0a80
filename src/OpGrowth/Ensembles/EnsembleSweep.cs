using OpGrowth.Sweeps;

namespace OpGrowth.Ensembles;

/// <summary>
/// t*(N) for an ensemble: one series per size from a caller's factory, its figures, and the sweep library's own
/// averaging table and scaling fits (<see cref="SweepCollector.FitSeries"/>: t* = a + b ln N against
/// t* = a + N/v with the information-criterion comparison).
/// </summary>
public static class EnsembleSweep
{
    /// <summary>Runs every size and fits; <paramref name="make"/> gives the series of size N.</summary>
    public static EnsembleSweepResult Run(string name, string probe, IReadOnlyList<int> sizes, Func<int, EnsembleSeries> make, IProgress<string>? progress = null)
    {
        ArgumentNullException.ThrowIfNull(sizes);
        ArgumentNullException.ThrowIfNull(make);
        var rows = new List<DisorderAverage>();
        var series = new List<EnsembleSeries>();
        foreach (int n in sizes.Distinct().Order())
        {
            var s = make(n);
            var f = EnsembleFigures.Of(s);
            series.Add(s);
            rows.Add(Row(name, probe, s, f));
            progress?.Report(f.Figures.ScramblingTime.Value is double t ? FormattableString.Invariant($"N = {n}: t* = {t:0.###}") : $"N = {n}: t* not reached");
        }
        var fit = SweepCollector.FitSeries(rows);
        return new EnsembleSweepResult(rows, fit.FirstOrDefault(), series);
    }

    /// <summary>The sweep table's row of one series (nothing truncated: truncation error 0).</summary>
    public static DisorderAverage Row(string name, string probe, EnsembleSeries s, EnsembleFigures f)
    {
        var ts = f.Figures.ScramblingTime;
        return new DisorderAverage
        {
            Group = $"{name} {s.Engine}",
            Model = name,
            Parameters = new SortedDictionary<string, double>(StringComparer.Ordinal),
            Probe = probe,
            Engine = s.Engine,
            N = s.N,
            Seeds = 1,
            Reached = ts.Value is null ? 0 : 1,
            TStar = ts.Value,
            TStarTruncationError = 0,
            TStarGridError = ts.GridUncertainty ?? 0,
            TStarSamplingError = f.TStarSamplingError is double e && double.IsFinite(e) ? e : null,
            GrowthKind = f.Figures.Growth.Regime is "exponential" or "linear" ? f.Figures.Growth.Regime : null,
            GrowthRate = f.GrowthRate,
            VB = f.Figures.Butterfly?.Primary.Velocity,
            MaxDiscardedWeight = 0,
            Converged = true,
        };
    }
}

/// <summary>Rows by size, the fitted series (null with fewer than three sizes) and the series themselves.</summary>
public sealed record EnsembleSweepResult(IReadOnlyList<DisorderAverage> Rows, SeriesFit? Fit, IReadOnlyList<EnsembleSeries> Series);
