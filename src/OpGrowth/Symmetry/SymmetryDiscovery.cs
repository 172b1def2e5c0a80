using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Symmetry;

/// <summary>
/// Finds the symmetries of a Hamiltonian from its terms and lattice, and plans how level statistics resolve
/// them: conserved totals (U(1) along X, Y or Z; SU(2)), every conserved Pauli string (GF(2) null space,
/// <see cref="PauliCommutant"/>), lattice translations and mirrors that map H onto itself, an anti-unitary
/// time reversal, and, as a guard, any other site permutation of H (<see cref="SiteAutomorphisms"/>).
/// Nothing declared in the model file is needed; declarations are checked elsewhere.
/// </summary>
public static class SymmetryDiscovery
{
    /// <summary>Largest number of Pauli-string parities resolved at once (each doubles the group).</summary>
    public const int MaxParities = 6;

    /// <summary>Analyses H on its lattice. <paramref name="majoranaModel"/> marks a model written in Majoranas.</summary>
    public static SymmetryAnalysis Analyze(Hamiltonian h, Lattice lattice, bool majoranaModel = false, int automorphismBudget = 20_000)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(lattice);
        int n = h.N;
        if (lattice.N != n) throw new ArgumentException($"Lattice of {lattice.N} sites, Hamiltonian on {n}.", nameof(lattice));
        var notes = new List<string>();
        var unresolved = new List<string>();
        var resolved = new List<string>();
        var terms = h.Terms.Where(t => !t.String.IsIdentity).Select(t => t.String).ToArray();

        // 1. conserved totals; total spin S^2 also when SU(2) is broken only by a uniform field along the
        //    conserved axis (the field shifts each magnetisation sector by a constant and commutes with S^2)
        var totals = "XYZ".Where(a => Conserves(h, a)).ToList();
        bool su2 = totals.Count == 3;
        var hSpin = h;
        bool fieldOnly = false;
        if (totals.Count == 1)
        {
            char f = totals[0];
            var field = h.Terms.Where(t => t.String.Weight == 1 && t.String[t.String.FirstSite] == f).ToList();
            if (field.Count == n && field.All(t => Math.Abs(t.Coefficient - field[0].Coefficient) <= 1e-12 * Math.Abs(field[0].Coefficient)))
            {
                var rest = new Hamiltonian(n, h.Terms.Except(field));
                if (rest.Terms.Count > 0 && "XYZ".All(a => Conserves(rest, a)))
                {
                    hSpin = rest;
                    fieldOnly = true;
                    su2 = true;
                    notes.Add(FormattableString.Invariant($"H is spin-rotation invariant up to a uniform field {field[0].Coefficient:G4} along {f}: total spin S^2 is conserved, and the field only shifts each S^{char.ToLowerInvariant(f)} sector; total spin is resolved with the field removed"));
                }
            }
        }

        // 2. frame: a conserved total to Z, an "imaginary" letter with even counts to Y (H real)
        char? axis = totals.Count == 3 ? 'Z' : totals.Count > 0 ? (totals.Contains('Z') ? 'Z' : totals[0]) : null;
        char? imaginary = "YXZ".Where(l => l != axis).FirstOrDefault(l => terms.All(t => (Count(t, l) & 1) == 0));
        if (imaginary == '\0') imaginary = null;
        LetterRotation rotation;
        if (axis is null && imaginary is null) rotation = LetterRotation.Identity;
        else if (axis is null) rotation = imaginary == 'Y' ? LetterRotation.Identity : LetterRotation.Bringing(toZ: "XYZ".First(c => c != imaginary), toY: imaginary);
        else rotation = LetterRotation.Bringing(axis.Value, imaginary);
        var hr = rotation.Apply(hSpin);
        bool real = hr.Terms.All(t => (Count(t.String, 'Y') & 1) == 0);
        if (!rotation.IsIdentity) notes.Add($"letters rotated ({rotation}) so that {(axis is not null && axis != 'Z' ? $"total {axis} becomes total Z" : "the conserved total is Z")}{(real && imaginary is not null && imaginary != 'Y' ? $" and H becomes real" : string.Empty)}");

        // 3. conserved strings and commuting terms (model frame)
        var conserved = PauliCommutant.Generators(n, terms);
        bool commuting = PauliCommutant.AllCommute(terms);

        // 4. lattice permutations that map H onto itself
        var candidates = Candidates(lattice);
        var symmetric = candidates.Where(c => IsSymmetry(c.Map, h)).ToList();
        var permNames = symmetric.Select(c => c.Name).ToList();

        // 5. plan
        bool resolveZ = totals.Count > 0;
        var abelian = new List<SymmetryGenerator>();
        var groupPerms = new List<int[]> { Enumerable.Range(0, n).ToArray() };
        foreach (var c in symmetric.Where(c => c.Translation))
        {
            if (!groupPerms.All(g => Commute(g, c.Map))) continue;
            if (Contains(groupPerms, c.Map)) continue;
            abelian.Add(new SymmetryGenerator(c.Short, MonomialOp.OfPermutation(c.Map)));
            groupPerms = Close(groupPerms, c.Map);
            resolved.Add(c.Name);
        }
        foreach (var c in symmetric.Where(c => !c.Translation && c.IsInvolution))
        {
            if (Contains(groupPerms, c.Map)) { resolved.Add(c.Name + " (product of the others)"); continue; }
            if (!groupPerms.All(g => Commute(g, c.Map))) continue;
            abelian.Add(new SymmetryGenerator(c.Short, MonomialOp.OfPermutation(c.Map)));
            groupPerms = Close(groupPerms, c.Map);
            resolved.Add(c.Name);
        }
        SymmetryGenerator? swap = null;
        foreach (var c in symmetric.Where(c => !c.Translation && c.IsInvolution && !Contains(groupPerms, c.Map)))
        {
            if (swap is null && Normalizes(c.Map, groupPerms))
            {
                swap = new SymmetryGenerator(c.Short, MonomialOp.OfPermutation(c.Map));
                resolved.Add(c.Name + " (pairs the sectors it exchanges)");
                var ext = groupPerms.Select(g => Compose(c.Map, g)).ToList();
                groupPerms = [.. groupPerms, .. ext];
            }
        }
        var residual = new List<SymmetryGenerator>();
        foreach (var c in symmetric.Where(c => !Contains(groupPerms, c.Map)))
        {
            unresolved.Add(c.Name);
            residual.Add(new SymmetryGenerator(c.Name, MonomialOp.OfPermutation(c.Map)));
        }

        // Pauli parities: conserved strings invariant under the resolved permutations (rotated frame)
        var rotatedConserved = conserved.Select(s => rotation.Apply(s).String).ToList();
        var permList = abelian.Where(g => !g.Op.PermIsIdentity).Select(g => g.Op.Perm.ToArray()).ToList();
        if (swap is not null) permList.Add(swap.Op.Perm.ToArray());
        var invariant = InvariantSpan(rotatedConserved, permList, n);
        SymmetryGenerator? flip = null;
        int parities = 0;
        var chosen = new List<PauliString>();
        if (su2)
        {
            if (conserved.Count > 0) resolved.Add("the global parities (spin rotations by pi, part of SU(2))");
        }
        else if (conserved.Count > 2 * MaxParities || conserved.Count >= Math.Max(3, n / 2))
        {
            notes.Add($"{conserved.Count} independent conserved Pauli strings: an extensive set of local conservation laws, too many to resolve into sectors");
            unresolved.Add($"{conserved.Count} conserved Pauli strings (e.g. {string.Join(", ", conserved.Take(3))})");
        }
        else
        {
            var span = PauliCommutant.Span(n, []);
            var allFlip = new ulong[PauliString.WordCount(n)];
            for (int j = 0; j < n; j++) allFlip[j >> 6] |= 1UL << (j & 63);
            if (resolveZ) span.Add(Pack(PauliString.Parse(string.Concat(Enumerable.Repeat("Z", n)), n))); // a function of total Z
            foreach (var s in invariant.OrderBy(s => s.Weight))
            {
                if (PauliCommutant.InSpan(span, s)) continue;
                bool zType = s.X.ToArray().All(w => w == 0);
                bool fullFlip = s.X.SequenceEqual(allFlip);
                if (resolveZ && !zType)
                {
                    if (fullFlip && flip is null && chosen.All(c => c.CommutesWith(s)) && n % 2 == 0)
                    {
                        flip = new SymmetryGenerator(ParityName(s), MonomialOp.OfString(s));
                        continue;
                    }
                    continue;
                }
                if (!chosen.All(c => c.CommutesWith(s)) || chosen.Count >= MaxParities) continue;
                chosen.Add(s);
                span.Add(Pack(s));
            }
            if (flip is not null && !chosen.All(c => c.CommutesWith(PauliFromOp(flip, n)))) flip = null;
            foreach (var s in chosen)
            {
                abelian.Add(new SymmetryGenerator(ParityName(s), MonomialOp.OfString(s)));
                resolved.Add($"parity {Describe(s, rotation)}");
                parities++;
            }
            if (flip is not null)
            {
                span.Add(Pack(PauliFromOp(flip, n)));
                resolved.Add($"spin flip {Describe(PauliFromOp(flip, n), rotation)} (at zero magnetisation; it pairs the others)");
            }
            foreach (var s in rotatedConserved)
            {
                if (PauliCommutant.InSpan(span, s)) continue;
                var inv = InverseRotate(s, rotation);
                if (resolveZ && !s.X.ToArray().All(w => w == 0) && !s.X.SequenceEqual(allFlip))
                    notes.Add($"conserved string {inv} changes total Z: it maps magnetisation sectors onto others (no further splitting)");
                else if (resolveZ && s.X.SequenceEqual(allFlip) && n % 2 != 0)
                    notes.Add($"conserved string {inv} reverses total Z; with an odd number of sites it only pairs sectors");
                else unresolved.Add($"conserved string {inv}");
            }
        }
        if (resolveZ) resolved.Insert(0, su2 ? (fieldOnly ? $"total spin S^2 and total {axis}" : "total spin (SU(2) multiplets) and total Z") : $"total {axis} (U(1))");

        // 6. guard: any other permutation symmetry of H
        if (n <= 24)
        {
            var guard = SiteAutomorphisms.FindOutside(hr, groupPerms, automorphismBudget);
            if (guard.Found is not null)
            {
                string name = $"a site permutation found by search ({DescribeMap(guard.Found)})";
                unresolved.Add(name);
                residual.Add(new SymmetryGenerator(name, MonomialOp.OfPermutation(guard.Found)));
            }
            else if (!guard.Complete) unresolved.Add("site permutations (the search ran out of its budget)");
        }

        string? forced = null;
        if (majoranaModel && h.Terms.All(t => t.String.IsIdentity || JordanWigner.MajoranaWeight(t.String.X, t.String.Z, n) % 4 == 0))
        {
            // Source: You, Ludwig, Xu, PRB 95, 115150 (2017): the class of each fermion-parity block follows
            // the number of Majoranas mod 8 (0: GOE, 2 and 6: GUE, 4: GSE).
            forced = (2 * n % 8) switch { 0 => "GOE", 4 => "GSE", _ => "GUE" };
            notes.Add($"Majorana model with only four-fermion terms: reference class {forced} from 2N mod 8 = {2 * n % 8} (You, Ludwig, Xu 2017)");
        }
        return new SymmetryAnalysis
        {
            N = n,
            Rotation = rotation,
            Rotated = hr,
            ConservedTotals = totals,
            SpinRotation = su2,
            Real = real,
            ConservedStrings = conserved,
            Commuting = commuting,
            Permutations = permNames,
            ResolveTotalZ = resolveZ,
            Abelian = abelian,
            Swap = swap,
            HalfFillingFlip = flip,
            Resolved = resolved,
            Unresolved = unresolved,
            Notes = notes,
            ForcedEnsemble = forced,
            Residual = residual,
        };
    }

    /// <summary>A candidate lattice permutation.</summary>
    internal sealed record Candidate(string Name, string Short, int[] Map, bool Translation)
    {
        public bool IsInvolution => Map.Select((m, j) => Map[m] == j).All(b => b);
    }

    /// <summary>Translations and mirrors of the lattice (before checking them against H).</summary>
    internal static List<Candidate> Candidates(Lattice lattice)
    {
        int n = lattice.N;
        var list = new List<Candidate>();
        int[] Make(Func<int, int> f) => Enumerable.Range(0, n).Select(f).ToArray();
        switch (lattice.Kind)
        {
            case "chain":
                list.Add(new("reflection", "R", Make(j => n - 1 - j), false));
                break;
            case "ring":
                list.Add(new("translation", "T", Make(j => (j + 1) % n), true));
                list.Add(new("reflection", "R", Make(j => n - 1 - j), false));
                break;
            case "ladder":
            {
                int l = lattice.Width;
                if (lattice.Periodic) list.Add(new("translation along the legs", "T", Make(j => 2 * ((j / 2 + 1) % l) + j % 2), true));
                list.Add(new("leg exchange", "My", Make(j => 2 * (j / 2) + 1 - j % 2), false));
                list.Add(new("mirror along the legs", "Mx", Make(j => 2 * (l - 1 - j / 2) + j % 2), false));
                break;
            }
            case "square":
            {
                int w = lattice.Width, hh = lattice.Height;
                int S(int x, int y) => ((y % hh + hh) % hh) * w + (x % w + w) % w;
                bool wrapX = lattice.Periodic && w > 2, wrapY = lattice.Periodic && hh > 2;
                if (wrapX) list.Add(new("translation along x", "Tx", Make(j => S(j % w + 1, j / w)), true));
                if (wrapY) list.Add(new("translation along y", "Ty", Make(j => S(j % w, j / w + 1)), true));
                if (wrapX && wrapY) list.Add(new("inversion", "I", Make(j => S(-(j % w), -(j / w))), false));
                list.Add(new("mirror x", "Mx", Make(j => S(w - 1 - j % w, j / w)), false));
                list.Add(new("mirror y", "My", Make(j => S(j % w, hh - 1 - j / w)), false));
                if (w == hh) list.Add(new("diagonal mirror", "D", Make(j => S(j / w, j % w)), false));
                break;
            }
        }
        return list.Where(c => !c.Map.Select((m, j) => m == j).All(b => b)).ToList();
    }

    private static bool IsSymmetry(int[] map, Hamiltonian h) => new SitePermutation("candidate", map).IsSymmetryOf(h);

    private static bool Conserves(Hamiltonian h, char axis)
    {
        var acc = new Dictionary<PauliString, System.Numerics.Complex>();
        double scale = h.Terms.Sum(t => Math.Abs(t.Coefficient)) + 1e-300;
        foreach (var t in h.Terms)
        {
            foreach (int j in t.String.Support())
            {
                if (!PauliString.Commutator(t.String, PauliString.Single(h.N, j, axis), out var c, out var p)) continue;
                acc[p!] = acc.GetValueOrDefault(p!) + t.Coefficient * c;
            }
        }
        return acc.Values.All(v => v.Magnitude <= 1e-12 * scale);
    }

    private static int Count(PauliString s, char letter) => s.Support().Count(j => s[j] == letter);

    private static bool Contains(List<int[]> group, int[] map) => group.Any(g => g.AsSpan().SequenceEqual(map));

    private static int[] Compose(int[] second, int[] first) => first.Select(j => second[j]).ToArray();

    private static bool Commute(int[] a, int[] b) => Compose(a, b).AsSpan().SequenceEqual(Compose(b, a));

    private static List<int[]> Close(List<int[]> group, int[] g)
    {
        var result = new List<int[]>(group);
        var frontier = new List<int[]>(group);
        while (frontier.Count > 0)
        {
            var next = new List<int[]>();
            foreach (var x in frontier)
            {
                var y = Compose(g, x);
                if (!Contains(result, y))
                {
                    result.Add(y);
                    next.Add(y);
                }
            }
            frontier = next;
        }
        return result;
    }

    private static bool Normalizes(int[] d, List<int[]> group)
        => group.All(g => Contains(group, Compose(Compose(d, g), d)));

    /// <summary>The conserved strings (a GF(2) span) left unchanged by every permutation given.</summary>
    private static List<PauliString> InvariantSpan(List<PauliString> basis, List<int[]> perms, int n)
    {
        if (perms.Count == 0 || basis.Count == 0) return basis;
        int k = basis.Count;
        // rows: one per (perm, bit of the packed string); columns: the basis elements
        var rows = new Gf2(k);
        var packed = basis.Select(Pack).ToArray();
        foreach (var p in perms)
        {
            var images = basis.Select(b => Pack(new SitePermutation("p", p).Apply(b))).ToArray();
            int bits = packed[0].Length * 64;
            for (int bit = 0; bit < bits; bit++)
            {
                var row = new ulong[(k + 63) >> 6];
                bool any = false;
                for (int c = 0; c < k; c++)
                {
                    bool v = ((packed[c][bit >> 6] ^ images[c][bit >> 6]) >> (bit & 63) & 1) != 0;
                    if (v)
                    {
                        row[c >> 6] |= 1UL << (c & 63);
                        any = true;
                    }
                }
                if (any) rows.Add(row);
            }
        }
        var result = new List<PauliString>();
        foreach (var a in rows.NullSpace(c => c < k))
        {
            var s = PauliString.Identity(n);
            for (int c = 0; c < k; c++)
            {
                if ((a[c >> 6] >> (c & 63) & 1) != 0) s = PauliString.Multiply(s, basis[c], out _);
            }
            if (!s.IsIdentity) result.Add(s);
        }
        return result;
    }

    private static ulong[] Pack(PauliString s)
    {
        int w = s.Words;
        var v = new ulong[2 * w];
        s.X.CopyTo(v.AsSpan(0, w));
        s.Z.CopyTo(v.AsSpan(w, w));
        return v;
    }

    private static PauliString PauliFromOp(SymmetryGenerator g, int n)
        => new(n, [g.Op.X], [g.Op.Z]);

    private static string ParityName(PauliString s) => s.Weight <= 4 ? $"P({s})" : $"P{s.Weight}";

    private static PauliString InverseRotate(PauliString s, LetterRotation r)
    {
        if (r.IsIdentity) return s;
        // find the letter mapped to each rotated letter
        var b = new PauliString.Builder(s.N);
        foreach (int j in s.Support())
        {
            char orig = "XYZ".First(c => r.Map(c).Letter == s[j]);
            b.Set(j, orig);
        }
        return b.Build();
    }

    private static string Describe(PauliString rotated, LetterRotation r)
    {
        var s = InverseRotate(rotated, r);
        int n = s.N;
        foreach (char l in "XYZ")
        {
            if (s.Weight == n && s.Support().All(j => s[j] == l)) return $"prod_j {l}_j";
        }
        return s.Weight <= 6 ? s.ToString() : $"{s} (weight {s.Weight})";
    }

    private static string DescribeMap(int[] map)
    {
        var moved = map.Select((m, j) => (j, m)).Where(p => p.j != p.m).ToList();
        return string.Join(", ", moved.Take(6).Select(p => $"{p.j}->{p.m}")) + (moved.Count > 6 ? ", ..." : string.Empty);
    }
}
