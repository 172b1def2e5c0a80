using OpGrowth.Evolution;
using OpGrowth.Krylov;
using OpGrowth.Reporting;

namespace OpGrowth.Pipeline;

public static partial class ScramblingRun
{
    /// <summary>Evolution series: evolution.csv, size_distribution.csv, site_weights.csv, ladder.csv (paths relative to the report folder).</summary>
    private static List<string> WriteEvolutionData(string dataDir, EvolutionResult evo)
    {
        var main = evo.Main;
        var recs = main.Records;
        int n = evo.N;
        double[] times = recs.Select(r => r.Time).ToArray();
        var fig = evo.Figures[0];
        double[] front = recs.Select((r, i) => fig.Butterfly is { } b && i < b.Front.Length ? b.Front[i] : double.NaN).ToArray();
        CsvTable.Write(Path.Combine(dataDir, "evolution.csv"),
            ["time", "strings", "norm_squared", "discarded_total", "autocorrelation", "mean_size", "front_distance"],
            [times, recs.Select(r => (double)r.Strings).ToArray(), recs.Select(r => r.NormSquared).ToArray(), recs.Select(r => r.DiscardedTotal).ToArray(),
             recs.Select(r => r.Autocorrelation).ToArray(), recs.Select(r => r.MeanSize).ToArray(), front]);
        var sizeCols = new List<double[]> { times };
        var sizeHeads = new List<string> { "time" };
        for (int k = 0; k <= n; k++)
        {
            sizeHeads.Add("p_" + k);
            int kk = k;
            sizeCols.Add(recs.Select(r => kk < r.SizeDistribution.Length ? r.SizeDistribution[kk] : 0).ToArray());
        }
        CsvTable.Write(Path.Combine(dataDir, "size_distribution.csv"), sizeHeads, sizeCols);
        var wCols = new List<double[]> { times };
        var wHeads = new List<string> { "time" };
        for (int j = 0; j < n; j++)
        {
            wHeads.Add("rho_" + j);
            int jj = j;
            wCols.Add(recs.Select(r => r.SiteWeights[jj]).ToArray());
        }
        CsvTable.Write(Path.Combine(dataDir, "site_weights.csv"), wHeads, wCols);
        var ladHeads = new List<string> { "time" };
        var ladCols = new List<double[]>();
        ladCols.Add(times);
        foreach (var rung in evo.Rungs)
        {
            ladHeads.Add("mean_size_budget_" + (rung.Budget.MaxStrings?.ToString(Inv) ?? "memory"));
            ladCols.Add(times.Select((t, i) => i < rung.Records.Count ? rung.Records[i].MeanSize : double.NaN).ToArray());
        }
        CsvTable.Write(Path.Combine(dataDir, "ladder.csv"), ladHeads, ladCols);
        return ["data/evolution.csv", "data/size_distribution.csv", "data/site_weights.csv", "data/ladder.csv"];
    }

    private static List<string> WriteLanczosData(string dataDir, LanczosEstimate lz, KrylovAnalysis? krylov)
    {
        var list = new List<string>();
        double[] nIdx = Enumerable.Range(1, lz.B.Count).Select(i => (double)i).ToArray();
        CsvTable.Write(Path.Combine(dataDir, "lanczos.csv"), ["n", "b", "uncertainty"], [nIdx, lz.B.ToArray(), lz.Uncertainty.ToArray()]);
        list.Add("data/lanczos.csv");
        if (krylov?.Chain is { } c)
        {
            CsvTable.Write(Path.Combine(dataDir, "krylov.csv"), ["time", "autocorrelation", "krylov_complexity"], [c.Times.ToArray(), c.Autocorrelation.ToArray(), c.Complexity.ToArray()]);
            list.Add("data/krylov.csv");
        }
        return list;
    }

    /// <summary>The t* statement as JSON, its members as CSV and the front's arrival times per bond dimension (paths relative to the report folder).</summary>
    private static List<string> WriteScramblingTimeData(string dataDir, OpGrowth.Sweeps.ScramblingTimeStatement s, FrontStage? front)
    {
        var list = new List<string>();
        if (s.Members.Count > 0)
        {
            CsvTable.Write(Path.Combine(dataDir, "tstar_members.csv"), ["n", "tstar", "error", "seed_spread", "seeds", "half_distance", "front_arrival"],
                [s.Members.Select(m => (double)m.N).ToArray(), s.Members.Select(m => m.TStar).ToArray(), s.Members.Select(m => m.Error).ToArray(),
                 s.Members.Select(m => m.Spread ?? double.NaN).ToArray(), s.Members.Select(m => (double)m.Seeds).ToArray(),
                 s.Members.Select(m => m.HalfDistance ?? double.NaN).ToArray(), s.Members.Select(m => m.FrontArrival ?? double.NaN).ToArray()]);
            list.Add("data/tstar_members.csv");
        }
        if (front is not null)
        {
            var fr = front.Result;
            var heads = new List<string> { "distance" };
            var cols = new List<double[]> { Enumerable.Range(0, fr.MaxDistance + 1).Select(d => (double)d).ToArray() };
            foreach (var run in fr.Runs)
            {
                heads.Add("arrival_bond_" + run.BondDimension.ToString(Inv));
                var a = run.Figures.Butterfly?.Primary.ArrivalTimes ?? [];
                cols.Add(Enumerable.Range(0, fr.MaxDistance + 1).Select(d => d < a.Length ? a[d] : double.NaN).ToArray());
            }
            heads.Add("uncertainty");
            cols.Add(Enumerable.Range(0, fr.MaxDistance + 1).Select(d => d < fr.ArrivalUncertainty.Length ? fr.ArrivalUncertainty[d] : double.NaN).ToArray());
            CsvTable.Write(Path.Combine(dataDir, "front_arrival.csv"), heads, cols);
            list.Add("data/front_arrival.csv");
        }
        return list;
    }

    private static string WriteCrossCheckData(string dataDir, CrossCheck x)
    {
        CsvTable.Write(Path.Combine(dataDir, "cross_check.csv"), ["time", "autocorrelation_pauli", "autocorrelation_exact", "difference"],
            [x.Times, x.PauliAutocorrelation, x.ExactAutocorrelation, x.Times.Select((_, i) => x.PauliAutocorrelation[i] - x.ExactAutocorrelation[i]).ToArray()]);
        return "data/cross_check.csv";
    }
}
