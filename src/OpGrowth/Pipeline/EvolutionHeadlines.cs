using System.Globalization;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.Reporting;

namespace OpGrowth.Pipeline;

/// <summary>
/// The headline figures of an evolution, stated one way for <c>opgrowth run</c> (console, report, results.json)
/// and <c>opgrowth evolve</c> (console, summary.txt): v_B on chains (otherwise the size growth rate), t*, the
/// saturation and the discarded weight. Each carries its uncertainty (fit and movement across budgets in
/// quadrature) and says when it is not converged, with the values at every budget, or when truncation was
/// not measured at all.
/// </summary>
public static class EvolutionHeadlines
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Headline names (also the keys tests and results.json use).</summary>
    public const string ButterflyVelocity = "butterfly velocity v_B";
    public const string ScramblingTime = "scrambling time t*";
    public const string Saturation = "saturation mean size";
    public const string DiscardedWeight = "discarded weight";

    /// <summary>Display names of the figures the budget series compares.</summary>
    public static string FigureName(string key) => key switch
    {
        "butterflyVelocity" => "v_B",
        "sizeGrowthRateLinear" => "size growth rate dn/dt",
        "sizeGrowthRateExponential" => "size growth rate lambda",
        "otocGrowthRate" => "OTOC growth rate",
        "saturationMeanSize" => "saturation mean size",
        "scramblingTime" => "t*",
        "majoranaScramblingTime" => "t* (Majoranas)",
        "majoranaSizeGrowthRateLinear" => "size growth rate dn/dt (Majoranas)",
        "majoranaSizeGrowthRateExponential" => "size growth rate lambda (Majoranas)",
        "majoranaSaturationMeanSize" => "saturation mean size (Majoranas)",
        _ => key,
    };

    private static double Q(double? a, double? b) => Math.Sqrt(Sq(a) + Sq(b));

    private static double Sq(double? x) => x is double v && double.IsFinite(v) ? v * v : 0;

    private static FitWindow? Win(double? a, double? b, string v = "t")
        => a is double x && b is double y && double.IsFinite(x) && double.IsFinite(y) && y >= x ? new FitWindow(x, y, v) : null;

    /// <summary>The budgets of the series, full first, as "100,000 / 50,000 / 25,000 strings".</summary>
    public static string BudgetList(EvolutionResult evo)
        => string.Join(" / ", evo.Runs.Select(s => s.Budget.MaxStrings is long m ? m.ToString("N0", Inv) : "no cap")) + " strings";

    /// <summary>True when nothing was discarded at the full budget (the evolution is exact up to the integrator).</summary>
    public static bool Untruncated(EvolutionResult evo) => evo.Main.Records.Count == 0 || Math.Abs(evo.Main.Records[^1].DiscardedTotal) < 1e-10;

    /// <summary>Whether a figure is converged, and the note that says why not.</summary>
    public static (bool Converged, string? Note) Convergence(EvolutionResult evo, string key)
    {
        if (Untruncated(evo)) return (true, null);
        var c = evo.Convergence.FirstOrDefault(x => x.Figure == key);
        if (c is null)
        {
            return evo.Runs.Count > 1
                ? (false, "not available at the smaller budgets, so its truncation uncertainty is unknown")
                : (false, "truncation not measured: a single budget (add --budgets 2 or 3 for a budget series)");
        }
        if (c.Converged) return (true, null);
        string values = string.Join(", ", c.Values.Select((v, i) => (v is double x ? NumberFormat.Number(x, 3) : "not reached") + " at " + (evo.Runs.ElementAtOrDefault(i)?.Budget.MaxStrings is long m ? m.ToString("N0", Inv) : "?")));
        return (false, $"values across budgets: {values} strings");
    }

    /// <summary>Every headline figure of the full-budget run.</summary>
    public static List<HeadlineFigure> Of(EvolutionResult evo, TimeUnits? units = null)
    {
        ArgumentNullException.ThrowIfNull(evo);
        var u = units ?? TimeUnits.Hamiltonian;
        var list = new List<HeadlineFigure>();
        if (evo.Figures.Count == 0 || evo.Main.Records.Count == 0) return list;
        var fig = evo.Figures[0];
        double end = evo.Main.Records[^1].Time;
        FigureConvergence? C(string name) => evo.Convergence.FirstOrDefault(c => c.Figure == name);
        HeadlineFigure Make(string name, Measured m, string key)
        {
            var (ok, note) = Convergence(evo, key);
            return new HeadlineFigure(name, m, ok) { Note = note };
        }
        const string inQuadrature = "uncertainty: fit error and movement across budgets in quadrature";
        if (fig.Butterfly?.Primary is { Velocity: double v } p)
        {
            list.Add(Make(ButterflyVelocity, new Measured(v, Q(p.VelocityError, C("butterflyVelocity")?.Movement),
                FormattableString.Invariant($"front r(t) where the site weight reaches {p.Threshold:0.###}, fitted over distances {p.MinDistance}..{p.MaxDistance}; {inQuadrature}"),
                Win(p.WindowStart, p.WindowEnd), u.Velocity), "butterflyVelocity"));
        }
        else
        {
            // Majorana models: sizes in Majoranas (random operator: N of 2N); qubit models: in sites.
            bool maj = fig.MajoranaGrowth is not null;
            var g = fig.MajoranaGrowth ?? fig.Growth;
            string pre = maj ? "majoranaS" : "s";
            bool expo = g.Regime.Contains("exp", StringComparison.OrdinalIgnoreCase);
            var (fit, key, label) = expo && g.SizeExponential.Rate is not null
                ? (g.SizeExponential, pre + "izeGrowthRateExponential", "size growth rate lambda (n ~ e^{lambda t})")
                : (g.SizeLinear, pre + "izeGrowthRateLinear", "size growth rate dn/dt");
            if (fit.Rate is double rate)
            {
                list.Add(Make(label, new Measured(rate, Q(fit.RateError, C(key)?.Movement), $"fit of the mean {(maj ? "Majorana " : "")}size ({g.Regime} regime); {inQuadrature}",
                    Win(fit.WindowStart, fit.WindowEnd), expo ? u.Rate : u.SizePerTime(maj ? "Majoranas" : "sites")), key));
            }
        }
        bool majorana = fig.MajoranaScramblingTime is not null;
        var ts = fig.MajoranaScramblingTime ?? fig.ScramblingTime;
        if (ts.Value is double tv)
        {
            var c = C(majorana ? "majoranaScramblingTime" : "scramblingTime");
            Measured m = c is { Movement: null } && c.Values.Length > 1 && c.Values[1] is null
                // The smaller budget never reached the level: all that is known is that t* lies before the end of the run.
                ? new Measured(tv, Math.Max(ts.GridUncertainty ?? 0, end - tv), $"{ts.Definition}; the smaller budget did not reach the level by t = {NumberFormat.Number(end, 3)}, so the uncertainty is the rest of the run (a bound)", null, u.Time)
                : new Measured(tv, Q(ts.GridUncertainty, c?.Movement), $"{ts.Definition}; uncertainty: time grid and movement across budgets in quadrature", null, u.Time);
            list.Add(Make(ScramblingTime, m, majorana ? "majoranaScramblingTime" : "scramblingTime"));
        }
        var sg = fig.MajoranaGrowth ?? fig.Growth;
        if (sg.Saturation is double s)
        {
            bool maj = fig.MajoranaGrowth is not null;
            string key = maj ? "majoranaSaturationMeanSize" : "saturationMeanSize";
            list.Add(Make(Saturation, new Measured(s, Q(sg.SaturationSpread, C(key)?.Movement),
                FormattableString.Invariant($"late-time mean {(maj ? "Majorana " : "")}size; a random operator has {sg.SaturationExpected:0.###} ({(maj ? "N of 2N Majoranas" : "3N/4")}), ratio {sg.SaturationRatio ?? double.NaN:0.###}"),
                sg.SaturationWindowStart is double w0 ? Win(w0, end) : null, maj ? "Majoranas" : "sites"), key));
        }
        return list;
    }

    /// <summary>
    /// The discarded weight in words: "0.49 by t = 6 at 100,000 strings (0.57 at 50,000, 0.65 at 25,000)",
    /// or "none (no string was dropped)".
    /// </summary>
    public static string DiscardedText(EvolutionResult evo)
    {
        ArgumentNullException.ThrowIfNull(evo);
        if (evo.Main.Records.Count == 0) return "not recorded";
        var last = evo.Main.Records[^1];
        if (last.DiscardedTotal == 0) return "none (no string was dropped)";
        // Branch pruning books its loss with its sign, so a total at the rounding level can come out slightly negative.
        if (Math.Abs(last.DiscardedTotal) < 1e-10) return FormattableString.Invariant($"below 1e-10 by t = {NumberFormat.Number(last.Time, 3)} (rounding level)");
        string Budget(EvolutionSeries s) => s.Budget.MaxStrings is long m ? $"{m.ToString("N0", Inv)} strings" : "the threshold rules";
        string text = $"{NumberFormat.Number(last.DiscardedTotal, 3)} by t = {NumberFormat.Number(last.Time, 3)} at {Budget(evo.Main)}";
        var others = evo.Runs.Skip(1).Where(s => s.Records.Count > 0).Select(s => $"{NumberFormat.Number(s.Records[^1].DiscardedTotal, 3)} at {Budget(s)}").ToList();
        return others.Count == 0 ? text : text + " (" + string.Join(", ", others) + ")";
    }

    /// <summary>
    /// The largest growth of the kept norm ||O(t)||^2 between two records of the full-budget run, and the time it
    /// started from. Rotations keep the norm and truncation only lowers it, so growth beyond rounding means branch
    /// pruning broke a pass's unitarity: the records after that time describe a broken evolution.
    /// </summary>
    public static (double Increase, double From) NormGrowth(EvolutionResult evo)
    {
        ArgumentNullException.ThrowIfNull(evo);
        double worst = 0, from = double.NaN;
        var recs = evo.Main.Records;
        for (int i = 1; i < recs.Count; i++)
        {
            double up = recs[i].NormSquared - recs[i - 1].NormSquared;
            if (up > worst)
            {
                worst = up;
                from = recs[i - 1].Time;
            }
        }
        return (worst, from);
    }

    /// <summary>Growth of the kept norm above this counts as a broken evolution (rounding stays near 1e-12).</summary>
    public const double NormGrowthTolerance = 1e-6;

    /// <summary>The warning for a broken evolution, or null when the norm never grew.</summary>
    public static string? NormGrowthWarning(EvolutionResult evo)
    {
        var (up, from) = NormGrowth(evo);
        return up <= NormGrowthTolerance ? null
            : FormattableString.Invariant($"the kept norm ||O||^2 grew by {NumberFormat.Number(up, 2)} after t = {NumberFormat.Number(from, 3)}: branch pruning broke the unitarity of the passes, so figures read off later times are not reliable; use a smaller --dt or a larger budget (see docs/evolution.md, branch pruning)");
    }

    /// <summary>One console or text line per headline: "name: value (not converged: ...)".</summary>
    public static string Line(HeadlineFigure h)
    {
        ArgumentNullException.ThrowIfNull(h);
        string ctx = h.Value.Window is { } w ? $" ({w})" : "";
        return $"{h.Name}: {h.Value.FormatValue()}{ctx}{(h.Converged ? "" : $" (not converged: {h.Note ?? "see the budget series"})")}";
    }
}
