using System.Text.Json;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using OpGrowth.Reporting;

namespace OpGrowth.Tests.Reporting;

/// <summary>
/// The report files: self-contained HTML (every figure embedded, no http(s) references, no scripts), Markdown whose
/// links all resolve to written files, JSON that carries every number. Structural checks, exact counts.
/// </summary>
public partial class ReportWriterTests : IClassFixture<ReportFixture>
{
    private readonly ReportFixture _fx;

    public ReportWriterTests(ReportFixture fx) => _fx = fx;

    [GeneratedRegex("<img\\b[^>]*>", RegexOptions.IgnoreCase)]
    private static partial Regex ImgTag();

    [GeneratedRegex("\\bsrc=\"([^\"]*)\"", RegexOptions.IgnoreCase)]
    private static partial Regex SrcAttr();

    [GeneratedRegex("\\]\\(([^)]+)\\)")]
    private static partial Regex MarkdownLink();

    [GeneratedRegex("\\sid=\"([^\"]+)\"")]
    private static partial Regex IdAttr();

    [Fact]
    public void Write_PngMode_HtmlEmbedsEveryFigureAndFetchesNothing()
    {
        string dir = Directory.CreateTempSubdirectory("opg-report-").FullName;
        try
        {
            ReportFiles files = ReportWriter.Write(_fx.Document(), dir);
            string html = File.ReadAllText(files.Html!);

            string[] imgs = ImgTag().Matches(html).Select(m => m.Value).ToArray();
            Assert.Equal(_fx.Figures.Count, imgs.Length);
            Assert.All(imgs, img => Assert.StartsWith("data:image/png;base64,", SrcAttr().Match(img).Groups[1].Value, StringComparison.Ordinal));
            Assert.Equal(_fx.Figures.Count, Regex.Count(html, "data:image/png;base64,"));
            // Each embedded PNG is the figure's PNG, byte for byte.
            foreach (FigureImage f in _fx.Figures) Assert.Contains(Convert.ToBase64String(f.Png), html, StringComparison.Ordinal);

            Assert.DoesNotContain("http://", html, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("https://", html, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("<script", html, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("<link", html, StringComparison.OrdinalIgnoreCase);
            Assert.DoesNotContain("@import", html, StringComparison.OrdinalIgnoreCase);

            // User text is escaped, never markup.
            Assert.Contains("ring of 8 &lt;test&gt; sites", html, StringComparison.Ordinal);
            Assert.DoesNotContain("<tagged>", html, StringComparison.Ordinal);
            // Every section is there, and the not-converged and failed rows are marked in words.
            foreach (string id in new[] { "model", "headline", "verdict", "checks", "cautions", "figures", "data" })
                Assert.Contains($"<section id=\"{id}\">", html, StringComparison.Ordinal);
            Assert.Contains("NO: not converged", html, StringComparison.Ordinal);
            Assert.Contains("FAIL", html, StringComparison.Ordinal);
            Assert.Contains("1 of 2 checks passed.", html, StringComparison.Ordinal);
            Assert.Contains("1.49 ± 0.05 sites/time", html, StringComparison.Ordinal);
            Assert.Contains("t in [0.5, 3]", html, StringComparison.Ordinal);
            AssertBalanced(html);
        }
        finally { Directory.Delete(dir, true); }
    }

    [Fact]
    public void RenderHtml_SvgMode_InlinesEverySvgWithUniqueIds()
    {
        string html = ReportWriter.RenderHtml(_fx.Document(), HtmlFigureMode.Svg);
        Assert.Equal(_fx.Figures.Count, Regex.Count(html, "<svg\\b"));
        Assert.DoesNotContain("<?xml", html, StringComparison.Ordinal);
        Assert.DoesNotContain("<img", html, StringComparison.Ordinal);
        string[] ids = IdAttr().Matches(html).Select(m => m.Groups[1].Value).ToArray();
        Assert.Equal(ids.Length, ids.Distinct(StringComparer.Ordinal).Count());
        // Each inline SVG is still well-formed XML and scales with the page.
        foreach (Match m in Regex.Matches(html, "<svg\\b.*?</svg>", RegexOptions.Singleline))
        {
            XElement svg = XElement.Parse(m.Value);
            Assert.NotNull(svg.Attribute("viewBox"));
        }
        Assert.DoesNotContain("https://", html, StringComparison.OrdinalIgnoreCase);
    }

    [Fact]
    public void Write_Markdown_ReferencesFilesThatExist()
    {
        string dir = Directory.CreateTempSubdirectory("opg-report-").FullName;
        try
        {
            ReportFiles files = ReportWriter.Write(_fx.Document(), dir);
            string md = File.ReadAllText(files.Markdown!);
            string[] links = MarkdownLink().Matches(md).Select(m => m.Groups[1].Value).ToArray();
            Assert.Equal(2 * _fx.Figures.Count, links.Length);   // PNG image and SVG link per figure
            foreach (string link in links)
            {
                Assert.False(Path.IsPathRooted(link), link);
                Assert.True(File.Exists(Path.Combine(dir, link)), $"report.md links to missing {link}");
            }
            foreach (FigureImage f in _fx.Figures)
                Assert.Equal(f.Png, File.ReadAllBytes(Path.Combine(dir, "figures", f.PngFileName)));
            // Underscores inside words stay (they cannot start emphasis); the one before '{' is escaped; pipes and angle brackets too.
            Assert.Contains("| Hamiltonian | Σ_j (X_j X\\_{j+1} + 0.5 Z_j) \\| piped & \\<tagged\\> |", md, StringComparison.Ordinal);
            Assert.Contains("v_B", md, StringComparison.Ordinal);      // underscores inside words stay as written
            Assert.Contains("**NO: not converged**", md, StringComparison.Ordinal);
            Assert.Contains("t\\*", md, StringComparison.Ordinal);     // a star is escaped
            Assert.Equal(3 + 2 * _fx.Figures.Count, files.RelativePaths.Count);
        }
        finally { Directory.Delete(dir, true); }
    }

    [Fact]
    public void Write_Json_CarriesEveryNumberWithItsWindow()
    {
        string dir = Directory.CreateTempSubdirectory("opg-report-").FullName;
        try
        {
            ReportFiles files = ReportWriter.Write(_fx.Document(), dir);
            using JsonDocument json = JsonDocument.Parse(File.ReadAllBytes(files.Json!));
            JsonElement root = json.RootElement;
            JsonElement v = root.GetProperty("headlines")[0].GetProperty("value");
            Assert.Equal(1.49, v.GetProperty("value").GetDouble());
            Assert.Equal(0.05, v.GetProperty("uncertainty").GetDouble());
            Assert.Equal(0.5, v.GetProperty("window").GetProperty("start").GetDouble());
            Assert.Equal(3, v.GetProperty("window").GetProperty("end").GetDouble());
            Assert.Equal("1.49 ± 0.05 sites/time", v.GetProperty("text").GetString());
            Assert.False(root.GetProperty("headlines")[1].GetProperty("converged").GetBoolean());
            Assert.Equal(_fx.Figures.Count, root.GetProperty("figures").GetArrayLength());
            foreach (JsonElement f in root.GetProperty("figures").EnumerateArray())
                Assert.True(File.Exists(Path.Combine(dir, f.GetProperty("png").GetString()!)));
        }
        finally { Directory.Delete(dir, true); }
    }

    [Fact]
    public void Write_DuplicateFigureNames_Throws()
    {
        ReportDocument doc = _fx.Document();
        doc.Figures.Add(_fx.Figures[0]);
        Assert.Throws<ArgumentException>(() => ReportWriter.Write(doc, Path.Combine(Path.GetTempPath(), "opg-never-written")));
    }

    /// <summary>Every opened container element is closed, in order (a tolerant well-formedness check).</summary>
    private static void AssertBalanced(string html)
    {
        string[] containers = ["html", "head", "body", "header", "section", "table", "thead", "tbody", "tr", "td", "th", "ul", "li", "figure", "figcaption", "p", "footer", "style", "title", "b", "span", "code", "h1", "h2"];
        var stack = new Stack<string>();
        foreach (Match m in Regex.Matches(html, "<(/?)([a-zA-Z0-9]+)[^>]*>"))
        {
            string name = m.Groups[2].Value.ToLowerInvariant();
            if (!containers.Contains(name)) continue;
            if (m.Groups[1].Value.Length == 0) stack.Push(name);
            else
            {
                Assert.True(stack.Count > 0, $"</{name}> closes nothing");
                Assert.Equal(stack.Pop(), name);
            }
        }
        Assert.Empty(stack);
    }
}
