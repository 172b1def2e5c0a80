using System.Runtime.InteropServices;
using System.Security.Cryptography;
using System.Text.Json;
using OpGrowth.IO;

namespace OpGrowth.Reporting;

/// <summary>Writes and verifies manifest.json: the provenance of a run and the SHA-256 of every file it wrote.</summary>
public static class ManifestWriter
{
    public const string FileName = "manifest.json";

    /// <summary>SHA-256 of a file's bytes as lower-case hex.</summary>
    public static string Sha256OfFile(string path)
    {
        using FileStream fs = File.OpenRead(path);
        return Convert.ToHexStringLower(SHA256.HashData(fs));
    }

    /// <summary>Describes one file (size and hash); <paramref name="relativePath"/> is relative to <paramref name="folder"/>.</summary>
    public static ManifestFile Describe(string folder, string relativePath)
    {
        string rel = relativePath.Replace('\\', '/');
        if (Path.IsPathRooted(rel) || rel.Split('/').Contains(".."))
            throw new ArgumentException($"Manifest paths must stay inside the run folder; found '{relativePath}'.", nameof(relativePath));
        string full = Path.Combine(folder, rel);
        if (!File.Exists(full)) throw new FileNotFoundException($"A file listed for the manifest does not exist: {full}", full);
        return new ManifestFile(rel, new FileInfo(full).Length, Sha256OfFile(full));
    }

    /// <summary>
    /// Hashes the listed files (relative to <paramref name="folder"/>; sorted, duplicates and the manifest itself
    /// dropped), writes <c>folder/manifest.json</c> atomically and returns its path.
    /// </summary>
    public static string Write(string folder, RunManifest manifest, IEnumerable<string> relativePaths)
    {
        ArgumentNullException.ThrowIfNull(manifest);
        string root = Path.GetFullPath(folder);
        List<ManifestFile> files = relativePaths
            .Select(p => p.Replace('\\', '/'))
            .Where(p => !string.Equals(p, FileName, StringComparison.Ordinal))
            .Distinct(StringComparer.Ordinal)
            .Order(StringComparer.Ordinal)
            .Select(p => Describe(root, p))
            .ToList();
        string path = Path.Combine(root, FileName);
        AtomicFile.WriteJson(path, manifest with { Files = files });
        return path;
    }

    /// <summary>Reads a manifest back (options come back as a JSON element).</summary>
    public static RunManifest Read(string manifestPath)
    {
        byte[] bytes = File.ReadAllBytes(manifestPath);
        return JsonSerializer.Deserialize<RunManifest>(bytes, AtomicFile.Json)
               ?? throw new InputException(manifestPath, 1, "found an empty manifest; expected a JSON object");
    }

    /// <summary>
    /// Checks every listed file against its recorded size and SHA-256; returns one line per problem (missing file,
    /// size or hash mismatch), empty when all files verify.
    /// </summary>
    public static IReadOnlyList<string> Verify(string manifestPath)
    {
        RunManifest m = Read(manifestPath);
        string root = Path.GetDirectoryName(Path.GetFullPath(manifestPath))!;
        var problems = new List<string>();
        foreach (ManifestFile f in m.Files)
        {
            string full = Path.Combine(root, f.Path);
            if (!File.Exists(full)) { problems.Add($"{f.Path}: missing"); continue; }
            long size = new FileInfo(full).Length;
            if (size != f.Bytes) { problems.Add($"{f.Path}: size {size} bytes, manifest says {f.Bytes}"); continue; }
            string hash = Sha256OfFile(full);
            if (!string.Equals(hash, f.Sha256, StringComparison.OrdinalIgnoreCase)) problems.Add($"{f.Path}: SHA-256 {hash}, manifest says {f.Sha256}");
        }
        return problems;
    }

    /// <summary>The machine description stored in every manifest.</summary>
    public static IReadOnlyDictionary<string, string> DescribeMachine() => new Dictionary<string, string>
    {
        ["os"] = RuntimeInformation.OSDescription,
        ["architecture"] = RuntimeInformation.ProcessArchitecture.ToString(),
        ["runtime"] = RuntimeInformation.FrameworkDescription,
        ["processors"] = Environment.ProcessorCount.ToString(System.Globalization.CultureInfo.InvariantCulture),
    };
}
