namespace OpGrowth.Pauli;

/// <summary>
/// A Hamiltonian over a fixed key width, indexed by site: for each site the terms touching it
/// (compressed rows). A string S then meets only the terms that overlap its support; each
/// overlapping term is visited once, at the lowest site it shares with S.
/// </summary>
public sealed class CompiledHamiltonian<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Term strings.</summary>
    public T[] Keys { get; }

    /// <summary>Term coefficients.</summary>
    public double[] Coefficients { get; }

    /// <summary>Row starts into <see cref="SiteTerms"/>, length N + 1.</summary>
    public int[] SiteStart { get; }

    /// <summary>Term indices per site, rows in site order.</summary>
    public int[] SiteTerms { get; }

    public CompiledHamiltonian(int n, (T Key, double Coefficient)[] terms)
    {
        if (n > T.Capacity) throw new ArgumentException($"{n} qubits exceed the key capacity {T.Capacity}.", nameof(n));
        N = n;
        Keys = terms.Select(t => t.Key).ToArray();
        Coefficients = terms.Select(t => t.Coefficient).ToArray();
        var count = new int[n + 1];
        Span<int> sites = stackalloc int[T.Capacity];
        foreach (var k in Keys)
        {
            int m = T.SupportSites(k, sites);
            for (int i = 0; i < m; i++) count[sites[i] + 1]++;
        }
        for (int j = 0; j < n; j++) count[j + 1] += count[j];
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

    /// <summary>Per-site lookup tables of the anticommuting terms (see <see cref="SiteWindows{T}"/>).</summary>
    public SiteWindows<T> Windows { get; }

    /// <summary>Number of terms.</summary>
    public int Count => Keys.Length;

    /// <summary>Terms touching site j.</summary>
    public ReadOnlySpan<int> TermsAt(int j) => SiteTerms.AsSpan(SiteStart[j], SiteStart[j + 1] - SiteStart[j]);
}
