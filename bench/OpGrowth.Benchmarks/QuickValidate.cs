using System.Globalization;
using OpGrowth.Evolution;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Sweeps;

namespace OpGrowth.Benchmarks;

/// <summary>
/// The predicted route checked against measured sweep points (`-- quick-validate chain AVERAGES.csv [NMAX] [TARGETS]` or
/// `-- quick-validate cluster AVERAGES.csv NMAX TARGETS`): members are the averages up to NMAX, predictions at the
/// targets are printed with their bands next to the measured averages. The numbers quoted in docs/sweeps.md.
/// </summary>
internal static class QuickValidate
{
    private static readonly CultureInfo Ci = CultureInfo.InvariantCulture;

    private sealed record Row(int N, double TStar, double Error, double? Spread, int Seeds);

    private static List<Row> Read(string csv)
    {
        var lines = File.ReadAllLines(csv);
        var head = lines[0].Split(',');
        int Col(string name) => Array.IndexOf(head, name);
        double D(string[] f, string name) => double.TryParse(f[Col(name)], NumberStyles.Float, Ci, out double v) ? v : 0;
        var rows = new List<Row>();
        foreach (var l in lines.Skip(1))
        {
            var f = l.Split(',');
            if (f[Col("t_star")].Length == 0) continue;
            double err = Math.Sqrt(Math.Pow(D(f, "t_star_stat_err"), 2) + Math.Pow(D(f, "t_star_trunc_err"), 2) + Math.Pow(D(f, "t_star_grid_err"), 2) + Math.Pow(D(f, "t_star_sampling_err"), 2));
            double? spread = f[Col("t_star_seed_spread")].Length > 0 ? D(f, "t_star_seed_spread") : null;
            rows.Add(new Row(int.Parse(f[Col("N")], Ci), D(f, "t_star"), err, spread, int.Parse(f[Col("seeds")], Ci)));
        }
        return rows;
    }

    public static void Run(string kind, string csv, int nmax, int[] targets)
    {
        var rows = Read(csv);
        var members = rows.Where(r => r.N <= nmax).Select(r => new ScramblingTimeMember(r.N, r.TStar, Math.Max(r.Error, 1e-6), r.Spread, r.Seeds, (r.N - 1) / 2.0)).ToList();
        if (kind == "cluster")
        {
            foreach (int n in targets)
            {
                var p = ScramblingTimePrediction.Scaling(n, members);
                var meas = rows.FirstOrDefault(r => r.N == n);
                string m = meas is null ? "not measured" : FormattableString.Invariant($"measured {meas.TStar:0.####} +- {meas.Error:0.####}");
                double band = 2 * Math.Sqrt(p.FitError * p.FitError + (meas?.Error ?? 0) * (meas?.Error ?? 0));
                Console.WriteLine(FormattableString.Invariant($"N = {n}: predicted average {p.Mean:0.####} +- {p.FitError:0.####} (log {p.Laws[0].Value:0.####} +- {p.Laws[0].Error:0.####} w {p.Laws[0].Weight:0.00}; linear {p.Laws[1].Value:0.####} +- {p.Laws[1].Error:0.####} w {p.Laws[1].Weight:0.00}); {m}; inside 2-sigma band {p.Mean - band:0.####}..{p.Mean + band:0.####}: {(meas is not null && Math.Abs(meas.TStar - p.Mean) <= band)}"));
                Console.WriteLine("   " + p.Comparison.Verdict);
            }
            return;
        }
        // Chain: the front on 40 sites (bond dimensions 16/32/64) to t = 9.
        var chain = ModelLoader.Load(ShippedModels.Resolve("mixed-field-ising"), new Dictionary<string, string> { ["N"] = "40" });
        var fr = FrontEvolution.Run(chain.Hamiltonian, PauliString.Single(40, 0, 'Z'), new FrontEvolutionOptions { Time = 9, BondDimensions = [16, 32, 64], Threads = 2 });
        var bp = fr.Runs[^1].Figures.Butterfly!.Primary;
        var vc = fr.Convergence.Single(c => c.Figure == "butterflyVelocity");
        double vb = bp.Velocity!.Value, vbe = Math.Sqrt(Math.Pow(bp.VelocityError ?? 0, 2) + Math.Pow(vc.Movement ?? 0, 2));
        Console.WriteLine(FormattableString.Invariant($"front on 40 sites: v_B = {vb:0.####} +- {vbe:0.####}, budgets agree to distance {fr.ConvergedDistance}, part at {fr.PartDistance}; arrivals {string.Join(" ", fr.Arrival.Take(14).Select(a => a.ToString("0.###", Ci)))}"));
        var withFront = members.Select(m => m with { FrontArrival = ScramblingTimePrediction.ArrivalAt(m.HalfDistance!.Value, fr.Arrival, fr.ArrivalUncertainty, fr.ConvergedDistance, vb, vbe).Time }).ToList();
        foreach (var m in withFront) Console.WriteLine(FormattableString.Invariant($"  member N = {m.N}: t* = {m.TStar:0.####} +- {m.Error:0.####}, d = {m.HalfDistance:0.#}, arrival {m.FrontArrival:0.####}, offset {m.TStar - m.FrontArrival:0.####}"));
        foreach (int n in targets)
        {
            double half = (n - 1) / 2.0;
            var at = ScramblingTimePrediction.ArrivalAt(half, fr.Arrival, fr.ArrivalUncertainty, fr.ConvergedDistance, vb, vbe);
            var st = ScramblingTimePrediction.FromFront(n, half, at, withFront, vb, "front engine, 40 sites");
            var meas = rows.FirstOrDefault(r => r.N == n);
            string m = meas is null ? "not measured" : FormattableString.Invariant($"measured {meas.TStar:0.####} +- {meas.Error:0.####}");
            Console.WriteLine(FormattableString.Invariant($"N = {n}: {st.Text()}; {m}; inside: {(meas is not null && meas.TStar >= st.Low && meas.TStar <= st.High)}"));
            Console.WriteLine("   " + st.Basis);
            foreach (var a in st.Also) Console.WriteLine("   " + a);
        }
    }
}
