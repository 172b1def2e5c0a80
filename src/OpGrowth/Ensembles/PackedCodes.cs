using OpGrowth.Pauli;

namespace OpGrowth.Ensembles;

/// <summary>
/// A single Pauli string packed two bits per site in <c>ulong</c> words (32 sites a word).
/// </summary>
/// <remarks>
/// Site j lives in word j / 32 at bits 2(j % 32) and 2(j % 32) + 1: the code is x + 2 z with the project's
/// symplectic bits, so I = 0, X = 1, Z = 2, Y = 3, and the product of two strings (up to phase) is the XOR of
/// their codes. Two single-site letters anticommute iff both are non-identity and differ.
/// </remarks>
internal static class PackedCodes
{
    public static int WordCount(int n) => (n + 31) >> 5;

    public static int Get(ReadOnlySpan<ulong> w, int site) => (int)(w[site >> 5] >> ((site & 31) << 1)) & 3;

    public static void Set(Span<ulong> w, int site, int code)
    {
        int shift = (site & 31) << 1;
        ref ulong word = ref w[site >> 5];
        word = (word & ~(3UL << shift)) | ((ulong)code << shift);
    }

    /// <summary>True when single-site codes a and b anticommute.</summary>
    public static bool Anticommute(int a, int b) => a != 0 && b != 0 && a != b;

    /// <summary>Letter of a code.</summary>
    public static char Letter(int code) => "IXZY"[code];

    /// <summary>Code of a project string's site.</summary>
    public static int CodeOf(PauliString s, int site)
    {
        int word = site >> 6, bit = site & 63;
        int x = (int)(s.X[word] >> bit) & 1, z = (int)(s.Z[word] >> bit) & 1;
        return x | (z << 1);
    }

    /// <summary>Writes a project string into packed words (cleared first); returns its size.</summary>
    public static int Load(PauliString s, Span<ulong> w)
    {
        w.Clear();
        int size = 0;
        foreach (int j in s.Support())
        {
            Set(w, j, CodeOf(s, j));
            size++;
        }
        return size;
    }
}
