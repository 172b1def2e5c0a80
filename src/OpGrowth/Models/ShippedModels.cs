using OpGrowth.IO;

namespace OpGrowth.Models;

/// <summary>
/// The model files shipped with OpGrowth (the repository's models/ folder, copied next to the
/// executable at build time) and lookup of a model by name.
/// </summary>
public static class ShippedModels
{
    /// <summary>Environment variable that, when set, names the models folder to use.</summary>
    public const string EnvironmentVariable = "OPGROWTH_MODELS";

    private static readonly Lazy<string?> Found = new(Locate);

    /// <summary>
    /// The models folder: $OPGROWTH_MODELS if set; else models/ beside the executable; else the first
    /// models/ folder holding .toml files found walking up from the executable's folder, then from the
    /// current directory. Throws an InputException when none exists.
    /// </summary>
    public static string Directory => Found.Value ?? throw new InputException(
        $"found no models folder (looked in ${EnvironmentVariable}, beside the executable and in parent folders); expected a models/ folder with .toml files");

    /// <summary>True when a models folder was found.</summary>
    public static bool IsAvailable => Found.Value is not null;

    /// <summary>Every shipped model file (full paths), sorted by path relative to <see cref="Directory"/>.</summary>
    public static IReadOnlyList<string> Files
    {
        get
        {
            string dir = Directory;
            return System.IO.Directory.EnumerateFiles(dir, "*.toml", SearchOption.AllDirectories)
                .OrderBy(f => Path.GetRelativePath(dir, f).Replace('\\', '/'), StringComparer.Ordinal)
                .ToArray();
        }
    }

    /// <summary>Shipped-model name of a file: its path relative to the models folder without ".toml", e.g. "mixed-field-ising" or "demo/tilted-chain".</summary>
    public static string NameOf(string file)
    {
        string rel = Path.GetRelativePath(Directory, file).Replace('\\', '/');
        return rel.EndsWith(".toml", StringComparison.OrdinalIgnoreCase) ? rel[..^5] : rel;
    }

    /// <summary>
    /// Resolves a MODEL argument: an existing file path is returned as is; otherwise a shipped model
    /// by relative name ("demo/tilted-chain"), by file name without folder ("tilted-chain") when unique,
    /// or by the name written in the file. Throws an InputException listing the choices otherwise.
    /// </summary>
    public static string Resolve(string nameOrPath)
    {
        ArgumentNullException.ThrowIfNull(nameOrPath);
        if (File.Exists(nameOrPath)) return nameOrPath;
        if (System.IO.Directory.Exists(nameOrPath)) throw new InputException(nameOrPath, 0, "found a folder; expected a model file (.toml) or the name of a shipped model");
        bool looksLikePath = nameOrPath.Contains(Path.DirectorySeparatorChar, StringComparison.Ordinal) && nameOrPath.EndsWith(".toml", StringComparison.OrdinalIgnoreCase);
        if (!IsAvailable || looksLikePath)
        {
            throw new InputException(nameOrPath, 0, "found no such file; expected a model file path or the name of a shipped model (see 'opgrowth models')");
        }
        string key = nameOrPath.Replace('\\', '/');
        if (key.EndsWith(".toml", StringComparison.OrdinalIgnoreCase)) key = key[..^5];
        var files = Files;
        var byRel = files.Where(f => NameOf(f) == key).ToArray();
        if (byRel.Length == 1) return byRel[0];
        var byStem = files.Where(f => Path.GetFileNameWithoutExtension(f) == key).ToArray();
        if (byStem.Length == 1) return byStem[0];
        if (byStem.Length > 1)
        {
            throw new InputException(nameOrPath, 0, $"found {byStem.Length} shipped models called '{key}'; expected one of: {string.Join(", ", byStem.Select(NameOf))}");
        }
        foreach (var f in files)
        {
            if (DeclaredName(f) == key) return f;
        }
        var names = files.Select(NameOf).ToArray();
        throw new InputException(nameOrPath, 0, $"found neither a file nor a shipped model of that name{ModelLoader.ClosestOf(key, names)}; expected a path or one of: {string.Join(", ", names)}");
    }

    /// <summary>The name = "..." written in a file, read cheaply (null if absent).</summary>
    private static string? DeclaredName(string file)
    {
        try
        {
            foreach (var raw in File.ReadLines(file))
            {
                string line = raw.Trim();
                if (line.StartsWith('[')) break;
                if (!line.StartsWith("name", StringComparison.Ordinal)) continue;
                int eq = line.IndexOf('=', StringComparison.Ordinal);
                if (eq < 0 || line[..eq].Trim() != "name") continue;
                return line[(eq + 1)..].Trim().Trim('"');
            }
        }
        catch (IOException)
        {
        }
        return null;
    }

    private static string? Locate()
    {
        string? env = Environment.GetEnvironmentVariable(EnvironmentVariable);
        if (!string.IsNullOrEmpty(env) && System.IO.Directory.Exists(env)) return Path.GetFullPath(env);
        foreach (string start in new[] { AppContext.BaseDirectory, System.IO.Directory.GetCurrentDirectory() })
        {
            var dir = new DirectoryInfo(start);
            while (dir is not null)
            {
                string candidate = Path.Combine(dir.FullName, "models");
                if (HasModels(candidate)) return candidate;
                dir = dir.Parent;
            }
        }
        return null;
    }

    private static bool HasModels(string dir)
    {
        try
        {
            return System.IO.Directory.Exists(dir) && System.IO.Directory.EnumerateFiles(dir, "*.toml", SearchOption.AllDirectories).Any();
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return false;
        }
    }
}
