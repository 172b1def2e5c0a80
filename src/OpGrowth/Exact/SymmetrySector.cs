using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// One symmetry sector of the computational basis: fixed total Z magnetisation (optional), fixed
/// eigenvalues +-1 of a set of commuting involutive site permutations ("mirrors": the chain reflection
/// j -&gt; N-1-j, or the mirror axes of a rectangle) and of the spin flip prod_j X_j (optional), and
/// optionally the eigenvalue of one more involution (a "swap", e.g. the diagonal mirror of a square)
/// that maps the mirror group onto itself. Holds the orthonormal basis of symmetrised states and the
/// block of H in that basis.
/// </summary>
/// <remarks>
/// The symmetries act on basis states as permutations and form a group G; a sector is labelled by a
/// real one-dimensional character chi(g) = +-1. Basis states are
/// |a~&gt; = (|G| |Stab a|)^{-1/2} sum_g chi(g) g|a&gt; over orbit representatives a (the smallest index of the
/// orbit) whose stabiliser has trivial character; then
/// &lt;a~|H|b~&gt; = sum_k h_k chi(g_k) sqrt(|Stab a| / |Stab b|) over the terms H|b&gt; = sum_k h_k |s_k&gt; with
/// s_k = g_k a (chi(g) = chi(g^-1) for real characters, so the group need not be abelian). The block is
/// real when H is real in the computational basis.
/// <para>
/// With a swap d (d m d in the mirror group A for every mirror m), a character chi of A either is
/// invariant under conjugation by d (then G = A + dA and chi extends in two ways, d = +-1: two sectors,
/// e.g. A1 and B1 of the square's point group D4 inside mirror-x = mirror-y = +1), or it is not (then d
/// maps the chi sector onto the chi o Ad_d sector: the two have the same spectrum, together a
/// two-dimensional irrep, e.g. E of D4; only one of them is listed, with <see cref="Multiplicity"/> 2).
/// </para>
/// </remarks>
public sealed class SymmetrySector
{
    private readonly int _n;
    private readonly int[] _reps;
    private readonly int[] _stab;
    private readonly Element[] _elements; // [0] = identity
    private readonly int[] _chi;

    private readonly record struct Element(SitePermutation? Perm, bool Flip);

    /// <summary>Readable label, e.g. "Sz=0, R=+1, F=-1" or "Mx=+1, My=+1, D=-1".</summary>
    public string Label { get; }

    /// <summary>The number of 1-bits (down spins) when total Z is fixed; -1 otherwise.</summary>
    public int DownSpins { get; }

    /// <summary>Eigenvalue +-1 of each resolved mirror (same order as given to <see cref="Enumerate(int, bool, IReadOnlyList{SitePermutation}, bool, SitePermutation?)"/>).</summary>
    public IReadOnlyList<(string Name, int Parity)> MirrorParities { get; }

    /// <summary>Parity of the mirror named "reflection" (the chain reversal), 0 when it is not resolved.</summary>
    public int ReflectionParity => MirrorParities.Where(p => p.Name == "reflection").Select(p => p.Parity).FirstOrDefault();

    /// <summary>Eigenvalue of the swap (+1/-1); 0 when no swap is resolved or this sector is one of a swapped pair.</summary>
    public int SwapParity { get; }

    /// <summary>Spin-flip parity (+1/-1), 0 when not resolved.</summary>
    public int FlipParity { get; }

    /// <summary>
    /// How many times this block's spectrum occurs in the full spectrum: 2 for one of a pair of sectors
    /// mapped onto each other by the swap, and 2 for a magnetisation sector whose spin-flipped partner
    /// (more down than up spins) is left out; 1 otherwise (products when both apply).
    /// </summary>
    public int Multiplicity { get; }

    /// <summary>Sector dimension.</summary>
    public int Dimension => _reps.Length;

    private SymmetrySector(int n, int downSpins, IReadOnlyList<(string, int)> mirrors, int swap, int pf, int multiplicity, string label,
        int[] reps, int[] stab, Element[] elements, int[] chi)
    {
        _n = n;
        DownSpins = downSpins;
        MirrorParities = mirrors;
        SwapParity = swap;
        FlipParity = pf;
        Multiplicity = multiplicity;
        Label = label;
        _reps = reps;
        _stab = stab;
        _elements = elements;
        _chi = chi;
    }

    /// <summary>Bit reversal of an N-bit index (site j -&gt; N-1-j).</summary>
    public static int Reflect(int s, int n)
    {
        int r = 0;
        for (int b = 0; b < n; b++) if ((s >> b & 1) != 0) r |= 1 << (n - 1 - b);
        return r;
    }

    /// <summary>
    /// All sectors for the chosen symmetries with the chain reflection j -&gt; N-1-j as the only mirror
    /// (when <paramref name="reflection"/>). See the general overload.
    /// </summary>
    public static IReadOnlyList<SymmetrySector> Enumerate(int n, bool totalZ, bool reflection, bool spinFlip)
        => Enumerate(n, totalZ, reflection ? [SitePermutation.Reversal(n)] : [], spinFlip);

    /// <summary>
    /// All sectors for the chosen symmetries. <paramref name="mirrors"/> must be commuting, independent
    /// involutions; <paramref name="swap"/> (optional) an involution outside their group that maps each
    /// mirror into the group by conjugation. With total Z and spin flip both resolved, the magnetisation
    /// sectors with more down than up spins are left out (the flip maps them onto the others: same
    /// spectrum, see <see cref="Multiplicity"/>), and the flip parity is resolved in the zero-magnetisation
    /// sector.
    /// </summary>
    public static IReadOnlyList<SymmetrySector> Enumerate(int n, bool totalZ, IReadOnlyList<SitePermutation> mirrors, bool spinFlip, SitePermutation? swap = null)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(n, 24);
        ArgumentNullException.ThrowIfNull(mirrors);
        int k = mirrors.Count;
        var group = MirrorGroup(n, mirrors); // index = bit mask of generators
        int[]? conj = swap is null ? null : Conjugation(n, mirrors, group, swap);
        var result = new List<SymmetrySector>();
        var mags = totalZ ? Enumerable.Range(0, n + 1).Where(m => !spinFlip || 2 * m <= n).ToArray() : [-1];
        foreach (int m in mags)
        {
            bool flipHere = spinFlip && (!totalZ || 2 * m == n);
            int magMult = totalZ && spinFlip && 2 * m < n ? 2 : 1;
            // characters of the mirror group: bit i of c set = mirror i has eigenvalue -1
            for (int c = 0; c < 1 << k; c++)
            {
                int cs = c;
                if (conj is not null)
                {
                    cs = 0;
                    for (int i = 0; i < k; i++) if ((BitOperations.PopCount((uint)(conj[i] & c)) & 1) != 0) cs |= 1 << i;
                }
                if (cs < c) continue; // the partner with the smaller character index is listed
                var parities = mirrors.Select((p, i) => (p.Name, (c >> i & 1) != 0 ? -1 : 1)).ToArray();
                int[] swapParities = conj is null || cs != c ? [0] : [1, -1];
                foreach (int pd in swapParities)
                {
                    var elems = new List<Element>();
                    var chiList = new List<int>();
                    for (int g = 0; g < group.Length; g++)
                    {
                        elems.Add(new Element(g == 0 ? null : group[g], false));
                        chiList.Add(CharOf(g, c));
                    }
                    if (pd != 0)
                    {
                        for (int g = 0; g < group.Length; g++)
                        {
                            elems.Add(new Element(g == 0 ? swap : swap!.After(group[g]), false));
                            chiList.Add(pd * CharOf(g, c));
                        }
                    }
                    foreach (int pf in flipHere ? new[] { 1, -1 } : new[] { 0 })
                    {
                        var el = new List<Element>(elems);
                        var chi = new List<int>(chiList);
                        if (flipHere)
                        {
                            foreach (var (e, x) in elems.Zip(chiList))
                            {
                                el.Add(e with { Flip = true });
                                chi.Add(pf * x);
                            }
                        }
                        var (reps, stab) = Representatives(n, m, el, chi);
                        if (reps.Length == 0) continue;
                        int mult = magMult * (conj is not null && cs != c ? 2 : 1);
                        string label = MakeLabel(n, m, parities, swap, pd, cs != c ? mirrors.Select((p, i) => (p.Name, (cs >> i & 1) != 0 ? -1 : 1)).ToArray() : null, pf);
                        result.Add(new SymmetrySector(n, m, parities, pd, pf, mult, label, reps, stab, [.. el], [.. chi]));
                    }
                }
            }
        }
        return result;
    }

    private static int CharOf(int groupMask, int character) => (BitOperations.PopCount((uint)(groupMask & character)) & 1) != 0 ? -1 : 1;

    private static SitePermutation[] MirrorGroup(int n, IReadOnlyList<SitePermutation> mirrors)
    {
        int k = mirrors.Count;
        if (k > 8) throw new ArgumentException("At most 8 mirrors.", nameof(mirrors));
        var id = new SitePermutation("identity", Enumerable.Range(0, n).ToArray());
        foreach (var p in mirrors)
        {
            if (p.N != n) throw new ArgumentException($"Mirror '{p.Name}' acts on {p.N} sites, expected {n}.", nameof(mirrors));
            if (!p.IsInvolution || p.IsIdentity) throw new ArgumentException($"Mirror '{p.Name}' is not an involution.", nameof(mirrors));
            foreach (var q in mirrors) if (!p.CommutesWith(q)) throw new ArgumentException($"Mirrors '{p.Name}' and '{q.Name}' do not commute.", nameof(mirrors));
        }
        var group = new SitePermutation[1 << k];
        group[0] = id;
        for (int g = 1; g < group.Length; g++)
        {
            int i = BitOperations.TrailingZeroCount(g);
            group[g] = mirrors[i].After(group[g & (g - 1)]);
        }
        for (int a = 0; a < group.Length; a++)
        {
            for (int b = a + 1; b < group.Length; b++)
            {
                if (group[a].SameMap(group[b])) throw new ArgumentException("The mirrors are not independent (one is a product of others).", nameof(mirrors));
            }
        }
        return group;
    }

    /// <summary>conj[i] = group mask of swap * mirror_i * swap.</summary>
    private static int[] Conjugation(int n, IReadOnlyList<SitePermutation> mirrors, SitePermutation[] group, SitePermutation swap)
    {
        if (swap.N != n || !swap.IsInvolution || swap.IsIdentity) throw new ArgumentException($"Swap '{swap.Name}' is not an involution on {n} sites.", nameof(swap));
        if (group.Any(g => g.SameMap(swap))) throw new ArgumentException($"Swap '{swap.Name}' lies in the mirror group.", nameof(swap));
        var conj = new int[mirrors.Count];
        for (int i = 0; i < mirrors.Count; i++)
        {
            var c = swap.After(mirrors[i]).After(swap);
            int idx = Array.FindIndex(group, g => g.SameMap(c));
            if (idx < 0) throw new ArgumentException($"Swap '{swap.Name}' does not map mirror '{mirrors[i].Name}' into the mirror group.", nameof(swap));
            conj[i] = idx;
        }
        return conj;
    }

    /// <summary>True when <paramref name="swap"/> can be used with <paramref name="mirrors"/> in <see cref="Enumerate(int, bool, IReadOnlyList{SitePermutation}, bool, SitePermutation?)"/>.</summary>
    public static bool IsCompatibleSwap(IReadOnlyList<SitePermutation> mirrors, SitePermutation swap)
    {
        ArgumentNullException.ThrowIfNull(mirrors);
        ArgumentNullException.ThrowIfNull(swap);
        try
        {
            Conjugation(swap.N, mirrors, MirrorGroup(swap.N, mirrors), swap);
            return true;
        }
        catch (ArgumentException)
        {
            return false;
        }
    }

    private static (int[] Reps, int[] Stab) Representatives(int n, int m, List<Element> el, List<int> chi)
    {
        var reps = new List<int>();
        var stab = new List<int>();
        int full = (1 << n) - 1;
        for (int s = 0; s <= full; s++)
        {
            if (m >= 0 && BitOperations.PopCount((uint)s) != m) continue;
            int st = 0, chiSum = 0;
            bool smaller = false;
            for (int e = 0; e < el.Count; e++)
            {
                int img = Apply(el[e], s, full);
                if (img < s)
                {
                    smaller = true; // s is not the smallest index of its orbit
                    break;
                }
                if (img == s)
                {
                    st++;
                    chiSum += chi[e];
                }
            }
            if (smaller || chiSum == 0) continue;
            reps.Add(s);
            stab.Add(st);
        }
        return ([.. reps], [.. stab]);
    }

    private static string MakeLabel(int n, int m, (string Name, int Parity)[] parities, SitePermutation? swap, int pd, (string Name, int Parity)[]? partner, int pf)
    {
        static string Short(string name) => name switch
        {
            "reflection" => "R",
            "mirror-x" => "Mx",
            "mirror-y" => "My",
            "diagonal" => "D",
            _ => name,
        };
        static string Sign(int p) => p > 0 ? "+1" : "-1";
        var parts = new List<string>();
        if (m >= 0) parts.Add($"Sz={(n - 2 * m) / 2.0:0.#}");
        foreach (var (name, p) in parities) parts.Add($"{Short(name)}={Sign(p)}");
        if (pd != 0) parts.Add($"{Short(swap!.Name)}={Sign(pd)}");
        if (pf != 0) parts.Add($"F={Sign(pf)}");
        string label = parts.Count == 0 ? "full space" : string.Join(", ", parts);
        if (partner is not null)
        {
            label += $" (x2: {Short(swap!.Name)} maps it onto {string.Join(", ", partner.Select(q => $"{Short(q.Name)}={Sign(q.Parity)}"))})";
        }
        return label;
    }

    private static int Apply(Element g, int s, int full)
    {
        if (g.Perm is not null) s = g.Perm.ApplyToIndex(s);
        if (g.Flip) s ^= full;
        return s;
    }

    /// <summary>
    /// The sector's basis written out in the computational basis: for every basis index t, the row of the
    /// symmetrised state |a~&gt; that contains it (-1: none) and its amplitude there, chi(g) / sqrt(|orbit of a|)
    /// with t = g a. Used to apply operators that are not Pauli sums (e.g. a one-period unitary) to the basis.
    /// </summary>
    public (int[] RowOf, double[] Amplitude) Expansion()
    {
        int dim = 1 << _n, full = dim - 1;
        var rowOf = new int[dim];
        var amp = new double[dim];
        Array.Fill(rowOf, -1);
        for (int row = 0; row < _reps.Length; row++)
        {
            int a = _reps[row];
            double norm = Math.Sqrt((double)_stab[row] / _elements.Length);
            for (int e = 0; e < _elements.Length; e++)
            {
                int t = Apply(_elements[e], a, full);
                if (rowOf[t] >= 0) continue; // reached again through the stabiliser: same character
                rowOf[t] = row;
                amp[t] = _chi[e] * norm;
            }
        }
        return (rowOf, amp);
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
        int full = (1 << _n) - 1;
        for (int col = 0; col < _reps.Length; col++)
        {
            int b = _reps[col];
            foreach (var (mask, c) in masks)
            {
                int s = (int)((ulong)b ^ mask.X);
                Complex amp = c * mask.Factor((ulong)b);
                // representative of s and an element g with g(s) = rep; chi(g^-1) = chi(g) for real characters
                int rep = s, ge = 0;
                for (int e = 1; e < _elements.Length; e++)
                {
                    int img = Apply(_elements[e], s, full);
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
