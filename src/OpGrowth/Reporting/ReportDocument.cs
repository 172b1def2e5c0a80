namespace OpGrowth.Reporting;

/// <summary>
/// Everything a report states, in the order it is printed: title, model summary, headline figures, verdict,
/// checks, cautions, figures and data files. Build it, then hand it to <see cref="ReportWriter"/>.
/// </summary>
public sealed class ReportDocument
{
    public ReportDocument(string title)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(title);
        Title = title;
    }

    public string Title { get; }

    /// <summary>One line under the title (e.g. the model name and the question asked).</summary>
    public string? Subtitle { get; set; }

    /// <summary>Model summary, printed as a two-column table in this order.</summary>
    public IList<KeyValuePair<string, string>> Model { get; } = new List<KeyValuePair<string, string>>();

    public IList<HeadlineFigure> Headlines { get; } = new List<HeadlineFigure>();

    /// <summary>The answer in a few sentences, printed above the verdict table.</summary>
    public string? VerdictSummary { get; set; }

    public IList<VerdictRow> Verdicts { get; } = new List<VerdictRow>();

    /// <summary>Further tables, printed after the verdict table in this order.</summary>
    public IList<ReportTable> Tables { get; } = new List<ReportTable>();

    public IList<CheckRow> Checks { get; } = new List<CheckRow>();

    public IList<string> Cautions { get; } = new List<string>();

    public IList<FigureImage> Figures { get; } = new List<FigureImage>();

    public IList<DataFileEntry> DataFiles { get; } = new List<DataFileEntry>();

    public string ToolVersion { get; set; } = ReportWriter.ToolVersion;

    /// <summary>When the results were produced; printed in the header (UTC).</summary>
    public DateTimeOffset? Created { get; set; }

    /// <summary>Adds a model summary line.</summary>
    public ReportDocument AddModel(string key, string value)
    {
        Model.Add(new KeyValuePair<string, string>(key, value));
        return this;
    }
}
