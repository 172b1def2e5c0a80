using System.Numerics;

namespace OpGrowth.Pauli;

/// <summary>
/// Lookup tables that answer, for one site j of a string S, which of the terms touching j are visited by
/// <see cref="LiouvilleTerms.ForEachAnticommuting"/> at j: those that anticommute with S and share no site
/// below j with it. Both conditions depend only on S's letters on the sites the terms at j cover (their
/// window), so for every window of at most <see cref="MaxWidth"/> sites a table indexed by those letters
/// (<see cref="IPauliKey{TSelf}.Window"/>) holds the answer as a bit mask over the site's row of terms.
/// One load and one bit scan per support site replace a symplectic product and an overlap test per term,
/// and with them the unpredictable branch on each term.
/// </summary>
/// <remarks>
/// The set bits are taken lowest first, which is the row's order, so the terms are visited in exactly the
/// order of the term-by-term loop (and the results are the same bits). Sites whose terms span more than
/// <see cref="MaxWidth"/> sites, or that have more than 64 terms, keep the term-by-term loop. Sites with the
/// same relative pattern (the interior of a uniform chain) share one table, so a chain's tables take a few
/// kilobytes.
/// </remarks>
public sealed class SiteWindows<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Widest window given a table (4^6 entries of 8 bytes = 32 KiB).</summary>
    public const int MaxWidth = 6;

    /// <summary>Per site: its window and the offset of its table in <see cref="Masks"/> (-1: no table).</summary>
    internal readonly SiteWindow[] Sites;

    /// <summary>The tables, one after another: bit r of entry w is set when row term r is visited for window letters w.</summary>
    internal readonly ulong[] Masks;

    /// <summary>
    /// Beside <see cref="Masks"/>: bit r set when the product of row term r with the string is i^1 times a
    /// string (P_t S = i^k P3; k depends only on the letters in the window), i.e. when i[P_t, S] = -2 P3.
    /// </summary>
    internal readonly ulong[] Signs;

    /// <summary>Sites with a table.</summary>
    public int Covered { get; }

    /// <summary>Builds the tables for terms indexed by site (rows of <paramref name="siteTerms"/> from <paramref name="siteStart"/>) on <paramref name="n"/> sites.</summary>
    public SiteWindows(T[] keys, int[] siteStart, int[] siteTerms, int n) : this(keys, siteStart, siteTerms, n, MaxWidth)
    {
    }

    /// <summary>As above with windows of at most <paramref name="maxWidth"/> sites (0: no tables, every site tested term by term).</summary>
    internal SiteWindows(T[] keys, int[] siteStart, int[] siteTerms, int n, int maxWidth)
    {
        ArgumentOutOfRangeException.ThrowIfGreaterThan(maxWidth, MaxWidth);
        Sites = new SiteWindow[n];
        var masks = new List<ulong>();
        var signs = new List<ulong>();
        var shared = new Dictionary<string, int>();
        Span<int> support = stackalloc int[T.Capacity];
        for (int j = 0; j < n; j++)
        {
            int row = siteStart[j], count = siteStart[j + 1] - row;
            int lo = j, hi = j;
            for (int r = 0; r < count; r++)
            {
                var k = keys[siteTerms[row + r]];
                lo = Math.Min(lo, k.FirstSite);
                hi = Math.Max(hi, k.LastSite);
            }
            int width = hi - lo + 1;
            if (count == 0 || count > 64 || width > maxWidth)
            {
                Sites[j] = new SiteWindow(lo, width, -1);
                continue;
            }
            // The letters of each term on the window, and the window's sites below j.
            var tx = new int[count];
            var tz = new int[count];
            for (int r = 0; r < count; r++)
            {
                var k = keys[siteTerms[row + r]];
                for (int p = 0; p < width; p++)
                {
                    int code = k.LetterCode(lo + p);
                    tx[r] |= (code & 1) << p;
                    tz[r] |= (code >> 1) << p;
                }
            }
            int below = (1 << (j - lo)) - 1;
            var table = new ulong[1 << (2 * width)];
            var sign = new ulong[table.Length];
            for (int w = 0; w < table.Length; w++)
            {
                int sx = w & ((1 << width) - 1), sz = w >> width;
                int sSupport = sx | sz;
                ulong bits = 0, neg = 0;
                for (int r = 0; r < count; r++)
                {
                    bool anti = (BitOperations.PopCount((uint)((tx[r] & sz) ^ (tz[r] & sx))) & 1) != 0;
                    bool overlapBelow = ((tx[r] | tz[r]) & sSupport & below) != 0;
                    if (!anti || overlapBelow) continue;
                    bits |= 1UL << r;
                    // The keys' phase rule on the window (sites outside it add nothing: the term is the identity there).
                    int px = tx[r] ^ sx, pz = tz[r] ^ sz;
                    int k = (BitOperations.PopCount((uint)(tx[r] & tz[r])) + BitOperations.PopCount((uint)(sx & sz))
                             - BitOperations.PopCount((uint)(px & pz)) + 2 * BitOperations.PopCount((uint)(tz[r] & sx))) & 3;
                    if (k == 1) neg |= 1UL << r;
                }
                table[w] = bits;
                sign[w] = neg;
            }
            var bytes = new byte[16 * table.Length];
            System.Runtime.InteropServices.MemoryMarshal.AsBytes(table.AsSpan()).CopyTo(bytes);
            System.Runtime.InteropServices.MemoryMarshal.AsBytes(sign.AsSpan()).CopyTo(bytes.AsSpan(8 * table.Length));
            string id = Convert.ToBase64String(bytes);
            if (!shared.TryGetValue(id, out int offset))
            {
                offset = masks.Count;
                masks.AddRange(table);
                signs.AddRange(sign);
                shared.Add(id, offset);
            }
            Sites[j] = new SiteWindow(lo, width, offset);
            Covered++;
        }
        Masks = [.. masks];
        Signs = [.. signs];
    }
}

/// <summary>One site's window: first site, width, and the offset of its table (-1: tested term by term).</summary>
internal readonly record struct SiteWindow(int First, int Width, int Offset);
