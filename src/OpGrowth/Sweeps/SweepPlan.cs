using System.Globalization;
using System.Text;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// What a sweep runs: model files, sizes N, parameter grids, disorder seeds, probe operators and the
/// engine options. Read from a plan file (<see cref="SweepPlanReader"/>) or assembled from command-line
/// ranges; <see cref="Expand"/> turns it into points in a fixed order (model, parameter combination,
/// probe, N, seed), which is also the Slurm array order.
/// </summary>
public sealed record SweepPlan
{
    /// <summary>Plan file it was read from, if any (for messages).</summary>
    public string? SourceFile { get; init; }

    /// <summary>Short name (used for job names and output labels).</summary>
    public string Name { get; init; } = "sweep";

    /// <summary>One line on what the sweep asks.</summary>
    public string Description { get; init; } = "";

    /// <summary>Model files (absolute paths).</summary>
    public IReadOnlyList<string> ModelFiles { get; init; } = [];

    /// <summary>Sizes N, in the order given.</summary>
    public IReadOnlyList<int> Sizes { get; init; } = [];

    /// <summary>Disorder seeds; empty for clean models (one point per size).</summary>
    public IReadOnlyList<long> Seeds { get; init; } = [];

    /// <summary>The model parameter that receives the seed.</summary>
    public string SeedParameter { get; init; } = "seed";

    /// <summary>Probe templates (<see cref="ProbeTemplate"/>); default the model's first probe.</summary>
    public IReadOnlyList<string> Probes { get; init; } = ["model:0"];

    /// <summary>Parameter grids; the sweep runs their Cartesian product.</summary>
    public IReadOnlyList<ParameterAxis> Parameters { get; init; } = [];

    /// <summary>Engine options.</summary>
    public EngineSettings Engine { get; init; } = new();

    /// <summary>Number of points the plan expands to at most (seeds counted for every model).</summary>
    public int PointCount => ModelFiles.Count * Combinations().Count * Probes.Count * Sizes.Count * Math.Max(1, Seeds.Count);

    /// <summary>
    /// Expands the plan into points. Reads each model file once to hash its content; a missing file or a
    /// probe that does not resolve at some N is an <see cref="InputException"/>.
    /// </summary>
    public IReadOnlyList<SweepPoint> Expand()
    {
        if (ModelFiles.Count == 0) throw new InputException(SourceFile, 0, "found no model file; expected [model] file = \"path.toml\" or --model FILE");
        if (Sizes.Count == 0) throw new InputException(SourceFile, 0, "found no sizes; expected [model] sizes = [8, 12, 16] or --sizes 8:16:4");
        var points = new List<SweepPoint>(PointCount);
        var combos = Combinations();
        var seeds = Seeds.Count == 0 ? [(long?)null] : Seeds.Select(s => (long?)s).ToArray();
        foreach (string file in ModelFiles)
        {
            string sha;
            try
            {
                sha = PointIdentity.FileSha256(file);
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                throw new InputException(SourceFile, 0, $"found model file '{file}' unreadable ({ex.Message}); expected an existing model file");
            }
            string label = Path.GetFileNameWithoutExtension(file);
            // Seeds go to models that have the seed parameter; a clean model in the same plan gets one point per size.
            var modelSeeds = Seeds.Count == 0 || UsesSeed(file) ? seeds : [(long?)null];
            foreach (var combo in combos)
            {
                foreach (string probe in Probes)
                {
                    foreach (int n in Sizes)
                    {
                        if (!ProbeTemplate.TryResolve(probe, n, out string resolved, out string? error))
                        {
                            throw new InputException(SourceFile, 0, error!);
                        }
                        foreach (long? seed in modelSeeds)
                        {
                            string id = PointIdentity.Compute(sha, n, combo, seed, SeedParameter, resolved, Engine);
                            points.Add(new SweepPoint
                            {
                                Index = points.Count,
                                Id = id,
                                ModelFile = file,
                                ModelLabel = label,
                                ModelSha256 = sha,
                                N = n,
                                Parameters = combo,
                                Seed = seed,
                                SeedParameter = SeedParameter,
                                Probe = resolved,
                                ProbeTemplate = probe,
                                Engine = Engine,
                            });
                        }
                    }
                }
            }
        }
        var dup = points.GroupBy(p => p.Id).FirstOrDefault(g => g.Count() > 1);
        if (dup is not null)
        {
            throw new InputException(SourceFile, 0, $"found the same point twice ({dup.First()}); expected distinct sizes, seeds, probes and parameter values");
        }
        return points;
    }

    /// <summary>
    /// True when the model file declares <see cref="SeedParameter"/> (read with its default values). The
    /// synthetic engine never reads models, so there every model takes the seeds.
    /// </summary>
    private bool UsesSeed(string file)
        => Engine.Engine == EngineChoice.Synthetic || Models.ModelLoader.Load(file).Parameters.ContainsKey(SeedParameter);

    /// <summary>Cartesian product of the parameter grids, each combination sorted by name.</summary>
    public IReadOnlyList<IReadOnlyList<KeyValuePair<string, double>>> Combinations()
    {
        var result = new List<IReadOnlyList<KeyValuePair<string, double>>> { Array.Empty<KeyValuePair<string, double>>() };
        foreach (var axis in Parameters)
        {
            var next = new List<IReadOnlyList<KeyValuePair<string, double>>>();
            foreach (var partial in result)
            {
                foreach (double v in axis.Values)
                {
                    next.Add(partial.Append(new KeyValuePair<string, double>(axis.Name, v))
                        .OrderBy(kv => kv.Key, StringComparer.Ordinal).ToArray());
                }
            }
            result = next;
        }
        return result;
    }

    /// <summary>The plan as a plan file (absolute model paths): what array tasks and the results folder keep.</summary>
    public string ToToml()
    {
        var ci = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        sb.Append("# Sweep plan as resolved by opgrowth (model paths absolute).\n");
        sb.Append("name = ").Append(Quote(Name)).Append('\n');
        sb.Append("description = ").Append(Quote(Description)).Append("\n\n");
        sb.Append("[model]\n");
        sb.Append("files = [").Append(string.Join(", ", ModelFiles.Select(Quote))).Append("]\n");
        sb.Append("sizes = [").Append(string.Join(", ", Sizes.Select(s => s.ToString(ci)))).Append("]\n");
        if (Seeds.Count > 0) sb.Append("seeds = [").Append(string.Join(", ", Seeds.Select(s => s.ToString(ci)))).Append("]\n");
        sb.Append("seed_parameter = ").Append(Quote(SeedParameter)).Append('\n');
        sb.Append("probes = [").Append(string.Join(", ", Probes.Select(Quote))).Append("]\n");
        if (Parameters.Count > 0)
        {
            sb.Append("\n[parameters]\n");
            foreach (var a in Parameters) sb.Append(a.Name).Append(" = [").Append(string.Join(", ", a.Values.Select(Num))).Append("]\n");
        }
        var e = Engine;
        sb.Append("\n[engine]\n");
        sb.Append("engine = ").Append(Quote(EngineSettings.Name(e.Engine))).Append('\n');
        sb.Append("exact_max_n = ").Append(e.ExactMaxN.ToString(ci)).Append('\n');
        sb.Append("time = ").Append(Num(e.Time)).Append('\n');
        sb.Append("dt = ").Append(Num(e.Dt)).Append('\n');
        sb.Append("record_every = ").Append(e.RecordEvery.ToString(ci)).Append('\n');
        sb.Append("method = ").Append(Quote(e.Method)).Append('\n');
        sb.Append("max_strings = ").Append(e.MaxStrings.ToString(ci)).Append('\n');
        sb.Append("threshold = ").Append(Num(e.Threshold)).Append('\n');
        sb.Append("budgets = ").Append(e.Budgets.ToString(ci)).Append('\n');
        sb.Append("samples = ").Append(e.Samples.ToString(ci)).Append('\n');
        sb.Append("sample_seed = ").Append(e.SampleSeed.ToString(ci)).Append('\n');
        sb.Append("front_fraction = ").Append(Num(e.FrontFraction)).Append('\n');
        sb.Append("exact_mode = ").Append(Quote(e.ExactMode)).Append('\n');
        sb.Append("size_estimator = ").Append(Quote(e.SizeEstimator)).Append('\n');
        sb.Append("probe_groups = ").Append(e.ProbeGroups.ToString(ci)).Append('\n');
        var s = e.Synthetic;
        sb.Append("\n[synthetic]\n");
        sb.Append("law = ").Append(Quote(s.Law)).Append('\n');
        sb.Append("a = ").Append(Num(s.A)).Append('\n');
        sb.Append("b = ").Append(Num(s.B)).Append('\n');
        sb.Append("noise = ").Append(Num(s.Noise)).Append('\n');
        sb.Append("truncation_fraction = ").Append(Num(s.TruncationFraction)).Append('\n');
        sb.Append("delay = ").Append(Num(s.Delay)).Append('\n');
        sb.Append("memory = ").Append(s.MemoryBytes.ToString(ci)).Append('\n');
        return sb.ToString();
    }

    private static string Num(double v)
    {
        string s = v.ToString("R", CultureInfo.InvariantCulture);
        return s.Contains('.', StringComparison.Ordinal) || s.Contains('E', StringComparison.Ordinal) ? s.Replace("E", "e", StringComparison.Ordinal) : s + ".0";
    }

    private static string Quote(string s)
    {
        var sb = new StringBuilder("\"");
        foreach (char c in s)
        {
            switch (c)
            {
                case '"': sb.Append("\\\""); break;
                case '\\': sb.Append("\\\\"); break;
                case '\n': sb.Append("\\n"); break;
                case '\t': sb.Append("\\t"); break;
                case '\r': sb.Append("\\r"); break;
                default:
                    if (char.IsControl(c)) sb.Append("\\u").Append(((int)c).ToString("X4", CultureInfo.InvariantCulture));
                    else sb.Append(c);
                    break;
            }
        }
        return sb.Append('"').ToString();
    }
}
