using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// A set of mutually commuting Pauli generators P_g with weights w_g, indexed by site. Conjugating
/// by exp(-i s sum_g w_g P_g) factorises into commuting Pauli rotations with angles
/// theta_g = 2 s w_g, so the whole group is applied exactly, in any order, in one pass.
/// For Trotter steps w_g are the Hamiltonian coefficients and s a fraction of the step; for a
/// periodic drive w_g = angle_g / 2 and s = 1.
/// </summary>
internal sealed class RotationGroup<T> where T : unmanaged, IPauliKey<T>
{
    public int N { get; }

    public T[] Keys { get; }

    public double[] Weights { get; }

    /// <summary>Row starts into <see cref="SiteTerms"/>, length N + 1.</summary>
    public int[] SiteStart { get; }

    /// <summary>Generator indices touching each site, rows in site order.</summary>
    public int[] SiteTerms { get; }

    /// <summary>Largest number of group generators that touch one site.</summary>
    public int MaxPerSite { get; }

    public RotationGroup(int n, IReadOnlyList<T> keys, IReadOnlyList<double> weights)
    {
        N = n;
        Keys = [.. keys];
        Weights = [.. weights];
        var count = new int[n + 1];
        Span<int> sites = stackalloc int[T.Capacity];
        foreach (var k in Keys)
        {
            int m = T.SupportSites(k, sites);
            for (int i = 0; i < m; i++) count[sites[i] + 1]++;
        }
        int max = 0;
        for (int j = 0; j < n; j++)
        {
            max = Math.Max(max, count[j + 1]);
            count[j + 1] += count[j];
        }
        MaxPerSite = max;
        SiteStart = (int[])count.Clone();
        SiteTerms = new int[count[n]];
        var fill = (int[])count.Clone();
        for (int t = 0; t < Keys.Length; t++)
        {
            int m = T.SupportSites(Keys[t], sites);
            for (int i = 0; i < m; i++) SiteTerms[fill[sites[i]]++] = t;
        }
        Windows = new SiteWindows<T>(Keys, SiteStart, SiteTerms, n);
    }

    /// <summary>Per-site lookup tables of the anticommuting generators (see <see cref="SiteWindows{T}"/>).</summary>
    public SiteWindows<T> Windows { get; }

    /// <summary>Number of generators.</summary>
    public int Count => Keys.Length;
}
