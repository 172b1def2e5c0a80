using System.Numerics.Tensors;

namespace OpGrowth.Exact;

/// <summary>
/// Managed eigensolvers for real symmetric matrices: the implicit QL method on a tridiagonal matrix
/// (with or without eigenvectors) and Householder reduction of a dense matrix to tridiagonal form for
/// eigenvalues only (the level-statistics path, where eigenvectors are not needed).
/// </summary>
/// <remarks>
/// Source: Householder tridiagonalization and the implicit QL iteration with Wilkinson-type shifts as in
/// Bowdler, Martin, Reinsch and Wilkinson, Numer. Math. 11, 293 (1968) ("tql1/tql2"), and
/// Golub and Van Loan, Matrix Computations, ch. 8.
/// </remarks>
public static class SymmetricEigen
{
    /// <summary>
    /// Diagonalises the symmetric tridiagonal matrix with diagonal <paramref name="d"/> and off-diagonal
    /// <paramref name="e"/> (e[i] couples i and i+1; length n, last entry ignored). On return d holds the
    /// eigenvalues in ascending order. When <paramref name="z"/> (n x n, row-major, initialised to the
    /// identity or to an orthogonal basis change) is given, its columns become the eigenvectors.
    /// </summary>
    public static void Tridiagonal(Span<double> d, Span<double> e, Span<double> z = default)
    {
        int n = d.Length;
        if (e.Length < n) throw new ArgumentException($"Off-diagonal needs {n} entries, got {e.Length}.", nameof(e));
        bool vectors = !z.IsEmpty;
        if (vectors && z.Length != n * n) throw new ArgumentException($"Eigenvector storage needs {n * n} entries, got {z.Length}.", nameof(z));
        if (n == 0) return;
        e[n - 1] = 0;
        // An absolute floor (1e-3 of the matrix scale, times the unit round-off) lets a split be declared
        // between two (nearly) zero diagonal entries: highly degenerate spectra (commuting Hamiltonians) put
        // many eigenvalues at exactly 0, where a purely relative test never passes.
        double scale = 0;
        for (int i = 0; i < n; i++) scale = Math.Max(scale, Math.Abs(d[i]) + Math.Abs(e[i]));
        double floor = 1e-3 * scale;
        for (int l = 0; l < n; l++)
        {
            int iter = 0;
            int m;
            do
            {
                for (m = l; m < n - 1; m++)
                {
                    double dd = Math.Abs(d[m]) + Math.Abs(d[m + 1]);
                    if (Math.Abs(e[m]) <= double.Epsilon + 2.220446049250313e-16 * Math.Max(dd, floor)) break;
                }
                if (m != l)
                {
                    if (iter++ == 200) throw new ArithmeticException("Tridiagonal QL iteration did not converge.");
                    double g = (d[l + 1] - d[l]) / (2.0 * e[l]);
                    double r = Hypot(g, 1.0);
                    g = d[m] - d[l] + e[l] / (g + (g >= 0 ? Math.Abs(r) : -Math.Abs(r)));
                    double s = 1, c = 1, p = 0;
                    int i;
                    bool underflow = false;
                    for (i = m - 1; i >= l; i--)
                    {
                        double f = s * e[i], b = c * e[i];
                        r = Hypot(f, g);
                        e[i + 1] = r;
                        if (r == 0)
                        {
                            d[i + 1] -= p;
                            e[m] = 0;
                            underflow = true;
                            break;
                        }
                        s = f / r;
                        c = g / r;
                        g = d[i + 1] - p;
                        r = (d[i] - g) * s + 2.0 * c * b;
                        p = s * r;
                        d[i + 1] = g + p;
                        g = c * r - b;
                        if (vectors)
                        {
                            for (int k = 0; k < n; k++)
                            {
                                int row = k * n;
                                double t = z[row + i + 1];
                                z[row + i + 1] = s * z[row + i] + c * t;
                                z[row + i] = c * z[row + i] - s * t;
                            }
                        }
                    }
                    if (underflow) continue;
                    d[l] -= p;
                    e[l] = g;
                    e[m] = 0;
                }
            }
            while (m != l);
        }
        SortAscending(d, z, n, vectors);
    }

    /// <summary>
    /// Eigenvalues (ascending) of a dense real symmetric matrix given row-major in
    /// <paramref name="a"/> (n x n; overwritten). Householder tridiagonalization then implicit QL;
    /// rows are updated in parallel on <paramref name="threads"/> threads.
    /// </summary>
    public static double[] Eigenvalues(double[] a, int n, int threads = 1)
    {
        ArgumentNullException.ThrowIfNull(a);
        if (a.Length != n * n) throw new ArgumentException($"Expected {n * n} entries for an {n} x {n} matrix, got {a.Length}.", nameof(a));
        var d = new double[n];
        var e = new double[n];
        Tridiagonalize(a, n, d, e, threads);
        Tridiagonal(d, e);
        return d;
    }

    /// <summary>Householder reduction of a symmetric matrix (overwritten) to tridiagonal (d, e).</summary>
    internal static void Tridiagonalize(double[] a, int n, double[] d, double[] e, int threads)
    {
        var v = new double[n];
        var p = new double[n];
        var opts = StateVector.Options(threads);
        for (int k = 0; k < n - 2; k++)
        {
            int m = n - k - 1; // size of the trailing block
            int o = k + 1;
            // x = A[k+1.., k] (= row k beyond the diagonal by symmetry, contiguous in row-major).
            var x = a.AsSpan(k * n + o, m);
            double norm = Math.Sqrt(TensorPrimitives.Dot(x, x));
            d[k] = a[k * n + k];
            if (norm == 0)
            {
                e[k] = 0;
                continue;
            }
            double alpha = x[0] >= 0 ? -norm : norm;
            var vs = v.AsSpan(0, m);
            x.CopyTo(vs);
            vs[0] -= alpha;
            double vtv = TensorPrimitives.Dot(vs, vs);
            e[k] = alpha;
            if (vtv == 0) continue;
            double beta = 2.0 / vtv;
            // p = beta A22 v
            var ps = p.AsSpan(0, m);
            if (m >= 256 && threads > 1)
            {
                Parallel.For(0, m, opts, i => p[i] = beta * TensorPrimitives.Dot(a.AsSpan((o + i) * n + o, m), v.AsSpan(0, m)));
            }
            else
            {
                for (int i = 0; i < m; i++) ps[i] = beta * TensorPrimitives.Dot(a.AsSpan((o + i) * n + o, m), vs);
            }
            // q = p - (beta/2)(v.p) v ; A22 -= v q^T + q v^T
            double kf = 0.5 * beta * TensorPrimitives.Dot(vs, ps);
            for (int i = 0; i < m; i++) ps[i] -= kf * vs[i];
            if (m >= 256 && threads > 1)
            {
                Parallel.For(0, m, opts, i => Rank2Row(a.AsSpan((o + i) * n + o, m), v.AsSpan(0, m), p.AsSpan(0, m), v[i], p[i]));
            }
            else
            {
                for (int i = 0; i < m; i++) Rank2Row(a.AsSpan((o + i) * n + o, m), vs, ps, vs[i], ps[i]);
            }
        }
        if (n >= 2)
        {
            d[n - 2] = a[(n - 2) * n + n - 2];
            e[n - 2] = a[(n - 1) * n + n - 2];
        }
        d[n - 1] = a[(n - 1) * n + n - 1];
        e[n - 1] = 0;
    }

    private static void Rank2Row(Span<double> row, ReadOnlySpan<double> v, ReadOnlySpan<double> q, double vi, double qi)
    {
        // row -= vi q + qi v
        TensorPrimitives.MultiplyAdd(q, -vi, row, row);
        TensorPrimitives.MultiplyAdd(v, -qi, row, row);
    }

    private static double Hypot(double a, double b)
    {
        double x = Math.Abs(a), y = Math.Abs(b);
        if (x < y) (x, y) = (y, x);
        if (x == 0) return 0;
        double r = y / x;
        return x * Math.Sqrt(1 + r * r);
    }

    private static void SortAscending(Span<double> d, Span<double> z, int n, bool vectors)
    {
        if (!vectors)
        {
            d.Sort();
            return;
        }
        for (int i = 0; i < n - 1; i++)
        {
            int k = i;
            double p = d[i];
            for (int j = i + 1; j < n; j++)
            {
                if (d[j] < p)
                {
                    k = j;
                    p = d[j];
                }
            }
            if (k == i) continue;
            d[k] = d[i];
            d[i] = p;
            if (vectors)
            {
                for (int r = 0; r < n; r++) (z[r * n + i], z[r * n + k]) = (z[r * n + k], z[r * n + i]);
            }
        }
    }
}
