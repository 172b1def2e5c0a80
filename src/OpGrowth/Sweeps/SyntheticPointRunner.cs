using System.Diagnostics;

namespace OpGrowth.Sweeps;

/// <summary>
/// A fast stand-in runner with a known law (<see cref="SyntheticSettings"/>): t*(N) = a + b N or
/// a + b ln N, times (1 + noise * g) with g a standard normal drawn from the point's seed and N only
/// (so results do not depend on run order, threads or machines). Growth rate 1/b for the log law, v_B =
/// 1/(2 b) for the linear law (operator at one end, half-saturation definition). Used by tests and to
/// try a cluster set-up without physics.
/// </summary>
public sealed class SyntheticPointRunner : IPointRunner
{
    public long EstimateMemoryBytes(SweepPoint point) => point.Engine.Synthetic.MemoryBytes;

    public PointResult Run(SweepPoint point, CancellationToken cancellationToken)
    {
        var sw = Stopwatch.StartNew();
        var s = point.Engine.Synthetic;
        if (s.Delay > 0) cancellationToken.WaitHandle.WaitOne(TimeSpan.FromSeconds(s.Delay));
        cancellationToken.ThrowIfCancellationRequested();
        bool linear = s.Law == "linear";
        double t = s.A + s.B * (linear ? point.N : Math.Log(point.N));
        if (point.Seed is long seed && s.Noise > 0) t *= 1 + s.Noise * Gaussian(seed, point.N);
        double? vb = linear && s.B > 0 ? 1 / (2 * s.B) : null;
        double? rate = !linear && s.B > 0 ? 1 / s.B : null;
        return new PointResult
        {
            TStar = t,
            TStarGridError = point.Engine.Dt * point.Engine.RecordEvery / 10,
            TStarTruncationError = Math.Abs(t) * s.TruncationFraction,
            GrowthRate = rate,
            GrowthKind = rate is null ? null : "exponential",
            GrowthRateError = rate * 0.05,
            GrowthRateTruncationError = rate is null ? null : 0,
            VB = vb,
            VBError = vb * 0.05,
            VBTruncationError = vb is null ? null : 0,
            DiscardedWeight = 0,
            FinalSizeFraction = 1,
            FinalTime = point.Engine.Time,
            Engine = "synthetic",
            ProbeResolved = point.Probe,
            Converged = true,
            WallSeconds = sw.Elapsed.TotalSeconds,
            MemoryBytes = s.MemoryBytes,
        };
    }

    /// <summary>A standard normal number fixed by (seed, N): Box-Muller on a SplitMix64 stream.</summary>
    internal static double Gaussian(long seed, int n)
    {
        ulong state = unchecked((ulong)seed * 0x9E3779B97F4A7C15UL + (ulong)n * 0xBF58476D1CE4E5B9UL + 0x94D049BB133111EBUL);
        double u1 = (Next(ref state) >> 11) * (1.0 / (1UL << 53));
        double u2 = (Next(ref state) >> 11) * (1.0 / (1UL << 53));
        if (u1 < 1e-300) u1 = 1e-300;
        return Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }

    // Source: G. L. Steele, D. Lea, C. H. Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014 (SplitMix64).
    private static ulong Next(ref ulong s)
    {
        ulong z = s += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }
}
