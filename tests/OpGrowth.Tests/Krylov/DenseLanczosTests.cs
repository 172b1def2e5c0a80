using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Krylov;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Krylov;

/// <summary>The Pauli-basis recursion against an independent dense-matrix route (MathNet, Reference/Dense.cs).</summary>
public class DenseLanczosTests
{
    /// <summary>
    /// Independent Lanczos on 2^N x 2^N matrices: L O = [H, O] by matrix products, (A|B) = Tr(A^dagger B)/2^N,
    /// complex form A_n = L O_{n-1} - b_{n-1} O_{n-2} (conventions.md), no re-orthogonalization.
    /// </summary>
    private static List<double> DenseLanczos(Matrix<Complex> h, Matrix<Complex> o, int depth)
    {
        var b = new List<double>();
        var cur = o / Math.Sqrt(Dense.Inner(o, o).Real);
        Matrix<Complex>? prev = null;
        for (int n = 1; n <= depth; n++)
        {
            var a = h * cur - cur * h;
            if (prev is not null) a -= prev * (Complex)b[^1];
            double bn = Math.Sqrt(Dense.Inner(a, a).Real);
            if (bn < 1e-10) break;
            b.Add(bn);
            prev = cur;
            cur = a / bn;
        }
        return b;
    }

    [Theory]
    [InlineData(6, 11, "Z_2")]
    [InlineData(7, 12, "X_0 Y_3")]
    [InlineData(8, 13, "Y_4")]
    public void Run_RandomTwoLocalChain_MatchesDenseLanczos(int n, int seed, string probe)
    {
        // Same mathematics, different arithmetic (symplectic strings vs dense complex matrices). 15 steps stay well
        // before Lanczos loses orthogonality, so rounding differences stay near 1e-13; the brief asks for 1e-10.
        const int depth = 15;
        var h = KrylovTestModels.Random2Local(n, seed);
        var p = PauliString.Parse(probe, n);
        var pauli = LanczosRecursion.Run(h, p, KrylovTestModels.Options(depth));
        var dense = DenseLanczos(Dense.Of(n, h.Terms), Dense.Of(p), depth);
        Assert.Equal(dense.Count, pauli.B.Count);
        for (int i = 0; i < dense.Count; i++) Assert.True(Math.Abs(dense[i] - pauli.B[i]) < 1e-10, $"b_{i + 1}: dense {dense[i]} vs Pauli {pauli.B[i]}");
    }

    [Theory]
    [InlineData(21)]
    [InlineData(22)]
    [InlineData(23)]
    public void Run_RandomN6_MomentsEqualDenseTraces(int seed)
    {
        // mu_2k = Tr(O L^2k O)/2^N / (O|O) by dense repeated commutators, against the moments implied by b_n:
        // Dyck paths on the Lanczos chain give mu_2 = b1^2, mu_4 = b1^2 (b1^2 + b2^2),
        // mu_6 = b1^2 [(b1^2 + b2^2)^2 + b2^2 b3^2] (Viswanath and Mueller, The Recursion Method, 1994).
        const int n = 6;
        var h = KrylovTestModels.Random2Local(n, seed);
        var rng = new Random(seed);
        var terms = new List<PauliTerm>();
        for (int k = 0; k < 3; k++)
        {
            var s = new PauliString.Builder(n);
            for (int j = 0; j < n; j++) s.Set(j, "IXYZ"[rng.Next(4)]);
            var ps = s.Build();
            if (!ps.IsIdentity) terms.Add(new PauliTerm(ps, rng.NextDouble() + 0.5));
        }
        var r = LanczosRecursion.Run(h, terms, KrylovTestModels.Options(3));
        double b1 = r.B[0] * r.B[0], b2 = r.B[1] * r.B[1], b3 = r.B[2] * r.B[2];
        double[] fromB = [b1, b1 * (b1 + b2), b1 * ((b1 + b2) * (b1 + b2) + b2 * b3)];
        var hm = Dense.Of(n, h.Terms);
        var om = Dense.Of(n, terms);
        double norm = Dense.Inner(om, om).Real;
        var lk = om;
        for (int k = 1; k <= 6; k++)
        {
            lk = hm * lk - lk * hm;
            if (k % 2 == 1) continue;
            double mu = Dense.Inner(om, lk).Real / norm; // Tr(O^dagger L^k O)/2^N / (O|O)
            double expected = fromB[k / 2 - 1];
            // Relative 1e-11: both sides are sums of O(10^3..10^6) numbers with rounding near 1e-15 each.
            Assert.True(Math.Abs(mu - expected) <= 1e-11 * expected, $"mu_{k}: dense {mu} vs from b_n {expected}");
        }
    }
}
