using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;

namespace OpGrowth.Sweeps;

/// <summary>
/// The identity of a sweep point: the first <see cref="IdLength"/> hex digits of the SHA-256 of its
/// canonical JSON description. The description holds the model file's content hash (not its path),
/// N, the parameter overrides, the seed and the parameter it goes into, the probe, every engine option
/// and the result schema version, with object keys sorted and numbers in shortest round-trip form. The
/// same inputs always give the same id; any change of an input gives a new one, so a rerun skips finished
/// points and never reuses a result computed with different options.
/// </summary>
public static class PointIdentity
{
    /// <summary>Version of the point-result schema; bump when results computed before are no longer valid.</summary>
    public const string SchemaVersion = "opgrowth.sweep-point/1";

    /// <summary>Hex digits kept (64 bits: collisions are negligible for any sweep).</summary>
    public const int IdLength = 16;

    /// <summary>The canonical JSON (compact, sorted keys) the id hashes.</summary>
    public static string CanonicalJson(string modelSha256, int n, IEnumerable<KeyValuePair<string, double>> parameters,
        long? seed, string seedParameter, string probe, EngineSettings engine)
    {
        using var ms = new MemoryStream();
        using (var w = new Utf8JsonWriter(ms, new JsonWriterOptions { Indented = false }))
        {
            w.WriteStartObject();
            w.WriteStartObject("engine");
            foreach (var kv in engine.Canonical(n)) w.WriteString(kv.Key, kv.Value);
            w.WriteEndObject();
            w.WriteString("model_sha256", modelSha256);
            w.WriteNumber("n", n);
            w.WriteStartObject("parameters");
            foreach (var kv in parameters.OrderBy(p => p.Key, StringComparer.Ordinal)) w.WriteString(kv.Key, EngineSettings.F(kv.Value));
            w.WriteEndObject();
            w.WriteString("probe", probe);
            w.WriteString("schema", SchemaVersion);
            if (seed is long s)
            {
                w.WriteString("seed", s.ToString(CultureInfo.InvariantCulture));
                w.WriteString("seed_parameter", seedParameter);
            }
            else
            {
                w.WriteNull("seed");
            }
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(ms.ToArray());
    }

    /// <summary>The id of a description.</summary>
    public static string Compute(string modelSha256, int n, IEnumerable<KeyValuePair<string, double>> parameters,
        long? seed, string seedParameter, string probe, EngineSettings engine)
        => Sha256Hex(Encoding.UTF8.GetBytes(CanonicalJson(modelSha256, n, parameters, seed, seedParameter, probe, engine)))[..IdLength];

    /// <summary>Recomputes a point's id from its fields (to check a stored point).</summary>
    public static string Compute(SweepPoint p)
        => Compute(p.ModelSha256, p.N, p.Parameters, p.Seed, p.SeedParameter, p.Probe, p.Engine);

    /// <summary>Lower-case hex SHA-256.</summary>
    public static string Sha256Hex(ReadOnlySpan<byte> bytes) => Convert.ToHexStringLower(SHA256.HashData(bytes));

    /// <summary>Lower-case hex SHA-256 of a file's bytes.</summary>
    public static string FileSha256(string path)
    {
        using var fs = File.OpenRead(path);
        return Convert.ToHexStringLower(SHA256.HashData(fs));
    }

    /// <summary>Everything but N and the seed: points with the same key form one t*(N) series.</summary>
    internal static string GroupKey(SweepPoint p)
    {
        var sb = new StringBuilder();
        sb.Append(p.ModelLabel).Append('|').Append(p.ModelSha256[..8]);
        foreach (var kv in p.Parameters) sb.Append('|').Append(kv.Key).Append('=').Append(EngineSettings.F(kv.Value));
        sb.Append('|').Append(p.ProbeTemplate);
        string engine = string.Join(';', p.Engine.CanonicalAll().Select(kv => kv.Key + "=" + kv.Value));
        sb.Append('|').Append(Sha256Hex(Encoding.UTF8.GetBytes(engine))[..8]);
        return sb.ToString();
    }
}
