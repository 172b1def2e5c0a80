namespace OpGrowth.Reporting;

/// <summary>One file listed in a manifest: path relative to the manifest's folder (forward slashes), size, SHA-256 (lower-case hex).</summary>
public sealed record ManifestFile(string Path, long Bytes, string Sha256);
