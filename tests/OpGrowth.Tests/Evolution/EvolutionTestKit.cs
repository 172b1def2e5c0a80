using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Evolution;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Evolution;

/// <summary>Shared builders for the evolution tests. Dense matrices follow Reference/Dense.cs (site 0 = most significant bit).</summary>
internal static class EvolutionTestKit
{
    /// <summary>A random Hamiltonian of weight-1..3 strings with coefficients uniform in [-scale, scale].</summary>
    public static Hamiltonian RandomHamiltonian(int n, int terms, int seed, double scale = 1.0, int maxWeight = 3)
    {
        var rng = new Random(seed);
        var list = new List<PauliTerm>();
        for (int t = 0; t < terms; t++)
        {
            int w = 1 + rng.Next(maxWeight);
            var b = new PauliString.Builder(n);
            var sites = Enumerable.Range(0, n).OrderBy(_ => rng.Next()).Take(w);
            foreach (int s in sites) b.Set(s, "XYZ"[rng.Next(3)]);
            list.Add(new PauliTerm(b.Build(), scale * (2 * rng.NextDouble() - 1)));
        }
        return new Hamiltonian(n, list);
    }

    /// <summary>Mixed-field Ising chain H = J sum Z_j Z_{j+1} + g sum X_j + h sum Z_j (open).</summary>
    public static Hamiltonian MixedFieldIsing(int n, double j = 1.0, double g = 1.05, double h = 0.5)
    {
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) terms.Add(new PauliTerm(Pair(n, i, 'Z', i + 1, 'Z'), j));
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, 'X'), g));
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, 'Z'), h));
        return new Hamiltonian(n, terms);
    }

    /// <summary>XX chain H = Jp sum (X_j X_{j+1} + Y_j Y_{j+1}) (open).</summary>
    public static Hamiltonian XxChain(int n, double jp = 0.5)
    {
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++)
        {
            terms.Add(new PauliTerm(Pair(n, i, 'X', i + 1, 'X'), jp));
            terms.Add(new PauliTerm(Pair(n, i, 'Y', i + 1, 'Y'), jp));
        }
        return new Hamiltonian(n, terms);
    }

    /// <summary>Transverse-field Ising chain H = -J sum Z_j Z_{j+1} - h sum X_j (open).</summary>
    public static Hamiltonian TransverseIsing(int n, double j = 1.0, double h = 0.7)
    {
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) terms.Add(new PauliTerm(Pair(n, i, 'Z', i + 1, 'Z'), -j));
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, 'X'), -h));
        return new Hamiltonian(n, terms);
    }

    public static PauliString Pair(int n, int a, char la, int b, char lb)
        => new PauliString.Builder(n).Set(a, la).Set(b, lb).Build();

    public static EvolutionProblem Problem(Hamiltonian h, PauliString probe, bool majoranas = false)
        => new() { N = h.N, Hamiltonian = h, Initial = EvolutionProblem.Probe(probe), CountMajoranas = majoranas };

    /// <summary>Runs one rung directly and returns the engine (to read the final operator) and its series.</summary>
    public static (EvolutionEngine<T> Engine, EvolutionSeries Series) RunEngine<T>(EvolutionProblem p, EvolutionOptions o)
        where T : unmanaged, IPauliKey<T>
    {
        var budgets = OperatorEvolution.ResolveBudgets(p, o, out _);
        var e = new EvolutionEngine<T>(p, o, budgets[0], OperatorEvolution.Fingerprint(p, o, budgets[0]), null);
        var s = e.Run(0, 1, null, default);
        return (e, s);
    }

    /// <summary>Dense matrix of a Pauli sum, built entry by entry from the letters (signed permutation per string).</summary>
    public static Matrix<Complex> DenseOf(int n, IEnumerable<PauliTerm> terms)
    {
        int d = 1 << n;
        var m = Matrix<Complex>.Build.Dense(d, d);
        foreach (var t in terms)
        {
            var s = t.String;
            for (int col = 0; col < d; col++)
            {
                int row = col;
                Complex amp = t.Coefficient;
                for (int j = 0; j < n; j++)
                {
                    int bit = n - 1 - j;
                    int b = (col >> bit) & 1;
                    switch (s[j])
                    {
                        case 'X':
                            row ^= 1 << bit;
                            break;
                        case 'Y':
                            row ^= 1 << bit;
                            amp *= b == 0 ? Complex.ImaginaryOne : -Complex.ImaginaryOne;
                            break;
                        case 'Z':
                            if (b == 1) amp = -amp;
                            break;
                    }
                }
                m[row, col] += amp;
            }
        }
        return m;
    }

    /// <summary>sqrt(sum_S (a_S - b_S)^2) = ||A - B||_F / sqrt(2^N): the distance in the Pauli basis.</summary>
    public static double PauliDistance(Matrix<Complex> a, Matrix<Complex> b)
        => (a - b).FrobeniusNorm() / Math.Sqrt(a.RowCount);

    /// <summary>exp(-i s G) for a Hermitian dense G (eigendecomposition).</summary>
    public static Matrix<Complex> Propagator(Matrix<Complex> g, double s)
    {
        var evd = g.Evd(Symmetricity.Hermitian);
        var v = evd.EigenVectors;
        var ph = Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(-Complex.ImaginaryOne * e.Real * s)).ToArray());
        return v * ph * v.ConjugateTranspose();
    }

    /// <summary>Bitwise equality of two doubles (NaN-safe).</summary>
    public static bool Same(double a, double b) => BitConverter.DoubleToInt64Bits(a) == BitConverter.DoubleToInt64Bits(b);

    /// <summary>Asserts two record lists are bit-identical.</summary>
    public static void AssertIdentical(IReadOnlyList<EvolutionRecord> a, IReadOnlyList<EvolutionRecord> b)
    {
        Assert.Equal(a.Count, b.Count);
        for (int i = 0; i < a.Count; i++)
        {
            var x = a[i];
            var y = b[i];
            Assert.Equal(x.Step, y.Step);
            Assert.Equal(x.Strings, y.Strings);
            foreach (var (u, v) in new[] { (x.Time, y.Time), (x.NormSquared, y.NormSquared), (x.DiscardedTotal, y.DiscardedTotal), (x.DiscardedWeight, y.DiscardedWeight), (x.Autocorrelation, y.Autocorrelation), (x.MeanSize, y.MeanSize), (x.CutMagnitude, y.CutMagnitude) })
            {
                Assert.True(Same(u, v), $"record {i}: {u:R} != {v:R}");
            }
            foreach (var (u, v) in new[] { (x.SizeDistribution, y.SizeDistribution), (x.SiteWeights, y.SiteWeights), (x.OtocX, y.OtocX), (x.OtocZ, y.OtocZ), (x.RightEdge, y.RightEdge), (x.LeftEdge, y.LeftEdge) })
            {
                Assert.Equal(u.Length, v.Length);
                for (int k = 0; k < u.Length; k++) Assert.True(Same(u[k], v[k]), $"record {i}, entry {k}: {u[k]:R} != {v[k]:R}");
            }
        }
    }
}
