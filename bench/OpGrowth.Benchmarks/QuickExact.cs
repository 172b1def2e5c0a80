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
            ProbeGroups = int.Parse(Environment.GetEnvironmentVariable("OPGROWTH_PROBE_GROUPS") ?? "1", CultureInfo.InvariantCulture),
        });
        foreach (var e in r.Evaluations) Console.WriteLine($"  n({e.Time:0.#####}) = {e.MeanSize:0.####} +- {e.Error:0.####}");
        Console.WriteLine($"{model} N = {n}: t* = {r.TStar:0.#####} (location {r.LocationError:G2}, sampling {r.SamplingError:G2}; {r.SamplingErrorKind}), {r.Evaluations.Count - 1} evaluations, {r.MatrixVectorProducts} H applications, {sw.Elapsed.TotalSeconds:0.0} s wall, vectors {r.VectorBytes / 1048576.0:0} MiB");
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
