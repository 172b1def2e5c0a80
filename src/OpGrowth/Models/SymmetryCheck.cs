using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Models;

/// <summary>
/// Verifies declared symmetries of a sum of Pauli terms exactly (no matrices): each check returns null
/// when the symmetry holds, or a short text naming a term that breaks it.
/// </summary>
internal static class SymmetryCheck
{
    /// <summary>Relative tolerance for coefficient comparisons: a few ulps of accumulated rounding (common practice).</summary>
    private const double RelTol = 1e-12;

    public static string? Check(string symmetry, IReadOnlyList<PauliTerm> terms, Lattice lattice)
    {
        if (terms.Count == 0) return null;
        double scale = terms.Max(t => Math.Abs(t.Coefficient));
        return symmetry switch
        {
            "total-z" => TotalZ(terms, scale),
            "spin-flip" or "fermion-parity" => FirstWhere(terms, t => (CountZ(t.String) & 1) != 0, "anticommutes with the product of all X"),
            "time-reversal" => FirstWhere(terms, t => (CountY(t.String) & 1) != 0, "is imaginary in the Z basis (odd number of Y)"),
            "reflection" => Permutation(terms, lattice.N, i => lattice.N - 1 - i, scale, "site reversal i -> N-1-i"),
            "translation" => Translation(terms, lattice, scale),
            _ => $"'{symmetry}' is not a known symmetry",
        };
    }

    private static int CountZ(PauliString s)
    {
        int c = 0;
        foreach (ulong w in s.Z) c += BitOperations.PopCount(w);
        return c;
    }

    private static int CountY(PauliString s)
    {
        int c = 0;
        for (int i = 0; i < s.Words; i++) c += BitOperations.PopCount(s.X[i] & s.Z[i]);
        return c;
    }

    private static string? FirstWhere(IReadOnlyList<PauliTerm> terms, Func<PauliTerm, bool> bad, string why)
    {
        foreach (var t in terms) if (bad(t)) return $"the term {t.String} {why}";
        return null;
    }

    /// <summary>[H, sum_j Z_j] = sum_t c_t sum_j [P_t, Z_j], with [P, Z_j] = 2 P Z_j when they anticommute; must vanish.</summary>
    private static string? TotalZ(IReadOnlyList<PauliTerm> terms, double scale)
    {
        var acc = new Dictionary<PauliString, Complex>();
        var origin = new Dictionary<PauliString, PauliString>();
        foreach (var t in terms)
        {
            int n = t.String.N;
            foreach (int j in t.String.Support())
            {
                char c = t.String[j];
                if (c == 'Z') continue;
                var z = PauliString.Single(n, j, 'Z');
                var prod = PauliString.Multiply(t.String, z, out int k);
                var add = 2 * t.Coefficient * PauliString.IPower(k);
                acc[prod] = acc.TryGetValue(prod, out var old) ? old + add : add;
                origin.TryAdd(prod, t.String);
            }
        }
        foreach (var kv in acc)
        {
            if (kv.Value.Magnitude > RelTol * scale * 4) return $"the term {origin[kv.Key]} does not conserve the total Z (nothing cancels its commutator with sum Z)";
        }
        return null;
    }

    private static string? Permutation(IReadOnlyList<PauliTerm> terms, int n, Func<int, int> map, double scale, string what)
    {
        var dict = new Dictionary<PauliString, double>();
        foreach (var t in terms) dict[t.String] = t.Coefficient;
        foreach (var t in terms)
        {
            var b = new PauliString.Builder(n);
            foreach (int j in t.String.Support()) b.Set(map(j), t.String[j]);
            var image = b.Build();
            if (!dict.TryGetValue(image, out double c) || Math.Abs(c - t.Coefficient) > RelTol * scale)
            {
                return $"the term {t.String} ({LoaderFmt(t.Coefficient)}) has no partner {image} with the same coefficient under {what}";
            }
        }
        return null;
    }

    private static string? Translation(IReadOnlyList<PauliTerm> terms, Lattice lattice, double scale)
    {
        int n = lattice.N;
        switch (lattice.Kind)
        {
            case "ring":
                return Permutation(terms, n, i => (i + 1) % n, scale, "translation by one site");
            case "ladder" when lattice.Periodic:
                return Permutation(terms, n, i => (i + 2) % n, scale, "translation by one rung");
            case "square" when lattice.Periodic:
            {
                int w = lattice.Width, h = lattice.Height;
                return Permutation(terms, n, i => (i / w) * w + (i % w + 1) % w, scale, "translation by one column")
                    ?? Permutation(terms, n, i => ((i / w + 1) % h) * w + i % w, scale, "translation by one row");
            }
            default:
                return $"a {lattice.Kind} lattice without periodic boundaries has no translation symmetry";
        }
    }

    /// <summary>
    /// Uniform couplings on a chain or ring: every term's translate by +-1 site (when it stays inside
    /// an open chain) exists with the same coefficient.
    /// </summary>
    public static bool IsTranslationInvariant(IReadOnlyList<PauliTerm> terms, Lattice lattice)
    {
        if (lattice.Kind is not ("chain" or "ring") || terms.Count == 0) return false;
        int n = lattice.N;
        double scale = terms.Max(t => Math.Abs(t.Coefficient));
        var dict = new Dictionary<PauliString, double>();
        foreach (var t in terms) dict[t.String] = t.Coefficient;
        bool ring = lattice.Kind == "ring";
        foreach (var t in terms)
        {
            foreach (int shift in (ReadOnlySpan<int>)[1, -1])
            {
                int first = t.String.FirstSite, last = t.String.LastSite;
                if (!ring && (last + shift >= n || first + shift < 0)) continue;
                var b = new PauliString.Builder(n);
                foreach (int j in t.String.Support()) b.Set(((j + shift) % n + n) % n, t.String[j]);
                if (!dict.TryGetValue(b.Build(), out double c) || Math.Abs(c - t.Coefficient) > RelTol * scale) return false;
            }
        }
        return true;
    }

    private static string LoaderFmt(double v) => v.ToString("G6", System.Globalization.CultureInfo.InvariantCulture);
}
