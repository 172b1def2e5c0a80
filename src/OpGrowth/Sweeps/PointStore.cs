using System.Globalization;
using System.Text;
using System.Text.Json;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// The results folder of a sweep: one JSON file per finished point, <c>points/&lt;id&gt;.json</c>, written
/// atomically (temporary file + rename), so a killed sweep loses only the points in flight. Each file
/// is an envelope { schema, checksum, payload } whose checksum is the SHA-256 of the payload's exact
/// text. A file that does not parse, has the wrong schema, a checksum or identity mismatch, or a name
/// that is not its id is corrupt: it is reported, moved to <c>corrupt/</c> and never merged; the sweep
/// then recomputes the point.
/// </summary>
public sealed class PointStore
{
    private readonly ILogger? _logger;

    /// <summary>The shared result settings with readable escaping (quotes inside strings as \").</summary>
    internal static readonly JsonSerializerOptions JsonOptions = new(AtomicFile.Json)
    {
        Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
    };

    public PointStore(string resultsDirectory, ILogger? logger = null)
    {
        Root = Path.GetFullPath(resultsDirectory);
        _logger = logger;
    }

    /// <summary>Results folder.</summary>
    public string Root { get; }

    /// <summary>Folder of point files.</summary>
    public string PointsDirectory => Path.Combine(Root, "points");

    /// <summary>Folder corrupt files are moved to.</summary>
    public string CorruptDirectory => Path.Combine(Root, "corrupt");

    /// <summary>Manifest of the current plan's points.</summary>
    public string ManifestPath => Path.Combine(Root, ManifestFileName);

    /// <summary>File name of the manifest of points (what marks a folder as a sweep's results folder).</summary>
    public const string ManifestFileName = "sweep.json";

    /// <summary>The resolved plan the sweep ran (array tasks read it).</summary>
    public string PlanPath => Path.Combine(Root, "plan.toml");

    /// <summary>Path of a point's file.</summary>
    public string PathOf(string id) => Path.Combine(PointsDirectory, id + ".json");

    /// <summary>
    /// Deletes temporary files that killed writers left in the points folder (never read as results) once
    /// they are older than <paramref name="age"/>, so that writers still running elsewhere are not disturbed.
    /// </summary>
    public int RemoveStaleTemporaryFiles(TimeSpan age)
    {
        if (!Directory.Exists(PointsDirectory)) return 0;
        int removed = 0;
        foreach (string f in Directory.EnumerateFiles(PointsDirectory, ".*.tmp"))
        {
            try
            {
                if (DateTime.UtcNow - File.GetLastWriteTimeUtc(f) > age)
                {
                    File.Delete(f);
                    removed++;
                }
            }
            catch (IOException)
            {
            }
            catch (UnauthorizedAccessException)
            {
            }
        }
        return removed;
    }

    /// <summary>Writes a finished point atomically.</summary>
    public void Save(SweepPoint point, PointResult result) => Save(StoredPoint.From(point, result));

    /// <summary>Writes a payload atomically inside its checksummed envelope.</summary>
    public void Save(StoredPoint stored)
    {
        // Indent the payload as it sits in the envelope; the checksum covers exactly these characters.
        string payload = JsonSerializer.Serialize(stored, JsonOptions).Replace("\n", "\n  ", StringComparison.Ordinal);
        string checksum = PointIdentity.Sha256Hex(Encoding.UTF8.GetBytes(payload));
        var sb = new StringBuilder();
        sb.Append("{\n  \"schema\": \"").Append(PointIdentity.SchemaVersion).Append("\",\n");
        sb.Append("  \"checksum\": \"sha256:").Append(checksum).Append("\",\n");
        sb.Append("  \"payload\": ").Append(payload).Append("\n}\n");
        AtomicFile.WriteAllText(PathOf(stored.Id), sb.ToString());
    }

    /// <summary>
    /// Reads a point file. Returns the payload, or null with <paramref name="problem"/> set when the file
    /// is missing (problem null) or corrupt (problem says why).
    /// </summary>
    public StoredPoint? TryRead(string path, out string? problem)
    {
        problem = null;
        byte[] bytes;
        try
        {
            bytes = File.ReadAllBytes(path);
        }
        catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException)
        {
            return null;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            problem = $"cannot be read ({ex.Message})";
            return null;
        }
        string expectedId = Path.GetFileNameWithoutExtension(path);
        try
        {
            using var doc = JsonDocument.Parse(bytes);
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object) return Fail("is not a JSON object", out problem);
            if (!root.TryGetProperty("schema", out var schema) || schema.ValueKind != JsonValueKind.String || schema.GetString() != PointIdentity.SchemaVersion)
            {
                return Fail($"has schema {(root.TryGetProperty("schema", out var s2) ? s2.GetRawText() : "(none)")}, expected \"{PointIdentity.SchemaVersion}\"", out problem);
            }
            if (!root.TryGetProperty("checksum", out var sum) || sum.ValueKind != JsonValueKind.String) return Fail("has no checksum", out problem);
            if (!root.TryGetProperty("payload", out var payload) || payload.ValueKind != JsonValueKind.Object) return Fail("has no payload", out problem);
            string raw = payload.GetRawText();
            string actual = "sha256:" + PointIdentity.Sha256Hex(Encoding.UTF8.GetBytes(raw));
            if (!string.Equals(actual, sum.GetString(), StringComparison.Ordinal)) return Fail("fails its checksum (content changed after writing)", out problem);
            var stored = payload.Deserialize<StoredPoint>(JsonOptions);
            if (stored is null || stored.Result is null) return Fail("has an empty payload", out problem);
            if (stored.Id != expectedId) return Fail($"holds point {stored.Id}, not {expectedId}", out problem);
            string idOfIdentity = PointIdentity.Sha256Hex(Encoding.UTF8.GetBytes(stored.Identity))[..PointIdentity.IdLength];
            if (idOfIdentity != stored.Id) return Fail("has an identity that does not hash to its id", out problem);
            return stored;
        }
        catch (JsonException ex)
        {
            return Fail($"is not valid JSON (truncated or damaged: {OneLine(ex.Message)})", out problem);
        }
        catch (Exception ex) when (ex is InvalidOperationException or FormatException or ArgumentException or NotSupportedException)
        {
            return Fail($"has an unreadable payload ({OneLine(ex.Message)})", out problem);
        }
    }

    /// <summary>
    /// The stored result of a point, if its file exists and is sound. A corrupt file is reported
    /// (logged and returned in <paramref name="corrupt"/>), moved aside, and null is returned so the
    /// point is recomputed.
    /// </summary>
    public StoredPoint? Load(string id, out CorruptPoint? corrupt)
    {
        corrupt = null;
        string path = PathOf(id);
        var stored = TryRead(path, out string? problem);
        if (stored is null && problem is not null) corrupt = Quarantine(path, problem);
        return stored;
    }

    /// <summary>Reads every point file; corrupt ones are reported and moved aside, never returned.</summary>
    public (List<StoredPoint> Points, List<CorruptPoint> Corrupt) LoadAll()
    {
        var points = new List<StoredPoint>();
        var corrupt = new List<CorruptPoint>();
        if (!Directory.Exists(PointsDirectory)) return (points, corrupt);
        foreach (string path in Directory.EnumerateFiles(PointsDirectory, "*.json").Order(StringComparer.Ordinal))
        {
            var stored = TryRead(path, out string? problem);
            if (stored is not null) points.Add(stored);
            else if (problem is not null) corrupt.Add(Quarantine(path, problem));
        }
        return (points, corrupt);
    }

    /// <summary>Moves a corrupt file to <see cref="CorruptDirectory"/> and logs it.</summary>
    public CorruptPoint Quarantine(string path, string problem)
    {
        string id = Path.GetFileNameWithoutExtension(path);
        Directory.CreateDirectory(CorruptDirectory);
        string stamp = DateTime.UtcNow.ToString("yyyyMMdd'T'HHmmssfff", CultureInfo.InvariantCulture);
        string target = Path.Combine(CorruptDirectory, $"{id}.{stamp}.{Guid.NewGuid().ToString("N")[..6]}.json");
        try
        {
            File.Move(path, target);
        }
        catch (Exception ex) when (ex is FileNotFoundException or IOException or UnauthorizedAccessException)
        {
            // Another process may have moved or rewritten it meanwhile: it is not merged either way.
            target = path;
        }
        _logger?.LogWarning("corrupt point file {Path}: {Problem}; moved to {Target}, the point will be recomputed and is not merged", path, problem, target);
        return new CorruptPoint(id, path, target, problem);
    }

    private static StoredPoint? Fail(string why, out string? problem)
    {
        problem = why;
        return null;
    }

    private static string OneLine(string s)
    {
        int nl = s.IndexOfAny(['\r', '\n']);
        return (nl >= 0 ? s[..nl] : s).Trim();
    }
}
