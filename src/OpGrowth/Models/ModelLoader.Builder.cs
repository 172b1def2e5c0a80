using System.Globalization;
using OpGrowth.IO;
using OpGrowth.Pauli;

namespace OpGrowth.Models;

public static partial class ModelLoader
{
    /// <summary>
    /// A coupling or angle as written: fixed, or a random distribution. Its numbers may depend on the
    /// placement (site index, distance, coordinates: see <see cref="PlacementScope"/>); those are evaluated
    /// once per placement.
    /// </summary>
    private sealed record ValueSpec(string? Distribution, Expression? AExpr, Expression? BExpr, double A, double B, string Text)
    {
        public bool IsRandom => Distribution is not null;

        /// <summary>True when a number depends on the placement.</summary>
        public bool PerPlacement => AExpr is not null || BExpr is not null;
    }

    /// <summary>
    /// Parameter values plus the placement variables of the placement being expanded: i and j (first and
    /// second site), d (graph distance between the first and last site), r (Euclidean distance between them
    /// in lattice coordinates, nearest image on periodic lattices), x and y (coordinates of the first site).
    /// </summary>
    private sealed class PlacementScope(IReadOnlyDictionary<string, double> parameters) : IReadOnlyDictionary<string, double>
    {
        public double I, J, D, R, X, Y;

        public double this[string key] => key switch
        {
            "i" => I,
            "j" => J,
            "d" => D,
            "r" => R,
            "x" => X,
            "y" => Y,
            _ => parameters[key],
        };

        public IEnumerable<string> Keys => PlacementVariables.Concat(parameters.Keys);

        public IEnumerable<double> Values => Keys.Select(k => this[k]);

        public int Count => PlacementVariables.Length + parameters.Count;

        public bool ContainsKey(string key) => Array.IndexOf(PlacementVariables, key) >= 0 || parameters.ContainsKey(key);

        public bool TryGetValue(string key, out double value)
        {
            bool ok = ContainsKey(key);
            value = ok ? this[key] : 0;
            return ok;
        }

        public IEnumerator<KeyValuePair<string, double>> GetEnumerator() => Keys.Select(k => new KeyValuePair<string, double>(k, this[k])).GetEnumerator();

        System.Collections.IEnumerator System.Collections.IEnumerable.GetEnumerator() => GetEnumerator();
    }

    /// <summary>One pass over a parsed file: parameters, lattice, terms or drive, probes, symmetries.</summary>
    private sealed class Builder
    {
        private readonly string _file;
        private readonly TomlTableNode _root;
        private readonly IReadOnlyDictionary<string, string> _overrides;
        private readonly Dictionary<string, double> _params = new(StringComparer.Ordinal);
        private readonly List<string> _paramOrder = [];
        private readonly List<long> _seeds = [];
        private Lattice _lattice = null!;
        private bool _disordered;
        private bool _majorana;
        private int _count;

        private readonly int _lastLine;
        private readonly bool _lenient;
        private readonly List<string> _notes = [];

        public Builder(string file, TomlTableNode root, IReadOnlyDictionary<string, string> overrides, int lastLine, bool lenient)
        {
            _lenient = lenient;
            _lastLine = lastLine;
            _file = file;
            _root = root;
            _overrides = overrides;
        }

        private InputException Err(int line, string problem) => new(_file, line, problem);

        /// <summary>Reads only the parameters and the lattice: the number of sites at these parameter values.</summary>
        public int CountSites()
        {
            ReadParameters();
            return ReadLattice().N;
        }

        public Model Build()
        {
            CheckKeys(_root, TopKeys, "the top level");
            string name = ReadName();
            string description = ReadDescription();
            ReadParameters();
            _lattice = ReadLattice();

            var termNode = _root.Get("term");
            var layerNode = _root.Get("layer");
            if (termNode is not null && layerNode is not null)
            {
                throw Err(_root.KeyLine("layer"), "found both [[term]] blocks and [[layer]] blocks; expected either a Hamiltonian ([[term]]) or a periodic drive ([[layer]]), not both");
            }
            if (termNode is null && layerNode is null)
            {
                throw Err(LastLine(), "found an empty Hamiltonian (no [[term]] and no [[layer]] blocks); expected at least one [[term]] block such as pauli = \"ZZ\", on = \"bonds\", coupling = \"J\"");
            }
            var periodNode = _root.Get("period");
            if (periodNode is not null && layerNode is null)
            {
                throw Err(_root.KeyLine("period"), "found 'period' in a model without [[layer]] blocks; expected period only for a periodic drive");
            }

            Hamiltonian hamiltonian;
            FloquetDrive? drive = null;
            if (termNode is not null)
            {
                hamiltonian = ReadTerms(termNode, _root.KeyLine("term"));
            }
            else
            {
                double period = 1.0;
                if (periodNode is not null)
                {
                    period = ReadNumber(periodNode, "period");
                    // Times are counted in periods, but the report states them in time units: keep them representable.
                    if (!(period >= 1e-9 && period <= 1e9)) throw Err(periodNode.Line, $"found period = {Fmt(period)}; expected a positive duration from 1e-9 to 1e9 (time is in units of 1/energy)");
                }
                drive = ReadDrive(layerNode!, _root.KeyLine("layer"), period);
                var avg = new List<PauliTerm>();
                foreach (var layer in drive.Layers)
                {
                    foreach (var r in layer) avg.Add(new PauliTerm(r.Generator, r.Angle / (2 * period)));
                }
                hamiltonian = new Hamiltonian(_lattice.N, avg);
            }

            var probes = ReadProbes();
            var symmetries = ReadSymmetries(hamiltonian, drive);
            var sizeParameters = ReadSize();
            var parameters = new Dictionary<string, double>(StringComparer.Ordinal);
            foreach (var p in _paramOrder) parameters[p] = _params[p];
            return new Model
            {
                Name = name,
                Description = description,
                SourceFile = _file,
                Lattice = _lattice,
                Hamiltonian = hamiltonian,
                Probes = probes,
                Symmetries = symmetries,
                Drive = drive,
                SizeMeasure = _majorana ? SizeMeasure.Majoranas : SizeMeasure.Qubits,
                Parameters = parameters,
                Seeds = _seeds.Distinct().ToArray(),
                SizeParameters = sizeParameters,
                LoadNotes = _notes.ToArray(),
                IsDisordered = _disordered,
                IsTranslationInvariant = drive is null
                    ? SymmetryCheck.IsTranslationInvariant(hamiltonian.Terms, _lattice)
                    : drive.Layers.All(l => l.Count == 0 || SymmetryCheck.IsTranslationInvariant(l.Select(r => new PauliTerm(r.Generator, r.Angle)).ToArray(), _lattice)),
            };
        }

        /// <summary>
        /// The parameters that set the system size: the file's <c>size</c> key (one name or a list), else
        /// <c>N</c> when defined, else the parameters that the lattice's size keys are written with
        /// (e.g. <c>length = "L"</c>, or <c>width = "Lx"</c> and <c>height = "Ly"</c>). Empty when the size
        /// is fixed by numbers.
        /// </summary>
        private IReadOnlyList<string> ReadSize()
        {
            var node = _root.Get("size");
            if (node is null)
            {
                if (_params.ContainsKey("N")) return ["N"];
                var names = new List<string>();
                if (_root.Get("lattice") is TomlTableNode lt)
                {
                    foreach (string key in new[] { "sites", "length", "width", "height" })
                    {
                        if (lt.Get(key) is TomlScalar { Value: string text } && Expression.TryParse(text, out var e, out _))
                        {
                            foreach (var n in e!.Names) if (!names.Contains(n)) names.Add(n);
                        }
                    }
                }
                return names;
            }
            var items = new List<(string, int)>();
            if (node is TomlScalar { Value: string one }) items.Add((one, node.Line));
            else if (node is TomlList { IsTableArray: false } list && list.Items.Count > 0 && list.Items.All(i => i is TomlScalar { Value: string }))
            {
                foreach (var item in list.Items) items.Add(((string)((TomlScalar)item).Value, item.Line));
            }
            else throw Err(node.Line, $"found {node.Describe()} for size; expected the name of the parameter that sets the system size, such as size = \"L\", or a list such as size = [\"Lx\", \"Ly\"]");
            var result = new List<string>();
            foreach (var (name, line) in items)
            {
                if (!_params.ContainsKey(name)) throw Err(line, $"found size = \"{TomlScalar.Shorten(name)}\", which is not a parameter{ClosestOf(name, _paramOrder)}; expected the name of a parameter from [parameters] that sets the system size");
                if (result.Contains(name)) throw Err(line, $"found the size parameter \"{name}\" twice; expected each once");
                result.Add(name);
            }
            return result;
        }

        /// <summary>The last non-blank line: where something missing from the file would have gone.</summary>
        private int LastLine() => _lastLine;

        // ---------------------------------------------------------------- keys and scalars

        private void CheckKeys(TomlTableNode t, string[] allowed, string where)
        {
            foreach (var (key, line, _) in t.Entries)
            {
                if (Array.IndexOf(allowed, key) < 0)
                {
                    throw Err(line, $"found unknown key '{key}' in {where}{ClosestOf(key, allowed)}; expected one of: {string.Join(", ", allowed)}");
                }
            }
        }

        private string ReadName()
        {
            var node = _root.Get("name") ?? throw Err(1, "found no 'name'; expected name = \"a-short-name\" at the top of the file");
            if (node is not TomlScalar { Value: string s }) throw Err(node.Line, $"found {node.Describe()} for name; expected a quoted short name such as \"mixed-field-ising\"");
            if (!NameRegex().IsMatch(s)) throw Err(node.Line, $"found name \"{TomlScalar.Shorten(s)}\"; expected letters, digits, '.', '_' or '-' (no spaces), starting with a letter or digit");
            return s;
        }

        private string ReadDescription()
        {
            var node = _root.Get("description") ?? throw Err(_root.KeyLine("name"), "found no 'description'; expected description = \"one line saying what the model is\"");
            if (node is not TomlScalar { Value: string s }) throw Err(node.Line, $"found {node.Describe()} for description; expected a quoted line of text");
            if (s.Contains('\n', StringComparison.Ordinal) || s.Contains('\r', StringComparison.Ordinal)) throw Err(node.Line, "found a description of several lines; expected one line (put longer notes in # comments)");
            if (string.IsNullOrWhiteSpace(s)) throw Err(node.Line, "found an empty description; expected one line saying what the model is");
            return s.Trim();
        }

        /// <summary>A number: a TOML integer/float, or a quoted expression over the parameters.</summary>
        private double ReadNumber(TomlNode node, string what)
        {
            switch (node)
            {
                case TomlScalar { Value: long l }:
                    return l;
                case TomlScalar { Value: double d }:
                    if (!double.IsFinite(d)) throw Err(node.Line, $"found {what} = {Fmt(d)}; expected a finite number");
                    return d;
                case TomlScalar { Value: string s }:
                    return EvalText(s, node.Line, what);
                default:
                    throw Err(node.Line, $"found {node.Describe()} for {what}; expected a number or a quoted expression such as \"J/2\"");
            }
        }

        private double EvalText(string text, int line, string what, string extraExpected = "")
        {
            if (!Expression.TryParse(text, out var e, out string? problem))
            {
                throw Err(line, $"found {problem} for {what}; expected {Expression.Grammar}{extraExpected}");
            }
            return EvalExpression(e!, line, what);
        }

        private double EvalExpression(Expression e, int line, string what)
        {
            foreach (string name in e.Names)
            {
                if (!_params.ContainsKey(name))
                {
                    string known = _paramOrder.Count == 0 ? "no parameters are defined" : "defined: " + string.Join(", ", _paramOrder);
                    throw Err(line, $"found the name '{name}' in \"{TomlScalar.Shorten(e.Text)}\" ({what}), a parameter that is never defined{ClosestOf(name, _paramOrder)}; expected a name from [parameters] ({known}) or pi");
                }
            }
            double v = e.Evaluate(_params);
            if (!double.IsFinite(v)) throw Err(line, $"found {what} = \"{TomlScalar.Shorten(e.Text)}\" = {Fmt(v)}; expected a finite number");
            return v;
        }

        private long ReadWhole(TomlNode node, string what, long min, long max)
        {
            double v = ReadNumber(node, what);
            double r = Math.Round(v);
            if (Math.Abs(v - r) > 1e-9 * Math.Max(1, Math.Abs(v))) throw Err(node.Line, $"found {what} = {Fmt(v)}; expected a whole number");
            if (r < min || r > max) throw Err(node.Line, $"found {what} = {Fmt(r)}; expected a whole number from {min} to {max}");
            return (long)r;
        }

        private bool ReadBool(TomlNode node, string what)
        {
            if (node is TomlScalar { Value: bool b }) return b;
            throw Err(node.Line, $"found {node.Describe()} for {what}; expected true or false");
        }

        private string ReadString(TomlNode node, string what, string expected)
        {
            if (node is TomlScalar { Value: string s }) return s;
            throw Err(node.Line, $"found {node.Describe()} for {what}; expected {expected}");
        }

        // ---------------------------------------------------------------- parameters

        private void ReadParameters()
        {
            var node = _root.Get("parameters");
            var defs = new Dictionary<string, (TomlNode? Node, string? Text, int Line)>(StringComparer.Ordinal);
            int tableLine = _root.KeyLine("parameters");
            if (node is not null)
            {
                if (node is not TomlTableNode table) throw Err(node.Line, $"found {node.Describe()} for parameters; expected a [parameters] table of name = value lines");
                foreach (var (key, line, value) in table.Entries)
                {
                    if (!IdentifierRegex().IsMatch(key)) throw Err(line, $"found the parameter name '{key}'; expected a name of letters, digits and '_' that starts with a letter");
                    if (Expression.Constants.ContainsKey(key) || Expression.Functions.ContainsKey(key)) throw Err(line, $"found the parameter name '{key}', which is a built-in constant or function; expected another name");
                    if (Array.IndexOf(PlacementVariables, key) >= 0) throw Err(line, $"found the parameter name '{key}', which couplings use for the placement ({string.Join(", ", PlacementVariables)}: site, distance, coordinates); expected another name");
                    if (value is TomlScalar { Value: long or double or string })
                    {
                        defs[key] = (value, null, value.Line);
                        _paramOrder.Add(key);
                    }
                    else
                    {
                        throw Err(line, $"found {value.Describe()} for parameter '{key}'; expected a number or a quoted expression over other parameters");
                    }
                }
            }
            foreach (var (key, text) in _overrides)
            {
                if (!defs.TryGetValue(key, out var d))
                {
                    string known = _paramOrder.Count == 0 ? "the file defines no parameters" : "one of: " + string.Join(", ", _paramOrder);
                    throw Err(tableLine, $"found --set {key}={text}, but the model has no parameter '{key}'{ClosestOf(key, _paramOrder)}; expected {known}");
                }
                defs[key] = (null, text, d.Line);
            }

            var state = new Dictionary<string, int>(StringComparer.Ordinal); // 1 = in progress, 2 = done
            var stack = new List<string>();
            double Resolve(string name)
            {
                if (state.TryGetValue(name, out int s))
                {
                    if (s == 2) return _params[name];
                    stack.Add(name);
                    throw Err(defs[name].Line, $"found parameter '{name}' defined through itself ({string.Join(" -> ", stack.SkipWhile(x => x != name))}); expected definitions without cycles");
                }
                state[name] = 1;
                stack.Add(name);
                var (n, text, line) = defs[name];
                string what = text is null ? $"parameter {name}" : $"parameter {name} (from --set)";
                double v;
                if (n is TomlScalar { Value: long l }) v = l;
                else if (n is TomlScalar { Value: double dv })
                {
                    if (!double.IsFinite(dv)) throw Err(line, $"found {what} = {Fmt(dv)}; expected a finite number");
                    v = dv;
                }
                else
                {
                    string src = text ?? (string)((TomlScalar)n!).Value;
                    if (!Expression.TryParse(src, out var e, out string? problem))
                    {
                        throw Err(line, $"found {problem} for {what}; expected {Expression.Grammar}");
                    }
                    foreach (string dep in e!.Names)
                    {
                        if (!defs.ContainsKey(dep))
                        {
                            throw Err(line, $"found the name '{dep}' in \"{TomlScalar.Shorten(src)}\" ({what}), a parameter that is never defined{ClosestOf(dep, _paramOrder)}; expected a name from [parameters] ({string.Join(", ", _paramOrder)}) or pi");
                        }
                        Resolve(dep);
                    }
                    v = e.Evaluate(_params);
                    if (!double.IsFinite(v)) throw Err(line, $"found {what} = \"{TomlScalar.Shorten(src)}\" = {Fmt(v)}; expected a finite number");
                }
                _params[name] = v;
                state[name] = 2;
                stack.RemoveAt(stack.Count - 1);
                return v;
            }
            foreach (var name in _paramOrder) Resolve(name);
        }

        // ---------------------------------------------------------------- lattice

        private Lattice ReadLattice()
        {
            var node = _root.Get("lattice") ?? throw Err(LastLine(), "found no [lattice] table; expected [lattice] with kind = \"chain\" and sites = \"N\" (or another kind)");
            if (node is not TomlTableNode t) throw Err(node.Line, $"found {node.Describe()} for lattice; expected a [lattice] table");
            var kindNode = t.Get("kind") ?? throw Err(t.Line, $"found a [lattice] without 'kind'; expected kind = one of {string.Join(", ", LatticeKinds)}");
            string kind = ReadString(kindNode, "lattice kind", $"one of {string.Join(", ", LatticeKinds)}");
            if (Array.IndexOf(LatticeKinds, kind) < 0)
            {
                throw Err(kindNode.Line, $"found lattice kind \"{TomlScalar.Shorten(kind)}\"{ClosestOf(kind, LatticeKinds)}; expected one of {string.Join(", ", LatticeKinds)}");
            }
            string[] keys = kind switch
            {
                "chain" => ["kind", "sites", "periodic"],
                "ring" or "all-to-all" => ["kind", "sites"],
                "ladder" => ["kind", "length", "periodic"],
                "square" => ["kind", "width", "height", "periodic"],
                _ => ["kind", "sites", "edges"],
            };
            CheckKeys(t, keys, $"a {kind} [lattice]");
            // The widest Pauli key of the engines: a larger model could be built but never run (and an all-to-all one
            // of that size takes seconds and gigabytes to build), so it is refused here, before any work.
            int max = Pauli.PauliWidth.MaxQubits;
            int Need(string key, int maxValue)
            {
                var n = t.Get(key) ?? throw Err(t.Line, $"found a {kind} lattice without '{key}'; expected {key} = a whole number or a parameter name such as \"N\"");
                return (int)ReadWhole(n, $"lattice {key}", 1, maxValue);
            }
            bool periodic = t.Get("periodic") is { } pn && ReadBool(pn, "lattice periodic");
            // A wrap-around bond needs at least 3 sites along that direction (else it doubles an existing bond): refuse rather than drop it.
            int TooShort(string key, int value, string what)
                => throw Err(t.Get("periodic")!.Line, $"found periodic = true with {key} = {value}; expected at least 3 {what} for periodic boundaries (with fewer the wrap-around bond would repeat an existing one), or periodic = false");
            switch (kind)
            {
                case "chain":
                {
                    int n = Need("sites", max);
                    if (periodic && n < 3) TooShort("sites", n, "sites");
                    return Lattice.Chain(n, periodic);
                }
                case "ring":
                    return Lattice.Chain(Need("sites", max), true);
                case "all-to-all":
                    return Lattice.AllToAll(Need("sites", max));
                case "ladder":
                {
                    int length = Need("length", max / 2);
                    if (periodic && length < 3) TooShort("length", length, "rungs");
                    return Lattice.Ladder(length, periodic);
                }
                case "square":
                {
                    int w = Need("width", max), h = Need("height", max);
                    if ((long)w * h > max) throw Err(t.Line, $"found a {w}x{h} square lattice ({(long)w * h} sites); expected at most {max} sites");
                    if (periodic && (w < 3 || h < 3))
                        throw Err(t.Get("periodic")!.Line, $"found periodic = true on a {w}x{h} square; expected width and height of at least 3 for periodic boundaries (with fewer the wrap-around bond would repeat an existing one; a periodic 2 x L strip is kind = \"ladder\"), or periodic = false");
                    return Lattice.Square(w, h, periodic);
                }
                default:
                {
                    int n = Need("sites", max);
                    var en = t.Get("edges") ?? throw Err(t.Line, "found an edge-list lattice without 'edges'; expected edges = [[0, 1], [1, 2], ...]");
                    if (en is not TomlList { IsTableArray: false } list || list.Items.Count == 0) throw Err(en.Line, $"found {en.Describe()} for edges; expected a non-empty array of site pairs such as [[0, 1], [1, 2]]");
                    var edges = new List<(int, int)>();
                    var seen = new Dictionary<(int, int), string>();
                    foreach (var item in list.Items)
                    {
                        if (item is not TomlList { Items.Count: 2 } pair) throw Err(item.Line, $"found {item.Describe()} in edges; expected a pair of sites such as [0, 1]");
                        int a = ReadSite(pair.Items[0], n, "edge site"), b = ReadSite(pair.Items[1], n, "edge site");
                        if (a == b) throw Err(item.Line, $"found the edge [{a}, {b}] joining a site to itself; expected two different sites");
                        var k = (Math.Min(a, b), Math.Max(a, b));
                        if (seen.TryGetValue(k, out string? first)) throw Err(item.Line, $"found the edge [{a}, {b}] twice (first as {first}); expected each edge once");
                        seen[k] = $"[{a}, {b}]";
                        edges.Add((a, b));
                    }
                    var lat = Lattice.FromEdges(n, edges);
                    if (!lat.IsConnected)
                    {
                        int lone = lat.DistancesFrom(0).Select((d, i) => (d, i)).First(x => x.d == int.MaxValue).i;
                        throw Err(en.Line, $"found an edge list that does not reach site {lone} from site 0; expected a connected graph (distances must be defined)");
                    }
                    return lat;
                }
            }
        }

        private int ReadSite(TomlNode node, int n, string what)
            => (int)ReadWhole(node, what, 0, n - 1);

        // ---------------------------------------------------------------- terms

        private IEnumerable<TomlTableNode> Blocks(TomlNode node, string key, int keyLine)
        {
            if (node is not TomlList list || list.Items.Count == 0 || list.Items.Any(i => i is not TomlTableNode))
            {
                throw Err(keyLine, $"found {node.Describe()} for '{key}'; expected [[{key}]] blocks (a list of tables)");
            }
            return list.Items.Cast<TomlTableNode>();
        }

        private Hamiltonian ReadTerms(TomlNode node, int keyLine)
        {
            var terms = new List<PauliTerm>();
            var firstLine = new Dictionary<PauliString, int>();
            foreach (var block in Blocks(node, "term", keyLine))
            {
                foreach (var (s, c, line) in Expand(block, "coupling", "[[term]]", TermKeys))
                {
                    if (c == 0) continue;
                    if (firstLine.TryGetValue(s, out int fl))
                    {
                        throw Err(line, $"found the term {s} a second time (first made at line {fl}); expected each Pauli string once: put the couplings into one [[term]]");
                    }
                    firstLine[s] = line;
                    terms.Add(new PauliTerm(s, c));
                }
            }
            if (terms.Count == 0) throw Err(keyLine, "found an empty Hamiltonian (every coupling is zero); expected at least one nonzero term");
            return new Hamiltonian(_lattice.N, terms);
        }

        private FloquetDrive ReadDrive(TomlNode node, int keyLine, double period)
        {
            var layers = new List<IReadOnlyList<PauliRotation>>();
            foreach (var block in Blocks(node, "layer", keyLine))
            {
                CheckKeys(block, LayerKeys, "a [[layer]]");
                var rn = block.Get("rotations") ?? throw Err(block.Line, "found a [[layer]] without 'rotations'; expected rotations = [ { pauli = \"X\", on = \"sites\", angle = \"2*b\" } ]");
                if (rn is not TomlList { IsTableArray: false } rl || rl.Items.Any(i => i is not TomlTableNode))
                {
                    throw Err(rn.Line, $"found {rn.Describe()} for rotations; expected an array of inline tables such as [ {{ pauli = \"X\", on = \"sites\", angle = 0.5 }} ]");
                }
                var layer = new List<PauliRotation>();
                var firstLine = new Dictionary<PauliString, int>();
                foreach (TomlTableNode rt in rl.Items)
                {
                    foreach (var (s, angle, line) in Expand(rt, "angle", "a rotation", RotationKeys))
                    {
                        if (angle == 0) continue;
                        if (firstLine.TryGetValue(s, out int fl))
                        {
                            throw Err(line, $"found the rotation generator {s} twice in one layer (first at line {fl}); expected each generator once per layer: add the angles");
                        }
                        firstLine[s] = line;
                        layer.Add(new PauliRotation(s, angle));
                    }
                }
                layers.Add(layer);
            }
            if (layers.All(l => l.Count == 0)) throw Err(keyLine, "found a drive whose every angle is zero; expected at least one nonzero rotation");
            return new FloquetDrive(layers, period);
        }

        private ValueSpec ReadValue(TomlNode node, string what)
        {
            if (node is TomlScalar { Value: string s })
            {
                var m = RandomRegex().Match(s);
                if (m.Success)
                {
                    string dist = m.Groups[1].Value;
                    var args = SplitTopLevel(m.Groups[2].Value);
                    string form = dist == "normal" ? "normal(mean, std)" : "uniform(low, high)";
                    if (args.Count != 2) throw Err(node.Line, $"found {dist} with {args.Count} argument(s) in \"{TomlScalar.Shorten(s)}\"; expected {form}");
                    var (a, ae) = ReadPlacementNumber(args[0], node.Line, $"{what} {dist} argument 1");
                    var (b, be) = ReadPlacementNumber(args[1], node.Line, $"{what} {dist} argument 2");
                    if (ae is null && be is null) CheckDistribution(dist, a, b, s, node.Line, null);
                    return new ValueSpec(dist, ae, be, a, b, s);
                }
                var (v, ve) = ReadPlacementNumber(s, node.Line, what, ", or a random normal(mean, std) / uniform(low, high)");
                return new ValueSpec(null, ve, null, v, 0, s);
            }
            return new ValueSpec(null, null, null, ReadNumber(node, what), 0, "");
        }

        private void CheckDistribution(string dist, double a, double b, string text, int line, string? at)
        {
            if (dist == "normal" && b < 0) throw Err(line, $"found a negative standard deviation {Fmt(b)}{at} in \"{TomlScalar.Shorten(text)}\"; expected normal(mean, std) with std >= 0");
            if (dist == "uniform" && b < a) throw Err(line, $"found uniform({Fmt(a)}, {Fmt(b)}){at} with low > high; expected uniform(low, high) with low <= high");
        }

        /// <summary>
        /// A number that may use the placement variables (i, j, d, r, x, y): evaluated now when it does not,
        /// otherwise returned as an expression for <see cref="ValueAt"/>.
        /// </summary>
        private (double Value, Expression? PerPlacement) ReadPlacementNumber(string text, int line, string what, string extraExpected = "")
        {
            if (!Expression.TryParse(text, out var e, out string? problem))
            {
                throw Err(line, $"found {problem} for {what}; expected {Expression.Grammar}, the placement variables {string.Join(", ", PlacementVariables)}{extraExpected}");
            }
            if (!e!.Names.Any(n => Array.IndexOf(PlacementVariables, n) >= 0)) return (EvalExpression(e, line, what), null);
            foreach (string name in e.Names)
            {
                if (Array.IndexOf(PlacementVariables, name) < 0 && !_params.ContainsKey(name))
                {
                    throw Err(line, $"found the name '{name}' in \"{TomlScalar.Shorten(e.Text)}\" ({what}), which is neither a parameter{ClosestOf(name, _paramOrder.Concat(PlacementVariables))} nor a placement variable; expected a name from [parameters] or one of {string.Join(", ", PlacementVariables)} (site, distance, coordinates of the placement)");
                }
            }
            return (double.NaN, e);
        }

        /// <summary>Draws (or evaluates) the value at one placement.</summary>
        private double ValueAt(ValueSpec spec, ModelRandom? rng, int[]? placement, int line, string what)
        {
            double a = spec.A, b = spec.B;
            if (spec.PerPlacement)
            {
                var scope = _scope ??= new PlacementScope(_params);
                if (placement is not null) SetPlacement(scope, placement);
                string at = placement is null ? string.Empty : $" at the placement [{string.Join(", ", placement)}] (d = {Fmt(scope.D)})";
                if (spec.AExpr is not null) a = Finite(spec.AExpr.Evaluate(scope), spec.AExpr, at);
                if (spec.BExpr is not null) b = Finite(spec.BExpr.Evaluate(scope), spec.BExpr, at);
                if (spec.IsRandom) CheckDistribution(spec.Distribution!, a, b, spec.Text, line, at);
            }
            return spec.Distribution switch
            {
                null => a,
                "normal" => rng!.Normal(a, b),
                _ => rng!.Uniform(a, b),
            };

            double Finite(double v, Expression e, string at)
            {
                if (!double.IsFinite(v)) throw Err(line, $"found {what} \"{TomlScalar.Shorten(e.Text)}\" = {Fmt(v)}{at}; expected a finite number at every placement");
                return v;
            }
        }

        private PlacementScope? _scope;

        private void SetPlacement(PlacementScope scope, int[] p)
        {
            int first = p[0], last = p[^1];
            scope.I = first;
            scope.J = p.Length > 1 ? p[1] : first;
            scope.D = p.Length > 1 ? _lattice.Distance(first, last) : 0;
            scope.R = p.Length > 1 ? _lattice.EuclideanDistance(first, last) : 0;
            var (x, y) = _lattice.Coordinate(first);
            scope.X = x;
            scope.Y = y;
        }

        private static List<string> SplitTopLevel(string s)
        {
            var parts = new List<string>();
            int depth = 0, start = 0;
            for (int i = 0; i < s.Length; i++)
            {
                if (s[i] == '(') depth++;
                else if (s[i] == ')') depth--;
                else if (s[i] == ',' && depth == 0)
                {
                    parts.Add(s[start..i]);
                    start = i + 1;
                }
            }
            parts.Add(s[start..]);
            if (parts.Count == 1 && string.IsNullOrWhiteSpace(parts[0])) parts.Clear();
            return parts;
        }

        /// <summary>
        /// Expands one [[term]] (or rotation) into (string, value, line) triples: Pauli words placed on
        /// sites/bonds/pairs/plaquettes/explicit lists, or Hermitian Majorana monomials.
        /// </summary>
        private List<(PauliString S, double Value, int Line)> Expand(TomlTableNode t, string valueKey, string where, string[] keys)
        {
            CheckKeys(t, keys, where);
            var pauliNode = t.Get("pauli");
            var majNode = t.Get("majorana");
            if (pauliNode is not null && majNode is not null)
            {
                throw Err(t.KeyLine("majorana"), $"found both 'pauli' and 'majorana' in {where}; expected one of them");
            }
            if (pauliNode is null && majNode is null)
            {
                throw Err(t.Line, $"found {where} without 'pauli' or 'majorana'; expected pauli = \"ZZ\" (one letter per site) or majorana = 4 (all 4-Majorana products)");
            }
            var valueNode = t.Get(valueKey) ?? throw Err(t.Line, $"found {where} without '{valueKey}'; expected {valueKey} = a number, an expression such as \"J/2\", or normal(mean, std) / uniform(low, high) with a seed");
            var spec = ReadValue(valueNode, valueKey);
            int valueLine = valueNode.Line;
            var seedNode = t.Get("seed");
            ModelRandom? rng = null;
            long seed = 0;
            if (spec.IsRandom)
            {
                if (seedNode is null) throw Err(valueLine, $"found a random {valueKey} \"{TomlScalar.Shorten(spec.Text)}\" without a seed; expected seed = a whole number next to it (the same seed gives the same draws)");
                seed = ReadWhole(seedNode, "seed", 0, 1L << 53);
                rng = new ModelRandom(seed);
            }
            else if (seedNode is not null)
            {
                throw Err(t.KeyLine("seed"), $"found a seed with a fixed {valueKey}; expected seed only next to a random {valueKey} normal(mean, std) or uniform(low, high)");
            }

            var result = new List<(PauliString, double, int)>();
            int n = _lattice.N;
            bool anyNonzero = false;
            if (pauliNode is not null)
            {
                int pauliLine = t.KeyLine("pauli");
                var words = ReadWords(pauliNode);
                var placements = ReadPlacements(t, where, words.Max(w => w.Length), out string placementName);
                foreach (var p in placements)
                {
                    foreach (var w in words)
                    {
                        if (w.Length != p.Length)
                        {
                            throw Err(pauliLine, $"found pauli \"{w}\" ({w.Length} letter(s)) on {placementName} of {p.Length} site(s); expected {p.Length} letter(s), one per site");
                        }
                    }
                }
                Count((long)placements.Count * words.Count, t.Line);
                foreach (var p in placements)
                {
                    double value = ValueAt(spec, rng, p, valueLine, valueKey);
                    foreach (var w in words)
                    {
                        var b = new PauliString.Builder(n);
                        for (int k = 0; k < p.Length; k++) b.Set(p[k], w[k]);
                        var s = b.Build();
                        if (s.IsIdentity) throw Err(pauliLine, $"found pauli \"{w}\", which is the identity; expected at least one X, Y or Z");
                        result.Add((s, value, pauliLine));
                        anyNonzero |= value != 0;
                    }
                }
            }
            else
            {
                foreach (var key in new[] { "on", "sites", "distance" })
                {
                    if (t.Get(key) is not null) throw Err(t.KeyLine(key), $"found '{key}' next to 'majorana'; expected majorana = q (all q-Majorana products) or majorana = [[0, 1, 2, 3], ...] alone");
                }
                _majorana = true;
                int majLine = t.KeyLine("majorana");
                int m = 2 * n;
                IEnumerable<int[]> monomials;
                if (majNode is TomlScalar)
                {
                    int q = (int)ReadWhole(majNode!, "majorana", 1, m);
                    if ((q & 1) != 0) throw Err(majLine, $"found majorana = {q}; expected an even number (an odd product of Majoranas is fermionic and cannot be a Hamiltonian term)");
                    Count(Binomial(m, q), t.Line);
                    monomials = Combinations(m, q);
                }
                else if (majNode is TomlList { IsTableArray: false } ml && ml.Items.Count > 0)
                {
                    var list = new List<int[]>();
                    foreach (var item in ml.Items)
                    {
                        if (item is not TomlList { IsTableArray: false } inner || inner.Items.Count == 0)
                        {
                            throw Err(item.Line, $"found {item.Describe()} in majorana; expected lists of Majorana indices such as [[0, 1], [2, 3]]");
                        }
                        if (_lenient && inner.Items.Any(x => ReadNumber(x, "Majorana index") > m - 1))
                        {
                            _notes.Add($"line {item.Line}: a Majorana product reaches beyond the {m} Majoranas of this member; it was dropped at this size");
                            continue;
                        }
                        var idx = inner.Items.Select(x => (int)ReadWhole(x, "Majorana index", 0, m - 1)).ToArray();
                        if (idx.Distinct().Count() != idx.Length) throw Err(item.Line, $"found a Majorana index twice in [{string.Join(", ", idx)}]; expected distinct indices (chi^2 = 1)");
                        if ((idx.Length & 1) != 0) throw Err(item.Line, $"found {idx.Length} Majoranas in [{string.Join(", ", idx)}]; expected an even number");
                        list.Add(idx);
                    }
                    Count(list.Count, t.Line);
                    monomials = list;
                }
                else
                {
                    throw Err(majLine, $"found {majNode!.Describe()} for majorana; expected an even whole number q or a list of index lists such as [[0, 1, 2, 3]]");
                }
                foreach (var idx in monomials)
                {
                    if (spec.PerPlacement) throw Err(valueLine, $"found the placement variables ({string.Join(", ", PlacementVariables)}) in {valueKey} of a Majorana term; expected them only with on = or sites = placements");
                    double value = ValueAt(spec, rng, null, valueLine, valueKey);
                    var (s, sign) = JordanWigner.HermitianMonomial(n, idx);
                    result.Add((s, sign * value, majLine));
                    anyNonzero |= value != 0;
                }
            }
            if (spec.IsRandom && anyNonzero)
            {
                _disordered = true;
                _seeds.Add(seed);
            }
            return result;
        }

        private void Count(long more, int line)
        {
            if (more > MaxTerms || _count + more > MaxTerms)
            {
                throw Err(line, $"found a model of more than {MaxTerms:N0} terms; expected at most {MaxTerms:N0} (lower the number of sites)");
            }
            _count += (int)more;
        }

        private static long Binomial(int n, int k)
        {
            double r = 1;
            for (int i = 1; i <= k; i++) r = r * (n - k + i) / i;
            return r > long.MaxValue / 2 ? long.MaxValue / 2 : (long)Math.Round(r);
        }

        private static IEnumerable<int[]> Combinations(int n, int k)
        {
            var c = new int[k];
            for (int i = 0; i < k; i++) c[i] = i;
            while (true)
            {
                yield return (int[])c.Clone();
                int j = k - 1;
                while (j >= 0 && c[j] == n - k + j) j--;
                if (j < 0) yield break;
                c[j]++;
                for (int i = j + 1; i < k; i++) c[i] = c[i - 1] + 1;
            }
        }

        private List<string> ReadWords(TomlNode node)
        {
            var raw = new List<(string Word, int Line)>();
            if (node is TomlScalar { Value: string s }) raw.Add((s, node.Line));
            else if (node is TomlList { IsTableArray: false } list && list.Items.Count > 0)
            {
                foreach (var item in list.Items)
                {
                    if (item is not TomlScalar { Value: string w }) throw Err(item.Line, $"found {item.Describe()} in pauli; expected strings of letters I, X, Y, Z such as \"XX\"");
                    raw.Add((w, item.Line));
                }
            }
            else throw Err(node.Line, $"found {node.Describe()} for pauli; expected a string such as \"ZZ\" or an array such as [\"XX\", \"YY\"]");
            var words = new List<string>();
            foreach (var (w, line) in raw)
            {
                if (w.Length == 0) throw Err(line, "found an empty pauli string; expected letters I, X, Y, Z, one per site");
                foreach (char c in w)
                {
                    if (c is not ('I' or 'X' or 'Y' or 'Z'))
                    {
                        throw Err(line, $"found the letter '{c}' in pauli \"{TomlScalar.Shorten(w)}\"; expected only the capital letters I, X, Y, Z (one per site)");
                    }
                }
                if (words.Contains(w)) throw Err(line, $"found pauli \"{w}\" twice in one term; expected each word once");
                words.Add(w);
            }
            return words;
        }

        private List<int[]> ReadPlacements(TomlTableNode t, string where, int wordLength, out string placementName)
        {
            var onNode = t.Get("on");
            var sitesNode = t.Get("sites");
            var distNode = t.Get("distance");
            int n = _lattice.N;
            if (onNode is not null && sitesNode is not null)
            {
                throw Err(t.KeyLine("sites"), $"found both 'on' and 'sites' in {where}; expected on = \"{string.Join("\" | \"", Placements)}\" or an explicit sites = [...] list, not both");
            }
            if (onNode is null && sitesNode is null)
            {
                throw Err(t.Line, $"found {where} with no 'on' or 'sites'; expected on = \"{string.Join("\" | \"", Placements)}\" or sites = [[0, 1], ...]");
            }
            if (sitesNode is not null)
            {
                if (distNode is not null) throw Err(t.KeyLine("distance"), "found 'distance' with an explicit sites list; expected distance only with on = \"pairs\"");
                placementName = "an explicit site list";
                if (sitesNode is not TomlList { IsTableArray: false } list || list.Items.Count == 0)
                {
                    throw Err(sitesNode.Line, $"found {sitesNode.Describe()} for sites; expected a non-empty array such as [0, 3] (single sites) or [[0, 1], [2, 3]] (groups)");
                }
                var result = new List<int[]>();
                var seen = new Dictionary<string, int>(StringComparer.Ordinal);
                foreach (var item in list.Items)
                {
                    int[] group;
                    if (_lenient && OutOfRange(item, n))
                    {
                        _notes.Add($"line {item.Line}: a site group reaches beyond the {n} sites of this member; it was dropped at this size");
                        continue;
                    }
                    if (item is TomlList { IsTableArray: false } inner && inner.Items.Count > 0)
                    {
                        group = inner.Items.Select(x => ReadSite(x, n, "site")).ToArray();
                        var dup = group.GroupBy(x => x).FirstOrDefault(g => g.Count() > 1);
                        if (dup is not null) throw Err(item.Line, $"found site {dup.Key} twice in [{string.Join(", ", group)}]; expected distinct sites in a group");
                    }
                    else if (item is TomlScalar)
                    {
                        group = [ReadSite(item, n, "site")];
                    }
                    else throw Err(item.Line, $"found {item.Describe()} in sites; expected a site number, a quoted expression such as \"N-1\", or a group such as [0, 1]");
                    string key = string.Join(",", group);
                    if (seen.TryGetValue(key, out int fl)) throw Err(item.Line, $"found the site group [{key}] twice (first at line {fl}); expected each placement once");
                    seen[key] = item.Line;
                    result.Add(group);
                }
                if (result.Count == 0) return Empty(sitesNode.Line, "found no site group within this member's sites");
                return result;
            }

            string on = ReadString(onNode!, "on", $"one of \"{string.Join("\", \"", Placements)}\"");
            int onLine = onNode!.Line;
            if (Array.IndexOf(Placements, on) < 0)
            {
                throw Err(onLine, $"found on = \"{TomlScalar.Shorten(on)}\"{ClosestOf(on, Placements)}; expected one of \"{string.Join("\", \"", Placements)}\" (or an explicit sites = [...] list)");
            }
            if (distNode is not null && on != "pairs") throw Err(t.KeyLine("distance"), $"found 'distance' with on = \"{on}\"; expected distance only with on = \"pairs\"");
            placementName = on;
            switch (on)
            {
                case "sites":
                    return Enumerable.Range(0, n).Select(i => new[] { i }).ToList();
                case "bonds":
                    if (_lattice.Edges.Count == 0) throw Err(onLine, $"found on = \"bonds\" on a lattice with no bonds ({_lattice}); expected a lattice of at least two sites");
                    return _lattice.Edges.Select(e => new[] { e.A, e.B }).ToList();
                case "legs" or "rungs" or "horizontal" or "vertical":
                {
                    string needs = on is "legs" or "rungs" ? "ladder" : "square";
                    if (_lattice.Kind != needs) throw Err(onLine, $"found on = \"{on}\" on a {_lattice.Kind} lattice; expected on = \"{on}\" only on a {needs} lattice (legs and rungs of a ladder, horizontal and vertical bonds of a square lattice)");
                    var list = _lattice.BondsOfKind(on).Select(e => new[] { e.A, e.B }).ToList();
                    if (list.Count == 0) return Empty(onLine, $"found no {on} bonds on {_lattice}");
                    return list;
                }
                case "segments":
                {
                    if (!_lattice.IsOneDimensional || _lattice.Kind == "ladder") throw Err(onLine, $"found on = \"segments\" on a {_lattice.Kind} lattice; expected segments (runs of consecutive sites) only on a chain or ring");
                    int k = wordLength;
                    var list = new List<int[]>();
                    int starts = _lattice.Periodic ? (k <= n ? n : 0) : n - k + 1;
                    for (int a = 0; a < starts; a++) list.Add(Enumerable.Range(0, k).Select(o => (a + o) % n).ToArray());
                    if (list.Count == 0) return Empty(onLine, $"found no runs of {k} consecutive sites on {_lattice}");
                    return list;
                }
                case "plaquettes":
                    if (_lattice.Plaquettes.Count == 0) throw Err(onLine, $"found on = \"plaquettes\" on a {_lattice.Kind} lattice ({_lattice}); expected a square lattice or ladder with at least 2x2 sites");
                    return _lattice.Plaquettes.Select(p => (int[])p.Clone()).ToList();
                default:
                {
                    int? d = null;
                    if (distNode is not null) d = (int)ReadWhole(distNode, "distance", 1, _lenient ? int.MaxValue : n);
                    long pairs = (long)n * (n - 1) / 2;
                    if (pairs > MaxTerms) throw Err(onLine, $"found on = \"pairs\" on {n} sites ({pairs:N0} pairs); expected at most {MaxTerms:N0} terms (lower the number of sites)");
                    var result = new List<int[]>();
                    for (int i = 0; i < n; i++)
                    {
                        for (int j = i + 1; j < n; j++)
                        {
                            if (d is null || _lattice.Distance(i, j) == d) result.Add([i, j]);
                        }
                    }
                    if (result.Count == 0) return Empty(distNode?.Line ?? onLine, $"found no pairs{(d is null ? "" : $" at distance {d}")} on {_lattice}");
                    return result;
                }
            }
        }

        /// <summary>True when a site entry (a number, expression or group) names a site outside 0..n-1.</summary>
        private bool OutOfRange(TomlNode item, int n)
        {
            IEnumerable<TomlNode> entries = item is TomlList { IsTableArray: false } l ? l.Items : [item];
            foreach (var e in entries)
            {
                double v;
                try
                {
                    v = ReadNumber(e, "site");
                }
                catch (InputException)
                {
                    return false; // let the strict reader report it
                }
                if (Math.Round(v) < 0 || Math.Round(v) > n - 1) return true;
            }
            return false;
        }

        /// <summary>
        /// A placement that places nothing: an error in a model as written; while a smaller member of the
        /// family is built (lenient loading), the term is dropped with a note.
        /// </summary>
        private List<int[]> Empty(int line, string found)
        {
            if (!_lenient) throw Err(line, $"{found}; expected at least one");
            _notes.Add($"line {line}: {found}; the term was dropped at this size");
            return [];
        }

        // ---------------------------------------------------------------- probes and symmetries

        private List<PauliString> ReadProbes()
        {
            var node = _root.Get("probes");
            int n = _lattice.N;
            if (node is null)
            {
                return _majorana
                    ? [JordanWigner.Majorana(n, 0).String]
                    : [PauliString.Single(n, _lattice.Center, 'Z')];
            }
            var items = new List<(string Text, int Line)>();
            if (node is TomlScalar { Value: string one })
                throw Err(node.Line, $"found the string \"{TomlScalar.Shorten(one)}\" for probes; expected an array of strings such as probes = [\"{TomlScalar.Shorten(one)}\"]");
            if (node is TomlList { IsTableArray: false } list && list.Items.Count > 0)
            {
                foreach (var item in list.Items)
                {
                    if (item is not TomlScalar { Value: string s }) throw Err(item.Line, $"found {item.Describe()} in probes; expected strings such as \"Z_0\", \"X_{{N/2}}\" or \"chi_0\"");
                    items.Add((s, item.Line));
                }
            }
            else throw Err(node.Line, $"found {node.Describe()} for probes; expected a non-empty array of strings such as [\"Z_0\", \"X_{{N/2}}\"]");
            var probes = new List<PauliString>();
            foreach (var (text, line) in items)
            {
                var p = ParseProbe(text, line);
                if (probes.Contains(p)) throw Err(line, $"found the probe {p} twice; expected each probe once");
                probes.Add(p);
            }
            return probes;
        }

        private PauliString ParseProbe(string text, int line)
        {
            int n = _lattice.N;
            const string Expected = "factors such as Z_3, X_{N/2} or chi_5 (a Majorana), separated by spaces, or a dense string of N letters";
            var tokens = new List<string>();
            int i = 0;
            while (i < text.Length)
            {
                if (char.IsWhiteSpace(text[i]) || text[i] == '*')
                {
                    i++;
                    continue;
                }
                int start = i;
                while (i < text.Length && !char.IsWhiteSpace(text[i]) && text[i] != '*')
                {
                    if (text[i] == '{')
                    {
                        int close = text.IndexOf('}', i);
                        if (close < 0) throw Err(line, $"found an unclosed '{{' in the probe \"{TomlScalar.Shorten(text)}\"; expected {Expected}");
                        i = close;
                    }
                    i++;
                }
                tokens.Add(text[start..i]);
            }
            if (tokens.Count == 0) throw Err(line, $"found an empty probe; expected {Expected}");
            if (tokens.Count == 1 && tokens[0].Length == n && n > 1 && tokens[0].All(c => c is 'I' or 'X' or 'Y' or 'Z'))
            {
                var b = new PauliString.Builder(n);
                for (int k = 0; k < n; k++) b.Set(k, tokens[0][k]);
                var dense = b.Build();
                if (dense.IsIdentity) throw Err(line, "found a probe equal to the identity; expected at least one X, Y or Z");
                return dense;
            }
            var acc = PauliString.Identity(n);
            var used = new HashSet<int>();
            foreach (string tok in tokens)
            {
                string head;
                string rest;
                if (tok.StartsWith("chi", StringComparison.Ordinal))
                {
                    head = "chi";
                    rest = tok[3..];
                }
                else if (tok.Length > 0 && tok[0] is 'X' or 'Y' or 'Z')
                {
                    head = tok[..1];
                    rest = tok[1..];
                }
                else throw Err(line, $"found '{tok}' in the probe \"{TomlScalar.Shorten(text)}\"; expected {Expected}");
                if (rest.StartsWith('_')) rest = rest[1..];
                double v;
                if (rest.StartsWith('{') && rest.EndsWith('}')) v = EvalText(rest[1..^1], line, $"probe index in '{tok}'");
                else if (rest.Length > 0 && rest.All(char.IsAsciiDigit) && double.TryParse(rest, NumberStyles.None, CultureInfo.InvariantCulture, out double d)) v = d;
                else throw Err(line, $"found '{tok}' in the probe \"{TomlScalar.Shorten(text)}\"; expected {Expected}");
                int limit = head == "chi" ? 2 * n : n;
                if (Math.Abs(v - Math.Round(v)) > 1e-9 || v < 0 || v >= limit)
                {
                    throw Err(line, $"found the {(head == "chi" ? "Majorana index" : "site")} {Fmt(v)} in probe '{tok}'; expected a whole number from 0 to {limit - 1}");
                }
                int idx = (int)Math.Round(v);
                PauliString factor;
                if (head == "chi")
                {
                    factor = JordanWigner.Majorana(n, idx).String;
                }
                else
                {
                    if (!used.Add(idx)) throw Err(line, $"found site {idx} twice in the probe \"{TomlScalar.Shorten(text)}\"; expected each site at most once");
                    factor = PauliString.Single(n, idx, head[0]);
                }
                acc = PauliString.Multiply(acc, factor, out _);
            }
            if (acc.IsIdentity) throw Err(line, $"found the probe \"{TomlScalar.Shorten(text)}\" equal to the identity; expected a non-trivial operator");
            return acc;
        }

        private List<string> ReadSymmetries(Hamiltonian h, FloquetDrive? drive)
        {
            var node = _root.Get("symmetries");
            var result = new List<string>();
            if (node is null) return result;
            if (node is not TomlList { IsTableArray: false } list) throw Err(node.Line, $"found {node.Describe()} for symmetries; expected an array such as [\"total-z\", \"reflection\"]");
            foreach (var item in list.Items)
            {
                if (item is not TomlScalar { Value: string s }) throw Err(item.Line, $"found {item.Describe()} in symmetries; expected names from: {string.Join(", ", KnownSymmetries)}");
                if (!KnownSymmetries.Contains(s)) throw Err(item.Line, $"found the symmetry \"{TomlScalar.Shorten(s)}\"{ClosestOf(s, KnownSymmetries)}; expected names from: {string.Join(", ", KnownSymmetries)}");
                if (result.Contains(s)) throw Err(item.Line, $"found the symmetry \"{s}\" twice; expected each once");
                string? broken = drive is null
                    ? SymmetryCheck.Check(s, h.Terms, _lattice)
                    : drive.Layers.Select(l => SymmetryCheck.Check(s, l.Select(r => new PauliTerm(r.Generator, r.Angle)).ToArray(), _lattice)).FirstOrDefault(x => x is not null);
                if (broken is not null) throw Err(item.Line, $"found the symmetry \"{s}\" declared, but {broken}; expected only symmetries the model has");
                result.Add(s);
            }
            return result;
        }
    }
}
