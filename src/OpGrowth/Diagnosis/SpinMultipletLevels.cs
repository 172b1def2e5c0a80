using OpGrowth.Exact;
using OpGrowth.Pauli;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Level statistics of an SU(2)-symmetric Hamiltonian with total spin resolved. The sector of total
/// S^z = m (and reflection parity, when H has it) holds one state of every multiplet with S &gt;= |m|, so the
/// energies of the S = m multiplets are the levels of the m sector minus those of the m + 1 sector
/// (a multiset difference, matched to rounding). Gap ratios are then taken within each (S, parity)
/// block and pooled. Mixing different S would pull &lt;r&gt; toward Poisson.
/// </summary>
internal static class SpinMultipletLevels
{
    /// <summary>One resolved block: its label and its levels (ascending).</summary>
    internal sealed record Block(string Label, double[] Levels);

    /// <summary>The (S, parity) blocks, or null when the level matching fails (then the caller falls back).</summary>
    public static IReadOnlyList<Block>? Resolve(Hamiltonian h, bool reflection, int threads, out string? problem)
    {
        int n = h.N;
        problem = null;
        var sectors = SymmetrySector.Enumerate(n, totalZ: true, reflection: reflection, spinFlip: false);
        bool real = h.Terms.All(t => PauliMask.From(t.String).IsReal);
        // Levels per (down spins k, parity), only k <= N/2 (S^z >= 0).
        var levels = new Dictionary<(int K, int P), double[]>();
        foreach (var sec in sectors)
        {
            if (2 * sec.DownSpins > n) continue;
            double[] ev = real
                ? LevelStatistics.SymmetricEigenvalues(sec.RealBlock(h), sec.Dimension, threads)
                : LevelStatistics.HermitianEigenvalues(sec.ComplexBlock(h), sec.Dimension, threads);
            levels[(sec.DownSpins, sec.ReflectionParity)] = ev;
        }
        double scale = levels.Values.SelectMany(v => v).Select(Math.Abs).DefaultIfEmpty(1).Max() + 1;
        double tol = 1e-8 * scale;
        var blocks = new List<Block>();
        foreach (var ((k, p), ev) in levels.OrderBy(kv => kv.Key.K).ThenBy(kv => kv.Key.P))
        {
            // S = S^z = (N - 2k)/2; remove the multiplets with larger S (present in the k - 1 sector).
            double[] rest = ev;
            if (k > 0 && levels.TryGetValue((k - 1, p), out var above))
            {
                rest = Difference(ev, above, tol, out bool ok);
                if (!ok || rest.Length != ev.Length - above.Length)
                {
                    problem = $"levels of S^z = {(n - 2 * k) / 2.0} and {(n - 2 * k + 2) / 2.0} did not match as SU(2) multiplets";
                    return null;
                }
            }
            string label = $"S={(n - 2 * k) / 2.0:0.#}" + (p != 0 ? $", R={(p > 0 ? "+1" : "-1")}" : string.Empty);
            blocks.Add(new Block(label, rest));
        }
        return blocks;
    }

    /// <summary>Sorted multiset difference a \ b with tolerance; ok = every element of b was found in a.</summary>
    internal static double[] Difference(double[] a, double[] b, double tol, out bool ok)
    {
        var result = new List<double>(Math.Max(0, a.Length - b.Length));
        int j = 0;
        ok = true;
        for (int i = 0; i < a.Length; i++)
        {
            if (j < b.Length && Math.Abs(a[i] - b[j]) <= tol)
            {
                j++;
                continue;
            }
            if (j < b.Length && b[j] < a[i] - tol)
            {
                ok = false; // an element of b has no partner in a
                j++;
                i--;
                continue;
            }
            result.Add(a[i]);
        }
        if (j < b.Length) ok = false;
        return [.. result];
    }
}
