using System.Globalization;
using OpGrowth.Models;

namespace OpGrowth.Diagnosis;

/// <summary>Smaller members of a model family read from a model file, by overriding its size parameters.</summary>
public static class FamilyMembers
{
    /// <summary>
    /// A <see cref="SmallerMember"/> for the model file at <paramref name="path"/> loaded with
    /// <paramref name="overrides"/>: the parameter <c>N</c> is set to n (or, for a square lattice with
    /// <c>Lx</c> and <c>Ly</c>, the most nearly square Lx x Ly &lt;= n with both sides at least 2), and for
    /// realisation r &gt; 0 the parameter <c>seed</c> is stepped by r. Returns null members when the file
    /// has no such parameters.
    /// </summary>
    public static SmallerMember FromFile(string path, IReadOnlyDictionary<string, string>? overrides, Model loaded)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(loaded);
        var baseOverrides = overrides ?? new Dictionary<string, string>();
        var parameters = loaded.Parameters;
        return (n, r) =>
        {
            var ov = new Dictionary<string, string>(baseOverrides);
            if (parameters.ContainsKey("N"))
            {
                ov["N"] = n.ToString(CultureInfo.InvariantCulture);
            }
            else if (parameters.ContainsKey("Lx") && parameters.ContainsKey("Ly"))
            {
                var (a, b) = NearSquare(n);
                if (a < 2) return null;
                ov["Lx"] = a.ToString(CultureInfo.InvariantCulture);
                ov["Ly"] = b.ToString(CultureInfo.InvariantCulture);
            }
            else
            {
                return null;
            }
            if (r > 0)
            {
                if (!parameters.TryGetValue("seed", out double seed)) return null;
                ov["seed"] = (seed + r).ToString(CultureInfo.InvariantCulture);
            }
            return ModelLoader.Load(path, ov);
        };
    }

    /// <summary>The factor pair a &lt;= b with a b &lt;= n, largest a b, then most nearly square.</summary>
    internal static (int A, int B) NearSquare(int n)
    {
        (int, int) best = (0, 0);
        for (int a = 2; a * a <= n; a++)
        {
            int b = n / a;
            if (a * b > best.Item1 * best.Item2 || (a * b == best.Item1 * best.Item2 && b - a < best.Item2 - best.Item1)) best = (a, b);
        }
        return best;
    }
}
