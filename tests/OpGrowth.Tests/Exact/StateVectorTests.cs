using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Exact;

public class StateVectorTests
{
    // Rounding only: a handful of additions of O(1) numbers.
    private const double Exact = 1e-12;

    private static Complex[] ToArray(MathNet.Numerics.LinearAlgebra.Vector<Complex> v) => v.ToArray();

    [Fact]
    public void ApplyPauli_EveryLetterOnEverySite_MatchesKroneckerMatrix()
    {
        // Source: Dense.Of (Kronecker products, site 0 leftmost = most significant bit).
        const int n = 4;
        var rng = new Random(11);
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, rng);
        var dpsi = MathNet.Numerics.LinearAlgebra.Vector<Complex>.Build.DenseOfArray(psi);
        for (int code = 0; code < 256; code++)
        {
            var b = new PauliString.Builder(n);
            for (int j = 0; j < n; j++) b.Set(j, "IXYZ"[(code >> (2 * j)) & 3]);
            var s = b.Build();
            var got = StateVector.ApplyPauli(PauliMask.From(s), psi);
            var want = ToArray(Dense.Of(s) * dpsi);
            for (int i = 0; i < got.Length; i++) Assert.True((got[i] - want[i]).Magnitude < Exact, $"{s} at {i}");
        }
    }

    [Fact]
    public void BasisConvention_SiteZero_IsMostSignificantBit()
    {
        // X_0 on |00..0> gives |10..0> = index 2^(N-1) (convention stated in PauliMask).
        const int n = 5;
        var v = StateVector.Basis(n, 0);
        var w = StateVector.ApplyPauli(PauliMask.From(PauliString.Parse("X_0", n)), v);
        Assert.Equal(Complex.One, w[1 << (n - 1)]);
        var z = StateVector.ApplyPauli(PauliMask.From(PauliString.Parse("Z_4", n)), StateVector.Basis(n, 1));
        Assert.Equal(-Complex.One, z[1]);
    }

    [Fact]
    public void Applier_RandomComplexHamiltonian_MatchesDenseMatrix()
    {
        // Source: Dense.Of(n, terms) built from Kronecker products with MathNet.
        const int n = 7;
        var h = TestModels.RandomLocal(n, 5);
        var app = new PauliHamiltonianApplier(h, threads: 1);
        Assert.False(app.IsReal);
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(3));
        var got = new Complex[psi.Length];
        double e = app.ApplyAndExpect(psi, got);
        var dh = Dense.Of(n, h.Terms);
        var dpsi = MathNet.Numerics.LinearAlgebra.Vector<Complex>.Build.DenseOfArray(psi);
        var want = dh * dpsi;
        for (int i = 0; i < got.Length; i++) Assert.True((got[i] - want[i]).Magnitude < 1e-12, $"amplitude {i}");
        Assert.Equal((dpsi.Conjugate() * want).Real, e, 12);
    }

    [Fact]
    public void Applier_ParallelChunks_MatchTermByTermReference()
    {
        // Reference: the plain one-string-at-a-time path; N = 16 spans many chunks and 2 threads,
        // with X masks in both the chunk-local and the far bits. Tolerance: rounding of ~150 terms.
        AssertMatchesTermByTerm(TestModels.RandomLocal(16, 9), 4, 1e-13);
    }

    // Fast path on two threads against the term-by-term reference, and bit-identical to one thread.
    private static PauliHamiltonianApplier AssertMatchesTermByTerm(Hamiltonian h, int seed, double tolerance)
    {
        var app = new PauliHamiltonianApplier(h, threads: 2);
        var psi = StateVector.Create(h.N);
        StateVector.FillHaarRandom(psi, new Random(seed));
        var fast = new Complex[psi.Length];
        var slow = new Complex[psi.Length];
        app.Apply(psi, fast);
        app.ApplyTermByTerm(psi, slow);
        double maxDiff = 0;
        for (int i = 0; i < fast.Length; i++) maxDiff = Math.Max(maxDiff, (fast[i] - slow[i]).Magnitude);
        Assert.True(maxDiff < tolerance, $"max difference {maxDiff}");
        var single = new Complex[psi.Length];
        new PauliHamiltonianApplier(h, threads: 1).Apply(psi, single);
        Assert.Equal(single, fast); // bit-identical at any thread count
        return app;
    }

    [Fact]
    public void Applier_PureXFastPaths_MatchTermByTerm()
    {
        // Mixed-field Ising uses the vectorised X path on every bit (low, in-chunk and far).
        const int n = 15;
        var h = TestModels.MixedFieldIsing(n);
        var app = new PauliHamiltonianApplier(h, threads: 2);
        Assert.True(app.IsReal);
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(8));
        var fast = new Complex[psi.Length];
        var slow = new Complex[psi.Length];
        app.Apply(psi, fast);
        app.ApplyTermByTerm(psi, slow);
        for (int i = 0; i < fast.Length; i++) Assert.True((fast[i] - slow[i]).Magnitude < 1e-13);
    }

    [Theory]
    [InlineData(9)]
    [InlineData(16)]
    public void Applier_AllToAllExchangePairs_MatchTermByTerm(int n)
    {
        // Random all-to-all XX + YY + ZZ (pair kernel: pairs inside a chunk, straddling it, above it, and on
        // bit 0) plus an anisotropic pair (XX and YY with different couplings: four distinct coefficients).
        // Reference: the one-string-at-a-time path. Tolerance: rounding of a few hundred terms.
        var rng = new Random(n);
        var t = new List<PauliTerm>();
        for (int i = 0; i < n; i++)
        {
            for (int j = i + 1; j < n; j++)
            {
                double jij = rng.NextDouble() - 0.5;
                t.Add(new(TestModels.P($"X_{i} X_{j}", n), jij));
                t.Add(new(TestModels.P($"Y_{i} Y_{j}", n), i == 0 && j == n - 1 ? 0.3 : jij));
                t.Add(new(TestModels.P($"Z_{i} Z_{j}", n), jij));
            }
        }
        var app = AssertMatchesTermByTerm(new Hamiltonian(n, t), 2, 1e-12);
        Assert.Equal(n * (n - 1) / 2, app.ExchangePairs);
    }

    [Fact]
    public void Applier_SykGroupsDifferingInEveryBit_MatchTermByTerm()
    {
        // q = 4 SYK with 28 Majoranas on N = 14 qubits (Families.Syk, Jordan-Wigner strings): its two-site groups
        // (a Majorana on each of two sites times Z on any third) differ in all 14 bits, beyond the small tables,
        // and get the Walsh-Hadamard-built large table. Reference: the one-string-at-a-time path (4,095 + terms);
        // bit-identical at one and two threads. Tolerance: rounding of ~20,000 terms of size 1/sqrt(N^3).
        var h = OpGrowth.Models.Families.Syk(14, 4, 1.0, 5);
        var app = AssertMatchesTermByTerm(h, 6, 1e-11);
        Assert.True(app.TableGroups > 1001, $"{app.TableGroups} table groups"); // C(14, 4) four-site groups plus two-site ones
    }

    [Fact]
    public void Applier_ManyTermGroupsWithTables_MatchDenseMatrix()
    {
        // Groups of several strings with one X mask and different Z masks (incl. odd Y: complex) use the
        // coefficient table; reference: MathNet Kronecker matrices (Dense.Of). Tolerance: rounding.
        const int n = 7;
        var rng = new Random(17);
        var t = new List<PauliTerm>();
        string[] pats = ["X_0 Z_2 X_4", "Y_0 Z_2 X_4", "X_0 Z_2 Y_4", "Y_0 Z_2 Y_4", "X_0 Z_1 Z_2 Z_3 X_4 Z_6", "Y_1 Y_5 Z_0", "X_1 X_5", "Y_1 X_5 Z_3", "X_3 Y_6"];
        foreach (var p in pats) t.Add(new(TestModels.P(p, n), rng.NextDouble() - 0.5));
        var h = new Hamiltonian(n, t);
        var app = new PauliHamiltonianApplier(h, threads: 1);
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(3));
        var got = new Complex[psi.Length];
        app.Apply(psi, got);
        var want = Dense.Of(n, h.Terms) * MathNet.Numerics.LinearAlgebra.Vector<Complex>.Build.DenseOfArray(psi);
        for (int i = 0; i < got.Length; i++) Assert.True((got[i] - want[i]).Magnitude < 1e-12, $"amplitude {i}");
    }

    [Fact]
    public void Inner_VectorisedAndParallel_MatchesScalarSum()
    {
        const int n = 16;
        var a = StateVector.Create(n);
        var b = StateVector.Create(n);
        StateVector.FillHaarRandom(a, new Random(1));
        StateVector.FillHaarRandom(b, new Random(2));
        Complex want = 0;
        for (int i = 0; i < a.Length; i++) want += Complex.Conjugate(a[i]) * b[i];
        var got = StateVector.Inner(a, b, threads: 2);
        Assert.True((got - want).Magnitude < 1e-14);
        Assert.Equal(1.0, StateVector.NormSquared(a, 2), 12);
    }
}
