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
/// increments that add up to about t*. Seconds per application are timed on the target N itself up to
/// <see cref="TimedLimit"/> qubits (a 64 MiB vector), in the search's own arrangement (two single-thread propagations
/// side by side when it splits, so memory-bandwidth contention is in the figure), and beyond that at the limit scaled
/// by the amplitude updates (2^N times the number of X-mask groups plus the diagonal). Timing a small member instead
/// (N = 12, as before) overestimated the all-to-all cluster by 4-5x (fixed per-group costs dominate small vectors)
/// and underestimated SYK (its coefficient tables fall out of cache at larger N). The half width comes from a
/// Lanczos estimate at the smaller size scaled by N (extensive energies). Memory is the search's own
/// <see cref="ScramblingTimeSearch.PlannedVectorBytes"/> plus the appliers' diagonals and a fixed reserve. Measured
/// ratios of actual to estimated time are quoted in docs/exact-engine.md.
/// </remarks>
public static class ScramblingTimeCost
{
    /// <summary>Largest N timed directly (one vector of 2^22 amplitudes is 64 MiB).</summary>
    public const int TimedLimit = 22;

    /// <summary>Relative times of the evaluations of a typical search, and of its forward increments, in units of t*.</summary>
    private static readonly double[] BackwardTimes = [0.5, 0.8, 1.05, 1.0];
    private static readonly double[] ForwardTimes = [0.5, 0.3, 0.2];

    /// <summary>
    /// Estimates a search on <paramref name="h"/> (at the target N) from a smaller member <paramref name="small"/> of the
    /// same family (used for the spectral width, and for timing when N is above <see cref="TimedLimit"/> and no
    /// <paramref name="timing"/> member is given; null: <paramref name="h"/> itself). <paramref name="siteBlocks"/>
    /// says whether the vectors per state are site blocks (no probe-group diagonals) or random-sign probe groups.
    /// </summary>
    public static ScramblingTimeEstimate Estimate(Hamiltonian h, Hamiltonian? small, double tStar, int samples, int vectorsPerState, int threads, double tolerance = 1e-8, bool siteBlocks = false, Hamiltonian? timing = null)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (!(tStar > 0)) throw new ArgumentOutOfRangeException(nameof(tStar), tStar, "t* must be positive.");
        threads = Math.Max(1, threads);
        var probeH = small ?? h;
        var timedH = timing ?? (h.N <= TimedLimit ? h : probeH);
        long dim = 1L << h.N;
        bool split = threads >= 2 && dim >= StateVector.ParallelThreshold;
        double perTimed = TimeApplication(timedH, split, threads);
        double perApp = perTimed * Units(h.N, CountGroups(h)) / Units(timedH.N, CountGroups(timedH));
        var bounds = SpectralBounds.Estimate(new PauliHamiltonianApplier(probeH, 1), steps: 40);
        double rho = bounds.HalfWidth * h.N / probeH.N;
        double x = rho * tStar;
        double perVector = BackwardTimes.Sum(f => Terms(f * x, tolerance)) + ForwardTimes.Sum(f => Terms(f * x, tolerance));
        long vectors = (long)vectorsPerState * samples;
        long apps = (long)Math.Ceiling(vectors * perVector) + 60;
        double seconds = (vectors * perVector + 60) * perApp;
        long bytes = ScramblingTimeSearch.PlannedVectorBytes(h.N, siteBlocks, vectorsPerState, samples, threads)
            + (split ? 3 : 1) * dim * 8 + (96L << 20);
        string basis = timedH.N == h.N
            ? (small is null ? $"timed at N = {h.N}" : $"H timed at N = {h.N}, its spectral width estimated at N = {small.N} and scaled")
            : $"H timed at N = {timedH.N} and its spectral width estimated at N = {probeH.N}, scaled to N = {h.N}";
        return new ScramblingTimeEstimate(seconds, bytes, apps, rho, tStar, perApp, basis);
    }

    // Wall seconds per application of H as the search does it: with split, two single-thread appliers on two vectors
    // at the same time (per application: half the wall time of the pair); otherwise one applier on all threads.
    private static double TimeApplication(Hamiltonian h, bool split, int threads)
    {
        int n = h.N;
        var psi = new[] { StateVector.Create(n), StateVector.Create(n) };
        var outs = new[] { new Complex[psi[0].Length], new Complex[psi[0].Length] };
        StateVector.FillHaarRandom(psi[0], new Random(1));
        StateVector.FillHaarRandom(psi[1], new Random(2));
        var apps = split ? new[] { new PauliHamiltonianApplier(h, 1), new PauliHamiltonianApplier(h, 1) } : new[] { new PauliHamiltonianApplier(h, threads) };
        void Once()
        {
            if (split) Parallel.For(0, 2, new ParallelOptions { MaxDegreeOfParallelism = 2 }, i => apps[i].Apply(psi[i], outs[i]));
            else apps[0].Apply(psi[0], outs[0]);
        }
        Once(); // warm-up (JIT, page faults)
        var sw = Stopwatch.StartNew();
        int reps = 0;
        do
        {
            Once();
            reps++;
        }
        while (reps < 2 || (sw.Elapsed.TotalSeconds < 0.3 && reps < 200));
        double perOnce = sw.Elapsed.TotalSeconds / reps;
        return split ? perOnce / 2 : perOnce;
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
