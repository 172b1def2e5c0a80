using System.Globalization;
using System.Text;
using System.Text.Json;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// A merged results folder: the point table, disorder averages, scaling fits, and what was left out
/// (corrupt files, missing points, results of other plans). <see cref="Write"/> produces
/// <c>table.csv</c>/<c>table.json</c> (one row per point, physics only, so reruns give identical files),
/// <c>averages.csv</c>, <c>fits.json</c>, <c>series.csv</c> (plot-ready) and <c>timings.csv</c>.
/// </summary>
public sealed record SweepCollection
{
    private static readonly CultureInfo Ci = CultureInfo.InvariantCulture;

    /// <summary>Plan name.</summary>
    public required string Name { get; init; }

    /// <summary>Plan description.</summary>
    public string Description { get; init; } = "";

    /// <summary>Merged points in plan order.</summary>
    public required IReadOnlyList<StoredPoint> Points { get; init; }

    /// <summary>Disorder averages.</summary>
    public required IReadOnlyList<DisorderAverage> Averages { get; init; }

    /// <summary>Series with fits.</summary>
    public required IReadOnlyList<SeriesFit> Series { get; init; }

    /// <summary>Corrupt point files found (moved aside, not merged).</summary>
    public required IReadOnlyList<CorruptPoint> Corrupt { get; init; }

    /// <summary>Points of the plan without a result.</summary>
    public required IReadOnlyList<ManifestEntry> Missing { get; init; }

    /// <summary>Point files of other plans (not merged).</summary>
    public int Stale { get; init; }

    /// <summary>Writes every output file into <paramref name="directory"/> (atomically); returns their paths.</summary>
    public IReadOnlyList<string> Write(string directory)
    {
        var files = new List<string>();
        void Put(string name, string text)
        {
            string path = Path.Combine(directory, name);
            AtomicFile.WriteAllText(path, text);
            files.Add(path);
        }
        var (header, rows) = TableRows();
        Put("table.csv", Csv(header, rows));
        Put("table.json", Json(JsonKeys(header), rows));
        Put("averages.csv", AveragesCsv());
        Put("series.csv", SeriesCsv());
        Put("timings.csv", TimingsCsv());
        Put("fits.json", JsonSerializer.Serialize(new
        {
            Schema = "opgrowth.sweep-fits/1",
            Name,
            Description,
            Points = Points.Count,
            Missing = Missing.Count,
            Corrupt = Corrupt.Count,
            Series = Series,
        }, AtomicFile.Json));
        return files;
    }

    /// <summary>The point table: header and rows of cells (null = empty).</summary>
    public (IReadOnlyList<string> Header, IReadOnlyList<object?[]> Rows) TableRows()
    {
        var fixedCols = new List<string> { "id", "model", "N" };
        var paramNames = Points.SelectMany(p => p.Parameters.Keys).Distinct().Order(StringComparer.Ordinal).ToList();
        var tail = new[]
        {
            "seed", "probe", "engine", "t_star", "t_star_grid_err", "t_star_trunc_err", "t_star_sampling_err", "growth_kind", "growth_rate", "growth_rate_err",
            "growth_rate_trunc_err", "growth_window", "v_b", "v_b_err", "v_b_trunc_err", "discarded_weight", "final_size_fraction",
            "final_time", "converged", "note",
        };
        var header = new List<string>(fixedCols);
        header.AddRange(paramNames.Select(n => fixedCols.Contains(n) || tail.Contains(n) ? "param_" + n : n));
        header.AddRange(tail);
        var rows = new List<object?[]>();
        foreach (var p in Points)
        {
            var r = p.Result;
            var cells = new List<object?> { p.Id, p.Model, p.N };
            cells.AddRange(paramNames.Select(n => p.Parameters.TryGetValue(n, out double v) ? v : (object?)null));
            cells.AddRange(new object?[]
            {
                p.Seed, r.ProbeResolved ?? p.Probe, r.Engine, r.TStar, r.TStarGridError, r.TStarTruncationError, r.TStarSamplingError, r.GrowthKind, r.GrowthRate, r.GrowthRateError,
                r.GrowthRateTruncationError, r.GrowthWindow, r.VB, r.VBError, r.VBTruncationError, r.DiscardedWeight, r.FinalSizeFraction,
                r.FinalTime, r.Converged, r.Note,
            });
            rows.Add(cells.ToArray());
        }
        return (header, rows);
    }

    /// <summary>The table's JSON keys: camelCase names of the fixed columns (as in the point files); parameter columns keep their names.</summary>
    private static IReadOnlyList<string> JsonKeys(IReadOnlyList<string> header)
    {
        var names = new Dictionary<string, string>(StringComparer.Ordinal)
        {
            ["N"] = "n", ["t_star"] = "tStar", ["t_star_grid_err"] = "tStarGridError", ["t_star_trunc_err"] = "tStarTruncationError",
            ["t_star_sampling_err"] = "tStarSamplingError", ["growth_kind"] = "growthKind", ["growth_rate"] = "growthRate", ["growth_rate_err"] = "growthRateError",
            ["growth_rate_trunc_err"] = "growthRateTruncationError", ["growth_window"] = "growthWindow", ["v_b"] = "vb", ["v_b_err"] = "vbError",
            ["v_b_trunc_err"] = "vbTruncationError", ["discarded_weight"] = "discardedWeight", ["final_size_fraction"] = "finalSizeFraction", ["final_time"] = "finalTime",
        };
        return header.Select((h, i) => names.TryGetValue(h, out var k) ? k : h.StartsWith("param_", StringComparison.Ordinal) ? "param" + h["param_".Length..] : h).ToList();
    }

    private string AveragesCsv()
    {
        var paramNames = Averages.SelectMany(a => a.Parameters.Keys).Distinct().Order(StringComparer.Ordinal).ToList();
        var header = new List<string> { "model" };
        header.AddRange(paramNames);
        header.AddRange(["probe", "engine", "N", "seeds", "reached", "t_star", "t_star_stat_err", "t_star_trunc_err", "t_star_grid_err",
            "t_star_seed_spread", "t_star_sampling_err", "growth_kind", "growth_rate", "growth_rate_stat_err", "v_b", "v_b_stat_err", "v_b_err", "max_discarded_weight", "converged"]);
        var rows = Averages.Select(a =>
        {
            var c = new List<object?> { a.Model };
            c.AddRange(paramNames.Select(n => a.Parameters.TryGetValue(n, out double v) ? v : (object?)null));
            c.AddRange(new object?[] { a.Probe, a.Engine, a.N, a.Seeds, a.Reached, a.TStar, a.TStarStatError, a.TStarTruncationError, a.TStarGridError,
                a.TStarSpread, a.TStarSamplingError, a.GrowthKind, a.GrowthRate, a.GrowthRateStatError, a.VB, a.VBStatError, a.VBError, a.MaxDiscardedWeight, a.Converged });
            return c.ToArray();
        }).ToList();
        return Csv(header, rows);
    }

    private string SeriesCsv()
    {
        var header = new[] { "series", "kind", "N", "t_star", "stat_err", "trunc_err", "grid_err", "total_err" };
        var rows = new List<object?[]>();
        foreach (var s in Series)
        {
            foreach (var a in s.Data)
            {
                rows.Add([s.Label, "data", (double)a.N, a.TStar, a.TStarStatError, a.TStarTruncationError, a.TStarGridError, a.TStar is null ? null : a.TStarTotalError]);
            }
            foreach (var c in s.Curve) rows.Add([s.Label, "fit-log", c.N, c.LogFit, null, null, null, null]);
            foreach (var c in s.Curve) rows.Add([s.Label, "fit-linear", c.N, c.LinearFit, null, null, null, null]);
        }
        return Csv(header, rows);
    }

    private string TimingsCsv()
    {
        var header = new[] { "id", "model", "N", "seed", "engine", "wall_seconds", "memory_bytes" };
        var rows = Points.Select(p => new object?[] { p.Id, p.Model, p.N, p.Seed, p.Result.Engine, p.Result.WallSeconds, p.Result.MemoryBytes }).ToList();
        return Csv(header, rows);
    }

    /// <summary>Human-readable summary: counts, then per series the averages and the fit comparison.</summary>
    public string Summary()
    {
        var sb = new StringBuilder();
        sb.Append(CultureInfo.InvariantCulture, $"sweep '{Name}': {Points.Count} points merged");
        if (Missing.Count > 0) sb.Append(CultureInfo.InvariantCulture, $", {Missing.Count} missing");
        if (Corrupt.Count > 0) sb.Append(CultureInfo.InvariantCulture, $", {Corrupt.Count} corrupt file(s) moved aside and not merged");
        if (Stale > 0) sb.Append(CultureInfo.InvariantCulture, $", {Stale} file(s) of other plans ignored");
        sb.Append('\n');
        foreach (var s in Series)
        {
            sb.Append('\n').Append(s.Label).Append(" [").Append(s.Engine).Append("]\n");
            sb.Append("      N  seeds        t*     stat    trunc     grid\n");
            foreach (var a in s.Data)
            {
                sb.Append(CultureInfo.InvariantCulture, $"  {a.N,5}  {a.Seeds,5}  {Fmt(a.TStar),8}  {Fmt(a.TStarStatError),7}  {Fmt(a.TStarTruncationError),7}  {Fmt(a.TStarGridError),7}");
                if (a.Reached < a.Seeds) sb.Append(CultureInfo.InvariantCulture, $"  ({a.Seeds - a.Reached} seed(s) did not reach t*)");
                if (!a.Converged) sb.Append("  (not converged)");
                sb.Append('\n');
            }
            if (s.TStarRatio is double r && s.SizeRatio is double nr)
            {
                sb.Append(CultureInfo.InvariantCulture, $"  t*(N_max)/t*(N_min) = {r:0.###} for N_max/N_min = {nr:0.###}\n");
            }
            if (s.Comparison is { } c)
            {
                static string V(double x, double e) => Reporting.NumberFormat.ValueWithUncertainty(x, e);
                static string N(double x) => Reporting.NumberFormat.Number(x, 3);
                sb.Append($"  log:    a = {V(c.Log.A, c.Log.AError)}, b = {V(c.Log.Slope, c.Log.SlopeError)}, chi2/dof = {N(c.Log.ReducedChiSquared)}, AIC = {N(c.Log.Aic)}\n");
                string v = c.Linear.V is double vv ? $", v = {V(vv, c.Linear.VError ?? double.NaN)}" : "";
                sb.Append($"  linear: a = {V(c.Linear.A, c.Linear.AError)}, 1/v = {V(c.Linear.Slope, c.Linear.SlopeError)}{v}, chi2/dof = {N(c.Linear.ReducedChiSquared)}, AIC = {N(c.Linear.Aic)}\n");
                sb.Append("  ").Append(c.Verdict).Append('\n');
            }
            if (s.Note is not null) sb.Append("  note: ").Append(s.Note).Append('\n');
        }
        foreach (var c in Corrupt) sb.Append("corrupt: ").Append(c.Path).Append(": ").Append(c.Problem).Append(" (moved to ").Append(c.MovedTo).Append(")\n");
        return sb.ToString();
    }

    private static string Fmt(double? v) => v is double d ? Reporting.NumberFormat.Number(d, 4) : "-";

    private static string Cell(object? v) => v switch
    {
        null => "",
        double d => d.ToString("R", Ci),
        bool b => b ? "true" : "false",
        IFormattable f => f.ToString(null, Ci),
        string s => s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"" : s,
        _ => v.ToString() ?? "",
    };

    private static string Csv(IReadOnlyList<string> header, IReadOnlyList<object?[]> rows)
    {
        var sb = new StringBuilder();
        sb.AppendJoin(',', header).Append('\n');
        foreach (var r in rows) sb.AppendJoin(',', r.Select(Cell)).Append('\n');
        return sb.ToString();
    }

    private static string Json(IReadOnlyList<string> header, IReadOnlyList<object?[]> rows)
    {
        using var ms = new MemoryStream();
        using (var w = new Utf8JsonWriter(ms, new JsonWriterOptions { Indented = true }))
        {
            w.WriteStartArray();
            foreach (var r in rows)
            {
                w.WriteStartObject();
                for (int i = 0; i < header.Count; i++)
                {
                    w.WritePropertyName(header[i]);
                    switch (r[i])
                    {
                        case null: w.WriteNullValue(); break;
                        case double d when double.IsFinite(d): w.WriteNumberValue(d); break;
                        case double: w.WriteNullValue(); break;
                        case int n: w.WriteNumberValue(n); break;
                        case long l: w.WriteNumberValue(l); break;
                        case bool b: w.WriteBooleanValue(b); break;
                        default: w.WriteStringValue(Convert.ToString(r[i], Ci)); break;
                    }
                }
                w.WriteEndObject();
            }
            w.WriteEndArray();
        }
        return Encoding.UTF8.GetString(ms.ToArray()) + "\n";
    }
}
