namespace OpGrowth.Reporting;

/// <summary>The machine-readable form of a report (report.json): every number with uncertainty, definition and window.</summary>
internal static class ReportJson
{
    internal sealed record NumberDto(double Value, double Uncertainty, string Unit, string Definition, WindowDto? Window, string Text);

    internal sealed record WindowDto(string Variable, double Start, double End);

    internal sealed record HeadlineDto(string Name, NumberDto Value, bool Converged, string? Note);

    internal sealed record VerdictDto(string Test, NumberDto Figure, string Threshold, string Verdict, string Reason);

    internal sealed record CheckDto(string Name, NumberDto Figure, string Tolerance, bool Passed);

    internal sealed record FigureDto(string Name, string Title, string Caption, string Png, string? Svg, int Width, int Height);

    internal sealed record Dto(
        string Title, string? Subtitle, string ToolVersion, DateTimeOffset? Created,
        IReadOnlyList<KeyValuePair<string, string>> Model, IReadOnlyList<HeadlineDto> Headlines, string? VerdictSummary,
        IReadOnlyList<VerdictDto> Verdicts, IReadOnlyList<CheckDto> Checks, IReadOnlyList<string> Cautions,
        IReadOnlyList<FigureDto> Figures, IReadOnlyList<DataFileEntry> DataFiles, IReadOnlyList<TableDto> Tables);

    internal sealed record TableDto(string Id, string Title, string? Intro, IReadOnlyList<string> Headers, IReadOnlyList<IReadOnlyList<string>> Rows, string? Footer);

    internal static NumberDto Number(Measured m) => new(m.Value, m.Uncertainty, m.Unit, m.Definition,
        m.Window is { } w ? new WindowDto(w.Variable, w.Start, w.End) : null, m.FormatValue());

    internal static Dto From(ReportDocument doc, string figureFolder, bool withSvg)
    {
        string folder = figureFolder.Replace('\\', '/').TrimEnd('/');
        string Rel(string file) => folder.Length == 0 ? file : folder + "/" + file;
        return new Dto(doc.Title, doc.Subtitle, doc.ToolVersion, doc.Created, doc.Model.ToList(),
            doc.Headlines.Select(h => new HeadlineDto(h.Name, Number(h.Value), h.Converged, h.Note)).ToList(),
            doc.VerdictSummary,
            doc.Verdicts.Select(v => new VerdictDto(v.Test, Number(v.Figure), v.Threshold, v.Verdict, v.Reason)).ToList(),
            doc.Checks.Select(c => new CheckDto(c.Name, Number(c.Figure), c.Tolerance, c.Passed)).ToList(),
            doc.Cautions.ToList(),
            doc.Figures.Select(f => new FigureDto(f.Name, f.Title, f.Caption, Rel(f.PngFileName), withSvg ? Rel(f.SvgFileName) : null, f.Width, f.Height)).ToList(),
            doc.DataFiles.ToList(),
            doc.Tables.Select(t => new TableDto(t.Id, t.Title, t.Intro, t.Headers, t.Rows, t.Footer)).ToList());
    }
}
