using System.Runtime.InteropServices;
using System.Numerics.Tensors;
using MathNet.Numerics.LinearAlgebra;

namespace OpGrowth.Evolution;

/// <summary>
/// Truncated singular value decomposition of a dense real matrix, M ~ U diag(s) V^T with at most k kept values,
/// for the bond updates of <see cref="PauliChainOperator"/>. The weight it drops, ||M||_F^2 - sum s^2, is exact
/// whatever the factorisation's accuracy, because the kept part is the projection of M onto the returned U.
/// </summary>
/// <remarks>
/// Small matrices (min(m, n) &lt;= k + 8): exact, from the symmetric eigendecomposition of the smaller Gram matrix
/// (MathNet). Larger ones: the randomized range finder with one power iteration (Source: Halko, Martinsson and
/// Tropp, SIAM Review 53, 217 (2011), algorithms 4.3 and 5.1): Y = M (M^T M) Omega for a Gaussian Omega with k + 8
/// columns, Q = orth(Y), B = Q^T M, and the exact SVD of the small B. Row-major storage throughout.
/// </remarks>
internal static class LowRankFactor
{
    private const int Oversample = 8;

    /// <summary>Result: U (m x k), S (k), Vt (k x n), row-major; Dropped = ||M||^2 - sum S^2.</summary>
    internal readonly record struct Factors(double[] U, double[] S, double[] Vt, int Rank, double Dropped);

    /// <summary>
    /// Factorises <paramref name="input"/> (rows x cols, row-major) keeping at most <paramref name="maxRank"/> values and
    /// none whose square is below <paramref name="cutoff"/> times the total weight.
    /// </summary>
    public static Factors Truncate(ReadOnlySpan<double> input, int rows, int cols, int maxRank, double cutoff, Random rng)
    {
        // Entries below 1e-100 of the largest cannot matter at any cutoff, and denormal numbers stall the eigen
        // iteration (MathNet's QL ran out of its index range on such a matrix): flush them to zero.
        var copy = input.ToArray();
        double big = Math.Abs(TensorPrimitives.MaxMagnitude(copy));
        for (int i = 0; i < copy.Length; i++)
        {
            if (Math.Abs(copy[i]) < 1e-100 * big) copy[i] = 0;
        }
        ReadOnlySpan<double> m = copy;
        double total = TensorPrimitives.Dot(m, m);
        if (total == 0) return new Factors(new double[rows], [0.0], new double[cols], 1, 0);
        int small = Math.Min(rows, cols);
        double[] q;          // orthonormal basis of the range (rows x r)
        int r;
        if (small <= maxRank + Oversample)
        {
            return ExactByGram(m, rows, cols, maxRank, cutoff, total);
        }
        r = maxRank + Oversample;
        // Y = M Omega; one power iteration Y = M (M^T Q).
        var omega = new double[cols * r];
        for (int i = 0; i < omega.Length; i++) omega[i] = Gaussian(rng);
        var y = new double[rows * r];
        Gemm(m, rows, cols, omega, r, y);
        q = Orthonormalize(y, rows, r);
        var mt = Transpose(m, rows, cols);
        var z = new double[cols * r];
        Gemm(mt, cols, rows, q, r, z);
        var zq = Orthonormalize(z, cols, r);
        Gemm(m, rows, cols, zq, r, y);
        q = Orthonormalize(y, rows, r);
        // B = Q^T M  (r x cols), exact SVD of B through its Gram matrix B B^T (r x r).
        var qt = Transpose(q, rows, r);
        var b = new double[r * cols];
        Gemm(qt, r, rows, m, cols, b);
        var f = ExactByGram(b, r, cols, maxRank, cutoff, total);
        // U = Q U_B
        var u = new double[rows * f.Rank];
        Gemm(q, rows, r, f.U, f.Rank, u);
        double kept = TensorPrimitives.Dot(f.S, f.S);
        return new Factors(u, f.S, f.Vt, f.Rank, Math.Max(0, total - kept));
    }

    // Exact truncated SVD from the eigendecomposition of the smaller Gram matrix; total is ||M||^2 of the original.
    private static Factors ExactByGram(ReadOnlySpan<double> m, int rows, int cols, int maxRank, double cutoff, double total)
    {
        bool wide = rows <= cols;
        int d = wide ? rows : cols;
        var g = new double[d * d];
        if (wide)
        {
            // G = M M^T
            for (int i = 0; i < rows; i++)
            {
                var ri = m.Slice(i * cols, cols);
                for (int j = 0; j <= i; j++) g[i * d + j] = g[j * d + i] = TensorPrimitives.Dot(ri, m.Slice(j * cols, cols));
            }
        }
        else
        {
            var mt = Transpose(m, rows, cols);
            for (int i = 0; i < cols; i++)
            {
                var ri = mt.AsSpan(i * rows, rows);
                for (int j = 0; j <= i; j++) g[i * d + j] = g[j * d + i] = TensorPrimitives.Dot(ri, mt.AsSpan(j * rows, rows));
            }
        }
        var (vals, vecs) = SymmetricEvd(g, d);
        // Descending order of the eigenvalues (MathNet returns them ascending).
        var order = Enumerable.Range(0, d).OrderByDescending(i => vals[i]).ToArray();
        double sum = order.Sum(i => Math.Max(0, vals[i]));
        int rank = 0;
        foreach (int i in order)
        {
            double w = vals[i];
            if (rank >= maxRank || w <= 0 || w < cutoff * sum) break;
            rank++;
        }
        rank = Math.Max(1, rank);
        var s = new double[rank];
        for (int k = 0; k < rank; k++) s[k] = Math.Sqrt(Math.Max(0, vals[order[k]]));
        double[] u, vt;
        if (wide)
        {
            // U = eigenvectors; Vt = diag(1/s) U^T M
            u = new double[rows * rank];
            for (int i = 0; i < rows; i++)
            {
                for (int k = 0; k < rank; k++) u[i * rank + k] = vecs[i, order[k]];
            }
            vt = new double[rank * cols];
            for (int k = 0; k < rank; k++)
            {
                var row = vt.AsSpan(k * cols, cols);
                if (s[k] == 0) continue;
                for (int i = 0; i < rows; i++)
                {
                    double c = u[i * rank + k] / s[k];
                    if (c != 0) TensorPrimitives.MultiplyAdd(m.Slice(i * cols, cols), c, row, row);
                }
            }
        }
        else
        {
            // V = eigenvectors (cols x rank); U = M V diag(1/s)
            vt = new double[rank * cols];
            for (int k = 0; k < rank; k++)
            {
                for (int j = 0; j < cols; j++) vt[k * cols + j] = vecs[j, order[k]];
            }
            u = new double[rows * rank];
            for (int i = 0; i < rows; i++)
            {
                var ri = m.Slice(i * cols, cols);
                for (int k = 0; k < rank; k++) u[i * rank + k] = s[k] == 0 ? 0 : TensorPrimitives.Dot(ri, vt.AsSpan(k * cols, cols)) / s[k];
            }
        }
        double kept = TensorPrimitives.Dot(s, s);
        return new Factors(u, s, vt, rank, Math.Max(0, total - kept));
    }

    // Eigenvalues and eigenvectors (columns) of a symmetric d x d matrix; MathNet for d >= 2.
    private static (double[] Values, Matrix<double> Vectors) SymmetricEvd(double[] g, int d)
    {
        if (d == 1) return ([g[0]], Matrix<double>.Build.DenseIdentity(1));
        // Products of flushed entries can still be denormal: flush the Gram matrix as well.
        double gb = 0;
        foreach (var x in g) gb = Math.Max(gb, Math.Abs(x));
        for (int i = 0; i < g.Length; i++)
        {
            if (Math.Abs(g[i]) < 1e-200 * gb) g[i] = 0;
        }
        var evd = Matrix<double>.Build.Dense(d, d, g).Evd(Symmetricity.Symmetric);
        return (evd.EigenValues.Select(v => v.Real).ToArray(), evd.EigenVectors);
    }

    /// <summary>c = a b with a (m x k) and b (k x n), row-major; c is overwritten.</summary>
    public static void Gemm(ReadOnlySpan<double> a, int m, int k, ReadOnlySpan<double> b, int n, Span<double> c)
    {
        c[..(m * n)].Clear();
        for (int i = 0; i < m; i++)
        {
            var ci = c.Slice(i * n, n);
            for (int l = 0; l < k; l++)
            {
                double x = a[i * k + l];
                if (x != 0) TensorPrimitives.MultiplyAdd(b.Slice(l * n, n), x, ci, ci);
            }
        }
    }

    /// <summary>The transpose of a (rows x cols) row-major matrix.</summary>
    public static double[] Transpose(ReadOnlySpan<double> a, int rows, int cols)
    {
        var t = new double[rows * cols];
        for (int i = 0; i < rows; i++)
        {
            for (int j = 0; j < cols; j++) t[j * rows + i] = a[i * cols + j];
        }
        return t;
    }

    // Orthonormal columns spanning those of y (rows x r), by modified Gram-Schmidt done twice (columns that vanish
    // are replaced by zero columns; the caller's truncation drops them).
    private static double[] Orthonormalize(double[] y, int rows, int r)
    {
        var t = Transpose(y, rows, r); // r x rows: one column per row of t
        for (int pass = 0; pass < 2; pass++)
        {
            for (int j = 0; j < r; j++)
            {
                var cj = t.AsSpan(j * rows, rows);
                for (int i = 0; i < j; i++)
                {
                    var ci = t.AsSpan(i * rows, rows);
                    double p = TensorPrimitives.Dot(ci, cj);
                    if (p != 0) TensorPrimitives.MultiplyAdd(ci, -p, cj, cj);
                }
                double nrm = Math.Sqrt(TensorPrimitives.Dot(cj, cj));
                if (nrm > 1e-300) TensorPrimitives.Multiply(cj, 1 / nrm, cj);
                else cj.Clear();
            }
        }
        return Transpose(t, r, rows);
    }

    private static double Gaussian(Random rng)
    {
        double u1 = 1.0 - rng.NextDouble(), u2 = rng.NextDouble();
        return Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }
}
