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
    private ulong _s0, _s1, _s2, _s3;
    private ulong _bits;
    private int _left;

    public SampleRandom(long seed, long sample)
    {
        ulong sm = unchecked((ulong)seed * 0x9E3779B97F4A7C15UL ^ ((ulong)sample + 0x632BE59BD9B4E019UL) * 0xBF58476D1CE4E5B9UL);
        _s0 = SplitMix(ref sm);
        _s1 = SplitMix(ref sm);
        _s2 = SplitMix(ref sm);
        _s3 = SplitMix(ref sm);
        _bits = 0;
        _left = 0;
    }

    private static ulong SplitMix(ref ulong s)
    {
        ulong z = s += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>64 uniform bits.</summary>
    public ulong Next()
    {
        ulong result = BitRotate(_s1 * 5, 7) * 9;
        ulong t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = BitRotate(_s3, 45);
        return result;
    }

    private static ulong BitRotate(ulong x, int k) => (x << k) | (x >> (64 - k));

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

    /// <summary>Uniform in 1..15: a non-identity two-qubit Pauli code (4 bits at a time, 0 rejected).</summary>
    public int NextNonIdentityPair()
    {
        while (true)
        {
            if (_left == 0)
            {
                _bits = Next();
                _left = 16;
            }
            int r = (int)(_bits & 15);
            _bits >>= 4;
            _left--;
            if (r != 0) return r;
        }
    }

    /// <summary>Uniform in 1..3: a non-identity single-qubit Pauli code (2 bits at a time, 0 rejected).</summary>
    public int NextNonIdentitySingle()
    {
        while (true)
        {
            if (_left == 0)
            {
                _bits = Next();
                _left = 16;
            }
            int r = (int)(_bits & 3);
            _bits >>= 4;
            _left--;
            if (r != 0) return r;
        }
    }
}
