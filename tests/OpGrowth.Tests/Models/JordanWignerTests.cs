using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Models;

/// <summary>
/// Jordan-Wigner Majoranas against dense matrices (Reference/Dense.cs, MathNet).
/// Source: P. Jordan and E. Wigner, Z. Phys. 47, 631 (1928); SYK normalisation: J. Maldacena and
/// D. Stanford, PRD 94, 106002 (2016).
/// Tolerance 1e-12: entries are sums of at most a few thousand products of O(1) numbers; rounding is
/// around 1e-15 per operation.
/// </summary>
public class JordanWignerTests
{
    private const double Tol = 1e-12;

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(4)]
    public void Majorana_Anticommutator_IsTwoDelta(int n)
    {
        var chi = Enumerable.Range(0, 2 * n).Select(m =>
        {
            var (s, phase) = JordanWigner.Majorana(n, m);
            return Dense.Of(s) * PauliString.IPower(phase);
        }).ToArray();
        int d = 1 << n;
        var id = Matrix<Complex>.Build.DenseIdentity(d);
        for (int a = 0; a < 2 * n; a++)
        {
            Assert.True((chi[a] - chi[a].ConjugateTranspose()).FrobeniusNorm() < Tol, $"chi_{a} not Hermitian");
            for (int b = 0; b < 2 * n; b++)
            {
                var anti = chi[a] * chi[b] + chi[b] * chi[a];
                var expected = a == b ? 2 * id : Matrix<Complex>.Build.Dense(d, d);
                Assert.True((anti - expected).FrobeniusNorm() < Tol, $"{{chi_{a}, chi_{b}}} != {(a == b ? 2 : 0)}");
            }
        }
    }

    [Fact]
    public void Majorana_Convention_MatchesDocumentedStrings()
    {
        // chi_{2j} = (prod_{k<j} X_k) Z_j, chi_{2j+1} = (prod_{k<j} X_k) Y_j
        Assert.Equal(PauliString.Parse("Z_0", 4), JordanWigner.Majorana(4, 0).String);
        Assert.Equal(PauliString.Parse("Y_0", 4), JordanWigner.Majorana(4, 1).String);
        Assert.Equal(PauliString.Parse("X_0 X_1 Z_2", 4), JordanWigner.Majorana(4, 4).String);
        Assert.Equal(PauliString.Parse("X_0 X_1 X_2 Y_3", 4), JordanWigner.Majorana(4, 7).String);
        // Local parity i chi_{2j} chi_{2j+1} = X_j.
        var (s, phase) = JordanWigner.Product(4, [4, 5]);
        Assert.Equal(PauliString.Parse("X_2", 4), s);
        Assert.Equal(3, phase); // chi_4 chi_5 = -i X_2, so i chi_4 chi_5 = X_2
    }

    [Theory]
    [InlineData(1)]
    [InlineData(3)]
    [InlineData(5)]
    public void MajoranaWeight_EverySubset_EqualsItsSize(int n)
    {
        int m = 2 * n;
        var seen = new HashSet<PauliString>();
        for (int mask = 0; mask < 1 << m; mask++)
        {
            var idx = Enumerable.Range(0, m).Where(i => (mask >> i & 1) != 0).ToArray();
            var (s, _) = JordanWigner.Product(n, idx);
            Assert.Equal(idx.Length, JordanWigner.MajoranaWeight(s.X, s.Z, n));
            Assert.Equal(idx, JordanWigner.MajoranaIndices(s));
            Assert.True(seen.Add(s), "two Majorana monomials gave the same string");
        }
        Assert.Equal(1 << m, seen.Count); // a bijection onto all 4^n strings
    }

    [Theory]
    [InlineData(63)]
    [InlineData(64)]
    [InlineData(65)]
    [InlineData(130)]
    public void MajoranaWeight_MultiWord_MatchesProductOfRandomSets(int n)
    {
        var rng = new Random(n);
        for (int trial = 0; trial < 40; trial++)
        {
            var idx = Enumerable.Range(0, 2 * n).Where(_ => rng.NextDouble() < 0.1).ToArray();
            var (s, _) = JordanWigner.Product(n, idx);
            Assert.Equal(idx.Length, JordanWigner.MajoranaWeight(s));
        }
    }

    [Fact]
    public void MajoranaWeight_FixedWidthKeys_MatchGeneralString()
    {
        var rng = new Random(5);
        foreach (int n in new[] { 10, 64, 100 })
        {
            for (int trial = 0; trial < 30; trial++)
            {
                var idx = Enumerable.Range(0, 2 * n).Where(_ => rng.NextDouble() < 0.15).ToArray();
                var (s, _) = JordanWigner.Product(n, idx);
                if (n <= 64) Assert.Equal(idx.Length, JordanWigner.MajoranaWeight(Pauli64.From(s), n));
                Assert.Equal(idx.Length, JordanWigner.MajoranaWeight(Pauli128.From(s), n));
            }
        }
    }

    [Fact]
    public void HermitianMonomial_FourMajoranas_DenseEqualsMinusProduct()
    {
        // i^{q/2} chi_a chi_b chi_c chi_d with q = 4 is -chi_a chi_b chi_c chi_d: built densely and compared.
        int n = 3;
        int[] idx = [0, 2, 3, 5];
        var dense = idx.Select(m => Dense.Of(JordanWigner.Majorana(n, m).String)).Aggregate((x, y) => x * y) * -1;
        var (s, sign) = JordanWigner.HermitianMonomial(n, idx);
        Assert.True((Dense.Of(s) * sign - dense).FrobeniusNorm() < Tol);
    }

    [Fact]
    public void Syk_HamiltonianEqualsDenseMajoranaSumAndIsHermitian()
    {
        // Independent route: redraw the couplings with the same generator and order, build
        // H = i^2 sum J_abcd psi_a psi_b psi_c psi_d with psi = chi / sqrt 2 from dense Majorana matrices.
        int n = 3, q = 4, mcount = 2 * n;
        double j = 1.3;
        long seed = 99;
        var h = Families.Syk(n, q, j, seed);
        Assert.All(h.Terms, t => Assert.True(double.IsFinite(t.Coefficient)));

        var psi = Enumerable.Range(0, mcount).Select(m => Dense.Of(JordanWigner.Majorana(n, m).String) / Math.Sqrt(2)).ToArray();
        double std = Math.Sqrt(6) * j / Math.Pow(mcount, 1.5); // variance J^2 (q-1)!/M^{q-1} (Maldacena-Stanford)
        var rng = new ModelRandom(seed);
        int d = 1 << n;
        var dense = Matrix<Complex>.Build.Dense(d, d);
        for (int a = 0; a < mcount; a++)
            for (int b = a + 1; b < mcount; b++)
                for (int c = b + 1; c < mcount; c++)
                    for (int e = c + 1; e < mcount; e++)
                        dense += psi[a] * psi[b] * psi[c] * psi[e] * (Complex)(-rng.Normal(0, std)); // i^{q/2} = -1

        Assert.True((dense - dense.ConjugateTranspose()).FrobeniusNorm() < Tol, "SYK Hamiltonian is not Hermitian");
        Assert.True((Dense.Of(n, h.Terms) - dense).FrobeniusNorm() < Tol, "Pauli-string SYK differs from the dense Majorana sum");
    }

    [Fact]
    public void Syk_NormMatchesVariance()
    {
        // E ||H||^2 = C(M,4) * std^2 with std^2 = 6 J^2 / M^3 / 16 (Pauli-string coefficients); M = 24.
        var h = Families.Syk(12, 4, 1.0, 5);
        int m = 24;
        double expected = 10626 * 6.0 / (m * m * m) / 16;
        // 10626 independent squared Gaussians: relative std sqrt(2/10626) = 1.4 %; allow 4 sigma.
        Assert.InRange(h.FrobeniusNormSquared, expected * 0.94, expected * 1.06);
    }
}
