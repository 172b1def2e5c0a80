using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;

namespace OpGrowth.Reporting;

/// <summary>
/// The HTML form of a report: one file, inline CSS, figures embedded (PNG data URI or inline SVG), no scripts and
/// no external references, laid out to read on screen and to print on A4/Letter.
/// </summary>
internal static class HtmlReport
{
    // Our own plain print-friendly sheet: dark text on white, hairline rules, tabular numbers.
    private const string Css = """
        :root { --ink: #1a1a1a; --muted: #5e5e5e; --rule: #d4d4d4; --accent: #1f4e8c; --bad: #8c3510; }
        * { box-sizing: border-box; }
        html { background: #fff; }
        body { color: var(--ink); background: #fff; max-width: 62rem; margin: 2rem auto 4rem; padding: 0 1.25rem;
               font: 15px/1.5 "DejaVu Sans", "Segoe UI", "Helvetica Neue", Arial, sans-serif; }
        header { border-bottom: 2px solid var(--ink); padding-bottom: .6rem; margin-bottom: 1.2rem; }
        h1 { font-size: 1.65rem; margin: 0 0 .2rem; line-height: 1.25; }
        h2 { font-size: 1.15rem; margin: 2.2rem 0 .6rem; padding-bottom: .2rem; border-bottom: 1px solid var(--rule); }
        .subtitle { margin: 0; font-size: 1.05rem; }
        .meta { margin: .3rem 0 0; color: var(--muted); font-size: .85rem; }
        .summary { border-left: 4px solid var(--accent); padding: .4rem .9rem; margin: 1rem 0; background: #f6f8fb; }
        table { border-collapse: collapse; width: 100%; margin: .4rem 0 1rem; font-size: .9rem; }
        th, td { text-align: left; vertical-align: top; padding: .32rem .7rem .32rem 0; border-bottom: 1px solid var(--rule); }
        th { font-weight: 600; border-bottom: 1.5px solid var(--ink); white-space: nowrap; }
        td.num { white-space: nowrap; font-variant-numeric: tabular-nums; }
        table.kv th { width: 14rem; border-bottom: 1px solid var(--rule); font-weight: 600; white-space: normal; }
        .ok { font-weight: 600; }
        .bad { font-weight: 700; color: var(--bad); }
        .note { color: var(--muted); font-size: .85rem; }
        ul.cautions li { margin: .25rem 0; }
        figure { margin: 1.6rem 0; break-inside: avoid; page-break-inside: avoid; }
        figure img, figure svg { display: block; max-width: 100%; height: auto; border: 1px solid #e4e4e4; }
        figure svg text { font-family: "DejaVu Sans", Verdana, Arial, sans-serif; }
        figcaption { color: var(--muted); font-size: .88rem; margin-top: .35rem; }
        figcaption b { color: var(--ink); }
        code { font-family: "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: .88em; }
        footer { margin-top: 3rem; padding-top: .5rem; border-top: 1px solid var(--rule); color: var(--muted); font-size: .8rem; }
        @media print {
          body { max-width: none; margin: 0; padding: 0; font-size: 10.5pt; }
          .summary { background: none; }
          h2 { break-after: avoid; page-break-after: avoid; }
          tr, figure { break-inside: avoid; page-break-inside: avoid; }
        }
        """;

    internal static string Render(ReportDocument doc, HtmlFigureMode mode)
    {
        var sb = new StringBuilder(1 << 16);
        sb.Append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
          .Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
          .Append("<title>").Append(E(doc.Title)).Append("</title>\n<style>\n").Append(Css).Append("\n</style>\n</head>\n<body>\n");

        sb.Append("<header>\n<h1>").Append(E(doc.Title)).Append("</h1>\n");
        if (!string.IsNullOrWhiteSpace(doc.Subtitle)) sb.Append("<p class=\"subtitle\">").Append(E(doc.Subtitle)).Append("</p>\n");
        sb.Append("<p class=\"meta\">").Append(E(MetaLine(doc))).Append("</p>\n</header>\n");

        if (!string.IsNullOrWhiteSpace(doc.VerdictSummary))
            sb.Append("<p class=\"summary\">").Append(E(doc.VerdictSummary)).Append("</p>\n");

        if (doc.Model.Count > 0)
        {
            sb.Append("<section id=\"model\">\n<h2>Model</h2>\n<table class=\"kv\">\n");
            foreach (KeyValuePair<string, string> kv in doc.Model)
                sb.Append("<tr><th scope=\"row\">").Append(E(kv.Key)).Append("</th><td>").Append(E(kv.Value)).Append("</td></tr>\n");
            sb.Append("</table>\n</section>\n");
        }

        if (doc.Headlines.Count > 0)
        {
            sb.Append("<section id=\"headline\">\n<h2>Headline figures</h2>\n<table>\n<thead><tr><th>Quantity</th><th>Value</th><th>Definition and window</th><th>Converged</th></tr></thead>\n<tbody>\n");
            foreach (HeadlineFigure h in doc.Headlines)
            {
                sb.Append("<tr><td>").Append(E(h.Name)).Append("</td><td class=\"num\">").Append(E(h.Value.FormatValue()))
                  .Append("</td><td>").Append(E(h.Value.FormatContext()));
                if (!string.IsNullOrWhiteSpace(h.Note)) sb.Append("<br><span class=\"note\">").Append(E(h.Note)).Append("</span>");
                sb.Append("</td><td>").Append(h.Converged ? "<span class=\"ok\">yes</span>" : "<span class=\"bad\">NO: not converged</span>")
                  .Append("</td></tr>\n");
            }
            sb.Append("</tbody>\n</table>\n</section>\n");
        }

        if (doc.Verdicts.Count > 0)
        {
            sb.Append("<section id=\"verdict\">\n<h2>Verdict</h2>\n<table>\n<thead><tr><th>Test</th><th>Figure</th><th>Threshold</th><th>Verdict</th><th>Reason</th></tr></thead>\n<tbody>\n");
            foreach (VerdictRow v in doc.Verdicts)
            {
                sb.Append("<tr><td>").Append(E(v.Test)).Append("</td><td class=\"num\">").Append(E(v.Figure.FormatValue()))
                  .Append("<br><span class=\"note\">").Append(E(v.Figure.FormatContext())).Append("</span></td><td>")
                  .Append(E(v.Threshold)).Append("</td><td><b>").Append(E(v.Verdict)).Append("</b></td><td>")
                  .Append(E(v.Reason)).Append("</td></tr>\n");
            }
            sb.Append("</tbody>\n</table>\n</section>\n");
        }

        foreach (ReportTable t in doc.Tables)
        {
            sb.Append("<section id=\"").Append(E(t.Id)).Append("\">\n<h2>").Append(E(t.Title)).Append("</h2>\n");
            if (!string.IsNullOrWhiteSpace(t.Intro)) sb.Append("<p>").Append(E(t.Intro)).Append("</p>\n");
            sb.Append("<table>\n<thead><tr>");
            foreach (string h in t.Headers) sb.Append("<th>").Append(E(h)).Append("</th>");
            sb.Append("</tr></thead>\n<tbody>\n");
            foreach (IReadOnlyList<string> row in t.Rows)
            {
                sb.Append("<tr>");
                for (int i = 0; i < row.Count; i++)
                {
                    sb.Append("<td>");
                    if (i == t.EmphasisColumn) sb.Append("<b>").Append(E(row[i])).Append("</b>");
                    else sb.Append(E(row[i]));
                    sb.Append("</td>");
                }
                sb.Append("</tr>\n");
            }
            sb.Append("</tbody>\n</table>\n");
            if (!string.IsNullOrWhiteSpace(t.Footer)) sb.Append("<p class=\"note\">").Append(E(t.Footer)).Append("</p>\n");
            sb.Append("</section>\n");
        }

        if (doc.Checks.Count > 0)
        {
            int passed = doc.Checks.Count(c => c.Passed);
            sb.Append("<section id=\"checks\">\n<h2>Checks</h2>\n<p>")
              .Append(passed.ToString(CultureInfo.InvariantCulture)).Append(" of ").Append(doc.Checks.Count.ToString(CultureInfo.InvariantCulture))
              .Append(" checks passed.</p>\n<table>\n<thead><tr><th>Check</th><th>Figure</th><th>Tolerance</th><th>Result</th></tr></thead>\n<tbody>\n");
            foreach (CheckRow c in doc.Checks)
            {
                sb.Append("<tr><td>").Append(E(c.Name)).Append("</td><td class=\"num\">").Append(E(c.Figure.FormatValue()))
                  .Append("<br><span class=\"note\">").Append(E(c.Figure.FormatContext())).Append("</span></td><td>")
                  .Append(E(c.Tolerance)).Append("</td><td>")
                  .Append(c.Passed ? "<span class=\"ok\">pass</span>" : "<span class=\"bad\">FAIL</span>").Append("</td></tr>\n");
            }
            sb.Append("</tbody>\n</table>\n</section>\n");
        }

        if (doc.Cautions.Count > 0)
        {
            sb.Append("<section id=\"cautions\">\n<h2>Cautions</h2>\n<ul class=\"cautions\">\n");
            foreach (string c in doc.Cautions) sb.Append("<li>").Append(E(c)).Append("</li>\n");
            sb.Append("</ul>\n</section>\n");
        }

        if (doc.Figures.Count > 0)
        {
            sb.Append("<section id=\"figures\">\n<h2>Figures</h2>\n");
            for (int i = 0; i < doc.Figures.Count; i++)
            {
                FigureImage f = doc.Figures[i];
                sb.Append("<figure id=\"fig-").Append(E(f.Name)).Append("\">\n");
                if (mode == HtmlFigureMode.Svg)
                {
                    sb.Append(InlineSvg(f, "f" + (i + 1).ToString(CultureInfo.InvariantCulture) + "-")).Append('\n');
                }
                else
                {
                    sb.Append("<img src=\"data:image/png;base64,").Append(Convert.ToBase64String(f.Png))
                      .Append("\" alt=\"").Append(E(f.Title)).Append("\" width=\"").Append(f.Width.ToString(CultureInfo.InvariantCulture))
                      .Append("\" height=\"").Append(f.Height.ToString(CultureInfo.InvariantCulture)).Append("\">\n");
                }
                sb.Append("<figcaption><b>Figure ").Append((i + 1).ToString(CultureInfo.InvariantCulture)).Append(". ")
                  .Append(E(f.Title)).Append(".</b> ").Append(E(f.Caption)).Append("</figcaption>\n</figure>\n");
            }
            sb.Append("</section>\n");
        }

        if (doc.DataFiles.Count > 0)
        {
            sb.Append("<section id=\"data\">\n<h2>Data files</h2>\n<table>\n<thead><tr><th>File</th><th>Contents</th></tr></thead>\n<tbody>\n");
            foreach (DataFileEntry d in doc.DataFiles)
                sb.Append("<tr><td><code>").Append(E(d.Path)).Append("</code></td><td>").Append(E(d.Description)).Append("</td></tr>\n");
            sb.Append("</tbody>\n</table>\n</section>\n");
        }

        sb.Append("<footer>Written by OpGrowth ").Append(E(doc.ToolVersion))
          .Append(". Figures are also stored as PNG and SVG files next to this report.</footer>\n</body>\n</html>\n");
        return sb.ToString();
    }

    internal static string MetaLine(ReportDocument doc)
    {
        string created = doc.Created is { } c ? ", results of " + c.ToUniversalTime().ToString("yyyy-MM-dd HH:mm 'UTC'", CultureInfo.InvariantCulture) : "";
        return "OpGrowth " + doc.ToolVersion + created;
    }

    /// <summary>
    /// The SVG prepared for inlining: no XML declaration, a viewBox so it scales with the page, an accessible
    /// title, and every id (clip paths) prefixed so that several figures in one page do not share ids.
    /// </summary>
    private static string InlineSvg(FigureImage f, string idPrefix)
    {
        int start = f.Svg.IndexOf("<svg", StringComparison.Ordinal);
        if (start < 0) throw new ArgumentException($"The SVG of figure '{f.Name}' has no <svg> element.");
        string body = f.Svg[start..];
        body = Regex.Replace(body, "(?<=\\s)id=\"([^\"]+)\"", m => "id=\"" + idPrefix + m.Groups[1].Value + "\"");
        body = Regex.Replace(body, "url\\(#([^)]+)\\)", m => "url(#" + idPrefix + m.Groups[1].Value + ")");
        body = Regex.Replace(body, "href=\"#([^\"]+)\"", m => "href=\"#" + idPrefix + m.Groups[1].Value + "\"");
        int close = body.IndexOf('>', StringComparison.Ordinal);
        string open = body[..close];
        if (!open.Contains("viewBox", StringComparison.Ordinal))
            open += string.Create(CultureInfo.InvariantCulture, $" viewBox=\"0 0 {f.Width} {f.Height}\"");
        open += " role=\"img\"";
        return open + "><title>" + E(f.Title) + "</title>" + body[(close + 1)..];
    }

    /// <summary>Escapes the five characters that matter in HTML text and attributes; everything else stays UTF-8.</summary>
    internal static string E(string? text)
    {
        if (string.IsNullOrEmpty(text)) return "";
        if (text.AsSpan().IndexOfAny("&<>\"'") < 0) return text;
        var sb = new StringBuilder(text.Length + 16);
        foreach (char c in text)
        {
            sb.Append(c switch
            {
                '&' => "&amp;",
                '<' => "&lt;",
                '>' => "&gt;",
                '"' => "&quot;",
                '\'' => "&#39;",
                _ => null,
            } ?? c.ToString());
        }
        return sb.ToString();
    }
}
