using System.CommandLine;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.Diagnosis;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth diagnose MODEL</c>: runs the diagnosis battery (level statistics, Lanczos growth, operator
/// size, front, conserved quantities, finite temperature) and prints a verdict table; JSON with --json.
/// </summary>
internal static class DiagnoseCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var model = new Argument<string>("MODEL") { Description = "Model file (.toml) or the name of a shipped model (see 'opgrowth models')." };
        var set = new Option<string[]>("--set") { Description = "Override a model parameter: NAME=VALUE. Repeat for several.", Arity = ArgumentArity.ZeroOrMore, AllowMultipleArgumentsPerToken = false };
        var effort = new Option<string>("--effort") { Description = "quick (a first look, well under a minute), standard (a few minutes), thorough (larger members, deeper Lanczos, longer evolutions): the same batteries as 'run'.", DefaultValueFactory = _ => "standard" };
        effort.AcceptOnlyFromAmong([.. DiagnosisOptions.EffortNames]);
        var maxWeight = new Option<string>("--max-weight") { Description = "Largest string weight k in the conserved-quantity search.", DefaultValueFactory = _ => "2" };
        var levelN = new Option<string?>("--level-n") { Description = "Size of the smaller member for level statistics (default 12, scaled by --effort)." };
        var clusterN = new Option<string?>("--cluster-n") { Description = "Cluster size of the conserved-quantity search (default 10)." };
        var thermalN = new Option<string?>("--thermal-n") { Description = "Size of the smaller member at finite temperature (default 12)." };
        var thermalSizes = new Option<string?>("--thermal-sizes") { Description = "Further sizes for the low-temperature plateau's N dependence, e.g. \"8,10\"." };
        var betas = new Option<string?>("--betas") { Description = "Inverse temperatures in units of 1/epsilon (epsilon = sqrt(||H||^2/N)), e.g. \"0.5,1,2\"." };
        var realizations = new Option<string>("--realizations") { Description = "Disorder realisations for level statistics (the 'seed' parameter is stepped).", DefaultValueFactory = _ => "1" };
        var skip = new Option<string?>("--skip") { Description = "Tests to skip, e.g. \"2,6\" (1 levels, 2 Lanczos, 3 size, 4 front, 5 conserved, 6 finite temperature, 7 term structure)." };
        var threads = new Option<string>("--threads") { Description = "Worker threads (0 = all cores).", DefaultValueFactory = _ => "0" };
        var seed = new Option<string>("--seed") { Description = "Seed of the random states.", DefaultValueFactory = _ => "1" };
        var json = new Option<bool>("--json") { Description = "Write the report as JSON on stdout instead of the table." };
        var outDir = new Option<string?>("--out") { Description = "Also write diagnosis.json and diagnosis.txt into this folder." };
        var cmd = new Command("diagnose",
            "Why does a model not scramble? Runs a bounded battery: level statistics at small N, Lanczos growth class, " +
            "operator size and autocorrelation, operator front, local conserved quantities with Mazur bounds, and " +
            "finite-temperature OTOC growth and freezing; prints a verdict per test (scrambles / fails / inconclusive) " +
            "with figure, threshold and reason, and an overall verdict with the leading mechanism.\n\n" +
            "Examples:\n  opgrowth diagnose demo/xxz-chain\n  opgrowth diagnose my-model.toml --effort quick\n  opgrowth diagnose mixed-field-ising --set N=20 --json\n" +
            "  opgrowth diagnose heisenberg-all-to-all --set N=20 --thermal-sizes 8,10 --out diag-heis")
        {
            model, set, effort, maxWeight, levelN, clusterN, thermalN, thermalSizes, betas, realizations, skip, threads, seed, json, outDir,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(
            pr.GetValue(model)!, pr.GetValue(set) ?? [], pr.GetValue(effort)!, pr.GetValue(maxWeight)!, pr.GetValue(levelN), pr.GetValue(clusterN),
            pr.GetValue(thermalN), pr.GetValue(thermalSizes), pr.GetValue(betas), pr.GetValue(realizations)!, pr.GetValue(skip), pr.GetValue(threads)!,
            pr.GetValue(seed)!, pr.GetValue(json), pr.GetValue(outDir), ct)));
        return cmd;
    }

    private static int Execute(string modelArg, string[] sets, string effortText, string maxWeightText, string? levelN, string? clusterN, string? thermalN,
        string? thermalSizes, string? betas, string realizationsText, string? skipText, string threadsText, string seedText, bool asJson, string? outDir, CancellationToken ct)
    {
        string path = ShippedModels.Resolve(modelArg);
        var overrides = ModelLoader.ParseOverrides(sets, path);
        var model = ModelLoader.Load(path, overrides);
        var o = DiagnosisOptions.For(effortText);
        o = o with
        {
            MaxWeight = ParseInt(maxWeightText, "--max-weight", 1, 4),
            LevelRealizations = ParseInt(realizationsText, "--realizations", 1, 1000),
            Threads = ParseInt(threadsText, "--threads", 0, 1024),
            Seed = ParseInt(seedText, "--seed", int.MinValue, int.MaxValue),
        };
        if (levelN is not null) o = o with { LevelN = ParseInt(levelN, "--level-n", 4, 18) };
        if (clusterN is not null) o = o with { ClusterN = ParseInt(clusterN, "--cluster-n", 2, 64) };
        if (thermalN is not null) o = o with { ThermalN = ParseInt(thermalN, "--thermal-n", 4, 24) };
        if (thermalSizes is not null) o = o with { ThermalExtraSizes = ParseList(thermalSizes, "--thermal-sizes", s => ParseInt(s, "--thermal-sizes", 4, 24)) };
        if (betas is not null) o = o with { BetaEpsilon = ParseList(betas, "--betas", s => ParseDouble(s, "--betas", 1e-6, 1e3)) };
        if (skipText is not null) o = o with { Skip = ParseList(skipText, "--skip", s => ParseInt(s, "--skip", 1, 7)).ToHashSet() };
        var members = FamilyMembers.FromFile(path, overrides, model);

        DiagnosisReport report;
        using (var lf = CliHost.CreateLoggerFactory())
        {
            var log = lf.CreateLogger("diagnose");
            report = DiagnosisBattery.Run(model, members, o with { Logger = log }, ct);
            if (outDir is not null)
            {
                Directory.CreateDirectory(outDir);
                AtomicFile.WriteAllText(Path.Combine(outDir, "diagnosis.json"), report.ToJson() + Environment.NewLine);
                AtomicFile.WriteAllText(Path.Combine(outDir, "diagnosis.txt"), report.ToText());
                log.LogInformation("wrote {Dir}/diagnosis.json and diagnosis.txt", outDir);
            }
        }
        CliHost.Out.Write(asJson ? report.ToJson() + Environment.NewLine : report.ToText());
        return ExitCodes.Ok;
    }

    private static int ParseInt(string text, string option, int min, int max)
    {
        if (!int.TryParse(text.Trim(), NumberStyles.Integer, Inv, out int v) || v < min || v > max)
            throw new InputException($"{option}: found '{text}'; expected an integer from {min} to {max}");
        return v;
    }

    private static double ParseDouble(string text, string option, double min, double max)
    {
        if (!double.TryParse(text.Trim(), NumberStyles.Float, Inv, out double v) || !double.IsFinite(v) || v < min || v > max)
            throw new InputException($"{option}: found '{text}'; expected a number from {min.ToString(Inv)} to {max.ToString(Inv)}");
        return v;
    }

    private static T[] ParseList<T>(string text, string option, Func<string, T> parse)
    {
        var parts = text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        if (parts.Length == 0) throw new InputException($"{option}: found '{text}'; expected a comma-separated list");
        return parts.Select(parse).ToArray();
    }
}
