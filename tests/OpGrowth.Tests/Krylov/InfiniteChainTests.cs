using OpGrowth.Krylov;

namespace OpGrowth.Tests.Krylov;

/// <summary>Infinite-chain mode: chain choice, boundary independence, run-time boundary check.</summary>
public class InfiniteChainTests
{
    [Fact]
    public void Run_TwoChainLengthsBeyondSupport_SameProbeSite_AgreeExactly()
    {
        // Source: conventions.md: while O_{n-1} stays r sites from both ends, b_n equal the infinite-chain values.
        // Same probe site on a 35- and a 50-site chain: the extra sites are never reached, the strings and the
        // order of every sum are the same, so the coefficients agree bit for bit.
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        const int depth = 16;
        var a = InfiniteChainLanczos.Run(cell, "Z", KrylovTestModels.Options(depth));
        var b = InfiniteChainLanczos.Run(cell, "Z", KrylovTestModels.Options(depth), sites: a.Sites + 15, probeSite: (a.Sites - 1) / 2);
        Assert.Equal(depth, a.VerifiedDepth);
        Assert.Equal(depth, b.VerifiedDepth);
        Assert.Equal(a.B, b.B);
    }

    [Fact]
    public void Run_TwoChainLengthsBeyondSupport_AgreeToRounding()
    {
        // Source: conventions.md: while O_{n-1} stays r sites from both ends, b_n equal the infinite-chain values,
        // so two open chains both long enough must give the same numbers. The keys sit at different positions,
        // so accumulation order differs: agreement to rounding (1e-12), not bit for bit.
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        const int depth = 14;
        var a = InfiniteChainLanczos.Run(cell, "Z", KrylovTestModels.Options(depth));
        var b = InfiniteChainLanczos.Run(cell, "Z", KrylovTestModels.Options(depth), sites: a.Sites + 9);
        Assert.Equal(depth, a.VerifiedDepth);
        Assert.Equal(depth, b.VerifiedDepth);
        Assert.Empty(a.Warnings);
        for (int n = 0; n < depth; n++) Assert.True(Math.Abs(a.B[n] - b.B[n]) <= KrylovTestModels.RoundingTolerance * a.B[n], $"b_{n + 1}: {a.B[n]} vs {b.B[n]}");
    }

    [Fact]
    public void Layout_MixedIsingZ_UsesLightConeOneSitePerTwoSteps()
    {
        // The Z edge needs an X field before a ZZ bond extends it: reach floor(k/2) per side after k steps,
        // far below the generic r k of conventions.md (which stays valid as an upper bound).
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        var reach = LightCone.RightReach(cell, "Z", 10);
        for (int k = 0; k <= 10; k++) Assert.Equal(k / 2, reach[k]);
        var layout = InfiniteChainLanczos.Layout(cell, "Z", 34);
        Assert.Equal(1 + 2 * 16 + 2, layout.Sites); // depth 34: O_33 reaches 16 sites each side, plus r = 1 margin each side
        Assert.Equal(69, layout.GenericSites);
    }

    [Fact]
    public void LightCone_BoundsMeasuredSupportOfEveryKrylovVector()
    {
        // Soundness: the measured support of O_k on a long chain never exceeds the light-cone reach.
        foreach (var (cell, probe) in new[] { (KrylovTestModels.MixedIsing(1, 1.05, 0.5), "Z"), (KrylovTestModels.XX(0.5), "X"), (KrylovTestModels.Tfim(1, 0.6), "ZYZ") })
        {
            const int depth = 10;
            var r = InfiniteChainLanczos.Run(cell, probe, KrylovTestModels.Options(depth), sites: 2 * depth * cell.Range + probe.Length + 4);
            int offset = (r.Sites - probe.Length) / 2;
            var right = LightCone.RightReach(cell, probe, depth);
            var left = LightCone.LeftReach(cell, probe, depth);
            foreach (var s in r.Steps)
            {
                Assert.True(s.SupportLast - (offset + probe.Length - 1) <= right[s.N], $"{probe}: O_{s.N} right edge beyond the light cone");
                Assert.True(offset - s.SupportFirst <= left[s.N], $"{probe}: O_{s.N} left edge beyond the light cone");
            }
        }
    }

    [Fact]
    public void Run_ChainTooShort_FlagsBoundaryAndLimitsVerifiedDepth()
    {
        // XX chain, Z probe: support grows one site per step; on 9 sites O_3 reaches the margin, so b_n for n > 3 are finite-chain values.
        var r = InfiniteChainLanczos.Run(KrylovTestModels.XX(0.5), "Z", KrylovTestModels.Options(8), sites: 9);
        Assert.NotEmpty(r.Warnings);
        Assert.Equal(4, r.VerifiedDepth);
        var ok = InfiniteChainLanczos.Run(KrylovTestModels.XX(0.5), "Z", KrylovTestModels.Options(8));
        for (int n = 0; n < 4; n++) Assert.Equal(ok.B[n], r.B[n], 12);
    }
}

/// <summary>Reflection-reduced storage against plain storage (same chain, same b_n).</summary>
public class ReflectionReductionTests
{
    [Theory]
    [InlineData("mfim", "Z", 18)]
    [InlineData("tfim", "XZX", 12)]
    [InlineData("xx", "ZZ", 14)]
    public void Run_WithReflection_MatchesPlainAndHalvesStrings(string model, string probe, int depth)
    {
        var cell = model switch
        {
            "mfim" => KrylovTestModels.MixedIsing(1, 1.05, 0.5),
            "tfim" => KrylovTestModels.Tfim(1, 0.6),
            _ => KrylovTestModels.XX(0.5),
        };
        var plain = InfiniteChainLanczos.Run(cell, probe, KrylovTestModels.Options(depth));
        var mirrored = InfiniteChainLanczos.Run(cell, probe, KrylovTestModels.Options(depth), useReflection: true);
        Assert.Equal(plain.Sites, mirrored.Sites);
        Assert.Equal(depth, mirrored.VerifiedDepth);
        // Different storage, same mathematics: rounding only.
        for (int n = 0; n < depth; n++) Assert.True(Math.Abs(plain.B[n] - mirrored.B[n]) <= KrylovTestModels.RoundingTolerance * plain.B[n], $"b_{n + 1}: {plain.B[n]} vs {mirrored.B[n]}");
        // A pair of mirror images is stored once: between half and (half + symmetric strings).
        long p = plain.Steps[^1].Strings, m = mirrored.Steps[^1].Strings;
        Assert.InRange(m, p / 2, p / 2 + p / 10 + 2);
    }

    [Fact]
    public void Run_WithReflectionAndAsymmetricProbe_Throws()
        => Assert.Throws<ArgumentException>(() => InfiniteChainLanczos.Run(KrylovTestModels.MixedIsing(1, 1.05, 0.5), "ZX", KrylovTestModels.Options(4), useReflection: true));
}
