using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// Heisenberg-picture action of a two-site unitary U = exp(-i h tau) on the 16 two-site Pauli coefficients:
/// U^dagger (sum_b c_b P_b) U = sum_a (sum_b M_ab c_b) P_a with M_ab = Tr(P_a U^dagger P_b U)/4 (real for Hermitian
/// strings; P_a = sigma_{a/4} (x) sigma_{a%4}, left factor on the lower site, letters I, X, Y, Z).
/// </summary>
public sealed class BondGate
{
    /// <summary>Non-zero entries (a, b, M_ab).</summary>
    public IReadOnlyList<(int A, int B, double Value)> Entries { get; }

    private BondGate(IReadOnlyList<(int, int, double)> entries) => Entries = entries;

    /// <summary>The identity map.</summary>
    public static BondGate Identity { get; } = new(Enumerable.Range(0, 16).Select(a => (a, a, 1.0)).ToArray());

    private static readonly Complex I = Complex.ImaginaryOne;

    private static readonly Complex[][,] Sigma =
    [
        new Complex[,] { { 1, 0 }, { 0, 1 } },
        new Complex[,] { { 0, 1 }, { 1, 0 } },
        new Complex[,] { { 0, -I }, { I, 0 } },
        new Complex[,] { { 1, 0 }, { 0, -1 } },
    ];

    /// <summary>The 4 x 4 matrix of the two-site Pauli string with letters a1 (left site) and a2.</summary>
    public static Matrix<Complex> Pauli(int a1, int a2)
    {
        var m = Matrix<Complex>.Build.Dense(4, 4);
        for (int i1 = 0; i1 < 2; i1++)
        {
            for (int i2 = 0; i2 < 2; i2++)
            {
                for (int j1 = 0; j1 < 2; j1++)
                {
                    for (int j2 = 0; j2 < 2; j2++) m[i1 * 2 + i2, j1 * 2 + j2] = Sigma[a1][i1, j1] * Sigma[a2][i2, j2];
                }
            }
        }
        return m;
    }

    /// <summary>The gate of exp(-i h tau) for a Hermitian 4 x 4 bond Hamiltonian h (basis |s_left s_right&gt;).</summary>
    public static BondGate Of(Matrix<Complex> h, double tau)
    {
        ArgumentNullException.ThrowIfNull(h);
        var u = Exponential(h * new Complex(0, -tau));
        var ud = u.ConjugateTranspose();
        var paulis = new Matrix<Complex>[16];
        for (int a = 0; a < 16; a++) paulis[a] = Pauli(a >> 2, a & 3);
        var entries = new List<(int, int, double)>();
        for (int b = 0; b < 16; b++)
        {
            var conj = ud * paulis[b] * u;
            for (int a = 0; a < 16; a++)
            {
                Complex tr = (paulis[a] * conj).Trace() / 4;
                if (Math.Abs(tr.Imaginary) > 1e-10) throw new ArithmeticException($"Pauli transfer entry ({a}, {b}) is not real: {tr}.");
                if (Math.Abs(tr.Real) > 1e-15) entries.Add((a, b, tr.Real));
            }
        }
        return new BondGate(entries);
    }

    // exp(a) of a small matrix by scaling and squaring with a Taylor series (terms until below 1e-17 of the sum).
    private static Matrix<Complex> Exponential(Matrix<Complex> a)
    {
        double norm = a.L1Norm();
        int squarings = norm > 0.5 ? (int)Math.Ceiling(Math.Log2(norm / 0.5)) : 0;
        var x = a / Math.Pow(2, squarings);
        var sum = Matrix<Complex>.Build.DenseIdentity(a.RowCount);
        var term = Matrix<Complex>.Build.DenseIdentity(a.RowCount);
        for (int k = 1; k < 40; k++)
        {
            term = term * x / k;
            sum += term;
            if (term.L1Norm() < 1e-17 * sum.L1Norm()) break;
        }
        for (int i = 0; i < squarings; i++) sum *= sum;
        return sum;
    }

    /// <summary>
    /// The bond Hamiltonians of a chain Hamiltonian: every term must act within two neighbouring sites; two-site
    /// terms go to their bond, single-site terms are split evenly between the site's bonds (the end sites' terms go
    /// to their one bond). Returns null (and a reason) when a term reaches further.
    /// </summary>
    public static Matrix<Complex>[]? BondHamiltonians(Hamiltonian h, out string? reason)
    {
        ArgumentNullException.ThrowIfNull(h);
        int n = h.N;
        reason = null;
        if (n < 2)
        {
            reason = "a chain needs at least two sites";
            return null;
        }
        var bonds = new Matrix<Complex>[n - 1];
        for (int b = 0; b < n - 1; b++) bonds[b] = Matrix<Complex>.Build.Dense(4, 4);
        foreach (var t in h.Terms)
        {
            var sup = t.String.Support();
            if (sup.Length == 0) continue; // the identity commutes with everything
            if (sup.Length > 2 || (sup.Length == 2 && sup[1] - sup[0] != 1))
            {
                reason = $"the term {t.String} acts beyond two neighbouring sites";
                return null;
            }
            if (sup.Length == 2)
            {
                bonds[sup[0]] += Pauli(PauliChainOperator.LetterIndex(t.String[sup[0]]), PauliChainOperator.LetterIndex(t.String[sup[1]])) * t.Coefficient;
                continue;
            }
            int j = sup[0];
            int letter = PauliChainOperator.LetterIndex(t.String[j]);
            var onLeft = Pauli(letter, 0);   // site j as the left site of bond j
            var onRight = Pauli(0, letter);  // site j as the right site of bond j - 1
            if (j == 0) bonds[0] += onLeft * t.Coefficient;
            else if (j == n - 1) bonds[n - 2] += onRight * t.Coefficient;
            else
            {
                bonds[j] += onLeft * (0.5 * t.Coefficient);
                bonds[j - 1] += onRight * (0.5 * t.Coefficient);
            }
        }
        return bonds;
    }
}
