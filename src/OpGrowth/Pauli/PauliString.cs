using System.Numerics;
using System.Text;

namespace OpGrowth.Pauli;

/// <summary>
/// A Hermitian Pauli string on <see cref="N"/> qubits, stored as bit-packed symplectic words.
/// This is the general, heap-backed form used at the library boundary (parsing, printing,
/// model building); hot engines convert it to a fixed-width key (<see cref="Pauli64"/>,
/// <see cref="Pauli128"/>, <see cref="PauliWide{TWords}"/>).
/// </summary>
/// <remarks>
/// Layout: site j lives in word j / 64, bit j % 64 of two arrays <c>X</c> and <c>Z</c>.
/// Letters: I = (0,0), X = (1,0), Z = (0,1), Y = (1,1).
/// Phase convention: the string with bits (x, z) denotes P(x,z) = i^{popcount(x &amp; z)} X^x Z^z,
/// which is Hermitian (Y = iXZ). Products obey
/// P(x1,z1) P(x2,z2) = i^k P(x1^x2, z1^z2), k = |x1&amp;z1| + |x2&amp;z2| - |x3&amp;z3| + 2|z1&amp;x2| (mod 4).
/// Bits above N are always zero.
/// </remarks>
public sealed class PauliString : IEquatable<PauliString>
{
    private readonly ulong[] _x;
    private readonly ulong[] _z;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Number of 64-bit words per symplectic half.</summary>
    public int Words => _x.Length;

    /// <summary>X bits (read-only view).</summary>
    public ReadOnlySpan<ulong> X => _x;

    /// <summary>Z bits (read-only view).</summary>
    public ReadOnlySpan<ulong> Z => _z;

    /// <summary>Largest supported number of qubits.</summary>
    public const int MaxQubits = 1 << 16;

    private PauliString(int n, ulong[] x, ulong[] z)
    {
        N = n;
        _x = x;
        _z = z;
    }

    /// <summary>Creates a string from symplectic words (copied); bits above <paramref name="n"/> must be zero.</summary>
    public PauliString(int n, ReadOnlySpan<ulong> x, ReadOnlySpan<ulong> z)
    {
        ValidateN(n);
        int w = WordCount(n);
        if (x.Length != w || z.Length != w)
        {
            throw new ArgumentException($"Expected {w} words for {n} qubits, got {x.Length} and {z.Length}.", nameof(x));
        }
        _x = x.ToArray();
        _z = z.ToArray();
        N = n;
        if (!TopBitsClear(n, _x) || !TopBitsClear(n, _z))
        {
            throw new ArgumentException($"Bits above site {n - 1} must be zero.", nameof(x));
        }
    }

    /// <summary>Words needed for <paramref name="n"/> qubits.</summary>
    public static int WordCount(int n) => (n + 63) >> 6;

    /// <summary>The identity on <paramref name="n"/> qubits.</summary>
    public static PauliString Identity(int n)
    {
        ValidateN(n);
        return new PauliString(n, new ulong[WordCount(n)], new ulong[WordCount(n)]);
    }

    /// <summary>A single-site string, e.g. Z on site 3.</summary>
    public static PauliString Single(int n, int site, char letter)
    {
        var b = new Builder(n);
        b.Set(site, letter);
        return b.Build();
    }

    /// <summary>Letter ('I','X','Y','Z') at a site.</summary>
    public char this[int site]
    {
        get
        {
            ArgumentOutOfRangeException.ThrowIfNegative(site);
            ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(site, N);
            ulong m = 1UL << (site & 63);
            bool x = (_x[site >> 6] & m) != 0, z = (_z[site >> 6] & m) != 0;
            return (x, z) switch { (false, false) => 'I', (true, false) => 'X', (false, true) => 'Z', _ => 'Y' };
        }
    }

    /// <summary>Number of non-identity sites (operator size).</summary>
    public int Weight
    {
        get
        {
            int w = 0;
            for (int i = 0; i < _x.Length; i++) w += BitOperations.PopCount(_x[i] | _z[i]);
            return w;
        }
    }

    /// <summary>True for the identity string.</summary>
    public bool IsIdentity
    {
        get
        {
            for (int i = 0; i < _x.Length; i++) if ((_x[i] | _z[i]) != 0) return false;
            return true;
        }
    }

    /// <summary>First non-identity site, or -1 for the identity.</summary>
    public int FirstSite
    {
        get
        {
            for (int i = 0; i < _x.Length; i++)
            {
                ulong s = _x[i] | _z[i];
                if (s != 0) return (i << 6) + BitOperations.TrailingZeroCount(s);
            }
            return -1;
        }
    }

    /// <summary>Last non-identity site, or -1 for the identity.</summary>
    public int LastSite
    {
        get
        {
            for (int i = _x.Length - 1; i >= 0; i--)
            {
                ulong s = _x[i] | _z[i];
                if (s != 0) return (i << 6) + 63 - BitOperations.LeadingZeroCount(s);
            }
            return -1;
        }
    }

    /// <summary>Sites where the string is not the identity, in increasing order.</summary>
    public int[] Support()
    {
        var sites = new int[Weight];
        int k = 0;
        for (int i = 0; i < _x.Length; i++)
        {
            ulong s = _x[i] | _z[i];
            while (s != 0)
            {
                sites[k++] = (i << 6) + BitOperations.TrailingZeroCount(s);
                s &= s - 1;
            }
        }
        return sites;
    }

    /// <summary>True when the two strings commute.</summary>
    public bool CommutesWith(PauliString other)
    {
        RequireSameN(other);
        int c = 0;
        for (int i = 0; i < _x.Length; i++)
        {
            c += BitOperations.PopCount((_x[i] & other._z[i]) ^ (_z[i] & other._x[i]));
        }
        return (c & 1) == 0;
    }

    /// <summary>Product a*b = i^phase * P, with phase in 0..3.</summary>
    public static PauliString Multiply(PauliString a, PauliString b, out int phase)
    {
        a.RequireSameN(b);
        int w = a._x.Length;
        var x = new ulong[w];
        var z = new ulong[w];
        int k = 0;
        for (int i = 0; i < w; i++)
        {
            ulong x1 = a._x[i], z1 = a._z[i], x2 = b._x[i], z2 = b._z[i];
            ulong x3 = x1 ^ x2, z3 = z1 ^ z2;
            k += BitOperations.PopCount(x1 & z1) + BitOperations.PopCount(x2 & z2)
                - BitOperations.PopCount(x3 & z3) + 2 * BitOperations.PopCount(z1 & x2);
            x[i] = x3;
            z[i] = z3;
        }
        phase = k & 3;
        return new PauliString(a.N, x, z);
    }

    /// <summary>
    /// Commutator [a, b] = coefficient * P. Returns false (and null) when the strings commute;
    /// otherwise coefficient = 2 i^phase with phase odd, so coefficient is +-2i.
    /// </summary>
    public static bool Commutator(PauliString a, PauliString b, out System.Numerics.Complex coefficient, out PauliString? product)
    {
        if (a.CommutesWith(b))
        {
            coefficient = 0;
            product = null;
            return false;
        }
        product = Multiply(a, b, out int k);
        coefficient = 2 * IPower(k);
        return true;
    }

    /// <summary>i^k as a complex number.</summary>
    public static System.Numerics.Complex IPower(int k) => (k & 3) switch
    {
        0 => System.Numerics.Complex.One,
        1 => System.Numerics.Complex.ImaginaryOne,
        2 => -System.Numerics.Complex.One,
        _ => -System.Numerics.Complex.ImaginaryOne,
    };

    /// <summary>
    /// Parses either the dense form ("IZXI", site 0 first) or the site-indexed form
    /// ("Z_3 X_4", also "Z3 X4" and "Z_3*X_4"; "I" or "" for the identity).
    /// </summary>
    public static PauliString Parse(string text, int n)
    {
        if (!TryParse(text, n, out var s, out string? error)) throw new FormatException(error);
        return s!;
    }

    /// <summary>Non-throwing parse; <paramref name="error"/> says what was found and what is expected.</summary>
    public static bool TryParse(string text, int n, out PauliString? result, out string? error)
    {
        result = null;
        if (n < 1 || n > MaxQubits)
        {
            error = $"number of qubits {n} is out of range 1..{MaxQubits}";
            return false;
        }
        string t = text.Trim();
        var b = new Builder(n);
        if (t.Length == 0 || t == "I")
        {
            result = b.Build();
            error = null;
            return true;
        }
        bool dense = t.Length == n && t.All(c => c is 'I' or 'X' or 'Y' or 'Z');
        if (dense)
        {
            for (int j = 0; j < n; j++) b.Set(j, t[j]);
            result = b.Build();
            error = null;
            return true;
        }
        foreach (var raw in t.Split([' ', '*', '\t'], StringSplitOptions.RemoveEmptyEntries))
        {
            char letter = char.ToUpperInvariant(raw[0]);
            if (letter is not ('I' or 'X' or 'Y' or 'Z'))
            {
                error = $"'{raw}' is not a Pauli factor; expected a letter I, X, Y or Z followed by a site, as in Z_3";
                return false;
            }
            string idx = raw.Length > 1 && raw[1] == '_' ? raw[2..] : raw[1..];
            if (!int.TryParse(idx, System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture, out int site))
            {
                error = raw.Length == n || raw.Length > 1 && raw.All(char.IsLetter)
                    ? $"dense string '{raw}' has length {raw.Length}; expected {n} letters from IXYZ"
                    : $"'{raw}' has no valid site index; expected a form such as {letter}_3";
                return false;
            }
            if (site >= n)
            {
                error = $"site {site} in '{raw}' is out of range; expected 0..{n - 1}";
                return false;
            }
            if (b.Get(site) != 'I')
            {
                error = $"site {site} appears twice in '{text}'; expected each site at most once";
                return false;
            }
            b.Set(site, letter);
        }
        result = b.Build();
        error = null;
        return true;
    }

    /// <summary>Site-indexed form, e.g. "Z_3 X_4"; "I" for the identity.</summary>
    public override string ToString()
    {
        if (IsIdentity) return "I";
        var sb = new StringBuilder();
        foreach (int j in Support())
        {
            if (sb.Length > 0) sb.Append(' ');
            sb.Append(this[j]).Append('_').Append(j.ToString(System.Globalization.CultureInfo.InvariantCulture));
        }
        return sb.ToString();
    }

    /// <summary>Dense form, one letter per site starting at site 0, e.g. "IZXI".</summary>
    public string ToDenseString()
    {
        var c = new char[N];
        for (int j = 0; j < N; j++) c[j] = this[j];
        return new string(c);
    }

    public bool Equals(PauliString? other)
    {
        if (other is null || other.N != N) return false;
        return _x.AsSpan().SequenceEqual(other._x) && _z.AsSpan().SequenceEqual(other._z);
    }

    public override bool Equals(object? obj) => obj is PauliString p && Equals(p);

    public override int GetHashCode()
    {
        var h = new HashCode();
        h.Add(N);
        for (int i = 0; i < _x.Length; i++)
        {
            h.Add(_x[i]);
            h.Add(_z[i]);
        }
        return h.ToHashCode();
    }

    public static bool operator ==(PauliString? a, PauliString? b) => a is null ? b is null : a.Equals(b);

    public static bool operator !=(PauliString? a, PauliString? b) => !(a == b);

    private void RequireSameN(PauliString other)
    {
        if (other.N != N) throw new ArgumentException($"Pauli strings act on different numbers of qubits ({N} and {other.N}).", nameof(other));
    }

    private static void ValidateN(int n)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(n, MaxQubits);
    }

    private static bool TopBitsClear(int n, ulong[] w)
    {
        int r = n & 63;
        return r == 0 || (w[^1] >> r) == 0;
    }

    /// <summary>Mutable builder for a string, letter by letter.</summary>
    public sealed class Builder
    {
        private readonly int _n;
        private readonly ulong[] _x;
        private readonly ulong[] _z;

        public Builder(int n)
        {
            ValidateN(n);
            _n = n;
            _x = new ulong[WordCount(n)];
            _z = new ulong[WordCount(n)];
        }

        public char Get(int site)
        {
            ulong m = 1UL << (site & 63);
            bool x = (_x[site >> 6] & m) != 0, z = (_z[site >> 6] & m) != 0;
            return (x, z) switch { (false, false) => 'I', (true, false) => 'X', (false, true) => 'Z', _ => 'Y' };
        }

        public Builder Set(int site, char letter)
        {
            ArgumentOutOfRangeException.ThrowIfNegative(site);
            ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(site, _n);
            (bool x, bool z) = char.ToUpperInvariant(letter) switch
            {
                'I' => (false, false),
                'X' => (true, false),
                'Y' => (true, true),
                'Z' => (false, true),
                _ => throw new ArgumentException($"Pauli letter '{letter}' is not one of I, X, Y, Z.", nameof(letter)),
            };
            ulong m = 1UL << (site & 63);
            int w = site >> 6;
            _x[w] = x ? _x[w] | m : _x[w] & ~m;
            _z[w] = z ? _z[w] | m : _z[w] & ~m;
            return this;
        }

        public PauliString Build() => new(_n, (ulong[])_x.Clone(), (ulong[])_z.Clone());
    }
}
