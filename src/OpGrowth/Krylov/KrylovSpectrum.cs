using System.Numerics;

namespace OpGrowth.Krylov;

/// <summary>
/// Spectral function of the autocorrelation from the continued fraction of its Laplace transform,
/// G(z) = int_0^inf e^{-zt} C(t) dt = 1/(z + b_1^2/(z + b_2^2/(z + ...))), evaluated at z = eta - i omega:
/// Phi(omega) = int C(t) e^{i omega t} dt = 2 Re G(eta - i omega). The fraction is cut at a finite depth
/// (coefficients beyond the computed ones from the continuation), so eta &gt; 0 is a broadening that
/// smooths the discrete poles of the cut fraction; normalisation: int Phi d omega / (2 pi) = C(0) = 1.
/// </summary>
/// <remarks>Source: Viswanath and Mueller, The Recursion Method (Springer, 1994), continued-fraction representation of the relaxation function.</remarks>
public static class KrylovSpectrum
{
    /// <summary>Phi(omega) at each omega with the fraction cut after <paramref name="depth"/> levels.</summary>
    public static double[] SpectralFunction(Func<int, double> b, int depth, IReadOnlyList<double> omegas, double broadening)
    {
        ArgumentNullException.ThrowIfNull(b);
        ArgumentNullException.ThrowIfNull(omegas);
        ArgumentOutOfRangeException.ThrowIfLessThan(depth, 1);
        if (!(broadening > 0)) throw new ArgumentOutOfRangeException(nameof(broadening), broadening, "expected a positive broadening");
        var b2 = new double[depth + 1];
        for (int n = 1; n <= depth; n++) b2[n] = b(n) * b(n);
        var result = new double[omegas.Count];
        for (int i = 0; i < omegas.Count; i++)
        {
            var z = new Complex(broadening, -omegas[i]);
            Complex g = Complex.Zero;
            for (int n = depth; n >= 1; n--) g = b2[n] / (z + g);
            result[i] = 2 * (1 / (z + g)).Real;
        }
        return result;
    }
}
