using Microsoft.Extensions.Logging;

namespace OpGrowth.Sweeps;

/// <summary>
/// Merges a results folder into one table and the scaling fits: reads every point file (corrupt ones are
/// reported, moved aside and left out), keeps the points of the current plan (the manifest), averages
/// over disorder seeds per series and size, and fits t*(N) = a + b ln N against t*(N) = a + N/v for
/// every series with at least three sizes.
/// </summary>
public static class SweepCollector
{
    /// <summary>Sizes a series needs before it is fitted.</summary>
    public const int MinSizesForFit = 3;

    /// <summary>Collects a results folder.</summary>
    public static SweepCollection Collect(string resultsDirectory, ILogger? logger = null)
    {
        var store = new PointStore(resultsDirectory, logger);
        if (!Directory.Exists(store.Root)) throw new IO.InputException(resultsDirectory, 0, "found no such folder; expected the results folder of a sweep (--results DIR)");
        var manifest = SweepManifest.Load(store.ManifestPath);
        var (all, corrupt) = store.LoadAll();
        var byId = all.ToDictionary(p => p.Id, StringComparer.Ordinal);
        var points = new List<StoredPoint>();
        var missing = new List<ManifestEntry>();
        int stale = 0;
        if (manifest is not null)
        {
            var ids = new HashSet<string>(manifest.Points.Select(e => e.Id), StringComparer.Ordinal);
            foreach (var e in manifest.Points.OrderBy(e => e.Index))
            {
                if (byId.TryGetValue(e.Id, out var sp)) points.Add(sp);
                else missing.Add(e);
            }
            stale = all.Count(p => !ids.Contains(p.Id));
        }
        else
        {
            points.AddRange(all.OrderBy(p => p.Group, StringComparer.Ordinal).ThenBy(p => p.N).ThenBy(p => p.Seed ?? long.MinValue).ThenBy(p => p.Id, StringComparer.Ordinal));
        }
        if (stale > 0) logger?.LogInformation("{Stale} point files belong to other plans (other options) and are not merged", stale);
        if (missing.Count > 0) logger?.LogWarning("{Missing} of {Total} points have no result yet (rerun the sweep to compute them)", missing.Count, manifest!.Points.Count);

        var averages = Average(points);
        var fits = FitSeries(averages);
        return new SweepCollection
        {
            Name = manifest?.Name ?? Path.GetFileName(store.Root.TrimEnd(Path.DirectorySeparatorChar)),
            Description = manifest?.Description ?? "",
            Points = points,
            Averages = averages,
            Series = fits,
            Corrupt = corrupt,
            Missing = missing,
            Stale = stale,
        };
    }

    /// <summary>Disorder averages per (series, N), in series order of first appearance and increasing N.</summary>
    public static IReadOnlyList<DisorderAverage> Average(IReadOnlyList<StoredPoint> points)
    {
        var groupOrder = points.Select(p => p.Group).Distinct().ToList();
        var result = new List<DisorderAverage>();
        foreach (string g in groupOrder)
        {
            foreach (var atN in points.Where(p => p.Group == g).GroupBy(p => p.N).OrderBy(x => x.Key))
            {
                var list = atN.OrderBy(p => p.Seed ?? long.MinValue).ToList();
                var first = list[0];
                var reached = list.Where(p => p.Result.TStar is not null).ToList();
                bool all = reached.Count == list.Count;
                var t = reached.Select(p => p.Result.TStar!.Value).ToArray();
                double? mean = all ? t.Average() : null;
                double? spread = all && t.Length > 1 ? Math.Sqrt(t.Sum(x => (x - mean!.Value) * (x - mean.Value)) / (t.Length - 1)) : null;
                double? trunc = all && list.All(p => p.Result.TStarTruncationError is not null) ? list.Average(p => p.Result.TStarTruncationError!.Value) : null;
                var rates = list.Select(p => p.Result.GrowthRate).ToArray();
                var kinds = list.Select(p => p.Result.GrowthKind).Distinct().ToArray();
                var sampling = list.Where(p => p.Result.TStarSamplingError is not null).Select(p => p.Result.TStarSamplingError!.Value).ToArray();
                var vbs = list.Select(p => p.Result.VB).ToArray();
                result.Add(new DisorderAverage
                {
                    Group = g,
                    Model = first.Model,
                    Parameters = first.Parameters,
                    Probe = first.ProbeTemplate,
                    Engine = string.Join('+', list.Select(p => p.Result.Engine).Distinct().Order(StringComparer.Ordinal)),
                    N = atN.Key,
                    Seeds = list.Count,
                    Reached = reached.Count,
                    TStar = mean,
                    TStarStatError = all ? Bootstrap.StandardError(t) : null,
                    TStarTruncationError = trunc,
                    TStarGridError = list.Average(p => p.Result.TStarGridError),
                    TStarSpread = spread,
                    TStarSamplingError = sampling.Length > 0 ? Math.Sqrt(sampling.Sum(x => x * x)) / list.Count : null,
                    GrowthKind = kinds.Length == 1 ? kinds[0] : null,
                    GrowthRate = rates.All(r => r is not null) ? rates.Average(r => r!.Value) : null,
                    GrowthRateStatError = rates.All(r => r is not null) ? Bootstrap.StandardError(rates.Select(r => r!.Value).ToArray()) : null,
                    VB = vbs.All(v => v is not null) ? vbs.Average(v => v!.Value) : null,
                    VBStatError = vbs.All(v => v is not null) ? Bootstrap.StandardError(vbs.Select(v => v!.Value).ToArray()) : null,
                    VBError = vbs.All(v => v is not null) ? VelocityError(list.Select(p => p.Result).ToList()) : null,
                    MaxDiscardedWeight = list.Max(p => p.Result.DiscardedWeight),
                    Converged = list.All(p => p.Result.Converged),
                });
            }
        }
        return result;
    }

    // Mean v_B's total error: bootstrap over seeds and each point's own error (fit and truncation) propagated to the mean.
    private static double VelocityError(List<PointResult> points)
    {
        double boot = Bootstrap.StandardError(points.Select(p => p.VB!.Value).ToArray()) ?? 0;
        double own = Math.Sqrt(points.Sum(p => Math.Pow(p.VBError ?? 0, 2) + Math.Pow(p.VBTruncationError ?? 0, 2))) / points.Count;
        return Math.Sqrt(boot * boot + own * own);
    }

    /// <summary>Scaling fits per series.</summary>
    public static IReadOnlyList<SeriesFit> FitSeries(IReadOnlyList<DisorderAverage> averages)
    {
        var fits = new List<SeriesFit>();
        foreach (var g in averages.GroupBy(a => a.Group))
        {
            var rows = g.OrderBy(a => a.N).ToList();
            var usable = rows.Where(a => a.TStar is not null).ToList();
            var first = rows[0];
            FitComparison? cmp = null;
            string? note = null;
            if (usable.Count < rows.Count) note = $"{rows.Count - usable.Count} size(s) without t* for every seed are left out of the fits";
            if (usable.Count >= MinSizesForFit)
            {
                cmp = FitComparison.Compare(
                    usable.Select(a => (double)a.N).ToArray(),
                    usable.Select(a => a.TStar!.Value).ToArray(),
                    usable.Select(a => a.TStarTotalError).ToArray());
            }
            else
            {
                note = (note is null ? "" : note + "; ") + $"{usable.Count} size(s) with t*: at least {MinSizesForFit} are needed for the fits";
            }
            double? ratio = usable.Count >= 2 ? usable[^1].TStar!.Value / usable[0].TStar!.Value : null;
            double? nRatio = usable.Count >= 2 ? usable[^1].N / (double)usable[0].N : null;
            var curve = new List<CurvePoint>();
            if (cmp is not null)
            {
                double lo = usable[0].N, hi = usable[^1].N;
                const int samples = 64;
                for (int i = 0; i < samples; i++)
                {
                    double n = lo + (hi - lo) * i / (samples - 1);
                    curve.Add(new CurvePoint(n, cmp.Log.Evaluate(n), cmp.Linear.Evaluate(n)));
                }
            }
            fits.Add(new SeriesFit
            {
                Group = g.Key,
                Model = first.Model,
                Parameters = first.Parameters,
                Probe = first.Probe,
                Engine = string.Join('+', rows.Select(r => r.Engine).Distinct()),
                Data = rows,
                Comparison = cmp,
                TStarRatio = ratio,
                SizeRatio = nRatio,
                Curve = curve,
                Note = note,
            });
        }
        return fits;
    }
}
