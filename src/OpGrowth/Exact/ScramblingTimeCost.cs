using System.Diagnostics;
using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>What a <see cref="ScramblingTimeSearch"/> is expected to cost before it runs.</summary>
/// <param name="Seconds">Wall time on the given threads.</param>
/// <param name="Bytes">Peak memory: state vectors, the diagonal and a fixed reserve.</param>
/// <param name="Applications">Applications of H.</param>
/// <param name="HalfWidth">Spectral half width assumed for the Chebyshev series.</param>
/// <param name="TStar">The t* the estimate assumes.</param>
/// <param name="SecondsPerApplication">One application of H at N on one thread.</param>
/// <param name="Basis">How the inputs were obtained, in one sentence.</param>
public sealed record ScramblingTimeEstimate(double Seconds, long Bytes, long Applications, double HalfWidth, double TStar, double SecondsPerApplication, string Basis);

/// <summary>
/// Cost model of the t* search: (vectors per state: 2N site blocks or G + 1 probe groups) x (random states) vectors, each propagated forward and backward
/// over the evaluation times, each propagation about K(rho t) applications of H, where K is the length of the
/// Chebyshev series (Tal-Ezer and Kosloff 1984) for half width rho at the search's tolerance.
/// </summary>
/// <remarks>
/// The typical search evaluates at about 0.5, 0.8, 1.05 and 1.0 t* (measured: 3 to 5 evaluations), with forward
/// increments that add up to about t*. Seconds per application come from timing the same model at a smaller
/// size and scaling by the amplitude updates (2^N times the number of X-mask groups plus the diagonal); the half
/// width from a Lanczos estimate at the smaller size scaled by N (extensive energies). Both are estimates: the
/// measured ratio of actual to estimated time is quoted in docs/exact-engine.md.
/// </remarks>
public static class ScramblingTimeCost
{
    /// <summary>Relative times of the evaluations of a typical search, and of its forward increments, in units of t*.</summary>
    private static readonly double[] BackwardTimes = [0.5, 0.8, 1.05, 1.0];
    private static readonly double[] ForwardTimes = [0.5, 0.3, 0.2];

    /// <summary>
    /// Estimates a search on <paramref name="h"/> (at the target N) from a smaller member <paramref name="small"/> of the
    /// same family (used for timing and the spectral width; null: time <paramref name="h"/> itself).
    /// </summary>
    public static ScramblingTimeEstimate Estimate(Hamiltonian h, Hamiltonian? small, double tStar, int samples, int vectorsPerState, int threads, double tolerance = 1e-8)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (!(tStar > 0)) throw new ArgumentOutOfRangeException(nameof(tStar), tStar, "t* must be positive.");
        var probeH = small ?? h;
        var app = new PauliHamiltonianApplier(probeH, 1);
        double units = Units(probeH.N, CountGroups(probeH));
        var psi = StateVector.Create(probeH.N);
        StateVector.FillHaarRandom(psi, new Random(1));
        var o = new Complex[psi.Length];
        app.Apply(psi, o);
        int reps = Math.Max(2, (int)Math.Min(50, 2e7 / units));
        var sw = Stopwatch.StartNew();
        for (int r = 0; r < reps; r++) app.Apply(psi, o);
        double perUnit = sw.Elapsed.TotalSeconds / reps / units;
        var bounds = SpectralBounds.Estimate(app, steps: 40);
        double rho = bounds.HalfWidth * h.N / probeH.N;
        int groupsN = CountGroups(h);
        double perApp = perUnit * Units(h.N, groupsN);
        double x = rho * tStar;
        double perVector = BackwardTimes.Sum(f => Terms(f * x, tolerance)) + ForwardTimes.Sum(f => Terms(f * x, tolerance));
        long vectors = (long)vectorsPerState * samples;
        long apps = (long)Math.Ceiling(vectors * perVector) + 60;
        int parallel = threads >= 2 ? 2 : 1;
        double seconds = vectors * perVector * perApp / parallel + 60 * perApp / Math.Max(1, threads * 0.8);
        long dim = 1L << h.N;
        long bytes = (2L * vectors + 13) * dim * 16 + 3 * dim * 8 + (96L << 20);
        string basis = small is null
            ? $"timed at N = {h.N}"
            : $"H timed and its spectral width estimated at N = {small.N}, scaled to N = {h.N}";
        return new ScramblingTimeEstimate(seconds, bytes, apps, rho, tStar, perApp, basis);
    }

    /// <summary>Applications of H in one Chebyshev propagation over x = rho t at the tolerance.</summary>
    public static int Terms(double x, double tolerance) => x <= 0 ? 0 : ChebyshevPropagator.Coefficients(x, 1, tolerance).Coefficients.Length - 1;

    private static double Units(int n, int groups) => Math.Pow(2, n) * (groups + 1);

    /// <summary>Distinct X masks among the off-diagonal terms (one pass of 2^N amplitudes each).</summary>
    public static int CountGroups(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        var set = new HashSet<ulong>();
        foreach (var t in h.Terms)
        {
            if (t.String.N > 64) return h.Terms.Count;
            ulong x = t.String.X[0];
            if (x != 0) set.Add(x);
        }
        return set.Count;
    }
}
