namespace OpGrowth.Ensembles;

/// <summary>
/// The circuit files shipped with OpGrowth (the repository's circuits/ folder, copied next to the executable), kept
/// apart from models/ because they are not model files. A name such as "demo/device-brickwork" is the path relative
/// to that folder without ".toml".
/// </summary>
public static class ShippedCircuits
{
    private static readonly Lazy<string?> Found = new(Locate);

    /// <summary>The circuits folder, or null when none was found.</summary>
    public static string? Directory => Found.Value;

    /// <summary>The file of a shipped circuit name, or null when there is none (an existing path is returned as is).</summary>
    public static string? TryResolve(string nameOrPath)
    {
        ArgumentNullException.ThrowIfNull(nameOrPath);
        if (File.Exists(nameOrPath)) return nameOrPath;
        if (Directory is not { } dir) return null;
        string key = nameOrPath.Replace('\\', '/');
        if (key.StartsWith("circuits/", StringComparison.Ordinal)) key = key["circuits/".Length..];
        if (!key.EndsWith(".toml", StringComparison.OrdinalIgnoreCase)) key += ".toml";
        string path = Path.Combine(dir, key);
        return File.Exists(path) ? path : null;
    }

    private static string? Locate()
    {
        foreach (string start in new[] { AppContext.BaseDirectory, System.IO.Directory.GetCurrentDirectory() })
        {
            var d = new DirectoryInfo(start);
            while (d is not null)
            {
                string candidate = Path.Combine(d.FullName, "circuits");
                if (System.IO.Directory.Exists(candidate) && System.IO.Directory.EnumerateFiles(candidate, "*.toml", SearchOption.AllDirectories).Any()) return candidate;
                d = d.Parent;
            }
        }
        return null;
    }
}
