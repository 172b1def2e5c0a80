using System.Reflection;
using OpGrowth.IO;

namespace OpGrowth.Reporting;

/// <summary>
/// Writes a <see cref="ReportDocument"/> into a folder: <c>report.html</c> (self-contained: inline CSS, figures
/// embedded, no scripts, nothing fetched), <c>report.md</c> (figures as relative PNG links to files written
/// alongside), <c>report.json</c> and the figure files. Every file is written atomically.
/// </summary>
public static class ReportWriter
{
    /// <summary>The product version (informational version of this assembly).</summary>
    public static string ToolVersion { get; } =
        typeof(ReportWriter).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion.Split('+')[0]
        ?? typeof(ReportWriter).Assembly.GetName().Version?.ToString() ?? "unknown";

    public const string HtmlFileName = "report.html";
    public const string MarkdownFileName = "report.md";
    public const string JsonFileName = "report.json";

    /// <summary>Writes the report files into <paramref name="folder"/> (created if needed).</summary>
    public static ReportFiles Write(ReportDocument document, string folder, ReportWriterOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(document);
        ArgumentException.ThrowIfNullOrWhiteSpace(folder);
        options ??= new ReportWriterOptions();
        CheckFigureNames(document);
        string root = Path.GetFullPath(folder);
        Directory.CreateDirectory(root);

        var figureFiles = new List<string>();
        if (options.WriteMarkdown || options.WriteSvgFiles)
        {
            string figDir = Path.Combine(root, options.FigureFolder);
            foreach (FigureImage f in document.Figures)
            {
                string png = Path.Combine(figDir, f.PngFileName);
                AtomicFile.WriteAllBytes(png, f.Png);
                figureFiles.Add(png);
                if (options.WriteSvgFiles)
                {
                    string svg = Path.Combine(figDir, f.SvgFileName);
                    AtomicFile.WriteAllText(svg, f.Svg);
                    figureFiles.Add(svg);
                }
            }
        }
        string? html = null, md = null, json = null;
        if (options.WriteHtml)
        {
            html = Path.Combine(root, HtmlFileName);
            AtomicFile.WriteAllText(html, HtmlReport.Render(document, options.HtmlFigures));
        }
        if (options.WriteMarkdown)
        {
            md = Path.Combine(root, MarkdownFileName);
            AtomicFile.WriteAllText(md, MarkdownReport.Render(document, options.FigureFolder, options.WriteSvgFiles));
        }
        if (options.WriteJson)
        {
            json = Path.Combine(root, JsonFileName);
            AtomicFile.WriteJson(json, ReportJson.From(document, options.FigureFolder, options.WriteSvgFiles));
        }
        return new ReportFiles(root, html, md, json, figureFiles);
    }

    /// <summary>The HTML text of the report (figures embedded).</summary>
    public static string RenderHtml(ReportDocument document, HtmlFigureMode figures = HtmlFigureMode.Png)
        => HtmlReport.Render(document, figures);

    /// <summary>The Markdown text of the report, linking figures as <c>figureFolder/name.png</c>.</summary>
    public static string RenderMarkdown(ReportDocument document, string figureFolder = "figures")
        => MarkdownReport.Render(document, figureFolder, linkSvg: true);

    private static void CheckFigureNames(ReportDocument document)
    {
        var seen = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        foreach (FigureImage f in document.Figures)
        {
            FigureImage.CheckName(f.Name);
            if (!seen.Add(f.Name))
                throw new ArgumentException($"Two figures are named '{f.Name}'; expected unique names (they become file names).", nameof(document));
        }
    }
}
