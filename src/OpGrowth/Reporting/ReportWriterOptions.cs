namespace OpGrowth.Reporting;

/// <summary>Options of <see cref="ReportWriter.Write"/>.</summary>
public sealed record ReportWriterOptions
{
    /// <summary>Sub-folder (relative to the report folder) for figure files.</summary>
    public string FigureFolder { get; init; } = "figures";

    public HtmlFigureMode HtmlFigures { get; init; } = HtmlFigureMode.Png;

    /// <summary>Also write each figure's SVG next to its PNG.</summary>
    public bool WriteSvgFiles { get; init; } = true;

    public bool WriteHtml { get; init; } = true;

    public bool WriteMarkdown { get; init; } = true;

    /// <summary>Write report.json: every number with its uncertainty, definition and window, and the file lists.</summary>
    public bool WriteJson { get; init; } = true;
}
