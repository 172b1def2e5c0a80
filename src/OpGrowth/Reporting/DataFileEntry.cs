namespace OpGrowth.Reporting;

/// <summary>A data file that belongs to the report: path relative to the report folder, and what it holds.</summary>
public sealed record DataFileEntry(string Path, string Description);
