namespace OpGrowth.Reporting;

/// <summary>
/// A further table of a report (for example the diagnosis battery's verdicts or a t*(N) scaling table):
/// a heading, an optional sentence above it, column headers, rows of text cells, and an optional note below.
/// Printed after the verdict table, in the order added.
/// </summary>
/// <param name="Id">Anchor of the section (letters, digits and dashes).</param>
/// <param name="Title">Section heading.</param>
/// <param name="Headers">Column headers.</param>
/// <param name="Rows">Rows; each has as many cells as there are headers.</param>
public sealed record ReportTable(string Id, string Title, IReadOnlyList<string> Headers, IReadOnlyList<IReadOnlyList<string>> Rows)
{
    /// <summary>Text printed above the table.</summary>
    public string? Intro { get; init; }

    /// <summary>Text printed below the table.</summary>
    public string? Footer { get; init; }

    /// <summary>Index of a column whose cells are printed in bold (the verdict column), or -1.</summary>
    public int EmphasisColumn { get; init; } = -1;
}
