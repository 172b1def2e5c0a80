using System.CommandLine;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.Exact;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Evolution;
using OpGrowth.Pauli;
using OpGrowth.Reporting;

namespace OpGrowth.Cli.Commands;

/// <summary>
/// <c>opgrowth exact MODEL</c>: the exact state-vector engine on a model: infinite-temperature OTOCs
/// (site-resolved), finite-temperature regularised OTOCs with growth-rate fits, or level statistics.
/// Writes JSON and CSV atomically into an output folder and prints a short summary.
/// </summary>
internal static class ExactCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create()
    {
        var model = CommonOptions.Model();
        var mode = new Option<string>("--mode") { Description = "otoc (infinite temperature), thermal (finite temperature at --beta), levels (level statistics), or tstar (locate t*, the first time the mean size reaches half its saturation, with the time grid refined around the crossing; the last time of --times is the latest evaluated).", DefaultValueFactory = _ => "otoc" };
        mode.AcceptOnlyFromAmong("otoc", "thermal", "levels", "tstar");
        var set = CommonOptions.Set();
        var op = CommonOptions.Probe();
        var sites = new Option<string>("--sites") { Description = "Sites j for OTOCs against X_j, Y_j, Z_j: \"all\", \"none\" or a list such as \"0,5,9\".", DefaultValueFactory = _ => "all" };
        var probe = new Option<string[]>("--against") { Description = "A further operator V to take the OTOC against (any Pauli string, e.g. \"Z_3 Z_4\"). Repeat for several.", Arity = ArgumentArity.ZeroOrMore, AllowMultipleArgumentsPerToken = false };
        var times = new Option<string>("--times") { Description = "Time grid: START:STOP:COUNT (e.g. 0:8:41) or a list \"0,0.5,1\"; for a periodic drive, whole numbers of periods.", DefaultValueFactory = _ => "0:5:26" };
        var beta = new Option<string>("--beta") { Description = "Inverse temperatures for --mode thermal, e.g. \"0.25,0.5,1\".", DefaultValueFactory = _ => "0.5" };
        var method = new Option<string>("--method") { Description = "auto (dense for N <= 8), dense (N <= 10), or typicality.", DefaultValueFactory = _ => "auto" };
        var samples = new Option<string>("--samples") { Description = "Random states per estimate (typicality); error bars are 68% Student-t intervals over them.", DefaultValueFactory = _ => "4" };
        var seed = new Option<string>("--seed") { Description = "Seed of the random states.", DefaultValueFactory = _ => "1" };
        var tol = new Option<string>("--tolerance") { Description = "Error tolerance of each propagation.", DefaultValueFactory = _ => "1e-8" };
        var threads = CommonOptions.Threads();
        var fit = new Option<string>("--fit-range") { Description = "Growth-fit window on C = 1 - F/F(0): LOW:HIGH.", DefaultValueFactory = _ => "1e-3:0.3" };
        var resolve = new Option<string?>("--resolve") { Description = "levels: symmetries to resolve (comma list of total-z, reflection, spin-flip; \"none\"); default: every one H has, with the lattice mirrors (and a square's diagonal) among the spatial ones." };
        var realizations = new Option<string>("--realizations") { Description = "levels: disorder realisations (the model's 'seed' parameter is stepped).", DefaultValueFactory = _ => "1" };
        var fraction = new Option<string>("--central-fraction") { Description = "levels: fraction of each sector's levels kept around the middle.", DefaultValueFactory = _ => "0.8" };
        var meanSize = new Option<bool>("--mean-size") { Description = "otoc: also estimate the mean size for all sites with one random-sign probe (cheap at large N; used when not every site is resolved)." };
        var outDir = CommonOptions.Out("Output folder [default: exact-<model name>].");
        var cmd = new Command("exact",
            "Exact state-vector engine at small N: OTOCs F(t) = Tr(W(t) V W(t) V)/2^N of the probe W against X, Y, Z on every site " +
            "(dense traces or quantum typicality), the regularised finite-temperature OTOC with fitted growth rate and " +
            "chaos-bound ratio, or level statistics (mean gap ratio in symmetry sectors).\n\n" +
            "Examples:\n  opgrowth exact mixed-field-ising --set N=12 --probe Z_0 --times 0:6:31\n" +
            "  opgrowth exact mixed-field-ising --set N=10 --mode thermal --beta 0.2,0.5 --sites 5\n" +
            "  opgrowth exact mixed-field-ising --set N=12 --mode levels\n" +
            "  opgrowth exact heisenberg-all-to-all --set N=18 --mode tstar --samples 1")
        {
            model, mode, set, op, sites, probe, times, beta, method, samples, seed, tol, threads, fit, resolve, realizations, fraction, meanSize, outDir,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(new Settings(
            pr.GetValue(model)!, pr.GetValue(mode)!, pr.GetValue(set) ?? [], pr.GetValue(op), pr.GetValue(sites)!, pr.GetValue(probe) ?? [],
            pr.GetValue(times)!, pr.GetValue(beta)!, pr.GetValue(method)!, pr.GetValue(samples)!, pr.GetValue(seed)!, pr.GetValue(tol)!,
            CommonOptions.ThreadsOrDefault(pr.GetValue(threads)), pr.GetValue(fit)!, pr.GetValue(resolve), pr.GetValue(realizations)!, pr.GetValue(fraction)!, pr.GetValue(meanSize), pr.GetValue(outDir)), ct)));
        return cmd;
    }

    private sealed record Settings(string Model, string Mode, string[] Sets, string? Operator, string Sites, string[] Probes, string Times, string Beta,
        string Method, string Samples, string Seed, string Tolerance, int Threads, string FitRange, string? Resolve, string Realizations, string Fraction, bool MeanSize, string? Out);

    private static int Execute(Settings s, CancellationToken ct)
    {
        var (path, overrides, model) = CommonOptions.LoadModel(s.Model, s.Sets);
        if (model.IsDriven && s.Mode != "otoc")
        {
            throw new InputException(path, 0, $"found a driven (Floquet) model with --mode {s.Mode}; expected --mode otoc (a drive has no thermal state and no energy levels)");
        }
        string outDir = Path.GetFullPath(s.Out ?? $"exact-{Pipeline.ScramblingRun.Sanitize(model.Name)}");
        using var lf = CliHost.CreateLoggerFactory();
        var log = lf.CreateLogger("exact");
        int threads = s.Threads;
        return s.Mode switch
        {
            "otoc" => RunOtoc(model, s, outDir, threads, log, thermal: false, ct),
            "thermal" => RunOtoc(model, s, outDir, threads, log, thermal: true, ct),
            "levels" => RunLevels(model, path, overrides, s, outDir, threads, log),
            "tstar" => RunScramblingTime(model, path, overrides, s, outDir, threads, log, ct),
            _ => throw new InputException($"--mode: found '{s.Mode}'; expected otoc, thermal, levels or tstar"),
        };
    }

    // t* by the search: the estimator follows the lattice (site blocks with distances, one random-sign group per site
    // on all-to-all lattices and for Majorana sizes); the cost estimate is logged before it starts.
    private static int RunScramblingTime(Model model, string path, IReadOnlyDictionary<string, string> overrides, Settings s, string outDir, int threads, ILogger log, CancellationToken ct)
    {
        int n = model.N;
        if (model.IsDriven) throw new InputException(path, 0, "found a driven (Floquet) model with --mode tstar; expected a Hamiltonian model");
        if (n > PauliMask.MaxQubits) throw new InputException($"model has N = {n}; expected N <= {PauliMask.MaxQubits} for state vectors (2^N amplitudes)");
        var w = s.Operator is null ? model.Probes[0] : ParsePauli(s.Operator, n, "--operator");
        var times = ParseTimes(s.Times);
        bool majorana = model.SizeMeasure == SizeMeasure.Majoranas;
        var (blocks, groups) = ScramblingTimeSearch.DefaultEstimator(n, model.Lattice.Diameter, majorana);
        int samples = ParseInt(s.Samples, "--samples", 1, 10_000);
        int th = threads > 0 ? threads : Environment.ProcessorCount;
        Model? small = n > 12 && model.Parameters.ContainsKey("N") ? ModelLoader.Load(path, new Dictionary<string, string>(overrides) { ["N"] = "12" }, lenient: true) : null;
        Model? timing = n > ScramblingTimeCost.TimedLimit && model.Parameters.ContainsKey("N") ? ModelLoader.Load(path, new Dictionary<string, string>(overrides) { ["N"] = ScramblingTimeCost.TimedLimit.ToString(System.Globalization.CultureInfo.InvariantCulture) }, lenient: true) : null;
        var est = ScramblingTimeCost.Estimate(model.Hamiltonian, small?.Hamiltonian, Math.Min(times[^1], ScramblingTimeSearch.FirstTime(model.Hamiltonian, w) * 4), samples, ScramblingTimeSearch.VectorsPerState(n, blocks, groups), th, siteBlocks: blocks, timing: timing?.Hamiltonian);
        log.LogInformation("estimated cost: {Seconds:0} s and {Gib:0.##} GiB on {Threads} thread(s) ({Basis}; t* assumed {T:0.##}, a rough first guess)", est.Seconds, est.Bytes / 1073741824.0, th, est.Basis, est.TStar);
        var r = ScramblingTimeSearch.Run(model.Hamiltonian, new ScramblingTimeSearchOptions
        {
            Operator = w,
            MajoranaSize = majorana,
            MaxTime = times[^1] > 0 ? times[^1] : 50,
            Samples = samples,
            Seed = ParseInt(s.Seed, "--seed", int.MinValue, int.MaxValue),
            PropagationTolerance = ParseDouble(s.Tolerance, "--tolerance", 1e-15, 0.1),
            SiteBlocks = blocks,
            ProbeGroups = groups,
            Threads = threads,
            Logger = log,
        }, ct);
        Directory.CreateDirectory(outDir);
        AtomicFile.WriteJson(Path.Combine(outDir, "exact-tstar.json"), r);
        var o = CliHost.Out;
        o.WriteLine($"{model.Name} N={n} W={w} size in {r.SizeMeasure}, {r.Estimator}, {r.Samples} state(s) ({r.WallSeconds:0.0} s, {r.MatrixVectorProducts} applications of H)");
        foreach (var e in r.Evaluations) o.WriteLine(FormattableString.Invariant($"  n({e.Time:0.#####}) = {e.MeanSize:0.####} +- {e.Error:0.####}"));
        o.WriteLine(r.TStar is double ts
            ? FormattableString.Invariant($"  t* = {ts:0.#####} (level {r.Target:0.###}; interpolation error {r.LocationError:G2}, sampling error {r.SamplingError:G2}: {r.SamplingErrorKind})")
            : FormattableString.Invariant($"  t* > {r.LowerBound:0.###}: the mean size stays below {r.Target:0.###}"));
        o.WriteLine($"wrote {Path.Combine(outDir, "exact-tstar.json")}");
        return ExitCodes.Ok;
    }

    private static int RunOtoc(Model model, Settings s, string outDir, int threads, ILogger log, bool thermal, CancellationToken ct)
    {
        int n = model.N;
        if (n > PauliMask.MaxQubits) throw new InputException($"model has N = {n}; expected N <= {PauliMask.MaxQubits} for state vectors (2^N amplitudes)");
        var w = ProbeChoice.Resolve(model, s.Operator);
        var probes = s.Probes.Select(p => ParsePauli(p, n, "--against")).ToArray();
        var times = ParseTimes(s.Times);
        if (model.Drive is { } drive)
        {
            // For a drive the grid counts periods: whole numbers only, then converted to time.
            var bad = times.FirstOrDefault(t => Math.Abs(t - Math.Round(t)) > 1e-9 * Math.Max(1, t), -1);
            if (bad >= 0) throw new InputException($"--times: found {bad.ToString(Inv)}; expected whole numbers of drive periods for a periodic drive");
            times = times.Select(t => Math.Round(t) * drive.Period).Distinct().ToArray();
        }
        var method = s.Method switch
        {
            "auto" => OtocMethod.Auto,
            "dense" => OtocMethod.Dense,
            "typicality" => OtocMethod.Typicality,
            _ => throw new InputException($"--method: found '{s.Method}'; expected auto, dense or typicality"),
        };
        if (method == OtocMethod.Dense && n > DenseSpectrum.DefaultMaxQubits) throw new InputException($"--method dense: found N = {n}; expected N <= {DenseSpectrum.DefaultMaxQubits} (use typicality)");
        var fit = ParseRange(s.FitRange, "--fit-range");
        var siteList = ParseSites(s.Sites, n);
        if (siteList is { Length: 0 } && probes.Length == 0 && !s.MeanSize) throw new InputException("--sites none: found no sites and no --against; expected at least one OTOC to compute");
        var betas = thermal ? ParseList(s.Beta, "--beta") : [0.0];
        if (betas.Any(b => b < 0)) throw new InputException("--beta: found a negative value; expected beta >= 0");
        var baseOptions = new ExactOtocOptions
        {
            Operator = w,
            Times = times,
            Sites = siteList,
            Probes = probes,
            Method = method,
            Samples = ParseInt(s.Samples, "--samples", 1, 10_000),
            Seed = ParseInt(s.Seed, "--seed", int.MinValue, int.MaxValue),
            Tolerance = ParseDouble(s.Tolerance, "--tolerance", 1e-15, 0.1),
            Threads = threads,
            FitRange = fit,
            EstimateMeanSize = s.MeanSize && !thermal,
            Logger = log,
        };
        var results = new List<ExactOtocResult>();
        foreach (double b in betas)
        {
            ct.ThrowIfCancellationRequested();
            log.LogInformation("{Model}: OTOC of {W}, beta = {Beta}, {Times} times", model.Name, w, b, times.Length);
            if (model.Drive is not null)
            {
                results.Add(ExactOtoc.Run(model.Drive, n, baseOptions, ct));
            }
            else
            {
                results.Add(ExactOtoc.Run(model.Hamiltonian, baseOptions with { Beta = b }, ct));
            }
        }
        string stem = thermal ? "exact-thermal" : "exact-otoc";
        var doc = new { model = model.Name, source = model.SourceFile, n, parameters = model.Parameters, mode = thermal ? "thermal" : "otoc", results };
        AtomicFile.WriteJson(Path.Combine(outDir, stem + ".json"), doc);
        AtomicFile.WriteAllText(Path.Combine(outDir, stem + ".csv"), OtocCsv(results));
        var o = CliHost.Out;
        static string V(double value, double error) => NumberFormat.ValueWithUncertainty(value, error);
        foreach (var r in results)
        {
            o.WriteLine(FormattableString.Invariant($"{model.Name} (N = {n}), probe W = {r.Operator}, beta = {NumberFormat.Number(r.Beta)}, {r.Method} ({NumberFormat.Duration(TimeSpan.FromSeconds(r.Cost.WallSeconds))}, peak {MemoryBudget.Format(r.Cost.PeakWorkingSetBytes)})"));
            o.WriteLine($"  error bars: {r.ErrorKind}");
            int last = r.Times.Length - 1;
            string at = NumberFormat.Number(r.Times[last]);
            o.WriteLine($"  autocorrelation at t = {at}: {V(r.Autocorrelation.Values[last], r.Autocorrelation.Errors[last])}");
            if (r.MeanSize is not null) o.WriteLine($"  mean size at t = {at}: {V(r.MeanSize.Values[last], r.MeanSize.Errors[last])} (random operator 3N/4 = {NumberFormat.Number(0.75 * n)}; {r.MeanSizeMethod})");
            foreach (var site in r.Sites.Take(40))
            {
                o.WriteLine($"  site {site.Site,3} at t = {at}: F_X {V(site.X.Values[last], site.X.Errors[last])}, F_Y {V(site.Y.Values[last], site.Y.Errors[last])}, F_Z {V(site.Z.Values[last], site.Z.Errors[last])}; weight {V(site.Weight.Values[last], site.Weight.Errors[last])}");
            }
            if (r.Sites.Count > 40) o.WriteLine($"  ({r.Sites.Count - 40} more sites in the files)");
            foreach (var p in r.Probes) o.WriteLine($"  against {p.Probe} at t = {at}: F = {V(p.Values[last], p.Errors[last])}");
            if (thermal)
            {
                foreach (var f in r.Fits.Where(f => f.Points >= 3))
                {
                    o.WriteLine($"  fit {f.Probe}: lambda = {V(f.Lambda, f.LambdaError)} on t in {NumberFormat.Window(f.WindowStart, f.WindowEnd)} ({f.Points} points, R^2 {NumberFormat.Number(f.RSquared, 3)}); lambda/(2 pi T) = {NumberFormat.Number(f.BoundRatio, 3)}");
                }
            }
            foreach (var note in r.Notes) o.WriteLine($"  note: {note}");
        }
        o.WriteLine($"wrote {Path.Combine(outDir, stem + ".json")} and .csv");
        return ExitCodes.Ok;
    }

    private static string OtocCsv(IEnumerable<ExactOtocResult> results)
    {
        var sb = new StringBuilder("beta,time,series,value,error\n");
        foreach (var r in results)
        {
            void Add(OtocSeries s)
            {
                for (int k = 0; k < r.Times.Length; k++) sb.Append(FormattableString.Invariant($"{r.Beta:R},{r.Times[k]:R},\"{s.Probe}\",{s.Values[k]:R},{s.Errors[k]:R}\n"));
            }
            Add(r.Autocorrelation);
            if (r.MeanSize is not null) Add(r.MeanSize);
            foreach (var site in r.Sites)
            {
                Add(site.X);
                Add(site.Y);
                Add(site.Z);
                Add(site.Mean);
                Add(site.Weight);
            }
            foreach (var p in r.Probes) Add(p);
        }
        return sb.ToString();
    }

    private static int RunLevels(Model model, string path, IReadOnlyDictionary<string, string> overrides, Settings s, string outDir, int threads, ILogger log)
    {
        int k = ParseInt(s.Realizations, "--realizations", 1, 100_000);
        var hs = new List<Hamiltonian> { model.Hamiltonian };
        if (k > 1)
        {
            if (!model.Parameters.TryGetValue("seed", out double seed0))
            {
                throw new InputException(path, 0, "found --realizations > 1 but the model has no 'seed' parameter; expected a disordered model with a seed parameter");
            }
            for (int i = 1; i < k; i++)
            {
                var ov = new Dictionary<string, string>(overrides) { ["seed"] = (seed0 + i).ToString(Inv) };
                hs.Add(ModelLoader.Load(path, ov).Hamiltonian);
            }
        }
        IReadOnlyList<string>? resolve = s.Resolve switch
        {
            null => null,
            "none" => [],
            _ => s.Resolve.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries),
        };
        if (resolve is null) return RunFoundLevels(model, path, hs, s, outDir, threads, log);
        var r = LevelStatistics.Analyze(hs, new LevelStatisticsOptions
        {
            DeclaredSymmetries = model.Symmetries,
            Resolve = resolve,
            SpatialCandidates = model.Lattice.Kind is "square" ? SitePermutation.RectangleMirrors(model.Lattice.Width, model.Lattice.Height) : null,
            SwapCandidate = model.Lattice.Kind is "square" ? SitePermutation.RectangleDiagonal(model.Lattice.Width, model.Lattice.Height) : null,
            CentralFraction = ParseDouble(s.Fraction, "--central-fraction", 1e-3, 1),
            Threads = threads,
            Logger = log,
        });
        var doc = new { model = model.Name, source = model.SourceFile, n = model.N, parameters = model.Parameters, mode = "levels", result = r };
        AtomicFile.WriteJson(Path.Combine(outDir, "exact-levels.json"), doc);
        var sb = new StringBuilder("sector,dimension,gaps,mean_ratio,standard_error,degeneracies\n");
        foreach (var sec in r.Sectors) sb.Append(FormattableString.Invariant($"\"{sec.Label}\",{sec.Dimension},{sec.Gaps},{sec.MeanRatio:R},{sec.StandardError:R},{sec.Degeneracies}\n"));
        AtomicFile.WriteAllText(Path.Combine(outDir, "exact-levels.csv"), sb.ToString());
        var o = CliHost.Out;
        o.WriteLine($"{model.Name} (N = {model.N}): <r> = {NumberFormat.ValueWithUncertainty(r.MeanRatio, r.StandardError)} over {r.Gaps} gap ratios, {r.Realizations} realisation(s) ({NumberFormat.Duration(TimeSpan.FromSeconds(r.WallSeconds))}; error: {r.ErrorKind})");
        o.WriteLine(FormattableString.Invariant($"  reference: Poisson {r.Poisson:F4}, GOE {r.Goe:F4}, GUE {r.Gue:F4}; closest: {r.Closest}; blocks {(r.RealBlocks ? "real (GOE class)" : "complex (GUE class)")}; eigensolver {(NativeLapack.IsAvailable ? "LAPACK" : "managed")}"));
        o.WriteLine($"  detected: {(r.Detected.Count == 0 ? "none" : string.Join(", ", r.Detected))}; resolved: {(r.Resolved.Count == 0 ? "none" : string.Join(", ", r.Resolved))}");
        foreach (var sec in r.Sectors) o.WriteLine($"  {sec.Label,-24} dim {sec.Dimension,6}  <r> = {NumberFormat.ValueWithUncertainty(sec.MeanRatio, sec.StandardError)}");
        foreach (var wn in r.Warnings) o.WriteLine($"  warning: {wn}");
        o.WriteLine($"wrote {Path.Combine(outDir, "exact-levels.json")} and .csv");
        return ExitCodes.Ok;
    }

    /// <summary>Level statistics with every symmetry found from the terms resolved (the same engine as the diagnosis battery's test 1).</summary>
    private static int RunFoundLevels(Model model, string path, List<Hamiltonian> hs, Settings s, string outDir, int threads, ILogger log)
    {
        _ = path;
        var analyses = hs.Select(h => OpGrowth.Symmetry.SymmetryDiscovery.Analyze(h, model.Lattice, model.SizeMeasure == SizeMeasure.Majoranas)).ToList();
        var sw = System.Diagnostics.Stopwatch.StartNew();
        var r = SectorLevels.Run(analyses, threads, ParseDouble(s.Fraction, "--central-fraction", 1e-3, 1), log: log);
        var a = analyses[0];
        var doc = new
        {
            model = model.Name, source = model.SourceFile, n = model.N, parameters = model.Parameters, mode = "levels",
            symmetries = new { resolved = a.Resolved, unresolved = a.Unresolved, conservedTotals = a.ConservedTotals.Select(c => c.ToString()), conservedStrings = a.ConservedStrings.Select(p => p.ToString()), commuting = a.Commuting, notes = a.Notes },
            result = r,
        };
        AtomicFile.WriteJson(Path.Combine(outDir, "exact-levels.json"), doc);
        var sb = new StringBuilder("sector,dimension,multiplicity,ensemble,gaps,mean_ratio,standard_error,degeneracies\n");
        foreach (var b in r.Blocks) sb.Append(FormattableString.Invariant($"\"{b.Label}\",{b.Dimension},{b.Multiplicity},{b.Ensemble},{b.Ratios},{b.Mean:R},{b.Error:R},{b.Degenerate}\n"));
        AtomicFile.WriteAllText(Path.Combine(outDir, "exact-levels.csv"), sb.ToString());
        var o = CliHost.Out;
        o.WriteLine(FormattableString.Invariant($"{model.Name} N={model.N}: <r> = {r.MeanRatio:F4} +- {r.Error:F4} over {r.Gaps} gap ratios, {r.Realizations} realisation(s) ({sw.Elapsed.TotalSeconds:F1} s)"));
        o.WriteLine(FormattableString.Invariant($"  reference: Poisson {LevelStatistics.PoissonRatio:F4}, {r.WignerDysonClass} {r.WignerDysonRatio:F4}; sectors cover {r.DimensionCovered} of {r.FullDimension} states; eigensolver {(NativeLapack.IsAvailable ? "LAPACK" : "managed")}"));
        o.WriteLine($"  resolved: {(a.Resolved.Count == 0 ? "none" : string.Join("; ", a.Resolved))}");
        o.WriteLine($"  unresolved: {(a.Unresolved.Count == 0 ? "none" : string.Join("; ", a.Unresolved))}");
        foreach (var b in r.Blocks) o.WriteLine(FormattableString.Invariant($"  {b.Label,-40} dim {b.Dimension,6}  {b.Ensemble}  <r> {b.Mean:F4} +- {b.Error:F4}"));
        foreach (var wn in r.Warnings) o.WriteLine($"  warning: {wn}");
        o.WriteLine($"wrote {Path.Combine(outDir, "exact-levels.json")} and .csv");
        return ExitCodes.Ok;
    }

    // ---- parsing (raw tokens, so that a bad value is an input error, not a crash) ----

    private static PauliString ParsePauli(string text, int n, string opt)
    {
        if (!PauliString.TryParse(text, n, out var p, out string? err)) throw new InputException($"{opt}: {err}");
        return p!;
    }

    private static int[]? ParseSites(string text, int n)
    {
        if (text == "all") return null;
        if (text == "none") return [];
        var r = new List<int>();
        foreach (var part in text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            if (!int.TryParse(part, NumberStyles.Integer, Inv, out int j) || j < 0 || j >= n) throw new InputException($"--sites: found '{part}'; expected a site in 0..{n - 1}, 'all' or 'none'");
            r.Add(j);
        }
        return [.. r.Distinct()];
    }

    private static double[] ParseTimes(string text)
    {
        var parts = text.Split(':');
        if (parts.Length == 3)
        {
            double a = ParseDouble(parts[0], "--times start", 0, 1e6), b = ParseDouble(parts[1], "--times stop", 0, 1e6);
            int c = ParseInt(parts[2], "--times count", 1, 100_000);
            if (b < a) throw new InputException($"--times: found stop {b} before start {a}; expected START <= STOP");
            return c == 1 ? [a] : Enumerable.Range(0, c).Select(i => a + (b - a) * i / (c - 1)).ToArray();
        }
        var list = ParseList(text, "--times");
        for (int i = 1; i < list.Length; i++) if (list[i] < list[i - 1]) throw new InputException($"--times: found {list[i]} after {list[i - 1]}; expected ascending times");
        if (list.Any(t => t < 0)) throw new InputException("--times: found a negative time; expected t >= 0");
        return list;
    }

    private static double[] ParseList(string text, string opt)
        => text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries).Select(p => ParseDouble(p, opt, double.MinValue, double.MaxValue)).ToArray() is { Length: > 0 } l
            ? l : throw new InputException($"{opt}: found '{text}'; expected a comma-separated list of numbers");

    private static (double, double) ParseRange(string text, string opt)
    {
        var p = text.Split(':');
        if (p.Length != 2) throw new InputException($"{opt}: found '{text}'; expected LOW:HIGH");
        double lo = ParseDouble(p[0], opt, 1e-300, 1), hi = ParseDouble(p[1], opt, 1e-300, 10);
        if (hi <= lo) throw new InputException($"{opt}: found LOW {lo} >= HIGH {hi}; expected LOW < HIGH");
        return (lo, hi);
    }

    private static double ParseDouble(string text, string opt, double min, double max)
    {
        if (!double.TryParse(text, NumberStyles.Float, Inv, out double v) || !double.IsFinite(v) || v < min || v > max)
        {
            throw new InputException($"{opt}: found '{text}'; expected a number in [{min.ToString(Inv)}, {max.ToString(Inv)}]");
        }
        return v;
    }

    private static int ParseInt(string text, string opt, int min, int max)
    {
        if (!int.TryParse(text, NumberStyles.Integer, Inv, out int v) || v < min || v > max) throw new InputException($"{opt}: found '{text}'; expected an integer in [{min}, {max}]");
        return v;
    }
}
