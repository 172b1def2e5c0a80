using System.Globalization;
using OpGrowth.IO;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// The unit cell of a translation-invariant 1D Hamiltonian with a one-site unit cell: the distinct local
/// terms, each summed over all translations. Extracted from (and checked against) a Hamiltonian on an open
/// or periodic chain, and used to build the same model on any other chain length, on a ring, or on an
/// infinite line.
/// </summary>
public sealed class TranslationCell
{
    /// <summary>Distinct local terms (letters from site 0).</summary>
    public IReadOnlyList<CellTerm> Terms { get; }

    /// <summary>Interaction range r: the largest span minus one.</summary>
    public int Range { get; }

    public TranslationCell(IEnumerable<CellTerm> terms)
    {
        var list = new List<CellTerm>();
        foreach (var t in terms)
        {
            if (t.Letters.Length == 0 || t.Letters.Any(c => c is not ('I' or 'X' or 'Y' or 'Z')))
                throw new ArgumentException($"Cell term '{t.Letters}' must be letters from IXYZ.", nameof(terms));
            if (t.Letters[0] == 'I' || t.Letters[^1] == 'I')
                throw new ArgumentException($"Cell term '{t.Letters}' must start and end with a non-identity letter.", nameof(terms));
            if (!double.IsFinite(t.Coefficient)) throw new ArgumentException($"Cell term '{t.Letters}' has a non-finite coefficient.", nameof(terms));
            if (t.Coefficient != 0) list.Add(t);
        }
        if (list.Count == 0) throw new ArgumentException("The unit cell has no terms.", nameof(terms));
        Terms = list;
        Range = list.Max(t => t.Span) - 1;
    }

    /// <summary>
    /// Extracts the unit cell from a Hamiltonian on a chain of N sites (open, or periodic when
    /// <paramref name="periodic"/>), checking that it is exactly the sum of its local terms over all
    /// translations (uniform couplings, no boundary terms). Throws <see cref="InputException"/> otherwise.
    /// </summary>
    public static TranslationCell FromHamiltonian(Hamiltonian h, bool periodic, string? source = null)
    {
        ArgumentNullException.ThrowIfNull(h);
        int n = h.N;
        var groups = new Dictionary<string, List<(int Start, double Coefficient)>>();
        var order = new List<string>();
        foreach (var t in h.Terms)
        {
            if (t.String.IsIdentity) continue;
            var (start, letters) = LocalPattern(t.String, periodic);
            if (!groups.TryGetValue(letters, out var list))
            {
                groups[letters] = list = [];
                order.Add(letters);
            }
            list.Add((start, t.Coefficient));
        }
        var cell = new List<CellTerm>();
        foreach (var letters in order)
        {
            var occ = groups[letters];
            int expected = periodic ? n : n - letters.Length + 1;
            double c = occ[0].Coefficient;
            string where = $"term {letters} (first at site {occ[0].Start})";
            foreach (var (start, coeff) in occ)
            {
                if (Math.Abs(coeff - c) > 1e-12 * Math.Abs(c))
                    throw new InputException(source, 0, $"not translation invariant: {where} has coefficient {Fmt(c)} but {Fmt(coeff)} at site {start}; expected uniform couplings");
            }
            if (occ.Count != expected)
                throw new InputException(source, 0, $"not translation invariant: {where} appears at {occ.Count} positions; expected {expected} on a{(periodic ? " periodic" : "n open")} chain of {n} sites");
            cell.Add(new CellTerm(letters, c));
        }
        if (cell.Count == 0) throw new InputException(source, 0, "the Hamiltonian has no non-identity terms; expected a translation-invariant chain");
        var result = new TranslationCell(cell);
        if (periodic && n < 2 * result.Range + 1)
            throw new InputException(source, 0, $"ring of {n} sites is too short for range {result.Range}; expected at least {2 * result.Range + 1} sites");
        return result;
    }

    /// <summary>
    /// Letters of a string from its first to its last support site, and the first site. On a ring the
    /// shortest arc holding the support is used (it starts after the largest gap between support sites).
    /// </summary>
    public static (int Start, string Letters) LocalPattern(PauliString s, bool periodic)
    {
        var sup = s.Support();
        if (sup.Length == 0) throw new ArgumentException("The identity has no local pattern.", nameof(s));
        int n = s.N;
        int start = sup[0], end = sup[^1];
        if (periodic && sup.Length > 1)
        {
            int bestGap = sup[0] + n - sup[^1];
            for (int i = 1; i < sup.Length; i++)
            {
                int gap = sup[i] - sup[i - 1];
                if (gap > bestGap)
                {
                    bestGap = gap;
                    start = sup[i];
                    end = sup[i - 1];
                }
            }
        }
        int len = ((end - start) % n + n) % n + 1;
        var c = new char[len];
        for (int i = 0; i < len; i++) c[i] = s[(start + i) % n];
        return (start, new string(c));
    }

    /// <summary>The model on an open chain of <paramref name="sites"/> sites (every placement that fits).</summary>
    public Hamiltonian OpenChain(int sites)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(sites, Range + 1);
        var terms = new List<PauliTerm>();
        foreach (var t in Terms)
        {
            for (int p = 0; p + t.Span <= sites; p++) terms.Add(new PauliTerm(Place(t.Letters, p, sites, false), t.Coefficient));
        }
        return new Hamiltonian(sites, terms);
    }

    /// <summary>The model on a ring of <paramref name="sites"/> sites (every placement, wrapping around).</summary>
    public Hamiltonian Ring(int sites)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(sites, 2 * Range + 1);
        var terms = new List<PauliTerm>();
        foreach (var t in Terms)
        {
            for (int p = 0; p < sites; p++) terms.Add(new PauliTerm(Place(t.Letters, p, sites, true), t.Coefficient));
        }
        return new Hamiltonian(sites, terms);
    }

    /// <summary>The mirror-image cell (site j -> -j), used for the left edge of a light cone.</summary>
    public TranslationCell Reflected() => new(Terms.Select(t => new CellTerm(new string(t.Letters.Reverse().ToArray()), t.Coefficient)));

    /// <summary>A dense pattern placed at site <paramref name="offset"/> of an n-site chain (wrapping on a ring).</summary>
    public static PauliString Place(string letters, int offset, int n, bool wrap)
    {
        var b = new PauliString.Builder(n);
        for (int i = 0; i < letters.Length; i++)
        {
            if (letters[i] == 'I') continue;
            int j = offset + i;
            if (wrap) j %= n;
            b.Set(j, letters[i]);
        }
        return b.Build();
    }

    public override string ToString()
        => string.Join(" + ", Terms.Select(t => $"{Fmt(t.Coefficient)} {t.Letters}")) + " (summed over translations)";

    private static string Fmt(double v) => v.ToString("G10", CultureInfo.InvariantCulture);
}
