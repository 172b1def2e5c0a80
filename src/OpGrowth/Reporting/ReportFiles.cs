namespace OpGrowth.Reporting;

/// <summary>What <see cref="ReportWriter.Write"/> wrote: full paths, and paths relative to the report folder.</summary>
public sealed record ReportFiles(string Folder, string? Html, string? Markdown, string? Json, IReadOnlyList<string> FigureFiles)
{
    /// <summary>Every written file relative to <see cref="Folder"/> (forward slashes), for the manifest.</summary>
    public IReadOnlyList<string> RelativePaths
    {
        get
        {
            var list = new List<string>();
            foreach (string? p in new[] { Html, Markdown, Json }.Concat(FigureFiles))
                if (p is not null) list.Add(Path.GetRelativePath(Folder, p).Replace('\\', '/'));
            return list;
        }
    }
}
