using OpGrowth.Models;

namespace OpGrowth.Tests.Models;

/// <summary>Finds the repository's test data (malformed corpus) and shipped models from the test binaries.</summary>
internal static class ModelTestFiles
{
    /// <summary>tests/OpGrowth.Tests/Models/Malformed, found by walking up from the test assembly.</summary>
    public static string MalformedDirectory { get; } = FindUp(Path.Combine("tests", "OpGrowth.Tests", "Models", "Malformed"));

    /// <summary>Every shipped model file.</summary>
    public static IReadOnlyList<string> Shipped => ShippedModels.Files;

    public static IEnumerable<object[]> ShippedNames() => ShippedModels.Files.Select(f => new object[] { ShippedModels.NameOf(f) });

    public static IEnumerable<object[]> MalformedNames()
        => Directory.EnumerateFiles(MalformedDirectory, "*.toml").Select(f => new object[] { Path.GetFileNameWithoutExtension(f) }).OrderBy(x => (string)x[0], StringComparer.Ordinal);

    private static string FindUp(string relative)
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null)
        {
            string candidate = Path.Combine(dir.FullName, relative);
            if (Directory.Exists(candidate)) return candidate;
            dir = dir.Parent;
        }
        throw new DirectoryNotFoundException($"{relative} not found above {AppContext.BaseDirectory}");
    }
}
