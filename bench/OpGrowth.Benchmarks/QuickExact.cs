using System.Diagnostics;
using System.Globalization;
using System.Numerics;
using OpGrowth.Exact;
using OpGrowth.Models;

namespace OpGrowth.Benchmarks;

/// <summary>
/// Hand timer for the exact engine: H|psi&gt; of a shipped model at size N (`-- quick-apply MODEL N THREADS [REPS]`).
/// For quick checks while tuning; the quoted figures come from <see cref="ScramblingTimeBenchmarks"/>.
/// </summary>
internal static class QuickExact
{
    public static void Apply(string model, int n, int threads, int reps)
    {
        var m = ModelLoader.Load(ShippedModels.Resolve(model), new Dictionary<string, string> { ["N"] = n.ToString(CultureInfo.InvariantCulture) });
        var sw = Stopwatch.StartNew();
        var app = new PauliHamiltonianApplier(m.Hamiltonian, threads);
        Console.WriteLine($"{model} N = {n}: {m.Hamiltonian.Terms.Count} terms, {app.OffDiagonalGroups} off-diagonal groups ({app.ExchangePairs} exchange pairs, {app.TableGroups} table groups), built in {sw.Elapsed.TotalSeconds:0.00} s");
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(1));
        var o = new Complex[psi.Length];
        app.Apply(psi, o);
        sw.Restart();
        for (int r = 0; r < reps; r++) app.Apply(psi, o);
        double per = sw.Elapsed.TotalSeconds / reps;
        Console.WriteLine($"  H psi: {per * 1e3:0.0} ms per application ({threads} thread(s))");
    }
}

/// <summary>Hand timer of the t* search (`-- quick-tstar MODEL N THREADS [SAMPLES] [SEED]`).</summary>
internal static class QuickScramblingTime
{
    public static void Run(string model, int n, int threads, int samples, int seed)
    {
        var m = ModelLoader.Load(ShippedModels.Resolve(model), new Dictionary<string, string> { ["N"] = n.ToString(CultureInfo.InvariantCulture) });
        var sw = Stopwatch.StartNew();
        var r = ScramblingTimeSearch.Run(m.Hamiltonian, new ScramblingTimeSearchOptions
        {
            Operator = m.Probes[0],
            MajoranaSize = m.SizeMeasure == SizeMeasure.Majoranas,
            Threads = threads,
            Samples = samples,
            Seed = seed,
            SiteBlocks = Environment.GetEnvironmentVariable("OPGROWTH_SITE_BLOCKS") is string sb ? sb == "1" : ScramblingTimeSearch.DefaultSiteBlocks(m.Lattice.Diameter, m.SizeMeasure == SizeMeasure.Majoranas),
            ProbeGroups = int.Parse(Environment.GetEnvironmentVariable("OPGROWTH_PROBE_GROUPS") ?? "0", CultureInfo.InvariantCulture) is int pg && pg > 0 ? pg : ScramblingTimeSearch.DefaultProbeGroups(n, m.Lattice.Diameter),
        });
        foreach (var e in r.Evaluations) Console.WriteLine($"  n({e.Time:0.#####}) = {e.MeanSize:0.####} +- {e.Error:0.####}");
        Console.WriteLine($"{model} N = {n}: t* = {r.TStar:0.#####} (location {r.LocationError:G2}, sampling {r.SamplingError:G2}; {r.SamplingErrorKind}), {r.Evaluations.Count - 1} evaluations, {r.Estimator}, {r.MatrixVectorProducts} H applications, {sw.Elapsed.TotalSeconds:0.0} s wall, vectors {r.VectorBytes / 1048576.0:0} MiB");
    }
}

/// <summary>Random-sign mean size against dense traces at one time (`-- quick-sizecheck MODEL N T SAMPLES GROUPS`).</summary>
internal static class QuickSizeCheck
{
    public static void Run(string model, int n, double t, int samples, int groups)
    {
        var m = ModelLoader.Load(ShippedModels.Resolve(model), new Dictionary<string, string> { ["N"] = n.ToString(CultureInfo.InvariantCulture) });
        var dense = ExactOtoc.Run(m.Hamiltonian, new ExactOtocOptions { Operator = m.Probes[0], Times = [t], Method = OtocMethod.Dense });
        var r = ScramblingTimeSearch.MeanSizes(m.Hamiltonian, new ScramblingTimeSearchOptions { Operator = m.Probes[0], Samples = samples, ProbeGroups = groups }, [t]);
        var e = r.Evaluations[^1];
        double mean = e.MeanSize;
        double sd = Math.Sqrt(e.PerSample.Sum(v => (v - mean) * (v - mean)) / (e.PerSample.Count - 1));
        Console.WriteLine($"{model} N = {n}, t = {t}: dense {dense.MeanSize!.Values[0]:0.####}; probe mean {mean:0.####} +- {e.Error:0.####}, per-state sd {sd:0.####} (a priori {0.75 * 3 * n / Math.Sqrt(1 << n) / 3:0.####}), groups {r.ProbeGroups}");
    }
}

/// <summary>Managed dense factorisation timings (`-- quick-svd N`): MathNet SVD and symmetric EVD of the Gram matrix.</summary>
internal static class QuickSvd
{
    public static void Run(int n)
    {
        var rng = new Random(1);
        var m = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.Dense(n, n, (i, j) => rng.NextDouble() - 0.5);
        var sw = Stopwatch.StartNew();
        int reps = 0;
        while (sw.Elapsed.TotalSeconds < 2) { _ = m.Svd(true); reps++; }
        Console.WriteLine($"MathNet SVD {n}x{n}: {sw.Elapsed.TotalMilliseconds / reps:0.0} ms");
        sw.Restart(); reps = 0;
        while (sw.Elapsed.TotalSeconds < 2) { var g = m.TransposeThisAndMultiply(m); _ = g.Evd(MathNet.Numerics.LinearAlgebra.Symmetricity.Symmetric); reps++; }
        Console.WriteLine($"MathNet Gram + EVD {n}x{n}: {sw.Elapsed.TotalMilliseconds / reps:0.0} ms");
    }
}

/// <summary>Front engine check and timing (`-- quick-front MODEL N PROBE TIME DT CHI1,CHI2,...`).</summary>
internal static class QuickFront
{
    public static void Run(string model, int n, string probe, double time, double dt, int[] chis)
    {
        var m = ModelLoader.Load(ShippedModels.Resolve(model), new Dictionary<string, string> { ["N"] = n.ToString(CultureInfo.InvariantCulture) });
        var p = OpGrowth.Pauli.PauliString.Parse(probe, n);
        var sw = Stopwatch.StartNew();
        var r = OpGrowth.Evolution.FrontEvolution.Run(m.Hamiltonian, p, new OpGrowth.Evolution.FrontEvolutionOptions { Time = time, Dt = dt, BondDimensions = chis, Cutoff = double.Parse(Environment.GetEnvironmentVariable("OPGROWTH_FRONT_CUTOFF") ?? "1e-16", CultureInfo.InvariantCulture), RecordEvery = Math.Max(1, (int)Math.Round(0.1 / dt)) });
        foreach (var run in r.Runs)
        {
            var b = run.Figures.Butterfly?.Primary;
            Console.WriteLine($"chi {run.BondDimension}: {run.WallSeconds:0.0} s, max bond {run.MaxBond.Max()}, final norm {run.NormSquared[^1]:0.######}, v_B {b?.Velocity:0.###} +- {b?.VelocityError:0.###}, mean size at end {run.MeanSize[^1]:0.###}, t* {run.Figures.ScramblingTime.Value:0.###}");
            Console.WriteLine("   arrival: " + string.Join(" ", (b?.ArrivalTimes ?? []).Select(x => x.ToString("0.##", CultureInfo.InvariantCulture))));
        }
        Console.WriteLine($"converged to distance {r.ConvergedDistance} of {r.MaxDistance}; part at {r.PartDistance} (t = {r.PartTime}); {sw.Elapsed.TotalSeconds:0.0} s");
        if (n <= 10)
        {
            var dense = ExactOtoc.Run(m.Hamiltonian, new ExactOtocOptions { Operator = p, Times = [r.Runs[^1].Times[^1]], Method = OtocMethod.Dense });
            double maxd = 0;
            foreach (var s in dense.Sites) maxd = Math.Max(maxd, Math.Abs(s.Weight.Values[0] - r.Runs[^1].SiteWeights[^1][s.Site]));
            Console.WriteLine($"max |rho_j(front) - rho_j(dense)| at t = {r.Runs[^1].Times[^1]}: {maxd:E2}");
        }
    }
}

/// <summary>Timing of the run's cross-check parts at small N (`-- quick-crosscheck MODEL N T`).</summary>
internal static class QuickCrossCheck
{
    public static void Run(string model, int n, double time)
    {
        var m = ModelLoader.Load(ShippedModels.Resolve(model), new Dictionary<string, string> { ["N"] = n.ToString(CultureInfo.InvariantCulture) });
        var times = Enumerable.Range(0, 31).Select(i => i * time / 30).ToArray();
        var sw = Stopwatch.StartNew();
        var dense = ExactOtoc.Run(m.Hamiltonian, new ExactOtocOptions { Operator = m.Probes[0], Times = times, Method = OtocMethod.Dense, Tolerance = 1e-12, Threads = 2 });
        Console.WriteLine($"dense exact OTOC, {times.Length} times: {sw.Elapsed.TotalSeconds:0.00} s");
        sw.Restart();
        var evo = OpGrowth.Evolution.OperatorEvolution.Run(new OpGrowth.Evolution.EvolutionProblem { N = n, Name = model, Hamiltonian = m.Hamiltonian, Initial = OpGrowth.Evolution.EvolutionProblem.Probe(m.Probes[0]) },
            new OpGrowth.Evolution.EvolutionOptions { Method = OpGrowth.Evolution.IntegrationMethod.Taylor, Dt = double.Parse(Environment.GetEnvironmentVariable("CC_DT") ?? "0.1", CultureInfo.InvariantCulture), Time = time, RecordEvery = 1, Threads = 2, LadderRungs = 1, Truncation = OpGrowth.Evolution.TruncationPolicy.None });
        Console.WriteLine($"Pauli engine, Taylor, no truncation: {sw.Elapsed.TotalSeconds:0.00} s ({evo.Main.Records.Count} records, {evo.Main.Records[^1].Strings} strings)");
    }
}

/// <summary>Front contours at several thresholds per bond dimension (`-- quick-contours N T CHI1,CHI2`).</summary>
internal static class QuickContours
{
    public static void Run(int n, double time, int[] chis)
    {
        var m = ModelLoader.Load(ShippedModels.Resolve("mixed-field-ising"), new Dictionary<string, string> { ["N"] = n.ToString(CultureInfo.InvariantCulture) });
        var r = OpGrowth.Evolution.FrontEvolution.Run(m.Hamiltonian, OpGrowth.Pauli.PauliString.Single(n, 0, 'Z'), new OpGrowth.Evolution.FrontEvolutionOptions { Time = time, BondDimensions = chis, RecordEvery = 10 });
        double[] thr = [1e-4, 1e-3, 0.01, 0.1, 0.375];
        foreach (var run in r.Runs)
        {
            Console.WriteLine($"chi {run.BondDimension}:");
            for (int i = 0; i < run.Times.Length; i += 2)
            {
                var w = run.SiteWeights[i];
                string c = string.Join(" ", thr.Select(th => { int last = -1; for (int j = 0; j < n; j++) if (w[j] >= th) last = j; return last.ToString(CultureInfo.InvariantCulture); }));
                Console.WriteLine($"  t={run.Times[i]:0.#} norm={run.NormSquared[i]:0.####} contours(1e-4,1e-3,0.01,0.1,0.375)= {c}");
            }
        }
    }
}
