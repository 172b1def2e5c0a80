using System.Globalization;
using System.Text.RegularExpressions;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// Reads sweep plans (TOML; format in docs/sweeps.md). Strict: an unknown key, a value of the wrong
/// kind or out of range, an empty range, a misspelt engine or method each give one
/// <see cref="InputException"/> line "file:line: found ...; expected ...".
/// </summary>
public static partial class SweepPlanReader
{
    internal static readonly string[] TopKeys = ["name", "description", "model", "parameters", "engine", "synthetic"];
    internal static readonly string[] ModelKeys = ["file", "files", "sizes", "seeds", "seed_parameter", "probes"];
    internal static readonly string[] EngineKeys =
        ["engine", "exact_max_n", "time", "dt", "record_every", "method", "max_strings", "threshold", "budgets", "samples", "sample_seed", "front_fraction", "exact_mode", "size_estimator", "probe_groups"];
    internal static readonly string[] SyntheticKeys = ["law", "a", "b", "noise", "truncation_fraction", "delay", "memory"];
    public static readonly IReadOnlyList<string> Engines = ["auto", "pauli", "exact", "synthetic"];
    internal static readonly string[] Methods = ["trotter2", "trotter4", "rk4"];
    internal static readonly string[] Laws = ["linear", "log"];
    internal static readonly string[] ExactModes = ["tstar", "sites"];
    internal static readonly string[] SizeEstimators = ["auto", "site-blocks", "random-signs"];

    /// <summary>Largest N a sweep accepts (the widest Pauli key).</summary>
    public const int MaxN = 1024;

    /// <summary>Largest number of points a plan may expand to.</summary>
    public const int MaxPoints = 1_000_000;

    /// <summary>Reads a plan file; model paths are taken relative to the plan's folder.</summary>
    public static SweepPlan Load(string path)
    {
        string text;
        try
        {
            text = File.ReadAllText(path);
        }
        catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException)
        {
            throw new InputException(path, 0, "found no such file; expected a sweep plan (TOML)");
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new InputException(path, 0, $"found a file that cannot be read ({ex.Message}); expected a readable sweep plan");
        }
        return Parse(text, path, Path.GetDirectoryName(Path.GetFullPath(path))!);
    }

    /// <summary>Reads plan text; <paramref name="file"/> names it in messages, <paramref name="baseDirectory"/> anchors relative model paths.</summary>
    public static SweepPlan Parse(string text, string file, string baseDirectory)
    {
        var root = PlanToml.Parse(text, file);
        var r = new Reader(file);
        r.CheckKeys(root, TopKeys, "the top level");
        var plan = new SweepPlan { SourceFile = file };
        if (root.Get("name") is { } nv) plan = plan with { Name = r.Name(nv, "name") };
        if (root.Get("description") is { } dv) plan = plan with { Description = r.String(dv, "description") };

        var model = root.Get("model") is { } mv ? r.Table(mv, "[model]") : throw new InputException(file, 0, "found no [model] table; expected [model] with file = \"...\" and sizes = [...]");
        r.CheckKeys(model, ModelKeys, "[model]");
        var files = new List<string>();
        var fileV = model.Get("file");
        var filesV = model.Get("files");
        if (fileV is not null && filesV is not null) throw new InputException(file, filesV.Line, "found both 'file' and 'files'; expected one of them");
        if (fileV is not null) files.Add(r.String(fileV, "file"));
        if (filesV is not null) files.AddRange(r.List(filesV, "files").Select(v => r.String(v, "files")));
        if (files.Count == 0) throw new InputException(file, model.Line, "found no model file in [model]; expected file = \"path.toml\" or files = [...]");
        int fileLine = (fileV ?? filesV)!.Line;
        var resolved = new List<string>();
        foreach (string f in files)
        {
            if (f.Trim().Length == 0) throw new InputException(file, fileLine, "found an empty model path; expected a model file path");
            string full = Path.GetFullPath(Path.IsPathRooted(f) ? f : Path.Combine(baseDirectory, f));
            if (!File.Exists(full))
            {
                // Not a file next to the plan: perhaps the name of a shipped model ("mixed-field-ising", "demo/tilted-chain").
                bool pathLike = f.Contains('/', StringComparison.Ordinal) && f.EndsWith(".toml", StringComparison.OrdinalIgnoreCase);
                string? shipped = null;
                if (!pathLike && Models.ShippedModels.IsAvailable)
                {
                    try
                    {
                        shipped = Path.GetFullPath(Models.ShippedModels.Resolve(f));
                    }
                    catch (InputException)
                    {
                        shipped = null;
                    }
                }
                full = shipped ?? throw new InputException(file, fileLine, $"found model file '{f}', which does not exist (looked at {full}); expected an existing model file, relative to the plan's folder, or the name of a shipped model");
            }
            if (resolved.Contains(full)) throw new InputException(file, fileLine, $"found model file '{f}' twice; expected each model once");
            resolved.Add(full);
        }
        plan = plan with { ModelFiles = resolved };

        var sizesV = model.Get("sizes") ?? throw new InputException(file, model.Line, "found no 'sizes' in [model]; expected sizes = [8, 12, 16] or sizes = { from = 8, to = 32, step = 4 }");
        var sizes = r.IntRange(sizesV, "sizes").Select(v => (int)v).ToList();
        foreach (int n in sizes)
        {
            if (n < 2 || n > MaxN) throw new InputException(file, sizesV.Line, $"found size {n}; expected sizes N in 2..{MaxN}");
        }
        if (sizes.Distinct().Count() != sizes.Count) throw new InputException(file, sizesV.Line, "found a size twice in 'sizes'; expected distinct sizes");
        plan = plan with { Sizes = sizes };

        if (model.Get("seeds") is { } seedsV)
        {
            var seeds = r.IntRange(seedsV, "seeds");
            if (seeds.Distinct().Count() != seeds.Count) throw new InputException(file, seedsV.Line, "found a seed twice in 'seeds'; expected distinct seeds");
            plan = plan with { Seeds = seeds };
        }
        if (model.Get("seed_parameter") is { } spV) plan = plan with { SeedParameter = r.Identifier(spV, "seed_parameter") };
        if (model.Get("probes") is { } probesV)
        {
            var probes = probesV.Value is string ? [r.String(probesV, "probes")] : r.List(probesV, "probes").Select(v => r.String(v, "probes")).ToList();
            if (probes.Count == 0) throw new InputException(file, probesV.Line, "found an empty 'probes' list; expected at least one probe such as \"Z_0\" or \"model\"");
            foreach (string p in probes)
            {
                foreach (int n in sizes)
                {
                    if (!ProbeTemplate.TryResolve(p, n, out _, out string? err)) throw new InputException(file, probesV.Line, err!);
                }
            }
            if (probes.Distinct().Count() != probes.Count) throw new InputException(file, probesV.Line, "found a probe twice; expected distinct probes");
            plan = plan with { Probes = probes };
        }

        var axisLines = new Dictionary<string, int>(StringComparer.Ordinal);
        if (root.Get("parameters") is { } pv)
        {
            var table = r.Table(pv, "[parameters]");
            var axes = new List<ParameterAxis>();
            foreach (var (key, value) in table.Entries)
            {
                if (!IdentifierRegex().IsMatch(key)) throw new InputException(file, value.Line, $"found parameter name '{key}'; expected a name of letters, digits and _ starting with a letter");
                if (key == "N") throw new InputException(file, value.Line, "found N in [parameters]; expected the sizes in [model] sizes = [...]");
                if (key == plan.SeedParameter) throw new InputException(file, value.Line, $"found the seed parameter '{key}' in [parameters]; expected the seeds in [model] seeds = [...]");
                var values = r.DoubleRange(value, key);
                if (values.Distinct().Count() != values.Count) throw new InputException(file, value.Line, $"found a value twice for parameter '{key}'; expected distinct values");
                axes.Add(new ParameterAxis(key, values));
                axisLines[key] = value.Line;
            }
            plan = plan with { Parameters = axes };
        }

        var engine = new EngineSettings();
        if (root.Get("engine") is { } ev)
        {
            var t = r.Table(ev, "[engine]");
            r.CheckKeys(t, EngineKeys, "[engine]");
            foreach (var (key, v) in t.Entries)
            {
                engine = key switch
                {
                    "engine" => engine with { Engine = Enum.Parse<EngineChoice>(r.Choice(v, key, Engines), ignoreCase: true) },
                    "exact_max_n" => engine with { ExactMaxN = (int)r.Int(v, key, 1, 30) },
                    "time" => engine with { Time = r.Double(v, key, 1e-9, 1e6) },
                    "dt" => engine with { Dt = r.Double(v, key, 1e-9, 1e3) },
                    "record_every" => engine with { RecordEvery = (int)r.Int(v, key, 1, 1_000_000) },
                    "method" => engine with { Method = r.Choice(v, key, Methods) },
                    "max_strings" => engine with { MaxStrings = r.Int(v, key, 1, 1L << 40) },
                    "threshold" => engine with { Threshold = r.Double(v, key, 0, 1) },
                    "budgets" => engine with { Budgets = (int)r.Int(v, key, 1, 3) },
                    "samples" => engine with { Samples = (int)r.Int(v, key, 1, 10_000) },
                    "sample_seed" => engine with { SampleSeed = r.Int(v, key, long.MinValue, long.MaxValue) },
                    "front_fraction" => engine with { FrontFraction = r.Double(v, key, 1e-6, 0.999999) },
                    "exact_mode" => engine with { ExactMode = r.Choice(v, key, ExactModes) },
                    "size_estimator" => engine with { SizeEstimator = r.Choice(v, key, SizeEstimators) },
                    "probe_groups" => engine with { ProbeGroups = (int)r.Int(v, key, 0, 1024) },
                    _ => engine,
                };
            }
            if (engine.Dt > engine.Time) throw new InputException(file, t.Line, $"found dt = {EngineSettings.F(engine.Dt)} larger than time = {EngineSettings.F(engine.Time)}; expected dt <= time");
            if (engine.Time / engine.Dt > Evolution.OperatorEvolution.MaxSteps)
                throw new InputException(file, t.Line, $"found time = {EngineSettings.F(engine.Time)} with dt = {EngineSettings.F(engine.Dt)} ({engine.Time / engine.Dt:G3} steps); expected at most {Evolution.OperatorEvolution.MaxSteps:N0} steps per point");
        }
        if (root.Get("synthetic") is { } sv)
        {
            var t = r.Table(sv, "[synthetic]");
            r.CheckKeys(t, SyntheticKeys, "[synthetic]");
            var s = engine.Synthetic;
            foreach (var (key, v) in t.Entries)
            {
                s = key switch
                {
                    "law" => s with { Law = r.Choice(v, key, Laws) },
                    "a" => s with { A = r.Double(v, key, -1e6, 1e6) },
                    "b" => s with { B = r.Double(v, key, -1e6, 1e6) },
                    "noise" => s with { Noise = r.Double(v, key, 0, 10) },
                    "truncation_fraction" => s with { TruncationFraction = r.Double(v, key, 0, 10) },
                    "delay" => s with { Delay = r.Double(v, key, 0, 3600) },
                    "memory" => s with { MemoryBytes = r.Bytes(v, key) },
                    _ => s,
                };
            }
            engine = engine with { Synthetic = s };
        }
        plan = plan with { Engine = engine };
        CheckParameters(plan, file, axisLines, model.Get("seeds")?.Line ?? model.Line);
        long count = (long)plan.ModelFiles.Count * plan.Combinations().Count * plan.Probes.Count * plan.Sizes.Count * Math.Max(1, plan.Seeds.Count);
        if (count > MaxPoints) throw new InputException(file, 0, $"found a plan of {count} points; expected at most {MaxPoints}");
        return plan;
    }

    /// <summary>
    /// Every swept parameter must be a parameter of every model file of the plan, and when seeds are given at
    /// least one model must have the seed parameter (seeds apply only where it is declared): a misspelt name would
    /// otherwise sweep nothing. <paramref name="file"/> and the lines name where the plan says it (null for options
    /// given on the command line).
    /// </summary>
    public static void CheckParameters(SweepPlan plan, string? file, IReadOnlyDictionary<string, int>? axisLines = null, int seedLine = 0)
    {
        ArgumentNullException.ThrowIfNull(plan);
        bool seeded = false;
        foreach (string modelFile in plan.ModelFiles)
        {
            var m = Models.ModelLoader.Load(modelFile);
            foreach (var axis in plan.Parameters)
            {
                if (m.Parameters.ContainsKey(axis.Name)) continue;
                int line = axisLines is not null && axisLines.TryGetValue(axis.Name, out int l) ? l : 0;
                throw new InputException(file, line, $"found parameter '{axis.Name}', which model {m.Name} ({Path.GetFileName(modelFile)}) does not have; expected one of {string.Join(", ", m.Parameters.Keys.Where(k => k != "N"))}");
            }
            seeded |= m.Parameters.ContainsKey(plan.SeedParameter);
        }
        if (plan.Seeds.Count > 0 && plan.ModelFiles.Count > 0 && !seeded)
            throw new InputException(file, seedLine, $"found seeds, but no model of the plan has the parameter '{plan.SeedParameter}'; expected seeds only with a disordered model (or seed_parameter = the name of its seed parameter)");
    }

    /// <summary>Parses a byte size: "8GiB", "512MiB", "2GB", "750MB", or a plain number of bytes.</summary>
    public static bool TryParseBytes(string text, out long bytes)
    {
        bytes = 0;
        string t = text.Trim();
        int i = 0;
        while (i < t.Length && (char.IsAsciiDigit(t[i]) || t[i] == '.')) i++;
        if (!double.TryParse(t[..i], NumberStyles.Float, CultureInfo.InvariantCulture, out double v) || v <= 0 || !double.IsFinite(v)) return false;
        double mult = t[i..].Trim().ToUpperInvariant() switch
        {
            "" or "B" => 1,
            "KB" or "K" => 1e3,
            "KIB" => 1024,
            "MB" or "M" => 1e6,
            "MIB" => 1 << 20,
            "GB" or "G" => 1e9,
            "GIB" => 1 << 30,
            "TB" or "T" => 1e12,
            "TIB" => 1L << 40,
            _ => double.NaN,
        };
        if (double.IsNaN(mult) || v * mult > long.MaxValue / 2) return false;
        bytes = (long)(v * mult);
        return bytes > 0;
    }

    /// <summary>Parses a command-line integer range: "8:32:4" (from:to:step, inclusive), "1:5" (step 1) or "8,12,16".</summary>
    public static IReadOnlyList<long> ParseIntRange(string text, string option)
    {
        string t = text.Trim();
        string expected = $"expected {option} as a list such as 8,12,16 or a range from:to[:step] such as 8:32:4";
        if (t.Contains(':', StringComparison.Ordinal))
        {
            var parts = t.Split(':');
            if (parts.Length is < 2 or > 3 || !parts.All(p => long.TryParse(p.Trim(), NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out _)))
            {
                throw new InputException($"found {option} '{text}'; {expected}");
            }
            long from = long.Parse(parts[0], CultureInfo.InvariantCulture), to = long.Parse(parts[1], CultureInfo.InvariantCulture);
            long step = parts.Length == 3 ? long.Parse(parts[2], CultureInfo.InvariantCulture) : 1;
            if (step <= 0 || to < from || (to - from) / step > MaxPoints) throw new InputException($"found {option} '{text}' (empty or too long); {expected} with from <= to and step >= 1");
            var list = new List<long>();
            for (long v = from; v <= to; v += step) list.Add(v);
            return list;
        }
        var items = t.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
        var result = new List<long>();
        foreach (string s in items)
        {
            if (!long.TryParse(s, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out long v)) throw new InputException($"found {option} '{text}'; {expected}");
            result.Add(v);
        }
        if (result.Count == 0) throw new InputException($"found an empty {option}; {expected}");
        return result;
    }

    /// <summary>Parses a command-line grid "name=v1,v2,..." or "name=from:to:step".</summary>
    public static ParameterAxis ParseGrid(string text)
    {
        int eq = text.IndexOf('=', StringComparison.Ordinal);
        string name = eq > 0 ? text[..eq].Trim() : "";
        string expected = "expected --grid NAME=v1,v2,... or NAME=from:to:step, as in --grid h=0.3,0.5,0.7";
        if (eq <= 0 || !IdentifierRegex().IsMatch(name)) throw new InputException($"found --grid '{text}'; {expected}");
        string rest = text[(eq + 1)..].Trim();
        var values = new List<double>();
        if (rest.Contains(':', StringComparison.Ordinal))
        {
            var parts = rest.Split(':');
            if (parts.Length != 3 || !parts.All(p => double.TryParse(p, NumberStyles.Float, CultureInfo.InvariantCulture, out double x) && double.IsFinite(x)))
            {
                throw new InputException($"found --grid '{text}'; {expected}");
            }
            double from = double.Parse(parts[0], CultureInfo.InvariantCulture), to = double.Parse(parts[1], CultureInfo.InvariantCulture), step = double.Parse(parts[2], CultureInfo.InvariantCulture);
            values.AddRange(Steps(from, to, step) ?? throw new InputException($"found --grid '{text}' (empty or too long); {expected}"));
        }
        else
        {
            foreach (string s in rest.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries))
            {
                if (!double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out double v) || !double.IsFinite(v)) throw new InputException($"found --grid '{text}'; {expected}");
                values.Add(v);
            }
        }
        if (values.Count == 0 || values.Distinct().Count() != values.Count) throw new InputException($"found --grid '{text}' (empty or repeated values); {expected}");
        return new ParameterAxis(name, values);
    }

    /// <summary>from, from+step, ... up to to (inclusive within rounding); null when empty or huge.</summary>
    internal static List<double>? Steps(double from, double to, double step)
    {
        if (!(step > 0) || to < from) return null;
        double count = Math.Floor((to - from) / step + 1e-9);
        if (count > MaxPoints) return null;
        var list = new List<double>();
        for (int k = 0; k <= (int)count; k++) list.Add(Math.Round(from + k * step, 12));
        return list;
    }

    [GeneratedRegex("^[A-Za-z_][A-Za-z0-9_]*$")]
    internal static partial Regex IdentifierRegex();

    [GeneratedRegex("^[A-Za-z0-9][A-Za-z0-9._-]*$")]
    private static partial Regex NameRegex();

    /// <summary>Typed access with one-line errors.</summary>
    private sealed class Reader(string file)
    {
        public void CheckKeys(PlanTable t, string[] allowed, string where)
        {
            foreach (var (key, value) in t.Entries)
            {
                if (!allowed.Contains(key))
                {
                    throw new InputException(file, value.Line, $"found unknown key '{key}' in {where}{Closest(key, allowed)}; expected one of {string.Join(", ", allowed)}");
                }
            }
        }

        public PlanTable Table(PlanValue v, string what)
            => v.Value as PlanTable ?? throw new InputException(file, v.Line, $"found {v.Describe()} for {what}; expected a table");

        public List<PlanValue> List(PlanValue v, string key)
            => v.Value as List<PlanValue> ?? throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected an array");

        public string String(PlanValue v, string key)
            => v.Value as string ?? throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected a string in quotes");

        public string Name(PlanValue v, string key)
        {
            string s = String(v, key);
            if (!NameRegex().IsMatch(s)) throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected a name of letters, digits, '.', '_' and '-'");
            return s;
        }

        public string Identifier(PlanValue v, string key)
        {
            string s = String(v, key);
            if (!IdentifierRegex().IsMatch(s)) throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected a parameter name");
            return s;
        }

        public string Choice(PlanValue v, string key, IReadOnlyList<string> options)
        {
            string s = String(v, key);
            if (!options.Contains(s)) throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'{Closest(s, options)}; expected one of {string.Join(", ", options.Select(o => $"\"{o}\""))}");
            return s;
        }

        public long Int(PlanValue v, string key, long min, long max)
        {
            if (v.Value is not long l) throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected an integer");
            if (l < min || l > max) throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected an integer in {min}..{max}");
            return l;
        }

        public double Double(PlanValue v, string key, double min, double max)
        {
            double d = v.Value switch
            {
                double x => x,
                long l => l,
                _ => throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected a number"),
            };
            if (!double.IsFinite(d) || d < min || d > max)
            {
                throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected a finite number in {EngineSettings.F(min)}..{EngineSettings.F(max)}");
            }
            return d;
        }

        public long Bytes(PlanValue v, string key)
        {
            if (v.Value is long l && l > 0) return l;
            if (v.Value is string s && TryParseBytes(s, out long b)) return b;
            throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; expected a size such as \"512MiB\", \"2GiB\" or a positive number of bytes");
        }

        /// <summary>An integer list [a, b, ...] or a range { from, to, step } / { from, count }.</summary>
        public List<long> IntRange(PlanValue v, string key)
        {
            string expected = $"expected {key} = [a, b, ...] or {key} = {{ from = a, to = b, step = s }} or {{ from = a, count = k }}";
            if (v.Value is List<PlanValue> list)
            {
                if (list.Count == 0) throw new InputException(file, v.Line, $"found an empty array for '{key}'; {expected}");
                return list.Select(x => x.Value is long l ? l : throw new InputException(file, x.Line, $"found {x.Describe()} in '{key}'; expected integers")).ToList();
            }
            if (v.Value is long single) return [single];
            if (v.Value is PlanTable t)
            {
                CheckKeys(t, ["from", "to", "step", "count"], $"'{key}'");
                long from = t.Get("from") is { } f ? Int(f, "from", long.MinValue / 4, long.MaxValue / 4) : throw new InputException(file, v.Line, $"found no 'from' in '{key}'; {expected}");
                long step = t.Get("step") is { } s ? Int(s, "step", 1, long.MaxValue / 4) : 1;
                var toV = t.Get("to");
                var countV = t.Get("count");
                if ((toV is null) == (countV is null)) throw new InputException(file, v.Line, $"found {(toV is null ? "neither" : "both")} 'to' and 'count' in '{key}'; {expected}");
                long count = countV is not null ? Int(countV, "count", 1, MaxPoints) : 0;
                if (toV is not null)
                {
                    long to = Int(toV, "to", long.MinValue / 4, long.MaxValue / 4);
                    if (to < from) throw new InputException(file, toV.Line, $"found to = {to} below from = {from} in '{key}'; expected from <= to");
                    if ((to - from) / step >= MaxPoints) throw new InputException(file, toV.Line, $"found a range of more than {MaxPoints} values in '{key}'; expected a shorter range");
                    count = (to - from) / step + 1;
                }
                var r = new List<long>();
                for (long k = 0; k < count; k++) r.Add(from + k * step);
                return r;
            }
            throw new InputException(file, v.Line, $"found {v.Describe()} for '{key}'; {expected}");
        }

        /// <summary>A number, a list of numbers, or { from, to, step } (inclusive).</summary>
        public List<double> DoubleRange(PlanValue v, string key)
        {
            string expected = $"expected {key} = 0.5, {key} = [0.3, 0.5] or {key} = {{ from = 0.1, to = 0.9, step = 0.2 }}";
            switch (v.Value)
            {
                case double or long: return [Double(v, key, double.MinValue, double.MaxValue)];
                case List<PlanValue> list:
                    if (list.Count == 0) throw new InputException(file, v.Line, $"found an empty array for parameter '{key}'; {expected}");
                    return list.Select(x => Double(x, key, double.MinValue, double.MaxValue)).ToList();
                case PlanTable t:
                {
                    CheckKeys(t, ["from", "to", "step"], $"parameter '{key}'");
                    double from = t.Get("from") is { } f ? Double(f, "from", double.MinValue, double.MaxValue) : throw new InputException(file, v.Line, $"found no 'from' for parameter '{key}'; {expected}");
                    double to = t.Get("to") is { } tt ? Double(tt, "to", double.MinValue, double.MaxValue) : throw new InputException(file, v.Line, $"found no 'to' for parameter '{key}'; {expected}");
                    double step = t.Get("step") is { } s ? Double(s, "step", double.Epsilon, double.MaxValue) : throw new InputException(file, v.Line, $"found no 'step' for parameter '{key}'; {expected}");
                    return Steps(from, to, step) ?? throw new InputException(file, v.Line, $"found an empty or huge range for parameter '{key}'; {expected} with from <= to");
                }
                default: throw new InputException(file, v.Line, $"found {v.Describe()} for parameter '{key}'; {expected}");
            }
        }

        private static string Closest(string found, IEnumerable<string> options)
        {
            string? best = null;
            int bestD = int.MaxValue;
            foreach (var o in options)
            {
                int d = Edit(found.ToLowerInvariant(), o);
                if (d < bestD)
                {
                    bestD = d;
                    best = o;
                }
            }
            return best is not null && bestD <= Math.Max(1, found.Length / 3) ? $" (did you mean '{best}'?)" : "";
        }

        private static int Edit(string a, string b)
        {
            var d = new int[a.Length + 1, b.Length + 1];
            for (int i = 0; i <= a.Length; i++) d[i, 0] = i;
            for (int j = 0; j <= b.Length; j++) d[0, j] = j;
            for (int i = 1; i <= a.Length; i++)
            {
                for (int j = 1; j <= b.Length; j++)
                {
                    d[i, j] = Math.Min(Math.Min(d[i - 1, j] + 1, d[i, j - 1] + 1), d[i - 1, j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1));
                }
            }
            return d[a.Length, b.Length];
        }
    }
}
