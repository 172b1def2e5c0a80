using OpGrowth.Pauli;

namespace OpGrowth.Tests.Exact;

/// <summary>Hamiltonians built in code for the exact-engine tests (open chains unless stated).</summary>
internal static class TestModels
{
    public static PauliString P(string s, int n) => PauliString.Parse(s, n);

    /// <summary>H = J sum Z_i Z_{i+1} + hx sum X_i + hz sum Z_i (open chain).</summary>
    public static Hamiltonian MixedFieldIsing(int n, double j = 1.0, double hx = 1.05, double hz = 0.5)
    {
        var t = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) t.Add(new(P($"Z_{i} Z_{i + 1}", n), j));
        for (int i = 0; i < n; i++) t.Add(new(P($"X_{i}", n), hx));
        if (hz != 0) for (int i = 0; i < n; i++) t.Add(new(P($"Z_{i}", n), hz));
        return new Hamiltonian(n, t);
    }

    /// <summary>H = -J sum Z_i Z_{i+1} - h sum X_i (open chain).</summary>
    public static Hamiltonian TransverseIsing(int n, double j = 1.0, double h = 0.7)
    {
        var t = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) t.Add(new(P($"Z_{i} Z_{i + 1}", n), -j));
        for (int i = 0; i < n; i++) t.Add(new(P($"X_{i}", n), -h));
        return new Hamiltonian(n, t);
    }

    /// <summary>H = Jp sum (X_i X_{i+1} + Y_i Y_{i+1}) + sum h_i Z_i (open chain).</summary>
    public static Hamiltonian XX(int n, double jp = 1.0, double[]? fields = null)
    {
        var t = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++)
        {
            t.Add(new(P($"X_{i} X_{i + 1}", n), jp));
            t.Add(new(P($"Y_{i} Y_{i + 1}", n), jp));
        }
        if (fields is not null) for (int i = 0; i < n; i++) t.Add(new(P($"Z_{i}", n), fields[i]));
        return new Hamiltonian(n, t);
    }

    /// <summary>A random Hamiltonian with every letter (Y terms make it complex), fixed seed.</summary>
    public static Hamiltonian RandomLocal(int n, int seed, bool withY = true)
    {
        var rng = new Random(seed);
        var t = new List<PauliTerm>();
        string letters = withY ? "XYZ" : "XZ";
        for (int i = 0; i < n; i++)
        {
            foreach (char a in letters) t.Add(new(P($"{a}_{i}", n), rng.NextDouble() - 0.5));
            if (i + 1 < n)
            {
                foreach (char a in letters)
                {
                    foreach (char b in letters) t.Add(new(P($"{a}_{i} {b}_{i + 1}", n), rng.NextDouble() - 0.5));
                }
            }
            if (i + 2 < n) t.Add(new(P($"X_{i} Z_{i + 1} Y_{i + 2}", n), withY ? 0.3 : 0));
        }
        t.Add(new(PauliString.Identity(n), 0.25));
        return new Hamiltonian(n, t.Where(x => x.Coefficient != 0));
    }
}
