namespace OpGrowth.Krylov;

/// <summary>Bessel functions J_0(z)..J_K(z) of integer order at one argument, for Chebyshev propagation.</summary>
/// <remarks>
/// Source: Miller's backward recurrence J_{k-1} = (2k/z) J_k - J_{k+1}, normalised by
/// J_0 + 2 sum_k J_{2k} = 1 (Abramowitz and Stegun, Handbook of Mathematical Functions, 1964, 9.12 and 9.1.46).
/// Stable for every order because the minimal solution dominates going down.
/// </remarks>
internal static class BesselSeries
{
    /// <summary>Fills j[0..K] with J_k(z), z &gt;= 0.</summary>
    public static void Fill(double z, Span<double> j)
    {
        int kmax = j.Length - 1;
        j.Clear();
        if (z < 1e-12)
        {
            // Leading terms of the series J_k(z) = (z/2)^k / k! (1 + O(z^2)); exact to rounding here.
            j[0] = 1;
            if (kmax >= 1) j[1] = z / 2;
            return;
        }
        int top = Math.Max(kmax, (int)z) + 20 + (int)Math.Sqrt(40 * Math.Max(kmax, z));
        if (top % 2 == 1) top++;
        double jp1 = 0, jk = 1e-300, norm = 0;
        for (int k = top; k >= 1; k--)
        {
            double jm1 = 2.0 * k / z * jk - jp1;
            jp1 = jk;
            jk = jm1; // now holds J_{k-1} (unnormalised)
            int order = k - 1;
            if (order <= kmax) j[order] = jk;
            if (order > 0 && order % 2 == 0) norm += 2 * jk;
            if (Math.Abs(jk) > 1e250)
            {
                // Rescale everything accumulated so far.
                jk *= 1e-250;
                jp1 *= 1e-250;
                norm *= 1e-250;
                for (int i = order; i <= kmax; i++) j[i] *= 1e-250;
            }
        }
        norm += jk; // J_0
        double inv = 1 / norm;
        for (int i = 0; i <= kmax; i++) j[i] *= inv;
    }
}
