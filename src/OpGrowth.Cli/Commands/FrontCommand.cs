using System.CommandLine;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.Evolution;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pipeline;
using OpGrowth.Reporting;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth front MODEL</c>: the operator front on a chain of any length from the matrix-product front engine, as a
/// budget series of bond dimensions: arrival time at every distance with its budget uncertainty, v_B, and the distance
/// where the budgets part. Writes front.json, front_arrival.csv, front_series.csv and the figure.
/// </summary>
internal static class FrontCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var model = new Argument<string>("MODEL") { Description = "Model file (.toml) or the name of a shipped model; every term must act within two neighbouring sites of the chain." };
        var set = CommonOptions.Set();
        var probe = CommonOptions.Probe();
        var time = new Option<double>("--time") { Description = "Final time.", DefaultValueFactory = _ => 10 };
        var dt = new Option<double>("--dt") { Description = "Time step of the second-order sweep (error O(dt^2)).", DefaultValueFactory = _ => 0.1 };
        var every = new Option<int>("--record-every") { Description = "Record the site weights every this many steps.", DefaultValueFactory = _ => 1 };
        var bonds = new Option<string>("--bond-dimensions") { Description = "Bond dimensions of the budget series, e.g. 16,32,64 (the largest is the main run).", DefaultValueFactory = _ => "16,32,64" };
        var fraction = new Option<double>("--front-fraction") { Description = "Front threshold as a fraction of the scrambled site weight 3/4.", DefaultValueFactory = _ => 0.5 };
        var threads = CommonOptions.Threads();
        var outDir = CommonOptions.Out("Output folder [default: ./front-<model name>].");
        var cmd = new Command("front",
            "The operator front on chains of any length (tested to 1000 sites): the operator as a matrix product in the Pauli basis, evolved by second-order sweeps of " +
            "two-site gates and truncated to a bond dimension. A budget series of bond dimensions gives every arrival time its truncation uncertainty and the distance " +
            "where the budgets part; truncation behind the front does not hold the front back (unlike the Pauli-string budget).")
        {
            model, set, probe, time, dt, every, bonds, fraction, threads, outDir,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(pr.GetValue(model)!, pr.GetValue(set) ?? [], pr.GetValue(probe), pr.GetValue(time), pr.GetValue(dt), pr.GetValue(every),
            pr.GetValue(bonds)!, pr.GetValue(fraction), CommonOptions.ThreadsOrDefault(pr.GetValue(threads)), pr.GetValue(outDir), ct)));
        return cmd;
    }

    private static int Execute(string modelArg, string[] sets, string? probeText, double time, double dt, int every, string bondText, double fraction, int threads, string? outDir, CancellationToken ct)
    {
        string path = ShippedModels.Resolve(modelArg);
        var model = ModelLoader.Load(path, ModelLoader.ParseOverrides(sets, path));
        if (model.Drive is not null) throw new InputException($"{model.Name}: found a periodic drive; expected a Hamiltonian on a chain");
        if (!FrontEvolution.Supports(model.Hamiltonian, out string? reason)) throw new InputException($"{model.Name}: {reason}; expected terms on single sites and neighbouring pairs of a chain");
        if (!(time > 0) || !double.IsFinite(time)) throw new InputException($"--time {time.ToString(Inv)}; expected a positive time");
        if (!(dt > 0) || dt > time) throw new InputException($"--dt {dt.ToString(Inv)}; expected 0 < dt <= time");
        if (every < 1) throw new InputException($"--record-every {every}; expected at least 1");
        if (!(fraction > 0 && fraction < 1)) throw new InputException($"--front-fraction {fraction.ToString(Inv)}; expected a value in (0, 1)");
        var dims = new List<int>();
        foreach (var part in bondText.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            if (!int.TryParse(part, NumberStyles.Integer, Inv, out int d) || d < 1 || d > 4096) throw new InputException($"--bond-dimensions: found '{part}'; expected bond dimensions 1..4096 such as 16,32,64");
            dims.Add(d);
        }
        if (dims.Count == 0) throw new InputException("--bond-dimensions: found none; expected a list such as 16,32,64");
        var probe = ProbeChoice.Resolve(model, probeText);
        using var lf = CliHost.CreateLoggerFactory();
        var log = lf.CreateLogger("front");
        string folder = Path.GetFullPath(outDir ?? "front-" + ScramblingRunName(model.Name));
        Directory.CreateDirectory(folder);
        log.LogInformation("{Model}: {N} sites, probe {Probe}, t = {T}, dt = {Dt}, bond dimensions {Dims}", model.Name, model.N, probe, time, dt, string.Join("/", dims));
        var r = FrontEvolution.Run(model.Hamiltonian, probe, new FrontEvolutionOptions
        {
            Time = time,
            Dt = dt,
            RecordEvery = every,
            BondDimensions = dims,
            FrontFraction = fraction,
            Threads = threads,
            Logger = log,
        }, ct);
        int dmax = r.MaxDistance;
        var heads = new List<string> { "distance" };
        var cols = new List<double[]> { Enumerable.Range(0, dmax + 1).Select(d => (double)d).ToArray() };
        foreach (var run in r.Runs)
        {
            heads.Add("arrival_bond_" + run.BondDimension.ToString(Inv));
            var a = run.Figures.Butterfly?.Primary.ArrivalTimes ?? [];
            cols.Add(Enumerable.Range(0, dmax + 1).Select(d => d < a.Length ? a[d] : double.NaN).ToArray());
        }
        heads.Add("uncertainty");
        cols.Add(Enumerable.Range(0, dmax + 1).Select(d => d < r.ArrivalUncertainty.Length ? r.ArrivalUncertainty[d] : double.NaN).ToArray());
        CsvTable.Write(Path.Combine(folder, "front_arrival.csv"), heads, cols);
        var sh = new List<string> { "time" };
        var sc = new List<double[]> { r.Runs[^1].Times };
        foreach (var run in r.Runs)
        {
            sh.Add("mean_size_bond_" + run.BondDimension.ToString(Inv));
            sc.Add(r.Runs[^1].Times.Select((_, i) => i < run.MeanSize.Length ? run.MeanSize[i] : double.NaN).ToArray());
            sh.Add("norm_squared_bond_" + run.BondDimension.ToString(Inv));
            sc.Add(r.Runs[^1].Times.Select((_, i) => i < run.NormSquared.Length ? run.NormSquared[i] : double.NaN).ToArray());
            sh.Add("front_bond_" + run.BondDimension.ToString(Inv));
            var fr = run.Figures.Butterfly?.Front ?? [];
            sc.Add(r.Runs[^1].Times.Select((_, i) => i < fr.Length ? (double)fr[i] : double.NaN).ToArray());
        }
        CsvTable.Write(Path.Combine(folder, "front_series.csv"), sh, sc);
        var fig = RunFigures.FrontFigure(r, null, FigureSize.Report);
        fig.Save(folder);
        AtomicFile.WriteJson(Path.Combine(folder, "front.json"), new
        {
            model = model.Name,
            n = model.N,
            probe = r.Probe,
            time,
            dt,
            threshold = r.Threshold,
            bondDimensions = r.Runs.Select(x => x.BondDimension),
            arrival = r.Arrival,
            arrivalUncertainty = r.ArrivalUncertainty,
            convergedDistance = r.ConvergedDistance,
            partDistance = r.PartDistance,
            partTime = r.PartTime,
            maxDistance = r.MaxDistance,
            runs = r.Runs.Select(x => new
            {
                bondDimension = x.BondDimension,
                velocity = x.Figures.Butterfly?.Primary.Velocity,
                velocityError = x.Figures.Butterfly?.Primary.VelocityError,
                window = new[] { x.Figures.Butterfly?.Primary.MinDistance, x.Figures.Butterfly?.Primary.MaxDistance },
                finalNormSquared = x.NormSquared[^1],
                maxBond = x.MaxBond.Max(),
                seconds = x.WallSeconds,
            }),
            convergence = r.Convergence,
            seconds = r.WallSeconds,
        });
        var o = CliHost.Out;
        foreach (var run in r.Runs)
        {
            var b = run.Figures.Butterfly?.Primary;
            o.WriteLine(FormattableString.Invariant($"bond dimension {run.BondDimension}: v_B = {b?.Velocity:0.###} +- {b?.VelocityError:0.###} (distances {b?.MinDistance}..{b?.MaxDistance}), kept norm {run.NormSquared[^1]:0.####}, {run.WallSeconds:0} s"));
        }
        o.WriteLine(r.PartDistance is int pd
            ? FormattableString.Invariant($"budgets agree to distance {r.ConvergedDistance} of {r.MaxDistance}; they part at distance {pd} (t = {r.PartTime:0.##})")
            : FormattableString.Invariant($"budgets agree to distance {r.ConvergedDistance} of {r.MaxDistance} and never part"));
        o.WriteLine($"wrote {folder}");
        return ExitCodes.Ok;
    }

    private static string ScramblingRunName(string name) => new(name.Select(c => char.IsLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '-').ToArray());
}
