namespace OpGrowth.Models;

/// <summary>
/// The random-number generator behind random couplings in model files and in the code-built families:
/// xoshiro256** seeded through splitmix64, so a seed gives the same couplings on every machine and
/// .NET version (System.Random does not promise that).
/// </summary>
/// <remarks>
/// Source: D. Blackman and S. Vigna, "Scrambled linear pseudorandom number generators",
/// ACM Trans. Math. Softw. 47, 36 (2021) (xoshiro256**, splitmix64 seeding).
/// Normal deviates use the Box-Muller transform (G. E. P. Box and M. E. Muller, Ann. Math. Stat. 29,
/// 610 (1958)), one deviate per two uniforms (the sine partner is discarded so that every draw consumes
/// the same amount of the stream).
/// </remarks>
public sealed class ModelRandom
{
    private ulong _s0, _s1, _s2, _s3;

    public ModelRandom(long seed)
    {
        ulong x = unchecked((ulong)seed);
        _s0 = SplitMix(ref x);
        _s1 = SplitMix(ref x);
        _s2 = SplitMix(ref x);
        _s3 = SplitMix(ref x);
    }

    private static ulong SplitMix(ref ulong x)
    {
        ulong z = x += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>Next 64 random bits.</summary>
    public ulong NextUInt64()
    {
        ulong result = ulong.RotateLeft(_s1 * 5, 7) * 9;
        ulong t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = ulong.RotateLeft(_s3, 45);
        return result;
    }

    /// <summary>Uniform in [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (NextUInt64() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Uniform in [low, high).</summary>
    public double Uniform(double low, double high) => low + (high - low) * NextDouble();

    /// <summary>Gaussian with the given mean and standard deviation (Box-Muller, cosine branch).</summary>
    public double Normal(double mean, double std)
    {
        double u1 = 1.0 - NextDouble(); // (0, 1]: log is finite
        double u2 = NextDouble();
        return mean + std * Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2.0 * Math.PI * u2);
    }
}
