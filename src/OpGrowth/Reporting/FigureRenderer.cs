using System.Text;
using ScottPlot;
using SkiaSharp;

namespace OpGrowth.Reporting;

/// <summary>
/// Draws a figure: title band, one or more stacked plot panels, caption band; once onto a raster surface (PNG)
/// and once onto an SVG canvas, from the same layout code so the two files show the same drawing.
/// </summary>
internal static partial class FigureRenderer
{
    [System.Text.RegularExpressions.GeneratedRegex(@" (x|y)=""([^""]*?),\s*""")]
    private static partial System.Text.RegularExpressions.Regex TrailingCommaRegex();

    private static readonly System.Text.RegularExpressions.Regex s_trailingComma = TrailingCommaRegex();

    private const float Margin = 14f;
    private const float TitleBand = 34f;
    /// <summary>Fixed paddings for stacked panels so that their data areas line up.</summary>
    private static readonly PixelPadding s_stackPadding = new(left: 78, right: 22, bottom: 44, top: 8);
    private static readonly PixelPadding s_upperPadding = new(left: 78, right: 22, bottom: 10, top: 8);

    internal static FigureImage Render(string name, string title, string caption, FigureSize size, params PanelSpec[] panels)
    {
        FigureImage.CheckName(name);
        ArgumentException.ThrowIfNullOrWhiteSpace(title);
        ArgumentException.ThrowIfNullOrWhiteSpace(caption);
        if (panels.Length == 0) throw new ArgumentException("A figure needs at least one panel.", nameof(panels));
        size.Validate();
        ReportFonts.EnsureRegistered();

        for (int i = 0; i < panels.Length; i++)
        {
            Plot plot = panels[i].Plot;
            plot.RenderManager.ClearCanvasBeforeEachRender = false;
            if (panels.Length == 1) continue;
            if (i < panels.Length - 1)
            {
                // Upper panels of a stack share the bottom panel's x axis: keep the ticks, drop their labels.
                plot.Axes.Bottom.TickLabelStyle.IsVisible = false;
                plot.Axes.Bottom.Label.Text = "";
                plot.Layout.Fixed(s_upperPadding);
            }
            else
            {
                plot.Layout.Fixed(s_stackPadding);
            }
        }

        // Auto-placed legends need the panel's pixel size: lay out once, place, then draw twice.
        (float Top, float Bottom)[] bands = PanelBands(size, caption, panels);
        for (int i = 0; i < panels.Length; i++)
            PlotKit.PlaceLegend(panels[i].Plot, size.Width - 8, bands[i].Bottom - bands[i].Top);

        byte[] png;
        int pw = (int)Math.Round(size.Width * size.Scale), ph = (int)Math.Round(size.Height * size.Scale);
        using (var surface = SKSurface.Create(new SKImageInfo(pw, ph, SKColorType.Rgba8888, SKAlphaType.Premul))
                             ?? throw new InvalidOperationException($"Could not allocate a {pw}x{ph} drawing surface."))
        {
            SKCanvas canvas = surface.Canvas;
            canvas.Clear(SKColors.White);
            canvas.Scale((float)size.Scale);
            Draw(canvas, title, caption, size, panels);
            canvas.Flush();
            using SKImage image = surface.Snapshot();
            using SKData data = image.Encode(SKEncodedImageFormat.Png, 100);
            png = data.ToArray();
        }

        // The SVG back end ignores dash effects (and complains on stderr): draw dashed lines solid in a tag
        // colour, then give them back their colour and a stroke-dasharray in the SVG text.
        List<(string Tag, string Replacement)> dashes = TagDashedLines(panels);
        string svg;
        using (var ms = new MemoryStream())
        {
            using (SKCanvas canvas = SKSvgCanvas.Create(SKRect.Create(size.Width, size.Height), ms))
            {
                using (var bg = new SKPaint { Color = SKColors.White, Style = SKPaintStyle.Fill })
                    canvas.DrawRect(SKRect.Create(size.Width, size.Height), bg);
                Draw(canvas, title, caption, size, panels);
            }
            svg = Encoding.UTF8.GetString(ms.ToArray());
        }
        foreach ((string tag, string replacement) in dashes) svg = svg.Replace(tag, replacement, StringComparison.Ordinal);
        // The SVG back end ends glyph position lists with ", " which strict parsers reject as a list item.
        svg = s_trailingComma.Replace(svg, " $1=\"$2\"");
        // Heatmaps are embedded as one pixel per cell; viewers must not blur them when scaling up.
        svg = svg.Replace("<image ", "<image image-rendering=\"optimizeSpeed\" style=\"image-rendering:pixelated\" ", StringComparison.Ordinal);

        foreach (PanelSpec p in panels) p.Plot.Dispose();
        return new FigureImage(name, title, caption, png, svg, size.Width, size.Height);
    }

    private static void Draw(SKCanvas canvas, string title, string caption, FigureSize size, PanelSpec[] panels)
    {
        float w = size.Width, h = size.Height;
        using SKFont titleFont = Font(ReportFonts.Bold, ChartStyle.TitleSize);
        using SKFont captionFont = Font(ReportFonts.Regular, ChartStyle.CaptionSize);
        using var ink = new SKPaint { Color = ChartStyle.Ink.ToSKColor(), IsAntialias = true };
        using var muted = new SKPaint { Color = ChartStyle.Muted.ToSKColor(), IsAntialias = true };

        string shownTitle = Fit(title, w - 2 * Margin, titleFont);
        canvas.DrawText(shownTitle, Margin, Margin + ChartStyle.TitleSize, SKTextAlign.Left, titleFont, ink);

        List<string> lines = Wrap(caption, w - 2 * Margin, captionFont, maxLines: 2);
        float captionBand = CaptionBand(lines.Count);
        float y = h - captionBand + ChartStyle.CaptionSize + 2f;
        foreach (string line in lines)
        {
            canvas.DrawText(line, Margin, y, SKTextAlign.Left, captionFont, muted);
            y += CaptionLineHeight;
        }

        (float Top, float Bottom)[] bands = PanelBands(size, caption, panels);
        for (int i = 0; i < panels.Length; i++)
            panels[i].Plot.Render(canvas, new PixelRect(left: 4, right: w - 4, bottom: bands[i].Bottom, top: bands[i].Top));
    }

    private const float CaptionLineHeight = ChartStyle.CaptionSize * 1.35f;

    private static float CaptionBand(int lines) => lines * CaptionLineHeight + 12f;

    /// <summary>Vertical extent of each panel: the space between title and caption, split by weight.</summary>
    private static (float Top, float Bottom)[] PanelBands(FigureSize size, string caption, PanelSpec[] panels)
    {
        using SKFont captionFont = Font(ReportFonts.Regular, ChartStyle.CaptionSize);
        int lines = Wrap(caption, size.Width - 2 * Margin, captionFont, maxLines: 2).Count;
        float top = TitleBand, bottom = size.Height - CaptionBand(lines);
        double totalWeight = panels.Sum(p => p.Weight);
        var bands = new (float, float)[panels.Length];
        float cursor = top;
        for (int i = 0; i < panels.Length; i++)
        {
            float ph = (float)((bottom - top) * panels[i].Weight / totalWeight);
            bands[i] = (cursor, cursor + ph);
            cursor += ph;
        }
        return bands;
    }

    /// <summary>
    /// Replaces every dashed line's colour by a unique tag colour (#0102nn) and its pattern by a solid one; returns
    /// the SVG attribute text to search for and its replacement (true colour plus stroke-dasharray).
    /// </summary>
    private static List<(string Tag, string Replacement)> TagDashedLines(PanelSpec[] panels)
    {
        var result = new List<(string, string)>();
        foreach (PanelSpec p in panels)
        {
            foreach (IPlottable item in p.Plot.GetPlottables())
            {
                if (item is not IHasLine line) continue;
                float[]? intervals = line.LinePattern.Intervals;
                if (intervals is null || intervals.Length == 0 || line.LinePattern.Name == LinePattern.Solid.Name) continue;
                if (result.Count == 255) break;
                Color original = line.LineColor;
                var tag = new Color((byte)1, (byte)2, (byte)(result.Count + 1), original.A);
                string dash = string.Join(' ', intervals.Select(v => v.ToString("0.##", System.Globalization.CultureInfo.InvariantCulture)));
                result.Add(($"stroke=\"#{tag.R:X2}{tag.G:X2}{tag.B:X2}\"",
                            $"stroke=\"#{original.R:X2}{original.G:X2}{original.B:X2}\" stroke-dasharray=\"{dash}\""));
                line.LineColor = tag;
                line.LinePattern = LinePattern.Solid;
            }
        }
        return result;
    }

    internal static SKFont Font(SKTypeface face, float size)
        => new(face, size) { Subpixel = true, Hinting = SKFontHinting.None, Edging = SKFontEdging.Antialias };

    /// <summary>Shortens a single line to fit, ending in an ellipsis.</summary>
    private static string Fit(string text, float width, SKFont font)
    {
        if (font.MeasureText(text) <= width) return text;
        int n = text.Length;
        while (n > 1 && font.MeasureText(text.AsSpan(0, n).ToString() + "…") > width) n--;
        return text[..n].TrimEnd() + "…";
    }

    /// <summary>Greedy word wrap; the last allowed line is shortened with an ellipsis if text remains.</summary>
    internal static List<string> Wrap(string text, float width, SKFont font, int maxLines)
    {
        var lines = new List<string>();
        var current = new StringBuilder();
        string[] words = text.Split(' ', StringSplitOptions.RemoveEmptyEntries);
        int i = 0;
        for (; i < words.Length; i++)
        {
            string trial = current.Length == 0 ? words[i] : current + " " + words[i];
            if (current.Length > 0 && font.MeasureText(trial) > width)
            {
                lines.Add(current.ToString());
                current.Clear();
                if (lines.Count == maxLines) break;
                current.Append(words[i]);
            }
            else
            {
                current.Clear().Append(trial);
            }
        }
        if (lines.Count < maxLines)
        {
            if (current.Length > 0) lines.Add(current.ToString());
        }
        else
        {
            string rest = string.Join(' ', words.Skip(i));
            lines[^1] = Fit(lines[^1] + " " + rest, width, font);
        }
        return lines;
    }
}
