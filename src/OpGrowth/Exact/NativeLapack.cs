using System.Numerics;
using System.Runtime.InteropServices;

namespace OpGrowth.Exact;

/// <summary>
/// Optional LAPACK eigensolvers (dsyevd / zheevd, and zgeev for general complex matrices) through the system's LAPACKE C interface
/// (liblapacke.so.3, e.g. Debian's liblapacke with OpenBLAS). When the library is missing or fails to
/// load, every method returns false and callers use the managed solvers; nothing else changes.
/// Set OPGROWTH_NO_LAPACK=1 to force the managed path.
/// </summary>
public static class NativeLapack
{
    private const string Lib = "liblapacke.so.3";
    private const int ColMajor = 102;
    private static readonly Lazy<bool> Probe = new(() =>
    {
        if (Environment.GetEnvironmentVariable("OPGROWTH_NO_LAPACK") == "1") return false;
        try
        {
            if (!NativeLibrary.TryLoad(Lib, out var handle)) return false;
            bool ok = NativeLibrary.TryGetExport(handle, "LAPACKE_dsyevd", out _) && NativeLibrary.TryGetExport(handle, "LAPACKE_zheevd", out _);
            return ok;
        }
        catch (Exception ex) when (ex is DllNotFoundException or BadImageFormatException or EntryPointNotFoundException)
        {
            return false;
        }
    });

    /// <summary>True when liblapacke.so.3 was found with the needed routines.</summary>
    public static bool IsAvailable => Probe.Value;

    [DllImport(Lib, EntryPoint = "LAPACKE_dsyevd")]
    private static extern int Dsyevd(int layout, byte jobz, byte uplo, int n, [In, Out] double[] a, int lda, [Out] double[] w);

    private static readonly Lazy<bool> ProbeGeneral = new(() =>
    {
        if (!IsAvailable) return false;
        try
        {
            return NativeLibrary.TryLoad(Lib, out var handle) && NativeLibrary.TryGetExport(handle, "LAPACKE_zgeev", out _);
        }
        catch (Exception ex) when (ex is DllNotFoundException or BadImageFormatException or EntryPointNotFoundException)
        {
            return false;
        }
    });

    [DllImport(Lib, EntryPoint = "LAPACKE_zgeev")]
    private static extern int Zgeev(int layout, byte jobvl, byte jobvr, int n, [In, Out] Complex[] a, int lda, [Out] Complex[] w, [Out] Complex[] vl, int ldvl, [Out] Complex[] vr, int ldvr);

    [DllImport(Lib, EntryPoint = "LAPACKE_zheevd")]
    private static extern int Zheevd(int layout, byte jobz, byte uplo, int n, [In, Out] Complex[] a, int lda, [Out] double[] w);

    /// <summary>
    /// Eigen-decomposition of a real symmetric n x n matrix (column-major, overwritten with the
    /// eigenvectors when <paramref name="vectors"/>). Returns false when LAPACK is unavailable or fails.
    /// </summary>
    public static bool TrySymmetricEigen(double[] a, int n, bool vectors, out double[] eigenvalues)
    {
        ArgumentNullException.ThrowIfNull(a);
        eigenvalues = [];
        if (!IsAvailable) return false;
        var w = new double[n];
        try
        {
            int info = Dsyevd(ColMajor, vectors ? (byte)'V' : (byte)'N', (byte)'L', n, a, n, w);
            if (info != 0) return false;
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            return false;
        }
        eigenvalues = w;
        return true;
    }

    /// <summary>As <see cref="TrySymmetricEigen"/> for a complex Hermitian matrix (column-major).</summary>
    public static bool TryHermitianEigen(Complex[] a, int n, bool vectors, out double[] eigenvalues)
    {
        ArgumentNullException.ThrowIfNull(a);
        eigenvalues = [];
        if (!IsAvailable) return false;
        var w = new double[n];
        try
        {
            int info = Zheevd(ColMajor, vectors ? (byte)'V' : (byte)'N', (byte)'L', n, a, n, w);
            if (info != 0) return false;
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            return false;
        }
        eigenvalues = w;
        return true;
    }

    /// <summary>
    /// Eigenvalues of a general complex n x n matrix (column-major; the input is left untouched).
    /// Returns false when LAPACK (with zgeev) is unavailable or fails.
    /// </summary>
    public static bool TryGeneralEigenvalues(Complex[] a, int n, out Complex[] eigenvalues)
    {
        ArgumentNullException.ThrowIfNull(a);
        eigenvalues = [];
        if (!ProbeGeneral.Value) return false;
        var copy = (Complex[])a.Clone();
        var w = new Complex[n];
        var none = new Complex[1];
        try
        {
            if (Zgeev(ColMajor, (byte)'N', (byte)'N', n, copy, n, w, none, 1, none, 1) != 0) return false;
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            return false;
        }
        eigenvalues = w;
        return true;
    }
}
