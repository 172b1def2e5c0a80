using OpGrowth.Evolution;
using OpGrowth.Krylov;
using OpGrowth.Reporting;

namespace OpGrowth.Pipeline;

/// <summary>The report's figures from a run's results (each only when its stage produced data).</summary>
public static class RunFigures
{
    /// <summary>
    /// All figures: size distribution, mean size (with the 3N/8 level and the smaller budgets), discarded weight,
    /// light cone, b_n, Krylov complexity (the part resting on the fitted continuation marked), Pauli vs exact
    /// (C(t) and OTOCs F_j(t)), and t*(N) when a sweep ran.
    /// </summary>
    public static List<FigureImage> All(ScramblingRunResult r)
    {
        var list = new List<FigureImage>();
        var size = FigureSize.Report;
        if (r.Evolution is { } evo && evo.Figures.Count > 0 && evo.Main.Records.Count > 1)
        {
            var recs = evo.Main.Records;
            var fig = evo.Figures[0];
            int n = evo.N;
            double[] times = recs.Select(x => x.Time).ToArray();
            // Majorana models count sizes in Majoranas (random operator: N of 2N), qubit models in qubits (3N/4).
            bool maj = fig.MajoranaGrowth is not null && recs.All(x => x.MeanMajoranaSize is not null && x.MajoranaSizeDistribution is not null);
            string timeLabel = r.Model.IsDriven ? AxisText.Periods : AxisText.Time;
            double Mean(EvolutionRecord x) => maj ? x.MeanMajoranaSize!.Value : x.MeanSize;
            double[] mean = recs.Select(Mean).ToArray();
            int kMax = maj ? 2 * n : n;
            var w = new double[kMax + 1, times.Length];
            for (int i = 0; i < times.Length; i++)
            {
                var dist = maj ? recs[i].MajoranaSizeDistribution! : recs[i].SizeDistribution;
                for (int k = 0; k <= kMax && k < dist.Length; k++) w[k, i] = dist[k];
            }
            list.Add(Charts.SizeDistribution(new SizeDistributionSeries(times, w) { MeanSize = mean, SizeUnit = maj ? "Majoranas" : "qubits", TimeLabel = timeLabel }, size));

            var smaller = evo.Runs.Skip(1).Select(s => new BudgetCurve(s.Budget.MaxStrings ?? 0, s.Records.Select(x => x.Time).ToArray(), s.Records.Select(x => maj && x.MeanMajoranaSize is double m ? m : x.MeanSize).ToArray())).ToList();
            var ts = maj ? fig.MajoranaScramblingTime! : fig.ScramblingTime;
            var tsHeadline = r.Headlines.FirstOrDefault(h => h.Name == EvolutionHeadlines.ScramblingTime);
            list.Add(Charts.MeanSize(new MeanSizeSeries(times, mean, maj ? fig.MajoranaGrowth!.SaturationExpected : fig.Growth.SaturationExpected)
            {
                ScramblingTime = tsHeadline?.Value,
                ScramblingLevel = ts.Target,
                Budgets = smaller,
                PartTime = ScramblingTimeStage.BudgetPartTime(evo),
                Budget = evo.Main.Budget.MaxStrings,
                SizeUnit = maj ? "Majoranas" : "qubits",
                TimeLabel = timeLabel,
                ScramblingLevelLabel = maj ? "N/2" : "3N/8",
                SaturationLabel = maj ? "saturation N (of 2N)" : "saturation 3N/4",
            }, size));

            if (DiscardedWeight(evo) is { } discarded) list.Add(discarded);

            var rho = new double[n, times.Length];
            for (int i = 0; i < times.Length; i++)
                for (int j = 0; j < n; j++) rho[j, i] = recs[i].SiteWeights[j];
            FrontFit? front = null;
            if (fig.Butterfly?.Primary is { Velocity: double, Intercept: double c } p && r.Headlines.FirstOrDefault(h => h.Name == EvolutionHeadlines.ButterflyVelocity) is { } vb)
                front = new FrontFit(vb.Value, c, p.Threshold);
            list.Add(Charts.LightCone(new LightConeMap(times, Enumerable.Range(0, n).Select(j => (double)j).ToArray(), rho)
            {
                Quantity = "ρ_j(t)",
                Origin = evo.ProbeSites.Length > 0 ? evo.ProbeSites[0] : 0,
                Front = r.Model.Lattice.IsOneDimensional ? front : null,
                ScaleMax = 0.75,
            }, size));
        }
        if (r.Lanczos is { } lz && lz.B.Count > 0)
        {
            GrowthCurve? curve = null;
            if (r.Krylov?.Growth is { } g)
            {
                double[] ns = Enumerable.Range(g.WindowStart, g.WindowEnd - g.WindowStart + 1).Select(x => (double)x).ToArray();
                curve = new GrowthCurve(GrowthClassNames.Of(g.Best.Class), ns, ns.Select(x => g.Best.Evaluate(x)).ToArray())
                {
                    Rate = r.Headlines.FirstOrDefault(h => h.Name == RunReport.LanczosSlope)?.Value,
                };
            }
            list.Add(Charts.Lanczos(new LanczosSeries(lz.B.ToArray()) { Spread = lz.Uncertainty.Select(u => double.IsNaN(u) ? 0 : u).ToArray(), Fit = curve }, size));
            if (r.Krylov?.Chain is { } chain)
            {
                list.Add(Charts.Krylov(new KrylovSeries(chain.Times.ToArray(), chain.Complexity.ToArray(), chain.Autocorrelation.ToArray())
                {
                    ContinuationTime = r.Krylov.Dynamics?.ContinuationTime,
                    ContinuationStart = r.Krylov.Dynamics?.ContinuationStart,
                }, size));
            }
        }
        if (r.CrossCheck is { Ran: true } x && x.Times.Length > 1) list.Add(PauliVersusExact(x, size));
        if (r.Front is { } frontStage) list.Add(FrontFigure(frontStage.Result, r.ScramblingTime, size));
        if (r.ScramblingTime is { Members.Count: > 0 } st) list.Add(StatementFigure(st, size));
        if (r.FreeFermion is { } ff)
        {
            list.Add(Charts.LightCone(new LightConeMap(ff.Times, Enumerable.Range(0, ff.Modes).Select(b => (double)b).ToArray(), ff.Weights)
            {
                Quantity = "|R_ab(t)|²",
                Origin = ff.Majorana,
                PositionLabel = "Majorana mode b",
                ScaleMax = ff.Weights.Cast<double>().Where(double.IsFinite).DefaultIfEmpty(1).Max(),
            }, size, "free-fermion-light-cone", $"Free-fermion light cone of Majorana {ff.Majorana}",
                FormattableString.Invariant($"Exact Majorana light cone |R_ab(t)|² = |(e^(At))_ab|² from the {ff.Modes} x {ff.Modes} single-particle matrix A of the free-fermion map, for {ff.MajoranaNote}; each time's weights sum to 1. The model is free, so no scrambling time is stated.")));
        }
        if (r.Sweep?.Series is { } series && TStarSeries(series) is { } tsSeries)
        {
            string caption = series.Comparison?.Verdict is { } v
                ? $"t* at each N with its total uncertainty and both fits; {v}."
                : $"t* at each N with its total uncertainty; {series.Note ?? "too few sizes for the fits"}.";
            list.Add(Charts.ScramblingTime(tsSeries, size, "tstar-scaling", $"t*(N): {r.Model.Name}, {RunReport.SweepProbeText(r)}", caption));
        }
        return list;
    }

    /// <summary>Cumulative discarded weight against time for every budget of the series (null when nothing was discarded).</summary>
    public static FigureImage? DiscardedWeight(EvolutionResult evo, FigureSize? size = null)
    {
        ArgumentNullException.ThrowIfNull(evo);
        if (EvolutionHeadlines.Untruncated(evo)) return null;
        var series = evo.Runs.Select((s, i) => new LineSeries(
            s.Budget.MaxStrings is long m ? $"budget {NumberFormat.Count(m)} strings" : $"budget {i + 1}",
            s.Records.Select(x => x.Time).ToArray(), s.Records.Select(x => x.DiscardedTotal).ToArray())
        { Slot = i == 0 ? 0 : i + 2 }).ToList();
        return Charts.Lines(new LineChartSpec("discarded-weight", "Discarded weight",
            $"Weight removed by truncation up to each time (sum of the squared coefficients dropped), one line per string budget; in total {EvolutionHeadlines.DiscardedText(evo)}.",
            AxisText.Time, "discarded weight (log scale)", series) { LogY = true }, size ?? FigureSize.Report);
    }

    /// <summary>
    /// Pauli engine against the exact engine: C(t) and the OTOCs F_j(t) against Z_j at the probe's nearest, middle
    /// and farthest sites (top), and the largest |difference| over every site, X/Y/Z and C at each time (bottom).
    /// </summary>
    public static FigureImage PauliVersusExact(CrossCheck x, FigureSize? size = null)
    {
        ArgumentNullException.ThrowIfNull(x);
        var curves = new List<OverlayCurve>();
        var sites = x.Sites.OrderBy(s => s.Site).ToList();
        if (sites.Count > 0)
        {
            foreach (int j in new[] { sites[0].Site, sites[sites.Count / 2].Site, sites[^1].Site }.Distinct())
            {
                var s = sites.First(q => q.Site == j);
                curves.Add(new OverlayCurve($"F_{j}(t) vs Z_{j}", s.PauliZ, s.ExactZ));
            }
        }
        var worst = new double[x.Times.Length];
        for (int i = 0; i < worst.Length; i++)
        {
            double d = Math.Abs(x.PauliAutocorrelation[i] - x.ExactAutocorrelation[i]);
            foreach (var s in sites)
            {
                d = Math.Max(d, Math.Abs(s.PauliX[i] - s.ExactX[i]));
                d = Math.Max(d, Math.Abs(s.PauliY[i] - s.ExactY[i]));
                d = Math.Max(d, Math.Abs(s.PauliZ[i] - s.ExactZ[i]));
            }
            worst[i] = d;
        }
        return Charts.PauliVersusExact(new OverlaySeries(x.Times, x.PauliAutocorrelation, x.ExactAutocorrelation, $"C(t), N = {x.N}")
        {
            Tolerance = x.Tolerance,
            LogDifference = true,
            Curves = curves,
            Difference = worst,
            DifferenceLabel = "largest |Pauli - exact| over C and every F_j (X, Y, Z)",
        }, size ?? FigureSize.Report);
    }

    /// <summary>
    /// Arrival time of the front against distance for every bond dimension of the budget series, with a vertical line
    /// where the two largest budgets part and one at the half-volume distance the t* statement uses.
    /// </summary>
    public static FigureImage FrontFigure(OpGrowth.Evolution.FrontEvolutionResult fr, OpGrowth.Sweeps.ScramblingTimeStatement? st, FigureSize size)
    {
        var series = fr.Runs.Select((run, i) =>
        {
            var a = run.Figures.Butterfly?.Primary.ArrivalTimes ?? [];
            var d = Enumerable.Range(0, a.Length).Select(x => (double)x).ToArray();
            return new LineSeries($"bond dimension {run.BondDimension}", d, a) { Look = SeriesLook.LineAndPoints };
        }).ToList();
        var refs = new List<ReferenceLine>();
        if (fr.PartDistance is int pd) refs.Add(new ReferenceLine($"budgets part (d = {pd})", pd, Vertical: true));
        string caption = FormattableString.Invariant($"Front (site weight >= {fr.Threshold:0.###}) of {fr.Probe} on {fr.N} sites from the matrix-product front engine; the bond dimensions agree up to distance {fr.ConvergedDistance} of {fr.MaxDistance}")
            + (fr.PartDistance is int p2 ? FormattableString.Invariant($" and part at distance {p2} (t = {fr.PartTime:0.##}).") : " and never part.");
        return Charts.Lines(new LineChartSpec("front-budget-series", $"Operator front: {fr.Probe}, {fr.N} sites", caption, "distance from the probe", "arrival time", series)
        {
            ReferenceLines = refs,
        }, size);
    }

    /// <summary>t* at the smaller members (error bars) and the statement at N (band as error bar), with the two laws when fitted.</summary>
    public static FigureImage StatementFigure(OpGrowth.Sweeps.ScramblingTimeStatement st, FigureSize size)
    {
        var ms = st.Members;
        var series = new List<LineSeries>
        {
            new("t* at smaller members (exact)", ms.Select(m => (double)m.N).ToArray(), ms.Select(m => m.TStar).ToArray()) { YError = ms.Select(m => m.Error).ToArray(), Look = SeriesLook.Points },
        };
        if (st.Value is double v)
            series.Add(new LineSeries($"t* at N = {st.N} ({st.Route}, 2 sigma)", [st.N], [v]) { YError = [2 * (st.Uncertainty ?? 0)], Look = SeriesLook.Points });
        double lo = ms.Min(m => m.N), hi = st.N;
        var xs = Enumerable.Range(0, 41).Select(i => lo + (hi - lo) * i / 40.0).ToArray();
        foreach (var l in st.Laws) series.Add(new LineSeries(l.Law == "log" ? FormattableString.Invariant($"a + b ln N (weight {l.Weight:0.00})") : FormattableString.Invariant($"a + N/v (weight {l.Weight:0.00})"), xs, xs.Select(l.Fit.Evaluate).ToArray()));
        string caption = $"{st.Text()}. {st.Basis}.";
        return Charts.Lines(new LineChartSpec("tstar-statement", $"Scrambling time at N = {st.N}: {st.Route}", caption, "N", "t*", series), size);
    }

    /// <summary>The t*(N) points of a sweep series with both fitted laws (null with fewer than two sizes that reached t*).</summary>
    public static ScramblingTimeSeries? TStarSeries(OpGrowth.Sweeps.SeriesFit s) => OpGrowth.Sweeps.SweepFigures.TStarSeries(s);
}
