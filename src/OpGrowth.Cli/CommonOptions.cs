using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using OpGrowth.Evolution;
using OpGrowth.IO;

namespace OpGrowth.Cli;

/// <summary>
/// The options every command shares, built in one place so that a name means the same thing, takes the
/// same values and has the same default everywhere: MODEL, --set, --probe (the evolved operator),
/// --threads, --memory and --out. Numbers are parsed from the raw token (a bad token is a usage error,
/// never a crash). DiagnoseCommand can adopt these as well.
/// </summary>
internal static class CommonOptions
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Largest --threads: four per core (more threads than cores only cost memory for buffers).</summary>
    public static int MaxThreads => Math.Max(4, 4 * Environment.ProcessorCount);

    /// <summary>The default thread count: every core this process may use.</summary>
    public static int DefaultThreads => Environment.ProcessorCount;

    /// <summary>The default memory budget: half of the memory available to this process.</summary>
    public static long DefaultMemory => MemoryBudget.DefaultBytes();

    /// <summary>The MODEL argument (a file or a shipped model name).</summary>
    public static Argument<string> Model() => new("MODEL") { Description = "Model file (.toml) or the name of a shipped model (see 'opgrowth models')." };

    /// <summary>--set NAME=VALUE (repeatable).</summary>
    public static Option<string[]> Set() => new("--set")
    {
        Description = "Override a model parameter: NAME=VALUE (a number or an expression over other parameters). Repeat for several.",
        Arity = ArgumentArity.ZeroOrMore,
        AllowMultipleArgumentsPerToken = false,
    };

    /// <summary>--probe: the operator that is evolved (a Pauli string or the index of one of the model's probes).</summary>
    public static Option<string?> Probe() => new("--probe")
    {
        Description = "Operator to evolve: a Pauli string such as \"Z_0\" or \"X_3 X_4\", or the index of one of the model's probes [default: 0, the model's first probe].",
        CustomParser = r => NonEmpty(r, "--probe", "a Pauli string such as Z_0 or a probe index such as 1"),
    };

    /// <summary>--threads: worker threads, 1..<see cref="MaxThreads"/>; null means every core.</summary>
    public static Option<int?> Threads() => new("--threads")
    {
        Description = $"Worker threads (results do not depend on it) [default: {DefaultThreads}, every core].",
        CustomParser = ParseThreads,
    };

    /// <summary>--memory: what the command may use in total; null means the default (half of the machine).</summary>
    public static Option<long?> Memory() => new("--memory")
    {
        Description = $"Memory the command may use in total, e.g. 8GiB, 512MiB or 2GB; a run that needs more stops with exit code 3 and keeps its results [default: {MemoryBudget.Format(DefaultMemory)}, half of this machine's memory].",
        CustomParser = ParseMemory,
    };

    /// <summary>--out FOLDER (a non-empty path).</summary>
    public static Option<string?> Out(string description) => new("--out")
    {
        Description = description,
        CustomParser = r => NonEmpty(r, "--out", "a folder path"),
    };

    /// <summary>Hard limit of the managed heap relative to an explicit --memory (room for fragmentation).</summary>
    public const double HeapSlack = 1.1;

    /// <summary>
    /// Makes an explicit --memory hold for the whole process: the managed heap gets a hard limit of that size
    /// (the GC then collects and returns memory before it would grow past it), so the resident set stays within the
    /// cap plus the runtime's own code and native data. The engines plan their arrays inside the same budget; an
    /// allocation beyond it ends the run with exit code 3. Only in the executable itself (tests call
    /// <see cref="Program.Run"/> in a shared process and must not cap it).
    /// </summary>
    public static void ApplyMemoryCap(long? bytes)
    {
        if (bytes is not long b || !CliHost.OwnsProcess) return;
        // 10% above the cap: room for heap fragmentation, so that the engines' own planning (inside the cap) decides
        // when to stop, not an allocation failure; the resident set then stays within 1.1 x cap + the runtime's baseline.
        AppContext.SetData("GCHeapHardLimit", (ulong)(b * HeapSlack));
        GC.RefreshMemoryLimit();
    }

    /// <summary>Applies an explicit --memory cap (<see cref="ApplyMemoryCap"/>), then runs the command body.</summary>
    public static int Capped(long? bytes, Func<int> body)
    {
        ArgumentNullException.ThrowIfNull(body);
        ApplyMemoryCap(bytes);
        return body();
    }

    /// <summary>The thread count to use (the default when the option was not given).</summary>
    public static int ThreadsOrDefault(int? threads) => threads ?? DefaultThreads;

    private static int? ParseThreads(ArgumentResult r)
    {
        string raw = r.Tokens.Count > 0 ? r.Tokens[0].Value : "";
        if (int.TryParse(raw, NumberStyles.None, Inv, out int n) && n >= 1 && n <= MaxThreads) return n;
        r.AddError($"--threads: found '{raw}'; expected a whole number from 1 to {MaxThreads} (this machine has {Environment.ProcessorCount} cores; more threads than cores only add memory)");
        return null;
    }

    private static long? ParseMemory(ArgumentResult r)
    {
        string raw = r.Tokens.Count > 0 ? r.Tokens[0].Value : "";
        if (MemoryBudget.TryParse(raw, out long bytes)) return bytes;
        r.AddError($"--memory: found '{raw}'; expected a size such as 8GiB, 512MiB or 2GB");
        return null;
    }

    private static string? NonEmpty(ArgumentResult r, string option, string expected)
    {
        string raw = r.Tokens.Count > 0 ? r.Tokens[0].Value : "";
        if (raw.Trim().Length > 0) return raw;
        r.AddError($"{option}: found an empty value; expected {expected}");
        return null;
    }

    /// <summary>Resolves a MODEL argument and its --set overrides and loads the model.</summary>
    public static (string Path, IReadOnlyDictionary<string, string> Overrides, Models.Model Model) LoadModel(string modelArg, string[] sets)
    {
        string path = Models.ShippedModels.Resolve(modelArg);
        var overrides = Models.ModelLoader.ParseOverrides(sets, path);
        return (path, overrides, Models.ModelLoader.Load(path, overrides));
    }

    /// <summary>
    /// A final time given on the command line, in the model's own unit: time for a Hamiltonian, drive periods
    /// for a periodic drive. Returns the absolute time; refuses values that are not finite and positive or
    /// that would need more than <paramref name="maxSteps"/> steps.
    /// </summary>
    public static double AbsoluteTime(double value, Models.Model model, double dt, long maxSteps = 100_000_000)
    {
        if (!(value > 0) || !double.IsFinite(value))
            throw new InputException($"--time: found {value.ToString(Inv)}; expected a positive {(model.Drive is null ? "time" : "number of drive periods")}");
        double step = model.Drive?.Period ?? dt;
        double steps = model.Drive is null ? Math.Ceiling(value / dt - 1e-9) : Math.Ceiling(value - 1e-9);
        if (!(steps <= maxSteps))
        {
            throw new InputException(model.Drive is null
                ? $"--time {value.ToString(Inv)} with --dt {dt.ToString(Inv)}: found {steps.ToString("G3", Inv)} steps; expected at most {maxSteps.ToString("N0", Inv)} (use a shorter time or a larger step)"
                : $"--time {value.ToString(Inv)}: found {steps.ToString("G3", Inv)} periods; expected at most {maxSteps.ToString("N0", Inv)}");
        }
        return model.Drive is null ? value : steps * step;
    }
}
