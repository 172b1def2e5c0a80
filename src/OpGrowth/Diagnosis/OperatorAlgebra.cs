using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>Small operator helpers the battery needs: energy scale, commutator norms, total spin components.</summary>
public static class OperatorAlgebra
{
    /// <summary>
    /// Local energy scale epsilon = sqrt(||H||^2 / N), ||H||^2 = sum of squared coefficients of the
    /// non-identity terms (Pauli normalisation): the root-mean-square energy per site. Times and
    /// temperatures of the battery are measured in units of 1/epsilon and epsilon.
    /// </summary>
    public static double EnergyScale(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        double s = h.Terms.Where(t => !t.String.IsIdentity).Sum(t => t.Coefficient * t.Coefficient);
        return s > 0 ? Math.Sqrt(s / h.N) : 1.0;
    }

    /// <summary>
    /// Motion scale: sqrt(sum of squared coefficients of the terms acting on two or more sites / N), the
    /// energy per site of the couplings that move operators from site to site (hopping, exchange). Strong
    /// on-site fields raise epsilon without moving anything, so the evolution time of tests 3 and 4 is
    /// measured in units of 1/(motion scale); falls back to epsilon when H has no such terms.
    /// </summary>
    public static double MotionScale(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        double s = h.Terms.Where(t => t.String.Weight >= 2).Sum(t => t.Coefficient * t.Coefficient);
        return s > 0 ? Math.Sqrt(s / h.N) : EnergyScale(h);
    }

    /// <summary>||i[H, Q]|| / ||Q|| in the normalised trace norm (A|A) = Tr(A^dagger A)/2^N.</summary>
    public static double CommutatorNorm(Hamiltonian h, IReadOnlyList<PauliTerm> q)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(q);
        var acc = new Dictionary<PauliString, Complex>();
        foreach (var a in h.Terms)
        {
            foreach (var b in q)
            {
                if (!PauliString.Commutator(a.String, b.String, out var c, out var p)) continue;
                acc[p!] = acc.GetValueOrDefault(p!) + a.Coefficient * b.Coefficient * c;
            }
        }
        double num = acc.Values.Sum(v => v.Magnitude * v.Magnitude);
        double den = q.Sum(t => t.Coefficient * t.Coefficient);
        return den > 0 ? Math.Sqrt(num / den) : 0;
    }

    /// <summary>True when [H, Q] vanishes to rounding (relative to ||H|| ||Q||).</summary>
    public static bool Commutes(Hamiltonian h, IReadOnlyList<PauliTerm> q)
    {
        double scale = Math.Sqrt(Math.Max(h.FrobeniusNormSquared, 1e-300));
        return CommutatorNorm(h, q) <= 1e-10 * scale;
    }

    /// <summary>The sum of one letter over all sites, e.g. total Z = sum_j Z_j.</summary>
    public static IReadOnlyList<PauliTerm> Total(int n, char letter)
        => Enumerable.Range(0, n).Select(j => new PauliTerm(PauliString.Single(n, j, letter), 1.0)).ToArray();

    /// <summary>True when H commutes with total X, Y and Z (SU(2) spin-rotation symmetry).</summary>
    public static bool HasSpinRotationSymmetry(Hamiltonian h)
        => Commutes(h, Total(h.N, 'X')) && Commutes(h, Total(h.N, 'Y')) && Commutes(h, Total(h.N, 'Z'));

    /// <summary>The non-identity terms of H as a list (for Mazur bounds).</summary>
    public static IReadOnlyList<PauliTerm> Traceless(Hamiltonian h)
        => h.Terms.Where(t => !t.String.IsIdentity).ToArray();
}
