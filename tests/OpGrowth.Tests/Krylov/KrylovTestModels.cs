using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Krylov;

/// <summary>Models built in code for the Krylov tests (unit cells and explicit chains), and shared tolerances.</summary>
internal static class KrylovTestModels
{
    /// <summary>Rounding-level agreement between two routes doing the same arithmetic in different orders (about 100 ulp of O(10) numbers).</summary>
    public const double RoundingTolerance = 1e-12;

    /// <summary>XX chain H = Jp sum (X X + Y Y).</summary>
    public static TranslationCell XX(double jp) => new([new CellTerm("XX", jp), new CellTerm("YY", jp)]);

    /// <summary>Transverse-field Ising H = -J sum Z Z - h sum X.</summary>
    public static TranslationCell Tfim(double j, double h) => new([new CellTerm("ZZ", -j), new CellTerm("X", -h)]);

    /// <summary>Mixed-field Ising H = J sum Z Z + g sum X + h sum Z.</summary>
    public static TranslationCell MixedIsing(double j, double g, double h) => new([new CellTerm("ZZ", j), new CellTerm("X", g), new CellTerm("Z", h)]);

    /// <summary>Random 2-local Hamiltonian on an open chain (all nine XX..ZZ couplings per bond, all three fields per site, one next-nearest ZZ), Gaussian coefficients.</summary>
    public static Hamiltonian Random2Local(int n, int seed)
    {
        var rng = new Random(seed);
        double G() => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
        var terms = new List<PauliTerm>();
        const string L = "XYZ";
        for (int j = 0; j < n; j++)
        {
            foreach (char a in L) terms.Add(new PauliTerm(PauliString.Parse($"{a}_{j}", n), G()));
            if (j + 1 < n)
            {
                foreach (char a in L)
                {
                    foreach (char b in L) terms.Add(new PauliTerm(PauliString.Parse($"{a}_{j} {b}_{j + 1}", n), G()));
                }
            }
            if (j + 2 < n) terms.Add(new PauliTerm(PauliString.Parse($"Z_{j} Z_{j + 2}", n), G()));
        }
        return new Hamiltonian(n, terms);
    }

    public static LanczosOptions Options(int depth, long maxStrings = 0) => new()
    {
        Depth = depth,
        MaxStrings = maxStrings,
        Threads = 2,
        MemoryBudgetBytes = 2L << 30,
    };
}
