using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// One symmetry sector of the computational basis: fixed total Z magnetisation (optional) and fixed
/// eigenvalues +-1 of the spatial reflection j -&gt; N-1-j and of the spin flip prod_j X_j (optional), with
/// its orthonormal basis of symmetrised states and the block of H in that basis.
/// </summary>
/// <remarks>
/// The symmetries used here act on basis states as permutations and form an abelian group G of
/// involutions, so a sector is labelled by characters chi(g) = +-1. Basis states are
/// |a~&gt; = (|G| |Stab a|)^{-1/2} sum_g chi(g) g|a&gt; over orbit representatives a (the smallest index of the
/// orbit) whose stabiliser has trivial character; then
/// &lt;a~|H|b~&gt; = sum_k h_k chi(g_k) sqrt(|Stab a| / |Stab b|) over the terms H|b&gt; = sum_k h_k |s_k&gt; with
/// s_k = g_k a. The block is real when H is real in the computational basis.
/// </remarks>
public sealed class SymmetrySector
{
    private readonly int _n;
    private readonly int[] _reps;
    private readonly int[] _stab;
    private readonly int[] _elements; // 0 = identity, 1 = reflection, 2 = flip, 3 = both
    private readonly int[] _chi;

    /// <summary>Readable label, e.g. "Sz=0, R=+1, F=-1".</summary>
    public string Label { get; }

    /// <summary>Number of up-minus-down... the number of 1-bits (down spins) when total Z is fixed; -1 otherwise.</summary>
    public int DownSpins { get; }

    /// <summary>Reflection parity (+1/-1), 0 when not resolved.</summary>
    public int ReflectionParity { get; }

    /// <summary>Spin-flip parity (+1/-1), 0 when not resolved.</summary>
    public int FlipParity { get; }

    /// <summary>Sector dimension.</summary>
    public int Dimension => _reps.Length;

    private SymmetrySector(int n, int downSpins, int pr, int pf, int[] reps, int[] stab, int[] elements, int[] chi)
    {
        _n = n;
        DownSpins = downSpins;
        ReflectionParity = pr;
        FlipParity = pf;
        _reps = reps;
        _stab = stab;
        _elements = elements;
        _chi = chi;
        var parts = new List<string>();
        if (downSpins >= 0) parts.Add($"Sz={(n - 2 * downSpins) / 2.0:0.#}");
        if (pr != 0) parts.Add($"R={(pr > 0 ? "+1" : "-1")}");
        if (pf != 0) parts.Add($"F={(pf > 0 ? "+1" : "-1")}");
        Label = parts.Count == 0 ? "full space" : string.Join(", ", parts);
    }

    /// <summary>Bit reversal of an N-bit index (site j -&gt; N-1-j).</summary>
    public static int Reflect(int s, int n)
    {
        int r = 0;
        for (int b = 0; b < n; b++) if ((s >> b & 1) != 0) r |= 1 << (n - 1 - b);
        return r;
    }

    /// <summary>
    /// All sectors for the chosen symmetries. With total Z and spin flip both resolved, the magnetisation
    /// sectors with more down than up spins are left out (the flip maps them onto the others: same
    /// spectrum), and the flip parity is resolved in the zero-magnetisation sector.
    /// </summary>
    public static IReadOnlyList<SymmetrySector> Enumerate(int n, bool totalZ, bool reflection, bool spinFlip)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(n, 24);
        var result = new List<SymmetrySector>();
        var mags = totalZ ? Enumerable.Range(0, n + 1).Where(m => !spinFlip || 2 * m <= n).ToArray() : [-1];
        foreach (int m in mags)
        {
            bool flipHere = spinFlip && (!totalZ || 2 * m == n);
            var elems = new List<int> { 0 };
            if (reflection) elems.Add(1);
            if (flipHere) elems.Add(2);
            if (reflection && flipHere) elems.Add(3);
            foreach (int pr in reflection ? new[] { 1, -1 } : new[] { 0 })
            {
                foreach (int pf in flipHere ? new[] { 1, -1 } : new[] { 0 })
                {
                    var chi = elems.Select(g => (g & 1) != 0 && pr < 0 ? -1 : 1).Select((c, i) => (elems[i] & 2) != 0 && pf < 0 ? -c : c).ToArray();
                    var reps = new List<int>();
                    var stab = new List<int>();
                    int full = (1 << n) - 1;
                    for (int s = 0; s <= full; s++)
                    {
                        if (m >= 0 && BitOperations.PopCount((uint)s) != m) continue;
                        int min = s, st = 0, chiSum = 0;
                        for (int e = 0; e < elems.Count; e++)
                        {
                            int img = Apply(elems[e], s, n);
                            if (img < min) min = img;
                            if (img == s)
                            {
                                st++;
                                chiSum += chi[e];
                            }
                        }
                        if (min != s || chiSum == 0) continue;
                        reps.Add(s);
                        stab.Add(st);
                    }
                    if (reps.Count > 0) result.Add(new SymmetrySector(n, m, pr, flipHere ? pf : 0, [.. reps], [.. stab], [.. elems], chi));
                }
            }
        }
        return result;
    }

    private static int Apply(int g, int s, int n)
    {
        if ((g & 1) != 0) s = Reflect(s, n);
        if ((g & 2) != 0) s ^= (1 << n) - 1;
        return s;
    }

    /// <summary>The block of H in this sector (row-major), complex; see <see cref="RealBlock"/> for real H.</summary>
    public Complex[] ComplexBlock(Hamiltonian h)
    {
        var m = new Complex[(long)Dimension * Dimension];
        Fill(h, (row, col, v) => m[(long)row * Dimension + col] += v);
        return m;
    }

    /// <summary>The block of H in this sector (row-major, symmetric). Throws when H is not real.</summary>
    public double[] RealBlock(Hamiltonian h)
    {
        var m = new double[(long)Dimension * Dimension];
        Fill(h, (row, col, v) =>
        {
            if (Math.Abs(v.Imaginary) > 0) throw new InvalidOperationException("The Hamiltonian is not real in the computational basis.");
            m[(long)row * Dimension + col] += v.Real;
        });
        return m;
    }

    private void Fill(Hamiltonian h, Action<int, int, Complex> add)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (h.N != _n) throw new ArgumentException($"Hamiltonian acts on {h.N} qubits; the sector on {_n}.", nameof(h));
        var index = new Dictionary<int, int>(_reps.Length);
        for (int i = 0; i < _reps.Length; i++) index[_reps[i]] = i;
        var masks = h.Terms.Select(t => (PauliMask.From(t.String), t.Coefficient)).ToArray();
        for (int col = 0; col < _reps.Length; col++)
        {
            int b = _reps[col];
            foreach (var (mask, c) in masks)
            {
                int s = (int)((ulong)b ^ mask.X);
                Complex amp = c * mask.Factor((ulong)b);
                // representative of s and the element g with g(rep) = s (involutions: g(s) = rep)
                int rep = s, ge = 0;
                for (int e = 1; e < _elements.Length; e++)
                {
                    int img = Apply(_elements[e], s, _n);
                    if (img < rep)
                    {
                        rep = img;
                        ge = e;
                    }
                }
                if (!index.TryGetValue(rep, out int row)) continue; // incompatible orbit: amplitude cancels
                add(row, col, amp * _chi[ge] * Math.Sqrt((double)_stab[row] / _stab[col]));
            }
        }
    }
}
