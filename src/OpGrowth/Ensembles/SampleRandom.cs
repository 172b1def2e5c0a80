namespace OpGrowth.Ensembles;

/// <summary>
/// The random stream of one sample: xoshiro256** seeded by SplitMix64 from (seed, sample index), so a
/// sample draws the same numbers whichever thread runs it (results are bit-identical at any thread count).
/// </summary>
/// <remarks>
/// Source: D. Blackman, S. Vigna, "Scrambled linear pseudorandom number generators", ACM TOMS 47, 36 (2021)
/// (xoshiro256**); G. L. Steele, D. Lea, C. H. Flood, OOPSLA 2014 (SplitMix64 seeding).
/// </remarks>
internal struct SampleRandom
{
    // The project's xoshiro256** stream (Models.ModelRandom), seeded from (seed, sample): one object per sample, none per gate.
    private readonly OpGrowth.Models.ModelRandom _r;
    private ulong _bits;
    private int _left;

    public SampleRandom(long seed, long sample)
    {
        _r = new OpGrowth.Models.ModelRandom(unchecked((long)((ulong)seed * 0x9E3779B97F4A7C15UL ^ ((ulong)sample + 0x632BE59BD9B4E019UL) * 0xBF58476D1CE4E5B9UL)));
        _bits = 0;
        _left = 0;
    }

    /// <summary>64 uniform bits.</summary>
    public readonly ulong Next() => _r.NextUInt64();

    /// <summary>Uniform in (0, 1], never 0 (safe for a logarithm).</summary>
    public double NextOpenDouble() => ((Next() >> 11) + 1) * (1.0 / (1UL << 53));

    /// <summary>Uniform integer in 0..n-1 (Lemire's multiply-shift with rejection: unbiased).</summary>
    public int NextInt(int n)
    {
        // Source: D. Lemire, "Fast random integer generation in an interval", ACM TOMACS 29, 3 (2019).
        ulong m = (ulong)(uint)Next() * (ulong)n;
        uint low = (uint)m;
        if (low < (uint)n)
        {
            uint threshold = (uint)(-n) % (uint)n;
            while (low < threshold)
            {
                m = (ulong)(uint)Next() * (ulong)n;
                low = (uint)m;
            }
        }
        return (int)(m >> 32);
    }

    /// <summary>Uniform in 1..15: a non-identity two-qubit Pauli code.</summary>
    public int NextNonIdentityPair() => NextNonZero(15);

    /// <summary>Uniform in 1..3: a non-identity single-qubit Pauli code.</summary>
    public int NextNonIdentitySingle() => NextNonZero(3);

    /// <summary>Uniform in 1..mask (mask 15 or 3): 4 buffered bits per try, masked, 0 rejected.</summary>
    private int NextNonZero(int mask)
    {
        while (true)
        {
            if (_left == 0)
            {
                _bits = Next();
                _left = 16;
            }
            int r = (int)(_bits & (ulong)mask);
            _bits >>= 4;
            _left--;
            if (r != 0) return r;
        }
    }
}
