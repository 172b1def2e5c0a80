using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Reference;

/// <summary>
/// Independent dense route for tests: 2^N x 2^N matrices built with MathNet from the 2x2 Pauli
/// matrices by Kronecker products (site 0 is the leftmost factor, i.e. the most significant bit of
/// the basis index). Nothing here uses the symplectic code paths under test.
/// </summary>
public static class Dense
{
    public static readonly Matrix<Complex> I2 = Matrix<Complex>.Build.DenseIdentity(2);
    public static readonly Matrix<Complex> X2 = Matrix<Complex>.Build.DenseOfArray(new Complex[,] { { 0, 1 }, { 1, 0 } });
    public static readonly Matrix<Complex> Y2 = Matrix<Complex>.Build.DenseOfArray(new Complex[,] { { 0, -Complex.ImaginaryOne }, { Complex.ImaginaryOne, 0 } });
    public static readonly Matrix<Complex> Z2 = Matrix<Complex>.Build.DenseOfArray(new Complex[,] { { 1, 0 }, { 0, -1 } });

    public static Matrix<Complex> Letter(char c) => c switch
    {
        'I' => I2,
        'X' => X2,
        'Y' => Y2,
        'Z' => Z2,
        _ => throw new ArgumentException($"bad letter {c}"),
    };

    /// <summary>Dense matrix of a Pauli string from its letters (site 0 leftmost).</summary>
    public static Matrix<Complex> Of(PauliString s)
    {
        var m = Letter(s[0]);
        for (int j = 1; j < s.N; j++) m = m.KroneckerProduct(Letter(s[j]));
        return m;
    }

    /// <summary>Dense matrix of a real-coefficient Pauli sum.</summary>
    public static Matrix<Complex> Of(int n, IEnumerable<PauliTerm> terms)
    {
        int d = 1 << n;
        var m = Matrix<Complex>.Build.Dense(d, d);
        foreach (var t in terms) m += Of(t.String) * (Complex)t.Coefficient;
        return m;
    }

    /// <summary>(A|B) = Tr(A^dagger B)/2^N.</summary>
    public static Complex Inner(Matrix<Complex> a, Matrix<Complex> b)
        => (a.ConjugateTranspose() * b).Trace() / a.RowCount;

    /// <summary>Expansion coefficients c_S = (S|A) over all 4^N strings (small N only).</summary>
    public static Dictionary<string, Complex> Decompose(int n, Matrix<Complex> a, double tol = 1e-13)
    {
        var result = new Dictionary<string, Complex>();
        int total = 1 << (2 * n);
        for (int code = 0; code < total; code++)
        {
            var b = new PauliString.Builder(n);
            for (int j = 0; j < n; j++) b.Set(j, "IXYZ"[(code >> (2 * j)) & 3]);
            var s = b.Build();
            var c = Inner(Of(s), a);
            if (c.Magnitude > tol) result[s.ToDenseString()] = c;
        }
        return result;
    }

    /// <summary>exp(i H t) A exp(-i H t) via MathNet's Hermitian eigendecomposition.</summary>
    public static Matrix<Complex> Heisenberg(Matrix<Complex> h, Matrix<Complex> a, double t)
    {
        var evd = h.Evd(Symmetricity.Hermitian);
        var v = evd.EigenVectors;
        var ev = evd.EigenValues;
        var phase = Matrix<Complex>.Build.DenseOfDiagonalArray(ev.Select(e => Complex.Exp(Complex.ImaginaryOne * e.Real * t)).ToArray());
        var u = v * phase * v.ConjugateTranspose(); // e^{iHt}
        return u * a * u.ConjugateTranspose();
    }
}
