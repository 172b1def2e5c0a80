using System.Numerics;

namespace OpGrowth.Evolution;

/// <summary>
/// Majorana size of a Pauli string under the Jordan-Wigner map with strings of X:
/// g_{2j} = (prod_{k&lt;j} X_k) Z_j and g_{2j+1} = (prod_{k&lt;j} X_k) Y_j (sites from 0), so that
/// X_j = i g_{2j} g_{2j+1} and Z_j Z_{j+1} = i g_{2j+1} g_{2j+2} (the transverse-field Ising chain
/// becomes quadratic). Every Pauli string is, up to a phase, a product of distinct Majoranas; its
/// Majorana size is how many.
/// Derivation: Z and Y carry one Majorana of their own plus the string of pairs below them, X
/// carries its pair. Per site k let p_k be the parity of Z/Y letters (z bits) above k; then
/// g_{2k} is present iff x_k ^ z_k ^ p_k and g_{2k+1} iff x_k ^ p_k.
/// Source: P. Jordan and E. Wigner, Z. Phys. 47, 631 (1928) (mapping); the counting is ours.
/// </summary>
internal static class MajoranaCount
{
    /// <summary>Number of Majoranas in the string with symplectic words (x, z) on n sites.</summary>
    public static int Weight(ReadOnlySpan<ulong> x, ReadOnlySpan<ulong> z, int n)
    {
        int words = (n + 63) >> 6;
        ulong carry = 0; // all ones when the z parity of the higher words is odd
        int total = 0;
        for (int w = words - 1; w >= 0; w--)
        {
            ulong zw = z[w], xw = x[w];
            ulong q = zw;
            q ^= q >> 1;
            q ^= q >> 2;
            q ^= q >> 4;
            q ^= q >> 8;
            q ^= q >> 16;
            q ^= q >> 32;
            ulong p = q ^ zw ^ carry; // parity of z strictly above each bit, all words
            ulong a = xw ^ zw ^ p;
            ulong b = xw ^ p;
            int r = n - (w << 6);
            ulong mask = r >= 64 ? ulong.MaxValue : (1UL << r) - 1;
            total += BitOperations.PopCount(a & mask) + BitOperations.PopCount(b & mask);
            if ((BitOperations.PopCount(zw) & 1) != 0) carry = ~carry;
        }
        return total;
    }
}
