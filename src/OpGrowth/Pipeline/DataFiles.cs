using System.Globalization;
using System.Text;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Krylov;

namespace OpGrowth.Pipeline;

/// <summary>
/// The data files of each engine, written the same way (same names, same columns) by <c>opgrowth run</c>
/// (into the report's data/ folder) and by the standalone commands (<c>evolve</c>, <c>lanczos</c>,
/// <c>compare</c>) into their output folders. CSV: header line, invariant culture, shortest round-trip
/// numbers, an empty cell where a value is undefined (NaN or infinite). Every file is written atomically.
/// </summary>
public static class DataFiles
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>What each file holds (for the report's file table and the docs).</summary>
    public static readonly IReadOnlyDictionary<string, string> Descriptions = new Dictionary<string, string>
    {
        ["evolution.csv"] = "per record: strings, norm, discarded weight (since the last record and in total), autocorrelation, mean size, front distance, squared commutator 2(1 - F) averaged over the sites outside the probe",
        ["steps.csv"] = "per time step and budget: strings kept and weight discarded",
        ["size_distribution.csv"] = "size distribution P_k(t), one column per size k",
        ["majorana_size_distribution.csv"] = "size distribution in Majorana operators, one column per size",
        ["site_weights.csv"] = "site weights rho_j(t) (the OTOC light cone: 1 - F averaged over X, Y, Z = 4/3 rho_j)",
        ["otoc.csv"] = "OTOCs F_j(t) against X_j, Y_j, Z_j on every site, their mean, the site weight and the edge weights",
        ["convergence.csv"] = "each derived figure at every budget of the budget series, its movement and whether it is converged",
        ["mean_size_by_budget.csv"] = "mean size n(t) at every budget of the budget series",
        ["lanczos.csv"] = "Lanczos coefficients b_n with their spread across string budgets, strings and discarded weight per step",
        ["krylov.csv"] = "autocorrelation C(t) and Krylov complexity K(t) from the b_n, and the weight carried by the fitted continuation",
        ["spectrum.csv"] = "spectral function from the continued fraction of the b_n",
        ["compare.csv"] = "Pauli engine against the exact engine at small N: autocorrelation and OTOCs F_j(t) per site from both, and their differences",
        ["tstar_members.csv"] = "t* at the smaller members behind the t* statement: N, t*, its error, the spread over seeds, the half-volume distance and the front's arrival there",
        ["front_arrival.csv"] = "arrival time of the operator front at each distance for every bond dimension of the front engine's budget series, and its uncertainty",
        ["free_fermion_light_cone.csv"] = "free models: the exact Majorana light cone |R_ab(t)|^2 of one Majorana a, one column per mode b",
        ["diagnosis.json"] = "the diagnosis battery's full report: verdict per test, figures, thresholds, sources, data, settings",
        ["diagnosis.txt"] = "the diagnosis battery's verdict table as text",
    };

    /// <summary>A CSV cell: shortest round-trip number, or empty when not finite.</summary>
    public static string Cell(double v) => double.IsFinite(v) ? v.ToString("R", Inv) : "";

    private static string Cell(double? v) => v is double x ? Cell(x) : "";

    /// <summary>Writes the evolution's files into <paramref name="dir"/>; returns their names.</summary>
    public static List<string> WriteEvolution(string dir, EvolutionResult r)
    {
        ArgumentNullException.ThrowIfNull(r);
        var names = new List<string>();
        void Put(string name, string text)
        {
            AtomicFile.WriteAllText(Path.Combine(dir, name), text);
            names.Add(name);
        }
        var main = r.Main;
        var fig = r.Figures.Count > 0 ? r.Figures[0] : null;
        int n = r.N;
        var probeSet = new HashSet<int>(r.ProbeSites);
        bool majorana = main.Records.Count > 0 && main.Records[0].MeanMajoranaSize is not null;

        var sb = new StringBuilder("time,step,strings,norm_squared,discarded,discarded_total,autocorrelation,mean_size,");
        if (majorana) sb.Append("mean_majorana_size,");
        sb.Append("front_distance,commutator_far,cut_magnitude\n");
        for (int i = 0; i < main.Records.Count; i++)
        {
            var rec = main.Records[i];
            double far = 0;
            int cnt = 0;
            for (int j = 0; j < n; j++)
            {
                if (probeSet.Contains(j)) continue;
                far += 8.0 / 3.0 * rec.SiteWeights[j]; // squared commutator 2 (1 - F), F averaged over X, Y, Z
                cnt++;
            }
            double front = fig?.Butterfly is { } b && i < b.Front.Length ? b.Front[i] : double.NaN;
            sb.Append(Cell(rec.Time)).Append(',').Append(rec.Step).Append(',').Append(rec.Strings).Append(',').Append(Cell(rec.NormSquared)).Append(',')
              .Append(Cell(rec.DiscardedWeight)).Append(',').Append(Cell(rec.DiscardedTotal)).Append(',').Append(Cell(rec.Autocorrelation)).Append(',')
              .Append(Cell(rec.MeanSize)).Append(',');
            if (majorana) sb.Append(Cell(rec.MeanMajoranaSize)).Append(',');
            sb.Append(Cell(front)).Append(',').Append(cnt > 0 ? Cell(far / cnt) : "").Append(',').Append(Cell(rec.CutMagnitude)).Append('\n');
        }
        Put("evolution.csv", sb.ToString());

        var stp = new StringBuilder("budget,max_strings,step,time,strings,discarded,discarded_total\n");
        foreach (var s in r.Runs)
        {
            foreach (var x in s.Steps)
            {
                stp.Append(s.Budget.Index + 1).Append(',').Append(s.Budget.MaxStrings?.ToString(Inv) ?? "").Append(',').Append(x.Step).Append(',').Append(Cell(x.Time)).Append(',')
                   .Append(x.Strings).Append(',').Append(Cell(x.Discarded)).Append(',').Append(Cell(x.DiscardedTotal)).Append('\n');
            }
        }
        Put("steps.csv", stp.ToString());
        Put("size_distribution.csv", Wide("p", n + 1, main.Records.Select(x => (x.Time, x.SizeDistribution))));
        if (majorana) Put("majorana_size_distribution.csv", Wide("p", 2 * n + 1, main.Records.Select(x => (x.Time, x.MajoranaSizeDistribution ?? []))));
        Put("site_weights.csv", Wide("rho", n, main.Records.Select(x => (x.Time, x.SiteWeights))));

        var ot = new StringBuilder("time,site,otoc_x,otoc_y,otoc_z,otoc_mean,site_weight,right_edge,left_edge\n");
        foreach (var rec in main.Records)
        {
            for (int j = 0; j < n; j++)
            {
                ot.Append(Cell(rec.Time)).Append(',').Append(j).Append(',').Append(Cell(rec.OtocX[j])).Append(',').Append(Cell(rec.OtocY[j])).Append(',')
                  .Append(Cell(rec.OtocZ[j])).Append(',').Append(Cell(rec.OtocMean[j])).Append(',').Append(Cell(rec.SiteWeights[j])).Append(',')
                  .Append(Cell(rec.RightEdge[j])).Append(',').Append(Cell(rec.LeftEdge[j])).Append('\n');
            }
        }
        Put("otoc.csv", ot.ToString());

        if (r.Runs.Count > 1)
        {
            var conv = new StringBuilder("figure");
            foreach (var s in r.Runs) conv.Append(",budget_").Append(s.Budget.MaxStrings?.ToString(Inv) ?? (s.Budget.Index + 1).ToString(Inv));
            conv.Append(",movement,relative_movement,converged\n");
            foreach (FigureConvergence c in r.Convergence)
            {
                conv.Append(c.Figure);
                for (int k = 0; k < r.Runs.Count; k++) conv.Append(',').Append(Cell(c.Values.ElementAtOrDefault(k)));
                conv.Append(',').Append(Cell(c.Movement)).Append(',').Append(Cell(c.RelativeMovement)).Append(',').Append(c.Converged ? "yes" : "no").Append('\n');
            }
            Put("convergence.csv", conv.ToString());

            var times = main.Records.Select(x => x.Time).ToArray();
            var bud = new StringBuilder("time");
            foreach (var s in r.Runs) bud.Append(",mean_size_budget_").Append(s.Budget.MaxStrings?.ToString(Inv) ?? (s.Budget.Index + 1).ToString(Inv));
            bud.Append('\n');
            for (int i = 0; i < times.Length; i++)
            {
                bud.Append(Cell(times[i]));
                foreach (var s in r.Runs) bud.Append(',').Append(i < s.Records.Count ? Cell(s.Records[i].MeanSize) : "");
                bud.Append('\n');
            }
            Put("mean_size_by_budget.csv", bud.ToString());
        }
        return names;
    }

    /// <summary>Writes the Lanczos files (lanczos.csv, krylov.csv, spectrum.csv) into <paramref name="dir"/>; returns their names.</summary>
    public static List<string> WriteLanczos(string dir, LanczosEstimate est, KrylovAnalysis? a)
    {
        ArgumentNullException.ThrowIfNull(est);
        var names = new List<string>();
        var r = est.Reference;
        var csv = new StringBuilder("n,b,uncertainty,strings,strings_before_truncation,discarded_weight,seconds,cpu_seconds,support_first,support_last");
        for (int i = 0; i < est.Runs.Count - 1; i++) csv.Append(Inv, $",b_budget_{est.Budgets[i]}");
        csv.Append('\n');
        for (int n = 0; n < est.B.Count; n++)
        {
            var st = r.Steps[n];
            csv.Append(n + 1).Append(',').Append(Cell(est.B[n])).Append(',').Append(Cell(est.Uncertainty[n])).Append(',').Append(st.Strings).Append(',')
               .Append(st.StringsBeforeTruncation).Append(',').Append(Cell(st.DiscardedWeight)).Append(',').Append(st.Seconds.ToString("F4", Inv)).Append(',')
               .Append(st.CpuSeconds.ToString("F4", Inv)).Append(',').Append(st.SupportFirst).Append(',').Append(st.SupportLast);
            for (int i = 0; i < est.Runs.Count - 1; i++) csv.Append(',').Append(n < est.Runs[i].B.Count ? Cell(est.Runs[i].B[n]) : "");
            csv.Append('\n');
        }
        AtomicFile.WriteAllText(Path.Combine(dir, "lanczos.csv"), csv.ToString());
        names.Add("lanczos.csv");

        if (a?.Chain is { } chain)
        {
            var alt = a.Dynamics?.Alternative;
            var tail = chain.TailWeight;
            var dyn = new StringBuilder("time,autocorrelation,krylov_complexity");
            if (tail is not null) dyn.Append(",continuation_weight");
            if (alt is not null) dyn.Append(Inv, $",autocorrelation_continued_from_{a.Dynamics!.SensitivityStart},krylov_complexity_continued_from_{a.Dynamics.SensitivityStart}");
            dyn.Append('\n');
            for (int i = 0; i < chain.Times.Count; i++)
            {
                dyn.Append(Cell(chain.Times[i])).Append(',').Append(Cell(chain.Autocorrelation[i])).Append(',').Append(Cell(chain.Complexity[i]));
                if (tail is not null) dyn.Append(',').Append(Cell(tail[i]));
                if (alt is not null) dyn.Append(',').Append(i < alt.Times.Count ? Cell(alt.Autocorrelation[i]) : "").Append(',').Append(i < alt.Times.Count ? Cell(alt.Complexity[i]) : "");
                dyn.Append('\n');
            }
            AtomicFile.WriteAllText(Path.Combine(dir, "krylov.csv"), dyn.ToString());
            names.Add("krylov.csv");
        }
        if (a is not null && a.Spectrum.Count > 0)
        {
            var sp = new StringBuilder("omega,spectral_function\n");
            for (int i = 0; i < a.Omegas.Count; i++) sp.Append(Cell(a.Omegas[i])).Append(',').Append(Cell(a.Spectrum[i])).Append('\n');
            AtomicFile.WriteAllText(Path.Combine(dir, "spectrum.csv"), sp.ToString());
            names.Add("spectrum.csv");
        }
        return names;
    }

    /// <summary>Writes compare.csv (both engines, per time: autocorrelation and every site's OTOCs) into <paramref name="dir"/>; returns its name.</summary>
    public static string WriteComparison(string dir, CrossCheck x)
    {
        ArgumentNullException.ThrowIfNull(x);
        var sb = new StringBuilder("time,site,quantity,pauli,exact,difference\n");
        for (int i = 0; i < x.Times.Length; i++)
        {
            Row(sb, x.Times[i], -1, "autocorrelation", x.PauliAutocorrelation[i], x.ExactAutocorrelation[i]);
            foreach (var site in x.Sites)
            {
                Row(sb, x.Times[i], site.Site, "otoc_x", site.PauliX[i], site.ExactX[i]);
                Row(sb, x.Times[i], site.Site, "otoc_y", site.PauliY[i], site.ExactY[i]);
                Row(sb, x.Times[i], site.Site, "otoc_z", site.PauliZ[i], site.ExactZ[i]);
            }
        }
        AtomicFile.WriteAllText(Path.Combine(dir, "compare.csv"), sb.ToString());
        return "compare.csv";
    }

    /// <summary>Writes tstar_members.csv (the t* statement's members) and front_arrival.csv (the front engine's arrival times) into <paramref name="dir"/>; returns their names.</summary>
    public static List<string> WriteScramblingTime(string dir, OpGrowth.Sweeps.ScramblingTimeStatement s, FrontStage? front)
    {
        ArgumentNullException.ThrowIfNull(s);
        var list = new List<string>();
        if (s.Members.Count > 0)
        {
            var sb = new StringBuilder("n,tstar,error,seed_spread,seeds,half_distance,front_arrival\n");
            foreach (var m in s.Members)
                sb.Append(m.N.ToString(Inv)).Append(',').Append(Cell(m.TStar)).Append(',').Append(Cell(m.Error)).Append(',').Append(Cell(m.Spread)).Append(',')
                  .Append(m.Seeds.ToString(Inv)).Append(',').Append(Cell(m.HalfDistance)).Append(',').Append(Cell(m.FrontArrival)).Append('\n');
            AtomicFile.WriteAllText(Path.Combine(dir, "tstar_members.csv"), sb.ToString());
            list.Add("tstar_members.csv");
        }
        if (front is not null)
        {
            var fr = front.Result;
            var sb = new StringBuilder("distance");
            foreach (var run in fr.Runs) sb.Append(",arrival_bond_").Append(run.BondDimension.ToString(Inv));
            sb.Append(",uncertainty\n");
            for (int d = 0; d <= fr.MaxDistance; d++)
            {
                sb.Append(d.ToString(Inv));
                foreach (var run in fr.Runs)
                {
                    var a = run.Figures.Butterfly?.Primary.ArrivalTimes ?? [];
                    sb.Append(',').Append(d < a.Length ? Cell(a[d]) : "");
                }
                sb.Append(',').Append(d < fr.ArrivalUncertainty.Length ? Cell(fr.ArrivalUncertainty[d]) : "").Append('\n');
            }
            AtomicFile.WriteAllText(Path.Combine(dir, "front_arrival.csv"), sb.ToString());
            list.Add("front_arrival.csv");
        }
        return list;
    }

    /// <summary>Writes free_fermion_light_cone.csv into <paramref name="dir"/>; returns its name.</summary>
    public static string WriteFreeFermion(string dir, FreeFermionStage ff)
    {
        ArgumentNullException.ThrowIfNull(ff);
        var rows = Enumerable.Range(0, ff.Times.Length).Select(i => (ff.Times[i], Enumerable.Range(0, ff.Modes).Select(b => ff.Weights[b, i]).ToArray()));
        AtomicFile.WriteAllText(Path.Combine(dir, "free_fermion_light_cone.csv"), Wide("mode", ff.Modes, rows));
        return "free_fermion_light_cone.csv";
    }

    private static void Row(StringBuilder sb, double t, int site, string quantity, double pauli, double exact)
        => sb.Append(Cell(t)).Append(',').Append(site >= 0 ? site.ToString(Inv) : "").Append(',').Append(quantity).Append(',')
             .Append(Cell(pauli)).Append(',').Append(Cell(exact)).Append(',').Append(Cell(pauli - exact)).Append('\n');

    private static string Wide(string prefix, int width, IEnumerable<(double Time, double[] Values)> rows)
    {
        var sb = new StringBuilder("time");
        for (int k = 0; k < width; k++) sb.Append(',').Append(prefix).Append('_').Append(k);
        sb.Append('\n');
        foreach (var (t, v) in rows)
        {
            sb.Append(Cell(t));
            for (int k = 0; k < width; k++) sb.Append(',').Append(k < v.Length ? Cell(v[k]) : "");
            sb.Append('\n');
        }
        return sb.ToString();
    }
}
