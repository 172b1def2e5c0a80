using OpGrowth.Pauli;

namespace OpGrowth.Symmetry;

/// <summary>
/// The same single-qubit Clifford rotation on every site, given by where it sends the letters:
/// X -&gt; s_x L_x, Y -&gt; s_y L_y, Z -&gt; s_z L_z with (L_x, L_y, L_z) a permutation of (X, Y, Z) and signs
/// chosen so the map is a rotation (s_x s_y s_z equals the sign of the permutation, so XY = iZ is kept).
/// Conjugating H by it changes no spectrum; it is used to bring a conserved total along X or Y to Z, or an
/// "imaginary" letter to Y so that H becomes real.
/// </summary>
public sealed class LetterRotation
{
    private readonly char[] _to = new char[3]; // images of X, Y, Z
    private readonly int[] _sign = new int[3];

    private LetterRotation(char toX, char toY, char toZ)
    {
        _to[0] = toX;
        _to[1] = toY;
        _to[2] = toZ;
        string p = new(_to);
        int parity = p is "XYZ" or "YZX" or "ZXY" ? 1 : -1;
        _sign[0] = 1;
        _sign[1] = 1;
        _sign[2] = parity;
    }

    /// <summary>The identity.</summary>
    public static LetterRotation Identity { get; } = new('X', 'Y', 'Z');

    /// <summary>True for the identity map.</summary>
    public bool IsIdentity => _to[0] == 'X' && _to[1] == 'Y' && _to[2] == 'Z';

    /// <summary>
    /// A rotation that sends <paramref name="toZ"/> to Z and, when given, <paramref name="toY"/> to Y
    /// (it must differ from <paramref name="toZ"/>).
    /// </summary>
    public static LetterRotation Bringing(char toZ, char? toY = null)
    {
        if (toZ is not ('X' or 'Y' or 'Z')) throw new ArgumentOutOfRangeException(nameof(toZ), toZ, "Expected X, Y or Z.");
        char y = toY ?? "XYZ".First(c => c != toZ && (toZ != 'Y' ? c == 'Y' : c == 'X'));
        if (y == toZ || y is not ('X' or 'Y' or 'Z')) throw new ArgumentException($"Cannot send both {toZ} to Z and {y} to Y.", nameof(toY));
        char x = "XYZ".First(c => c != toZ && c != y);
        // images: letter x -> X, y -> Y, toZ -> Z; store the map indexed by the source letter
        var to = new char[3];
        to[Index(x)] = 'X';
        to[Index(y)] = 'Y';
        to[Index(toZ)] = 'Z';
        return new LetterRotation(to[0], to[1], to[2]);
    }

    /// <summary>The image of one letter and its sign.</summary>
    public (char Letter, int Sign) Map(char letter) => letter == 'I' ? ('I', 1) : (_to[Index(letter)], _sign[Index(letter)]);

    /// <summary>The rotated string and the sign it picks up.</summary>
    public (PauliString String, int Sign) Apply(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        if (IsIdentity) return (s, 1);
        var b = new PauliString.Builder(s.N);
        int sign = 1;
        foreach (int j in s.Support())
        {
            var (l, g) = Map(s[j]);
            b.Set(j, l);
            sign *= g;
        }
        return (b.Build(), sign);
    }

    /// <summary>U^dagger H U: every term rotated, coefficients times the signs.</summary>
    public Hamiltonian Apply(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (IsIdentity) return h;
        return new Hamiltonian(h.N, h.Terms.Select(t =>
        {
            var (s, g) = Apply(t.String);
            return new PauliTerm(s, g * t.Coefficient);
        }));
    }

    /// <inheritdoc/>
    public override string ToString() => IsIdentity ? "none" : $"X->{Sign(0)}{_to[0]}, Y->{Sign(1)}{_to[1]}, Z->{Sign(2)}{_to[2]}";

    private string Sign(int i) => _sign[i] < 0 ? "-" : string.Empty;

    private static int Index(char c) => c switch { 'X' => 0, 'Y' => 1, _ => 2 };
}
