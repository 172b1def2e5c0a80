using OpGrowth.Reporting;

namespace OpGrowth.Pipeline;

/// <summary>The report's figures from a run's results (each only when its stage produced data).</summary>
public static class RunFigures
{
    /// <summary>All figures: size distribution, mean size, light cone, b_n, Krylov complexity, Pauli vs exact.</summary>
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
            double[] mean = recs.Select(x => x.MeanSize).ToArray();
            var w = new double[n + 1, times.Length];
            for (int i = 0; i < times.Length; i++)
                for (int k = 0; k <= n && k < recs[i].SizeDistribution.Length; k++) w[k, i] = recs[i].SizeDistribution[k];
            list.Add(Charts.SizeDistribution(new SizeDistributionSeries(times, w) { MeanSize = mean }, size));

            var ladder = evo.Rungs.Skip(1).Select(s => new LadderCurve(s.Budget.MaxStrings ?? 0, s.Records.Select(x => x.Time).ToArray(), s.Records.Select(x => x.MeanSize).ToArray())).ToList();
            var ts = fig.ScramblingTime;
            var tsHeadline = r.Headlines.FirstOrDefault(h => h.Name == "scrambling time t*");
            list.Add(Charts.MeanSize(new MeanSizeSeries(times, mean, fig.Growth.SaturationExpected)
            {
                ScramblingTime = tsHeadline?.Value,
                ScramblingLevel = ts.Target,
                Ladder = ladder,
                PartTime = ScramblingTimeStage.LadderPartTime(evo),
                Budget = evo.Main.Budget.MaxStrings,
            }, size));

            var rho = new double[n, times.Length];
            for (int i = 0; i < times.Length; i++)
                for (int j = 0; j < n; j++) rho[j, i] = recs[i].SiteWeights[j];
            FrontFit? front = null;
            if (fig.Butterfly?.Primary is { Velocity: double v, Intercept: double c } p && r.Headlines.FirstOrDefault(h => h.Name == "butterfly velocity v_B") is { } vb)
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
                curve = new GrowthCurve(g.Best.Class.ToString(), ns, ns.Select(x => g.Best.Evaluate(x)).ToArray())
                {
                    Rate = r.Headlines.FirstOrDefault(h => h.Name == "Lanczos slope alpha")?.Value,
                };
            }
            list.Add(Charts.Lanczos(new LanczosSeries(lz.B.ToArray()) { Spread = lz.Uncertainty.Select(u => double.IsNaN(u) ? 0 : u).ToArray(), Fit = curve }, size));
            if (r.Krylov?.Chain is { } chain)
                list.Add(Charts.Krylov(new KrylovSeries(chain.Times.ToArray(), chain.Complexity.ToArray(), chain.Autocorrelation.ToArray()), size));
        }
        if (r.CrossCheck is { Ran: true } x && x.Times.Length > 1)
        {
            list.Add(Charts.PauliVersusExact(new OverlaySeries(x.Times, x.PauliAutocorrelation, x.ExactAutocorrelation, $"autocorrelation C(t), N = {x.N}")
            {
                Tolerance = x.Tolerance,
                LogDifference = true,
            }, size));
        }
        if (r.Front is { } frontStage) list.Add(FrontFigure(frontStage.Result, r.ScramblingTime, size));
        if (r.ScramblingTime is { Members.Count: > 0 } st) list.Add(StatementFigure(st, size));
        if (r.Sweep?.Series is { } series && TStarSeries(series) is { } tsSeries)
        {
            string caption = series.Comparison?.Verdict is { } v
                ? $"t* at each N with its total uncertainty and both fits; {v}."
                : $"t* at each N with its total uncertainty; {series.Note ?? "too few sizes for the fits"}.";
            list.Add(Charts.ScramblingTime(tsSeries, size, "tstar-scaling", $"t*(N): {r.Model.Name}, probe {series.Probe}", caption));
        }
        return list;
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
