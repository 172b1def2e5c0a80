using System.Numerics;
using MathNet.Numerics.LinearAlgebra;

namespace OpGrowth.Tests.Ensembles;

/// <summary>
/// Independent dense route for the ensemble tests: an operator on N qubits as a 2^N x 2^N complex matrix (site j is
/// bit N-1-j of the basis index, as in <see cref="Reference.Dense"/>), conjugated by explicit gates, and its Pauli
/// weights c_S^2 = (Tr(S W) / 2^N)^2 over all 4^N strings.
/// </summary>
internal sealed class DenseOperatorRoute
{
    public readonly int N, D;
    public Complex[,] W;

    public DenseOperatorRoute(int n, int site, char letter)
    {
        N = n;
        D = 1 << n;
        W = new Complex[D, D];
        int bit = 1 << (n - 1 - site);
        for (int c = 0; c < D; c++)
        {
            switch (letter)
            {
                case 'Z': W[c, c] = (c & bit) != 0 ? -1 : 1; break;
                case 'X': W[c ^ bit, c] = 1; break;
                default: throw new ArgumentException("probe letter X or Z", nameof(letter));
            }
        }
    }

    /// <summary>W -> G^dagger W G for a two-qubit gate G on sites (a, b) (4x4, basis index 2 q_a + q_b).</summary>
    public void ConjugateTwo(Complex[,] g, int a, int b)
    {
        int ba = 1 << (N - 1 - a), bb = 1 << (N - 1 - b);
        // W G: act on columns; G^dagger (W G): act on rows.
        var tmp = new Complex[4];
        for (int row = 0; row < D; row++)
        {
            for (int c = 0; c < D; c++)
            {
                if ((c & (ba | bb)) != 0) continue;
                for (int k = 0; k < 4; k++)
                {
                    Complex s = 0;
                    for (int l = 0; l < 4; l++) s += W[row, Index(c, l, ba, bb)] * g[l, k];
                    tmp[k] = s;
                }
                for (int k = 0; k < 4; k++) W[row, Index(c, k, ba, bb)] = tmp[k];
            }
        }
        for (int col = 0; col < D; col++)
        {
            for (int r = 0; r < D; r++)
            {
                if ((r & (ba | bb)) != 0) continue;
                for (int k = 0; k < 4; k++)
                {
                    Complex s = 0;
                    for (int l = 0; l < 4; l++) s += Complex.Conjugate(g[l, k]) * W[Index(r, l, ba, bb), col];
                    tmp[k] = s;
                }
                for (int k = 0; k < 4; k++) W[Index(r, k, ba, bb), col] = tmp[k];
            }
        }
    }

    /// <summary>W -> U^dagger W U for a full 2^N unitary.</summary>
    public void ConjugateFull(Matrix<Complex> u)
    {
        var w = Matrix<Complex>.Build.DenseOfArray(W);
        W = (u.ConjugateTranspose() * w * u).ToArray();
    }

    private static int Index(int baseIndex, int local, int ba, int bb) => baseIndex | ((local & 2) != 0 ? ba : 0) | ((local & 1) != 0 ? bb : 0);

    /// <summary>Pauli weights: [x mask + D * z mask] over site bits (bit N-1-j for site j).</summary>
    public double[] Weights()
    {
        var w = new double[D * D];
        for (int x = 0; x < D; x++)
        {
            for (int z = 0; z < D; z++)
            {
                // Tr(S W) = sum_d i^{|x&z|} (-1)^{|z&d|} W[d, d^x]
                Complex s = 0;
                for (int d = 0; d < D; d++)
                {
                    var v = W[d, d ^ x];
                    s += (BitOperations.PopCount((uint)(z & d)) & 1) == 0 ? v : -v;
                }
                s *= Complex.Pow(Complex.ImaginaryOne, BitOperations.PopCount((uint)(x & z)));
                double c = s.Real / D;
                w[x + D * z] = c * c;
            }
        }
        return w;
    }

    /// <summary>Mean size and site weights rho_j from Pauli weights.</summary>
    public (double Mean, double[] Rho, double[] Distribution) Sizes(double[] weights)
    {
        var rho = new double[N];
        var dist = new double[N + 1];
        double mean = 0;
        for (int x = 0; x < D; x++)
        {
            for (int z = 0; z < D; z++)
            {
                double c = weights[x + D * z];
                if (c == 0) continue;
                int occ = x | z;
                int size = BitOperations.PopCount((uint)occ);
                mean += size * c;
                dist[size] += c;
                for (int j = 0; j < N; j++) if ((occ & (1 << (N - 1 - j))) != 0) rho[j] += c;
            }
        }
        return (mean, rho, dist);
    }

    /// <summary>A Haar-random 4x4 unitary: QR of a complex Gaussian matrix with the phases of R's diagonal moved into Q.</summary>
    // Source: F. Mezzadri, "How to generate random matrices from the classical compact groups", Notices AMS 54, 592 (2007).
    public static Complex[,] Haar4(Random rng)
    {
        var z = Matrix<Complex>.Build.Dense(4, 4, (_, _) => new Complex(Gauss(rng), Gauss(rng)) / Math.Sqrt(2));
        var qr = z.QR();
        var q = qr.Q;
        var r = qr.R;
        var u = new Complex[4, 4];
        for (int j = 0; j < 4; j++)
        {
            var ph = r[j, j] / r[j, j].Magnitude;
            for (int i = 0; i < 4; i++) u[i, j] = q[i, j] * ph;
        }
        return u;
    }

    /// <summary>A Haar single-qubit unitary embedded as a 4x4 gate on (a, a) is not used; a 2x2 Haar gate is applied as a 4x4 on (a, b) with identity on b.</summary>
    public static Complex[,] HaarOnFirst(Random rng)
    {
        var z = Matrix<Complex>.Build.Dense(2, 2, (_, _) => new Complex(Gauss(rng), Gauss(rng)) / Math.Sqrt(2));
        var qr = z.QR();
        var u2 = new Complex[2, 2];
        for (int j = 0; j < 2; j++)
        {
            var ph = qr.R[j, j] / qr.R[j, j].Magnitude;
            for (int i = 0; i < 2; i++) u2[i, j] = qr.Q[i, j] * ph;
        }
        var u = new Complex[4, 4];
        for (int i = 0; i < 2; i++)
            for (int j = 0; j < 2; j++)
                for (int k = 0; k < 2; k++) u[2 * i + k, 2 * j + k] = u2[i, j];
        return u;
    }

    public static double Gauss(Random rng)
    {
        double u1 = 1 - rng.NextDouble(), u2 = rng.NextDouble();
        return Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }
}
