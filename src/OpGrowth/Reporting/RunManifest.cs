namespace OpGrowth.Reporting;

/// <summary>
/// The provenance of a run, written as manifest.json beside its results: tool version, model file and its SHA-256,
/// the options (any record or dictionary; serialised as JSON as it is), seeds, thread count, timings, the machine,
/// and every output file with its SHA-256.
/// </summary>
public sealed record RunManifest
{
    public string Tool { get; init; } = "OpGrowth";

    public string ToolVersion { get; init; } = ReportWriter.ToolVersion;

    /// <summary>The command or pipeline that produced the files (e.g. "run").</summary>
    public string? Command { get; init; }

    public string? ModelFile { get; init; }

    /// <summary>SHA-256 of the model file's bytes (see <see cref="ManifestWriter.Sha256OfFile"/>).</summary>
    public string? ModelSha256 { get; init; }

    /// <summary>The options as given to the engines: a record, a dictionary, anything JSON-serialisable.</summary>
    public object? Options { get; init; }

    public IReadOnlyList<long> Seeds { get; init; } = [];

    public int Threads { get; init; }

    /// <summary>Wall-clock seconds per stage, in the order the stages ran.</summary>
    public IReadOnlyDictionary<string, double> TimingsSeconds { get; init; } = new Dictionary<string, double>();

    public DateTimeOffset Created { get; init; } = DateTimeOffset.UtcNow;

    /// <summary>Operating system, .NET version and processor count of the machine that ran it.</summary>
    public IReadOnlyDictionary<string, string> Machine { get; init; } = ManifestWriter.DescribeMachine();

    public IReadOnlyList<ManifestFile> Files { get; init; } = [];
}
