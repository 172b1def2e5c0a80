using System.Globalization;
using OpGrowth.IO;
using OpGrowth.Reporting;
using OpGrowth.Sweeps;

namespace OpGrowth.Ensembles;

/// <summary>
/// The report folder of an ensemble run, with the figures of a static run (size distribution, mean size, light cone,
/// t*(N)) drawn by the same chart code, every number with its sampling error, and, when a static run is given, the
/// two side by side.
/// </summary>
public static class EnsembleReport
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Writes the folder; returns the printed headline lines and the files written (relative).</summary>
    public static (IReadOnlyList<string> Lines, IReadOnlyList<string> Files) Write(string folder, EnsembleSeries s, EnsembleFigures f, EnsembleSweepResult? sweep,
        IReadOnlyList<KeyValuePair<string, string>> summary, StaticComparison? stat, TimeSpan elapsed)
    {
        ArgumentNullException.ThrowIfNull(s);
        ArgumentNullException.ThrowIfNull(f);
        Directory.CreateDirectory(folder);
        string unit = s.TimeUnit == "layers" ? "layer" : "time";
        string perTime = s.TimeUnit == "layers" ? "per layer" : "1/time";
        var doc = new ReportDocument($"{s.Name}: {s.Kind}")
        {
            Subtitle = $"N = {s.N}, probe {s.Probe}; {s.Method}",
            Created = DateTimeOffset.UtcNow,
        };
        foreach (var kv in summary) doc.AddModel(kv.Key, kv.Value);
        doc.AddModel("qubits", s.N.ToString(Inv));
        doc.AddModel("time unit", s.TimeUnit == "layers" ? "one two-qubit gate layer" : "the model file's time (1/energy)");
        doc.AddModel("samples", s.Samples > 0 ? $"{s.Samples} (seed {s.Seed}; sample s draws from a stream fixed by seed and s)" : "none: deterministic solution");

        var lines = new List<string>();
        void Headline(string name, Measured m)
        {
            doc.Headlines.Add(new HeadlineFigure(name, m, true));
            lines.Add($"{name}: {m.FormatValue()}");
        }
        var fig = f.Figures;
        if (fig.Butterfly?.Primary is { Velocity: double v } p)
        {
            double err = Quad(p.VelocityError, f.VBSamplingError);
            Headline("butterfly velocity v_B", new Measured(v, err, $"front where rho_j reaches {p.Threshold:0.###}; fit error and sampling error (jackknife) combined", new FitWindow(p.WindowStart ?? 0, p.WindowEnd ?? 0), $"sites/{unit}"));
        }
        if (f.GrowthRate is double g)
        {
            var gf = fig.Growth.Regime == "exponential" ? fig.Growth.SizeExponential : fig.Growth.SizeLinear;
            Headline(fig.Growth.Regime == "exponential" ? "size growth rate (exponential)" : "size growth rate (linear)",
                new Measured(g, Quad(f.GrowthRateFitError, f.GrowthRateSamplingError), $"{gf.Quantity}; {fig.Growth.RegimeReason}", new FitWindow(gf.WindowStart ?? 0, gf.WindowEnd ?? 0),
                    fig.Growth.Regime == "exponential" ? perTime : $"sites/{unit}"));
        }
        if (fig.ScramblingTime.Value is double ts)
            Headline("scrambling time t*", new Measured(ts, Quad(fig.ScramblingTime.GridUncertainty, f.TStarSamplingError), fig.ScramblingTime.Definition + "; grid and sampling error combined", null, s.TimeUnit == "layers" ? "layers" : ""));
        else
            lines.Add($"scrambling time t*: not reached by t = {s.Times[^1].ToString("0.##", Inv)} (mean size {s.MeanSize[^1]:0.##} of {fig.ScramblingTime.Target:0.##})");
        Headline("final mean size", new Measured(s.MeanSize[^1], s.MeanSizeError[^1], $"at t = {s.Times[^1].ToString("0.##", Inv)}; random-operator value {fig.Growth.SaturationExpected:0.##}"));
        doc.VerdictSummary = s.Engine == "circuit"
            ? "Haar-random circuit averages, exact up to the stated sampling error. They describe the circuit ensemble on this connectivity, not any particular circuit or Hamiltonian: see docs/ensembles.md for what carries over."
            : "Noise-averaged growth of the Brownian counterpart. It shares the static model's connectivity and coupling strengths but has no energy conservation and no coherent phases: it bounds what the connectivity allows, it does not predict the static model's numbers (docs/ensembles.md).";

        var files = new List<string>();
        string data = Path.Combine(folder, "data");
        Directory.CreateDirectory(data);
        CsvTable.Write(Path.Combine(data, "mean-size.csv"), ["time", "meanSize", "meanSizeError"], [s.Times, s.MeanSize, s.MeanSizeError]);
        files.Add("data/mean-size.csv");
        doc.DataFiles.Add(new DataFileEntry("data/mean-size.csv", "mean size and its sampling (or integration) error per record"));

        var size = FigureSize.Report;
        var w = new double[s.N + 1, s.Times.Length];
        for (int i = 0; i < s.Times.Length; i++)
            for (int k = 0; k <= s.N; k++) w[k, i] = s.SizeDistribution[i][k];
        string timeLabel = s.TimeUnit == "layers" ? "layers" : AxisText.Time;
        doc.Figures.Add(Charts.SizeDistribution(new SizeDistributionSeries(s.Times, w) { MeanSize = s.MeanSize, TimeLabel = timeLabel }, size));
        doc.Figures.Add(Charts.MeanSize(new MeanSizeSeries(s.Times, s.MeanSize, fig.Growth.SaturationExpected)
        {
            Uncertainty = s.MeanSizeError,
            ScramblingTime = doc.Headlines.FirstOrDefault(h => h.Name == "scrambling time t*")?.Value,
            ScramblingLevel = fig.ScramblingTime.Target,
            TimeLabel = timeLabel,
        }, size));
        if (s.N <= 4096)
        {
            var rho = new double[s.N, s.Times.Length];
            for (int i = 0; i < s.Times.Length; i++)
                for (int j = 0; j < s.N; j++) rho[j, i] = s.SiteWeights[i][j];
            OpGrowth.Reporting.FrontFit? front = null;
            if (fig.Butterfly?.Primary is { Intercept: double c } pf && doc.Headlines.FirstOrDefault(h => h.Name == "butterfly velocity v_B") is { } vb)
                front = new OpGrowth.Reporting.FrontFit(vb.Value, c, pf.Threshold);
            doc.Figures.Add(Charts.LightCone(new LightConeMap(s.Times, Enumerable.Range(0, s.N).Select(j => (double)j).ToArray(), rho)
            {
                Quantity = "ρ_j(t)",
                Origin = s.ProbeSites.Length > 0 ? s.ProbeSites[0] : 0,
                Front = s.Geometry.IsOneDimensional ? front : null,
                ScaleMax = 0.75,
                TimeLabel = timeLabel,
            }, size));
        }
        if (stat is not null)
        {
            doc.Figures.Add(Charts.Lines(new LineChartSpec("static-vs-brownian", $"{s.Name}: static model and its Brownian counterpart",
                $"Mean size n(t) of the static model (truncated evolution, discarded weight {stat.DiscardedWeight:0.###} at the end) and of its Brownian counterpart at the same N.",
                AxisText.Time, "mean size n(t)",
                [new LineSeries(stat.Label, stat.Times, stat.MeanSize), new LineSeries("Brownian counterpart", s.Times, s.MeanSize) { YError = s.MeanSizeError }])
            {
                ReferenceLines = [new ReferenceLine("3N/4", fig.Growth.SaturationExpected)],
            }, size));
            var rows = new List<IReadOnlyList<string>>
            {
                Row("v_B (sites/time)", stat.Figures.Butterfly?.Primary.Velocity, fig.Butterfly?.Primary.Velocity),
                Row("growth regime", null, null, stat.Figures.Growth.Regime, fig.Growth.Regime),
                Row("linear size growth dn/dt", stat.Figures.Growth.SizeLinear.Rate, fig.Growth.SizeLinear.Rate),
                Row("exponential rate", stat.Figures.Growth.SizeExponential.Rate, fig.Growth.SizeExponential.Rate),
                Row("t*", stat.Figures.ScramblingTime.Value, fig.ScramblingTime.Value),
            };
            doc.Tables.Add(new ReportTable("side-by-side", "Static model and Brownian counterpart", ["figure", "static", "Brownian"], rows)
            {
                Intro = "The same analysis on both series at the same N. Errors are in the two reports' headline figures.",
                Footer = "The counterpart's absolute rates follow the noise convention (rate 4 J_a^2 tau, tau = 1 unless set): compare the kind of growth (ballistic or exponential, t* against N), not the numbers. docs/ensembles.md says when the comparison means something.",
            });
        }
        if (sweep?.Fit is { } sf)
        {
            if (SweepFigures.TStarSeries(sf) is { } tsSeries)
                doc.Figures.Add(Charts.ScramblingTime(tsSeries with { TimeLabel = s.TimeUnit == "layers" ? "t* (layers)" : tsSeries.TimeLabel }, size, "tstar-scaling", $"t*(N): {s.Name}",
                    $"t* at each N with its grid and sampling error and both fits; {sf.Comparison?.Verdict ?? sf.Note ?? "too few sizes for the fits"}."));
            var rows = sweep.Rows.Select(r => (IReadOnlyList<string>)[r.N.ToString(Inv), r.TStar is double t ? NumberFormat.ValueWithUncertainty(t, r.TStarTotalError) : "not reached", r.VB is double vv ? NumberFormat.Number(vv, 3) : "-", r.GrowthRate is double gg ? NumberFormat.Number(gg, 3) : "-"]).ToList();
            doc.Tables.Add(new ReportTable("tstar", "Scrambling time against N", ["N", "t*", "v_B", "growth rate"], rows) { Footer = sf.Comparison?.Verdict ?? sf.Note });
            if (sf.Comparison is { } cmp) lines.Add($"t*(N): {cmp.Verdict}");
            CsvTable.Write(Path.Combine(data, "tstar.csv"), ["n", "tStar", "tStarError"],
                [sweep.Rows.Select(r => (double)r.N).ToArray(), sweep.Rows.Select(r => r.TStar ?? double.NaN).ToArray(), sweep.Rows.Select(r => r.TStarTotalError).ToArray()]);
            files.Add("data/tstar.csv");
            doc.DataFiles.Add(new DataFileEntry("data/tstar.csv", "t* per size with its total error"));
        }
        doc.Cautions.Add($"Sampling: {s.Method}. Errors are one standard error; figures with a fit window state it.");
        AtomicFile.WriteJson(Path.Combine(folder, "results.json"), new
        {
            kind = s.Kind,
            engine = s.Engine,
            name = s.Name,
            n = s.N,
            probe = s.Probe,
            samples = s.Samples,
            seed = s.Seed,
            method = s.Method,
            timeUnit = s.TimeUnit,
            butterflyVelocity = Finite(fig.Butterfly?.Primary.Velocity),
            butterflyVelocityError = Finite(Quad(fig.Butterfly?.Primary.VelocityError, f.VBSamplingError)),
            growthRegime = fig.Growth.Regime,
            growthRate = Finite(f.GrowthRate),
            growthRateError = Finite(Quad(f.GrowthRateFitError, f.GrowthRateSamplingError)),
            scramblingTime = Finite(fig.ScramblingTime.Value),
            scramblingTimeError = Finite(Quad(fig.ScramblingTime.GridUncertainty, f.TStarSamplingError)),
            tStarFit = sweep?.Fit?.Comparison is { } c2 ? new { preferred = c2.Preferred, strength = c2.Strength, deltaAic = c2.DeltaAic, logSlope = c2.Log.Slope, linearVelocity = Finite(c2.Linear.V) } : null,
            times = s.Times,
            meanSize = s.MeanSize,
            meanSizeError = s.MeanSizeError.Select(e => Finite(e)).ToArray(),
            wallSeconds = elapsed.TotalSeconds,
        });
        files.Add("results.json");
        var written = ReportWriter.Write(doc, folder);
        files.AddRange(written.RelativePaths);
        return (lines, files);
    }

    private static IReadOnlyList<string> Row(string name, double? a, double? b, string? ta = null, string? tb = null)
        => [name, ta ?? (a is double x ? NumberFormat.Number(x, 3) : "-"), tb ?? (b is double y ? NumberFormat.Number(y, 3) : "-")];

    private static double Quad(double? a, double? b)
    {
        double x = a is double u && double.IsFinite(u) ? u : 0, y = b is double v && double.IsFinite(v) ? v : 0;
        if ((a is null || !double.IsFinite(a.Value)) && (b is null || !double.IsFinite(b.Value))) return double.NaN;
        return Math.Sqrt(x * x + y * y);
    }

    private static double? Finite(double? v) => v is double x && double.IsFinite(x) ? x : null;
}
