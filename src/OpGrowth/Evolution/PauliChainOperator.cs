using System.Numerics.Tensors;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// An operator on an open chain as a matrix product in the Pauli basis: the coefficient of the string
/// s_0 s_1 ... s_{N-1} (s in I, X, Y, Z) is A_0[s_0] A_1[s_1] ... A_{N-1}[s_{N-1}], real matrices of bond dimension
/// at most chi. The operator's norm (sum of squared coefficients) is the sum of squares of all coefficients of the
/// product, so truncating a bond drops exactly the squared singular values it removes.
/// </summary>
/// <remarks>
/// <para>Source: matrix-product operators for operator spreading and OTOCs, Xu and Swingle, Nature Physics 16, 199
/// (2020) (from memory): truncation errors behind the front do not spoil the operator's leading edge, which is
/// captured with modest bond dimension. The time evolution is time-evolving block decimation (Vidal, PRL 93, 040502
/// (2004)) acting on operators: a two-site gate exp(-i h tau) maps the 16 two-site Pauli coefficients by the real
/// orthogonal matrix M_ab = Tr(P_a U^dagger P_b U)/4.</para>
/// <para>Storage: site j holds a row-major array [s][l][r] of 4 x chi_{j-1} x chi_j numbers (chi_{-1} = chi_{N-1} = 1).
/// The orthogonality centre moves with the sweeps: sites left of it are left-orthonormal, right of it
/// right-orthonormal, so the two-site block at the centre carries the whole norm.</para>
/// </remarks>
public sealed class PauliChainOperator
{
    private readonly double[][] _a;
    private readonly int[] _bond;   // _bond[j] = dimension between site j and j + 1 (length N - 1)
    private readonly Random _rng;

    /// <summary>Number of sites.</summary>
    public int N { get; }

    /// <summary>Site of the orthogonality centre.</summary>
    public int Center { get; private set; }

    /// <summary>Total weight dropped by truncations so far.</summary>
    public double Discarded { get; private set; }

    /// <summary>Largest bond dimension present.</summary>
    public int MaxBond => _bond.Length == 0 ? 1 : _bond.Max();

    private PauliChainOperator(int n, int seed)
    {
        N = n;
        _a = new double[n][];
        _bond = new int[Math.Max(0, n - 1)];
        _rng = new Random(seed);
    }

    /// <summary>The Pauli string <paramref name="p"/> with coefficient 1 (bond dimension 1), centre at site 0.</summary>
    public static PauliChainOperator FromString(PauliString p, int seed = 1)
    {
        ArgumentNullException.ThrowIfNull(p);
        if (p.N < 2) throw new ArgumentOutOfRangeException(nameof(p), p.N, "A chain needs at least two sites.");
        var o = new PauliChainOperator(p.N, seed);
        for (int j = 0; j < p.N; j++)
        {
            o._a[j] = new double[4];
            o._a[j][LetterIndex(p[j])] = 1;
        }
        Array.Fill(o._bond, 1);
        return o;
    }

    /// <summary>Index of a letter in the local basis I, X, Y, Z.</summary>
    public static int LetterIndex(char c) => c switch
    {
        'I' => 0,
        'X' => 1,
        'Y' => 2,
        'Z' => 3,
        _ => throw new ArgumentOutOfRangeException(nameof(c), c, "Expected I, X, Y or Z."),
    };

    private int Left(int j) => j == 0 ? 1 : _bond[j - 1];

    private int Right(int j) => j == N - 1 ? 1 : _bond[j];

    /// <summary>True when the site's tensor has no weight outside the identity letter.</summary>
    private bool IdentityOnly(int j)
    {
        var a = _a[j];
        int block = Left(j) * Right(j);
        for (int i = block; i < a.Length; i++)
        {
            if (a[i] != 0) return false;
        }
        return true;
    }

    /// <summary>
    /// Applies the two-site map <paramref name="gate"/> on sites (j, j + 1) (the centre must be at j or j + 1), keeps
    /// at most <paramref name="maxBond"/> singular values and none below <paramref name="cutoff"/> of the weight,
    /// and leaves the centre at j + 1 (<paramref name="moveRight"/>) or j. Returns the weight dropped.
    /// </summary>
    public double ApplyBond(int j, BondGate gate, int maxBond, double cutoff, bool moveRight)
    {
        ArgumentNullException.ThrowIfNull(gate);
        if (j < 0 || j >= N - 1) throw new ArgumentOutOfRangeException(nameof(j), j, "Bond index out of range.");
        if (Center != j && Center != j + 1) MoveCenter(moveRight ? j : j + 1);
        // Identity on both sites stays identity under conjugation by any unitary: nothing to do.
        if (_bond[j] == 1 && IdentityOnly(j) && IdentityOnly(j + 1))
        {
            Center = moveRight ? j + 1 : j;
            return 0;
        }
        int l = Left(j), m = _bond[j], r = Right(j + 1);
        var a = _a[j];
        var b = _a[j + 1];
        // theta[b1][b2] = A_j[b1] A_{j+1}[b2] (l x r each)
        int lr = l * r;
        var theta = new double[16 * lr];
        for (int b1 = 0; b1 < 4; b1++)
        {
            var ab1 = a.AsSpan(b1 * l * m, l * m);
            if (!TensorPrimitives.MaxMagnitude(ab1).Equals(0.0))
            {
                for (int b2 = 0; b2 < 4; b2++)
                {
                    LowRankFactor.Gemm(ab1, l, m, b.AsSpan(b2 * m * r, m * r), r, theta.AsSpan((b1 * 4 + b2) * lr, lr));
                }
            }
        }
        // Theta[(a1, l), (a2, r)] = sum_b M[a, b] theta[b][l][r]
        int rows = 4 * l, cols = 4 * r;
        var big = new double[rows * cols];
        foreach (var (ai, bi, v) in gate.Entries)
        {
            int a1 = ai >> 2, a2 = ai & 3;
            var src = theta.AsSpan(bi * lr, lr);
            for (int x = 0; x < l; x++)
            {
                var dst = big.AsSpan((a1 * l + x) * cols + a2 * r, r);
                TensorPrimitives.MultiplyAdd(src.Slice(x * r, r), v, dst, dst);
            }
        }
        var f = LowRankFactor.Truncate(big, rows, cols, maxBond, cutoff, _rng);
        int k = f.Rank;
        var na = new double[4 * l * k];
        var nb = new double[4 * k * r];
        for (int a1 = 0; a1 < 4; a1++)
        {
            for (int x = 0; x < l; x++)
            {
                for (int y = 0; y < k; y++)
                {
                    double u = f.U[(a1 * l + x) * k + y];
                    na[(a1 * l + x) * k + y] = moveRight ? u : u * f.S[y];
                }
            }
        }
        for (int y = 0; y < k; y++)
        {
            double sy = moveRight ? f.S[y] : 1;
            for (int a2 = 0; a2 < 4; a2++)
            {
                for (int z = 0; z < r; z++) nb[(a2 * k + y) * r + z] = sy * f.Vt[y * cols + a2 * r + z];
            }
        }
        _a[j] = na;
        _a[j + 1] = nb;
        _bond[j] = k;
        Center = moveRight ? j + 1 : j;
        Discarded += f.Dropped;
        return f.Dropped;
    }

    /// <summary>Moves the orthogonality centre to <paramref name="target"/> by exact (untruncated) factorisations.</summary>
    public void MoveCenter(int target)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(target);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(target, N);
        while (Center < target) Split(Center, right: true);
        while (Center > target) Split(Center - 1, right: false);
    }

    // Exact re-factorisation of bond (j, j+1) with the identity gate.
    private void Split(int j, bool right)
    {
        int l = Left(j), m = _bond[j], r = Right(j + 1);
        ApplyBond(j, BondGate.Identity, Math.Max(m, Math.Min(4 * l, 4 * r)), 0, right);
    }

    /// <summary>||O||^2 = sum of squared coefficients.</summary>
    public double NormSquared()
    {
        var e = new double[] { 1 };
        for (int j = 0; j < N; j++) e = LeftStep(e, j, all: true);
        return e[0];
    }

    // E_j = sum_s A_j[s]^T E_{j-1} A_j[s] (all letters) or the identity letter only.
    private double[] LeftStep(double[] e, int j, bool all)
    {
        int l = Left(j), r = Right(j);
        var next = new double[r * r];
        var tmp = new double[l * r];
        var t2 = new double[r * r];
        for (int s = 0; s < (all ? 4 : 1); s++)
        {
            var a = _a[j].AsSpan(s * l * r, l * r);
            if (TensorPrimitives.MaxMagnitude(a) == 0) continue;
            LowRankFactor.Gemm(e, l, l, a, r, tmp);                      // E A (l x r)
            var at = LowRankFactor.Transpose(a, l, r);                      // r x l
            LowRankFactor.Gemm(at, r, l, tmp, r, t2);                       // A^T E A
            TensorPrimitives.Add(next, t2, next);
        }
        return next;
    }

    // F_j = sum_s A_j[s] F_{j+1} A_j[s]^T
    private double[] RightStep(double[] f, int j)
    {
        int l = Left(j), r = Right(j);
        var next = new double[l * l];
        var tmp = new double[l * r];
        var t2 = new double[l * l];
        for (int s = 0; s < 4; s++)
        {
            var a = _a[j].AsSpan(s * l * r, l * r);
            if (TensorPrimitives.MaxMagnitude(a) == 0) continue;
            LowRankFactor.Gemm(a, l, r, f, r, tmp);                         // A F (l x r)
            var at = LowRankFactor.Transpose(a, l, r);                      // r x l
            LowRankFactor.Gemm(tmp, l, r, at, l, t2);                       // A F A^T
            TensorPrimitives.Add(next, t2, next);
        }
        return next;
    }

    /// <summary>
    /// Site weights rho_j = (sum of c_S^2 over strings with s_j != I) / ||O||^2 and the norm, from left and right
    /// environments (exact for the stored product, whatever the canonical form).
    /// </summary>
    public (double[] Weights, double NormSquared) SiteWeights()
    {
        var (letters, norm) = LetterWeights(identityOnly: true);
        var w = new double[N];
        for (int j = 0; j < N; j++) w[j] = Math.Clamp(1 - letters[j][0], 0, 1);
        return (w, norm);
    }

    /// <summary>
    /// Weight of each letter (I, X, Y, Z) at every site, normalised by ||O||^2 (rows sum to 1), and the norm. The OTOC
    /// against a single-site V follows: F = 1 - 2 (weight of the two letters that anticommute with V).
    /// </summary>
    public (double[][] Letters, double NormSquared) LetterWeights() => LetterWeights(identityOnly: false);

    private (double[][] Letters, double NormSquared) LetterWeights(bool identityOnly)
    {
        var left = new double[N + 1][];
        left[0] = [1];
        for (int j = 0; j < N; j++) left[j + 1] = LeftStep(left[j], j, all: true);
        var right = new double[N + 1][];
        right[N] = [1];
        for (int j = N - 1; j >= 0; j--) right[j] = RightStep(right[j + 1], j);
        double norm = left[N][0];
        var w = new double[N][];
        for (int j = 0; j < N; j++)
        {
            int l = Left(j), r = Right(j);
            w[j] = new double[4];
            var tmp = new double[l * r];
            var y = new double[l * l];
            for (int s = 0; s < (identityOnly ? 1 : 4); s++)
            {
                var a = _a[j].AsSpan(s * l * r, l * r);
                if (TensorPrimitives.MaxMagnitude(a) == 0) continue;
                LowRankFactor.Gemm(a, l, r, right[j + 1], r, tmp);             // A_s F (l x r)
                var at = LowRankFactor.Transpose(a, l, r);
                LowRankFactor.Gemm(tmp, l, r, at, l, y);                        // A_s F A_s^T
                double ws = TensorPrimitives.Dot(left[j], y);                   // Tr(E^T Y) = sum E_xy Y_xy
                w[j][s] = norm > 0 ? ws / norm : 0;
            }
        }
        return (w, norm);
    }

    /// <summary>The coefficient of the Pauli string <paramref name="p"/> (e.g. the autocorrelation against the probe).</summary>
    public double Coefficient(PauliString p)
    {
        ArgumentNullException.ThrowIfNull(p);
        var v = new double[] { 1 };
        for (int j = 0; j < N; j++)
        {
            int l = Left(j), r = Right(j);
            int s = LetterIndex(p[j]);
            var next = new double[r];
            LowRankFactor.Gemm(v, 1, l, _a[j].AsSpan(s * l * r, l * r), r, next);
            v = next;
        }
        return v[0];
    }

    /// <summary>Bond dimensions, bond j between sites j and j + 1.</summary>
    public IReadOnlyList<int> BondDimensions => _bond;
}
