using System.Globalization;
using System.Text;
using OpGrowth.Reporting;

namespace OpGrowth.Sweeps;

/// <summary>
/// Draws t*(N) of every series with the two fitted laws (the report's t*(N) chart), as PNG and SVG in
/// <c>figures/</c> of the results folder. Error bars are the total uncertainty (statistical, truncation,
/// grid and sampling in quadrature).
/// </summary>
public static class SweepFigures
{
    /// <summary>Writes one figure per series with at least two sizes that reached t*; returns the paths.</summary>
    public static IReadOnlyList<string> Write(SweepCollection collection, string directory)
    {
        ArgumentNullException.ThrowIfNull(collection);
        var files = new List<string>();
        string folder = Path.Combine(directory, "figures");
        int k = 0;
        foreach (var s in collection.Series)
        {
            k++;
            var series = TStarSeries(s);
            if (series is null) continue;
            string name = $"tstar-{k.ToString(CultureInfo.InvariantCulture)}-{Slug(s.Model)}";
            string caption = s.Comparison?.Verdict ?? s.Note ?? "t* at each N with its total uncertainty";
            var fig = Charts.ScramblingTime(series, name: name, title: $"t*(N): {s.Label}", caption: caption);
            var (png, svg) = fig.Save(folder);
            files.Add(png);
            files.Add(svg);
        }
        return files;
    }

    /// <summary>The t*(N) points of a sweep series with both fitted laws (null with fewer than two sizes that reached t*).</summary>
    public static ScramblingTimeSeries? TStarSeries(SeriesFit s)
    {
        ArgumentNullException.ThrowIfNull(s);
        var data = s.Data.Where(a => a.TStar is not null).ToList();
        if (data.Count < 2) return null;
        var series = new ScramblingTimeSeries(
            data.Select(a => (double)a.N).ToArray(),
            data.Select(a => a.TStar!.Value).ToArray(),
            data.Select(a => a.TStarTotalError).ToArray());
        if (s.Comparison is { } c)
        {
            series = series with
            {
                Logarithmic = new Reporting.ScalingFit(ScalingForm.Logarithmic, c.Log.A, c.Log.AError, c.Log.Slope, c.Log.SlopeError)
                {
                    ReducedChiSquare = double.IsFinite(c.Log.ReducedChiSquared) ? c.Log.ReducedChiSquared : null,
                },
                Ballistic = c.Linear.V is double v
                    ? new Reporting.ScalingFit(ScalingForm.Ballistic, c.Linear.A, c.Linear.AError, v, c.Linear.VError ?? double.NaN)
                    {
                        ReducedChiSquare = double.IsFinite(c.Linear.ReducedChiSquared) ? c.Linear.ReducedChiSquared : null,
                    }
                    : null,
            };
        }
        return series;
    }

    private static string Slug(string s)
    {
        var sb = new StringBuilder();
        foreach (char c in s) sb.Append(char.IsAsciiLetterOrDigit(c) || c is '-' or '_' ? c : '-');
        return sb.Length == 0 ? "series" : sb.ToString();
    }
}
