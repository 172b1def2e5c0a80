using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Krylov;

/// <summary>Word-level key permutations against the general PauliString (letters moved site by site).</summary>
public class KeyWordsTests
{
    private static PauliString RandomString(Random rng, int n, int lo, int hi)
    {
        var b = new PauliString.Builder(n);
        for (int j = lo; j <= hi; j++) b.Set(j, "IXYZ"[rng.Next(4)]);
        return b.Build();
    }

    private static PauliString Permute(PauliString s, Func<int, int> site)
    {
        var b = new PauliString.Builder(s.N);
        for (int j = 0; j < s.N; j++) if (s[j] != 'I') b.Set(site(j), s[j]);
        return b.Build();
    }

    private static void Check<T>(int seed) where T : unmanaged, IPauliKey<T>
    {
        var rng = new Random(seed);
        int cap = T.Capacity;
        for (int trial = 0; trial < 200; trial++)
        {
            int lo = rng.Next(cap / 2), hi = lo + rng.Next(cap / 2 - 1);
            var s = RandomString(rng, cap, lo, hi);
            var k = T.From(s);
            int down = rng.Next(lo + 1);
            Assert.Equal(T.From(Permute(s, j => j - down)), KeyWords<T>.ShiftDown(k, down));
            int up = rng.Next(cap - hi);
            Assert.Equal(T.From(Permute(s, j => j + up)), KeyWords<T>.ShiftUp(k, up));
            int m = hi + rng.Next(cap - hi); // mirror j -> m - j keeps sites in range when lo..hi within 0..m
            Assert.Equal(T.From(Permute(s, j => m - j)), KeyWords<T>.Reflect(k, m));
            int ring = hi + 1 + rng.Next(cap - hi);
            int rot = rng.Next(ring);
            Assert.Equal(T.From(Permute(s, j => ((j - rot) % ring + ring) % ring)), KeyWords<T>.RotateDown(k, rot, ring));
        }
    }

    [Fact]
    public void ShiftReflectRotate_Pauli64_MatchSiteBySitePermutation() => Check<Pauli64>(1);

    [Fact]
    public void ShiftReflectRotate_Pauli128_MatchSiteBySitePermutation() => Check<Pauli128>(2);

    [Fact]
    public void ShiftReflectRotate_Wide256_MatchSiteBySitePermutation() => Check<PauliWide<Words4>>(3);
}
