using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// Full spectrum and eigenvectors of a Hamiltonian by dense exact diagonalisation, for exact traces
/// at small N (the referee for typicality and for the Pauli engine). Uses MathNet's managed Hermitian
/// (or, for real H, symmetric) eigensolver, or LAPACK through <see cref="NativeLapack"/> when the system
/// library is present. Basis convention: <see cref="PauliMask"/>.
/// </summary>
public sealed class DenseSpectrum
{
    /// <summary>Largest N accepted by default (2^10 = 1024 levels: seconds to a minute managed).</summary>
    public const int DefaultMaxQubits = 10;

    /// <summary>Hard limit with <c>allowLarge</c> (2^13 = 8192 levels: memory 1 GiB, long run times).</summary>
    public const int HardMaxQubits = 13;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>2^N.</summary>
    public int Dimension { get; }

    /// <summary>Eigenvalues, ascending.</summary>
    public double[] Energies { get; }

    /// <summary>Eigenvectors as columns, in the same order as <see cref="Energies"/>.</summary>
    public Matrix<Complex> Vectors { get; }

    /// <summary>True when the native LAPACK path did the work.</summary>
    public bool UsedNativeLapack { get; }

    private DenseSpectrum(int n, double[] e, Matrix<Complex> v, bool native)
    {
        N = n;
        Dimension = 1 << n;
        Energies = e;
        Vectors = v;
        UsedNativeLapack = native;
    }

    /// <summary>Diagonalises H. Throws for N above <see cref="DefaultMaxQubits"/> unless <paramref name="allowLarge"/>.</summary>
    public static DenseSpectrum Compute(Hamiltonian h, bool allowLarge = false, bool useNative = true)
    {
        ArgumentNullException.ThrowIfNull(h);
        int max = allowLarge ? HardMaxQubits : DefaultMaxQubits;
        if (h.N > max)
        {
            throw new ArgumentOutOfRangeException(nameof(h), h.N, $"Dense diagonalisation is limited to N <= {max} qubits; use typicality for larger N.");
        }
        int d = 1 << h.N;
        bool real = h.Terms.All(t => (PauliMask.From(t.String).YCount & 1) == 0);
        if (real)
        {
            var a = DenseReal(h);
            if (useNative && NativeLapack.TrySymmetricEigen(a, d, vectors: true, out var w))
            {
                // a now holds the eigenvectors column-major (LAPACK layout).
                var vc = Matrix<Complex>.Build.Dense(d, d, (i, j) => a[j * d + i]);
                return new DenseSpectrum(h.N, w, vc, true);
            }
            var m = Matrix<double>.Build.Dense(d, d, a); // column-major; symmetric so layout is immaterial
            var evd = m.Evd(Symmetricity.Symmetric);
            var ev = evd.EigenValues.Select(z => z.Real).ToArray();
            var vv = evd.EigenVectors;
            var vcx = Matrix<Complex>.Build.Dense(d, d, (i, j) => vv[i, j]);
            return Sorted(h.N, ev, vcx, false);
        }
        else
        {
            var a = DenseComplex(h);
            if (useNative && NativeLapack.TryHermitianEigen(a, d, vectors: true, out var w))
            {
                var vc = Matrix<Complex>.Build.Dense(d, d, a); // column-major from LAPACK
                return new DenseSpectrum(h.N, w, vc, true);
            }
            var m = Matrix<Complex>.Build.Dense(d, d, a);
            var evd = m.Evd(Symmetricity.Hermitian);
            return Sorted(h.N, evd.EigenValues.Select(z => z.Real).ToArray(), evd.EigenVectors, false);
        }
    }

    /// <summary>Dense real matrix of H (column-major = row-major, symmetric); H must be real.</summary>
    public static double[] DenseReal(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        int d = 1 << h.N;
        var a = new double[(long)d * d];
        foreach (var t in h.Terms)
        {
            var m = PauliMask.From(t.String);
            double ph = m.Phase.Real;
            for (int k = 0; k < d; k++)
            {
                int row = (int)((ulong)k ^ m.X);
                double f = (BitOperations.PopCount((ulong)k & m.Z) & 1) == 0 ? ph : -ph;
                a[(long)k * d + row] += t.Coefficient * f;
            }
        }
        return a;
    }

    /// <summary>Dense complex matrix of H, column-major (element (i, k) at k*D + i).</summary>
    public static Complex[] DenseComplex(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        int d = 1 << h.N;
        var a = new Complex[(long)d * d];
        foreach (var t in h.Terms)
        {
            var m = PauliMask.From(t.String);
            for (int k = 0; k < d; k++)
            {
                int row = (int)((ulong)k ^ m.X);
                a[(long)k * d + row] += t.Coefficient * m.Factor((ulong)k);
            }
        }
        return a;
    }

    private static DenseSpectrum Sorted(int n, double[] e, Matrix<Complex> v, bool native)
    {
        var order = Enumerable.Range(0, e.Length).OrderBy(i => e[i]).ToArray();
        if (order.Select((o, i) => o == i).All(b => b)) return new DenseSpectrum(n, e, v, native);
        var es = order.Select(i => e[i]).ToArray();
        var vs = Matrix<Complex>.Build.Dense(v.RowCount, v.ColumnCount, (i, j) => v[i, order[j]]);
        return new DenseSpectrum(n, es, vs, native);
    }
}
