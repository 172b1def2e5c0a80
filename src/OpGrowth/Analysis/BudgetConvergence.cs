namespace OpGrowth.Analysis;

/// <summary>Compares the derived figures of the runs of a budget series (full budget first).</summary>
public static class BudgetConvergence
{
    /// <summary>One entry per figure.</summary>
    public static List<FigureConvergence> Compare(IReadOnlyList<ScramblingFigures> runs, double tolerance)
    {
        var pick = new (string Name, Func<ScramblingFigures, double?> Get)[]
        {
            ("butterflyVelocity", f => f.Butterfly?.Primary.Velocity),
            ("sizeGrowthRateLinear", f => f.Growth.SizeLinear.Rate),
            ("sizeGrowthRateExponential", f => f.Growth.SizeExponential.Rate),
            ("otocGrowthRate", f => f.Growth.OtocExponential.Rate),
            ("saturationMeanSize", f => f.Growth.Saturation),
            ("scramblingTime", f => f.ScramblingTime.Value),
            ("majoranaScramblingTime", f => f.MajoranaScramblingTime?.Value),
            ("majoranaSizeGrowthRateLinear", f => f.MajoranaGrowth?.SizeLinear.Rate),
            ("majoranaSizeGrowthRateExponential", f => f.MajoranaGrowth?.SizeExponential.Rate),
            ("majoranaSaturationMeanSize", f => f.MajoranaGrowth?.Saturation),
        };
        var list = new List<FigureConvergence>();
        foreach (var (name, get) in pick)
        {
            var vals = runs.Select(get).ToArray();
            if (vals.All(v => v is null)) continue;
            double? mv = vals.Length > 1 && vals[0] is double a && vals[1] is double b ? Math.Abs(a - b) : null;
            double? pm = vals.Length > 2 && vals[1] is double b1 && vals[2] is double c ? Math.Abs(b1 - c) : null;
            double? rel = mv is double m && vals[0] is double v0 && v0 != 0 ? m / Math.Abs(v0) : null;
            bool ok = rel is double r && r <= tolerance;
            string? note = null;
            if (vals[0] is null) note = "not available at the full budget";
            else if (mv is null) note = "not available at a smaller budget: cannot judge convergence";
            else if (!ok) note = $"moved by {rel:P1} between the two largest budgets (tolerance {tolerance:P0}): not converged";
            list.Add(new FigureConvergence { Figure = name, Values = vals, Movement = mv, PreviousMovement = pm, RelativeMovement = rel, Converged = ok, Note = note });
        }
        return list;
    }
}
