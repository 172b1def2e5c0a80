using System.Text.Json;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// The list of points of the plan a results folder was last used with (<c>sweep.json</c>). Collect
/// merges only these points: results of older plans (other ids) stay on disk but are not mixed in.
/// </summary>
public sealed record SweepManifest
{
    /// <summary>Format version.</summary>
    public string Schema { get; init; } = "opgrowth.sweep-manifest/1";

    /// <summary>Plan name.</summary>
    public required string Name { get; init; }

    /// <summary>Plan description.</summary>
    public string Description { get; init; } = "";

    /// <summary>Points in plan order.</summary>
    public required IReadOnlyList<ManifestEntry> Points { get; init; }

    /// <summary>Builds the manifest of expanded points.</summary>
    public static SweepManifest From(SweepPlan plan, IReadOnlyList<SweepPoint> points) => new()
    {
        Name = plan.Name,
        Description = plan.Description,
        Points = points.Select(p => new ManifestEntry(p.Index, p.Id, p.ToString(), p.N, p.Seed, p.GroupKey)).ToArray(),
    };

    /// <summary>Writes it atomically.</summary>
    public void Save(string path) => AtomicFile.WriteJson(path, this);

    /// <summary>Reads a manifest; null when absent. A damaged manifest is an input error naming the file.</summary>
    public static SweepManifest? Load(string path)
    {
        if (!File.Exists(path)) return null;
        try
        {
            return JsonSerializer.Deserialize<SweepManifest>(File.ReadAllBytes(path), AtomicFile.Json)
                ?? throw new InputException(path, 0, "found an empty manifest; expected the sweep.json written by 'opgrowth sweep'");
        }
        catch (JsonException ex)
        {
            throw new InputException(path, 0, $"found a damaged manifest ({ex.Message.Split('\n')[0]}); expected the sweep.json written by 'opgrowth sweep' (rerun the sweep to rewrite it)");
        }
    }
}
