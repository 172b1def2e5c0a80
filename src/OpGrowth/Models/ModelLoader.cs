using System.Globalization;
using System.Text.RegularExpressions;
using OpGrowth.IO;
using OpGrowth.Pauli;

namespace OpGrowth.Models;

/// <summary>
/// Reads model files (TOML; format in docs/model-files.md) into <see cref="Model"/>s. Every problem in a
/// file is reported as one <see cref="InputException"/> line "file:line: found ...; expected ...".
/// </summary>
public static partial class ModelLoader
{
    /// <summary>Largest number of Hamiltonian terms (or drive rotations) a file may produce.</summary>
    public const int MaxTerms = 2_000_000;

    /// <summary>Symmetry names a file may declare (each is verified).</summary>
    public static readonly IReadOnlyList<string> KnownSymmetries =
        ["total-z", "spin-flip", "fermion-parity", "time-reversal", "reflection", "translation"];

    internal static readonly string[] TopKeys = ["name", "description", "size", "period", "probes", "symmetries", "parameters", "lattice", "term", "layer"];
    internal static readonly string[] TermKeys = ["pauli", "majorana", "on", "sites", "distance", "coupling", "seed"];
    internal static readonly string[] RotationKeys = ["pauli", "majorana", "on", "sites", "distance", "angle", "seed"];
    internal static readonly string[] LayerKeys = ["rotations"];
    internal static readonly string[] LatticeKinds = ["chain", "ring", "ladder", "square", "all-to-all", "edges"];
    internal static readonly string[] Placements = ["sites", "bonds", "legs", "rungs", "horizontal", "vertical", "pairs", "segments", "plaquettes"];

    /// <summary>
    /// Names a coupling or angle may use besides the parameters: i and j (first and second site of the
    /// placement), d (graph distance between its first and last site), r (Euclidean distance in lattice
    /// coordinates), x and y (coordinates of its first site). Reserved: no parameter may take these names.
    /// </summary>
    internal static readonly string[] PlacementVariables = ["i", "j", "d", "r", "x", "y"];

    /// <summary>Loads a model file, applying parameter overrides (name -> value or expression).</summary>
    public static Model Load(string path, IReadOnlyDictionary<string, string>? overrides = null) => Load(path, overrides, lenient: false);

    /// <summary>
    /// Loads a model file. With <paramref name="lenient"/> (used for the smaller members of a family), a
    /// term whose placement places nothing at this size is dropped and noted in <see cref="Model.LoadNotes"/>
    /// instead of being an error.
    /// </summary>
    public static Model Load(string path, IReadOnlyDictionary<string, string>? overrides, bool lenient)
    {
        ArgumentNullException.ThrowIfNull(path);
        string text;
        try
        {
            text = File.ReadAllText(path);
        }
        catch (FileNotFoundException)
        {
            throw new InputException(path, 0, "found no such file; expected a model file path or the name of a shipped model (see 'opgrowth models')");
        }
        catch (DirectoryNotFoundException)
        {
            throw new InputException(path, 0, "found no such file or folder; expected a model file path or the name of a shipped model (see 'opgrowth models')");
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new InputException(path, 0, $"found a file that cannot be read ({ex.Message}); expected a readable model file");
        }
        return Parse(text, path, overrides, lenient);
    }

    /// <summary>Builds a model from TOML text; <paramref name="sourceName"/> names it in messages.</summary>
    public static Model Parse(string text, string sourceName, IReadOnlyDictionary<string, string>? overrides = null) => Parse(text, sourceName, overrides, lenient: false);

    /// <summary>Builds a model from TOML text; see <see cref="Load(string, IReadOnlyDictionary{string, string}?, bool)"/> for <paramref name="lenient"/>.</summary>
    public static Model Parse(string text, string sourceName, IReadOnlyDictionary<string, string>? overrides, bool lenient)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(sourceName);
        var root = TomlTree.Parse(text, sourceName);
        int lastLine = 1;
        var lines = text.Split('\n');
        for (int i = 0; i < lines.Length; i++)
        {
            if (!string.IsNullOrWhiteSpace(lines[i])) lastLine = i + 1;
        }
        return new Builder(sourceName, root, overrides ?? new Dictionary<string, string>(), lastLine, lenient).Build();
    }

    /// <summary>
    /// The number of sites of the model file at the given overrides, reading only its parameters and
    /// lattice (cheap even for very large lattices: no terms are built).
    /// </summary>
    public static int CountSites(string path, IReadOnlyDictionary<string, string>? overrides = null)
    {
        ArgumentNullException.ThrowIfNull(path);
        string text = File.ReadAllText(path);
        var root = TomlTree.Parse(text, path);
        return new Builder(path, root, overrides ?? new Dictionary<string, string>(), 1, lenient: true).CountSites();
    }

    /// <summary>
    /// Turns repeated "--set name=value" strings into an override map. A malformed item gives an
    /// InputException naming the option.
    /// </summary>
    public static IReadOnlyDictionary<string, string> ParseOverrides(IEnumerable<string>? items, string? file = null)
    {
        var result = new Dictionary<string, string>(StringComparer.Ordinal);
        if (items is null) return result;
        foreach (string raw in items)
        {
            int eq = raw.IndexOf('=', StringComparison.Ordinal);
            string name = eq > 0 ? raw[..eq].Trim() : "";
            string value = eq > 0 ? raw[(eq + 1)..].Trim() : "";
            if (eq <= 0 || value.Length == 0 || !IdentifierRegex().IsMatch(name))
            {
                throw new InputException(file, 0, $"found --set '{raw}'; expected --set NAME=VALUE with a parameter name and a number or expression, as in --set N=24 or --set h=J/2");
            }
            if (result.ContainsKey(name))
            {
                throw new InputException(file, 0, $"found --set {name}=... twice; expected each parameter set at most once");
            }
            result[name] = value;
        }
        return result;
    }

    [GeneratedRegex("^[A-Za-z_][A-Za-z0-9_]*$")]
    internal static partial Regex IdentifierRegex();

    [GeneratedRegex("^[A-Za-z0-9][A-Za-z0-9._-]*$")]
    internal static partial Regex NameRegex();

    [GeneratedRegex(@"^\s*(normal|uniform)\s*\((.*)\)\s*$", RegexOptions.Singleline)]
    internal static partial Regex RandomRegex();

    internal static string Fmt(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    internal static string ClosestOf(string found, IEnumerable<string> options)
    {
        string? best = null;
        int bestD = int.MaxValue;
        foreach (var o in options)
        {
            int d = EditDistance(found.ToLowerInvariant(), o.ToLowerInvariant());
            if (d < bestD)
            {
                bestD = d;
                best = o;
            }
        }
        return best is not null && bestD <= Math.Max(1, found.Length / 3) && bestD < found.Length ? $" (did you mean '{best}'?)" : "";
    }

    /// <summary>Optimal-string-alignment distance (insertions, deletions, substitutions, adjacent transpositions).</summary>
    private static int EditDistance(string a, string b)
    {
        var d = new int[a.Length + 1, b.Length + 1];
        for (int i = 0; i <= a.Length; i++) d[i, 0] = i;
        for (int j = 0; j <= b.Length; j++) d[0, j] = j;
        for (int i = 1; i <= a.Length; i++)
        {
            for (int j = 1; j <= b.Length; j++)
            {
                d[i, j] = Math.Min(Math.Min(d[i - 1, j] + 1, d[i, j - 1] + 1), d[i - 1, j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1));
                if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) d[i, j] = Math.Min(d[i, j], d[i - 2, j - 2] + 1); // transposition
            }
        }
        return d[a.Length, b.Length];
    }
}
