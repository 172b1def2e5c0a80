using System.Globalization;
using System.Text;

namespace OpGrowth.Reporting;

/// <summary>
/// The Markdown form of a report (CommonMark with pipe tables): readable as plain text, figures linked as
/// relative PNG files that the writer stores in the figure folder.
/// </summary>
internal static class MarkdownReport
{
    internal static string Render(ReportDocument doc, string figureFolder, bool linkSvg)
    {
        var sb = new StringBuilder(1 << 14);
        sb.Append("# ").Append(Text(doc.Title)).Append("\n\n");
        if (!string.IsNullOrWhiteSpace(doc.Subtitle)) sb.Append(Text(doc.Subtitle)).Append("\n\n");
        sb.Append('*').Append(Text(HtmlReport.MetaLine(doc))).Append("*\n\n");
        if (!string.IsNullOrWhiteSpace(doc.VerdictSummary)) sb.Append("> ").Append(Text(doc.VerdictSummary)).Append("\n\n");

        if (doc.Model.Count > 0)
        {
            sb.Append("## Model\n\n| Property | Value |\n|---|---|\n");
            foreach (KeyValuePair<string, string> kv in doc.Model) Row(sb, kv.Key, kv.Value);
            sb.Append('\n');
        }
        if (doc.Headlines.Count > 0)
        {
            sb.Append("## Headline figures\n\n| Quantity | Value | Definition and window | Converged |\n|---|---|---|---|\n");
            foreach (HeadlineFigure h in doc.Headlines)
            {
                string context = h.Value.FormatContext() + (string.IsNullOrWhiteSpace(h.Note) ? "" : " (" + h.Note + ")");
                Row(sb, h.Name, h.Value.FormatValue(), context, h.Converged ? "yes" : "**NO: not converged**", rawIndex: 3);
            }
            sb.Append('\n');
        }
        if (doc.Verdicts.Count > 0)
        {
            sb.Append("## Verdict\n\n| Test | Figure | Threshold | Verdict | Reason |\n|---|---|---|---|---|\n");
            foreach (VerdictRow v in doc.Verdicts)
                Row(sb, v.Test, v.Figure.FormatValue() + " (" + v.Figure.FormatContext() + ")", v.Threshold, "**" + Cell(v.Verdict) + "**", v.Reason, rawIndex: 3);
            sb.Append('\n');
        }
        foreach (ReportTable t in doc.Tables)
        {
            sb.Append("## ").Append(Text(t.Title)).Append("\n\n");
            if (!string.IsNullOrWhiteSpace(t.Intro)) sb.Append(Text(t.Intro)).Append("\n\n");
            sb.Append('|');
            foreach (string h in t.Headers) sb.Append(' ').Append(Cell(h)).Append(" |");
            sb.Append("\n|").Append(string.Concat(Enumerable.Repeat("---|", t.Headers.Count))).Append('\n');
            foreach (IReadOnlyList<string> row in t.Rows)
                Row(sb, row.Select((c, i) => i == t.EmphasisColumn ? "**" + Cell(c) + "**" : c).ToArray(), t.EmphasisColumn);
            sb.Append('\n');
            if (!string.IsNullOrWhiteSpace(t.Footer)) sb.Append(Text(t.Footer)).Append("\n\n");
        }
        if (doc.Checks.Count > 0)
        {
            int passed = doc.Checks.Count(c => c.Passed);
            sb.Append("## Checks\n\n").Append(passed.ToString(CultureInfo.InvariantCulture)).Append(" of ")
              .Append(doc.Checks.Count.ToString(CultureInfo.InvariantCulture)).Append(" checks passed.\n\n")
              .Append("| Check | Figure | Tolerance | Result |\n|---|---|---|---|\n");
            foreach (CheckRow c in doc.Checks)
                Row(sb, c.Name, c.Figure.FormatValue() + " (" + c.Figure.FormatContext() + ")", c.Tolerance, c.Passed ? "pass" : "**FAIL**", rawIndex: 3);
            sb.Append('\n');
        }
        if (doc.Cautions.Count > 0)
        {
            sb.Append("## Cautions\n\n");
            foreach (string c in doc.Cautions) sb.Append("- ").Append(Text(c)).Append('\n');
            sb.Append('\n');
        }
        if (doc.Figures.Count > 0)
        {
            sb.Append("## Figures\n\n");
            string folder = figureFolder.Replace('\\', '/').TrimEnd('/');
            for (int i = 0; i < doc.Figures.Count; i++)
            {
                FigureImage f = doc.Figures[i];
                string png = (folder.Length == 0 ? "" : folder + "/") + f.PngFileName;
                string svg = (folder.Length == 0 ? "" : folder + "/") + f.SvgFileName;
                sb.Append("### Figure ").Append((i + 1).ToString(CultureInfo.InvariantCulture)).Append(". ").Append(Text(f.Title)).Append("\n\n")
                  .Append("![").Append(Text(f.Title)).Append("](").Append(png).Append(")\n\n")
                  .Append(Text(f.Caption));
                if (linkSvg) sb.Append(" ([SVG](").Append(svg).Append("))");
                sb.Append("\n\n");
            }
        }
        if (doc.DataFiles.Count > 0)
        {
            sb.Append("## Data files\n\n| File | Contents |\n|---|---|\n");
            foreach (DataFileEntry d in doc.DataFiles) sb.Append("| `").Append(d.Path.Replace("`", "'", StringComparison.Ordinal).Replace("|", "\\|", StringComparison.Ordinal)).Append("` | ").Append(Cell(d.Description)).Append(" |\n");
            sb.Append('\n');
        }
        return sb.ToString();
    }

    private static void Row(StringBuilder sb, params string[] cells) => Row(sb, cells, -1);

    private static void Row(StringBuilder sb, string a, string b, string c, string d, int rawIndex) => Row(sb, [a, b, c, d], rawIndex);

    private static void Row(StringBuilder sb, string a, string b, string c, string d, string e, int rawIndex) => Row(sb, [a, b, c, d, e], rawIndex);

    /// <summary>A table row; the cell at <paramref name="rawIndex"/> is already Markdown (bold markers).</summary>
    private static void Row(StringBuilder sb, string[] cells, int rawIndex)
    {
        sb.Append('|');
        for (int i = 0; i < cells.Length; i++) sb.Append(' ').Append(i == rawIndex ? cells[i] : Cell(cells[i])).Append(" |");
        sb.Append('\n');
    }

    private static string Cell(string text) => Text(text).Replace("|", "\\|", StringComparison.Ordinal);

    /// <summary>
    /// Escapes characters that Markdown would read as markup, keeping plain text readable: underscores between
    /// letters or digits (b_n, v_B) cannot start emphasis and are left alone. Line breaks become spaces.
    /// </summary>
    internal static string Text(string? text)
    {
        if (string.IsNullOrEmpty(text)) return "";
        var sb = new StringBuilder(text.Length + 8);
        for (int i = 0; i < text.Length; i++)
        {
            char c = text[i];
            switch (c)
            {
                case '\r': break;
                case '\n': sb.Append(' '); break;
                case '\\' or '`' or '*' or '[' or ']' or '<' or '>' or '#':
                    if (c == '#' && !(sb.Length == 0)) { sb.Append(c); break; }
                    sb.Append('\\').Append(c);
                    break;
                case '_':
                    bool inWord = i > 0 && i < text.Length - 1 && char.IsLetterOrDigit(text[i - 1]) && char.IsLetterOrDigit(text[i + 1]);
                    if (!inWord) sb.Append('\\');
                    sb.Append(c);
                    break;
                default: sb.Append(c); break;
            }
        }
        return sb.ToString();
    }
}
