using System.Text.RegularExpressions;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Ensembles;

/// <summary>
/// Reads circuit files: the model-file TOML style (docs/model-files.md) with a <c>[circuit]</c> table in place of
/// <c>[[term]]</c> blocks (format in docs/ensembles.md). <c>name</c>, <c>description</c>, <c>probes</c>,
/// <c>[parameters]</c> (with --set overrides) and <c>[lattice]</c> are read by the model loader itself, so they
/// mean exactly what they mean in a model file; the <c>[circuit]</c> keys are read here.
/// </summary>
public static partial class CircuitLoader
{
    internal static readonly string[] TopKeys = ["name", "description", "probes", "parameters", "lattice", "circuit"];
    internal static readonly string[] CircuitKeys = ["layout", "layers", "single_qubit"];
    internal static readonly string[] Layouts = ["brickwork", "random-pairs"];

    /// <summary>True when the file has a [circuit] table (a circuit file rather than a model file).</summary>
    public static bool IsCircuitFile(string path)
    {
        try
        {
            return File.Exists(path) && File.ReadLines(path).Any(l => CircuitHeader().IsMatch(l));
        }
        catch (IOException)
        {
            return false;
        }
    }

    /// <summary>Loads a circuit file with parameter overrides.</summary>
    public static Circuit Load(string path, IReadOnlyDictionary<string, string>? overrides = null)
    {
        ArgumentNullException.ThrowIfNull(path);
        string text;
        try
        {
            text = File.ReadAllText(path);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new InputException(path, 0, $"found a file that cannot be read ({ex.Message}); expected a readable circuit file");
        }
        return Parse(text, path, overrides);
    }

    /// <summary>Builds a circuit from TOML text; <paramref name="file"/> names it in messages.</summary>
    public static Circuit Parse(string text, string file, IReadOnlyDictionary<string, string>? overrides = null)
    {
        var root = TomlTree.Parse(text, file);
        foreach (var (key, line, _) in root.Entries)
        {
            if (!TopKeys.Contains(key))
                throw new InputException(file, line, $"found the key '{key}'{ModelLoader.ClosestOf(key, TopKeys)}; expected one of {string.Join(", ", TopKeys)} in a circuit file ([[term]] and [[layer]] belong in model files)");
        }
        if (root.Get("circuit") is not TomlTableNode table)
            throw new InputException(file, root.Get("circuit")?.Line ?? 1, "found no [circuit] table; expected [circuit] with layout, layers and optionally single_qubit");
        // The model loader reads everything but [circuit]: blank those lines (line numbers stay) and add a placeholder term.
        var lines = text.Replace("\r\n", "\n", StringComparison.Ordinal).Split('\n');
        int start = Array.FindIndex(lines, l => CircuitHeader().IsMatch(l));
        int end = start + 1;
        while (end < lines.Length && !TableHeader().IsMatch(lines[end])) end++;
        for (int i = start; i < end; i++) lines[i] = "";
        string modelText = string.Join('\n', lines) + "\n[[term]]\npauli = \"Z\"\non = \"sites\"\ncoupling = 1\n";
        var model = ModelLoader.Parse(modelText, file, overrides);

        CircuitLayout? layout = null;
        int layers = 0;
        bool singles = false;
        foreach (var (key, line, value) in table.Entries)
        {
            switch (key)
            {
                case "layout":
                    string l = value is TomlScalar { Value: string s } ? s : "";
                    if (!Layouts.Contains(l)) throw new InputException(file, value.Line, $"found {value.Describe()} for layout{ModelLoader.ClosestOf(l, Layouts)}; expected \"brickwork\" or \"random-pairs\"");
                    layout = l == "brickwork" ? CircuitLayout.Brickwork : CircuitLayout.RandomPairs;
                    break;
                case "layers":
                    double v = Number(value, model.Parameters, file, "layers");
                    if (v < 1 || v > 1e7 || v != Math.Floor(v)) throw new InputException(file, value.Line, $"found layers = {v}; expected a whole number from 1 to 10^7");
                    layers = (int)v;
                    break;
                case "single_qubit":
                    if (value is not TomlScalar { Value: bool b }) throw new InputException(file, value.Line, $"found {value.Describe()} for single_qubit; expected true or false");
                    singles = b;
                    break;
                default:
                    throw new InputException(file, line, $"found the key '{key}'{ModelLoader.ClosestOf(key, CircuitKeys)} in [circuit]; expected one of {string.Join(", ", CircuitKeys)}");
            }
        }
        if (layout is null) throw new InputException(file, table.Line, "found no layout in [circuit]; expected layout = \"brickwork\" or \"random-pairs\"");
        if (layers == 0) throw new InputException(file, table.Line, "found no layers in [circuit]; expected layers = a whole number (or expression) of two-qubit gate layers");
        if (layout == CircuitLayout.Brickwork && model.Lattice.Kind == "all-to-all")
            throw new InputException(file, table.Line, "found layout = \"brickwork\" on an all-to-all lattice; expected \"random-pairs\" there (brickwork needs a lattice's bonds)");
        if (model.Lattice.Edges.Count == 0) throw new InputException(file, table.Line, "found a lattice without bonds; expected at least one bond for two-qubit gates");
        return new Circuit
        {
            Name = model.Name,
            Description = model.Description,
            N = model.N,
            Lattice = model.Lattice,
            Layout = layout.Value,
            Layers = layers,
            SingleQubitLayers = singles,
            Probes = model.Probes,
            Parameters = model.Parameters,
        };
    }

    private static double Number(TomlNode node, IReadOnlyDictionary<string, double> parameters, string file, string what)
    {
        switch (node)
        {
            case TomlScalar { Value: long l }: return l;
            case TomlScalar { Value: double d }: return d;
            case TomlScalar { Value: string s }:
                if (!Expression.TryParse(s, out var e, out string? problem) || e is null) throw new InputException(file, node.Line, $"found \"{s}\" for {what}: {problem}; expected a number or an expression of {Expression.Grammar}");
                var unknown = e.Names.Where(nm => !parameters.ContainsKey(nm)).ToList();
                if (unknown.Count > 0) throw new InputException(file, node.Line, $"found the unknown name '{unknown[0]}' in {what}; expected a parameter of [parameters]");
                return e.Evaluate(parameters);
            default:
                throw new InputException(file, node.Line, $"found {node.Describe()} for {what}; expected a number or a quoted expression");
        }
    }

    [GeneratedRegex(@"^\s*\[\s*circuit\s*\]\s*(#.*)?$")]
    private static partial Regex CircuitHeader();

    [GeneratedRegex(@"^\s*\[")]
    private static partial Regex TableHeader();
}
