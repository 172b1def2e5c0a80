using ScottPlot;
using SkiaSharp;

namespace OpGrowth.Reporting;

/// <summary>
/// Answers every font look-up of the plotting library with the shipped faces, whatever family is asked for:
/// a figure must never fall back to system fonts (which may be absent, giving text-free images).
/// </summary>
internal sealed class EmbeddedFontResolver : IFontResolver
{
    public SKTypeface? CreateTypeface(string fontName, FontWeight weight, FontSlant slant, FontSpacing spacing)
        => weight >= FontWeight.SemiBold ? ReportFonts.Bold : ReportFonts.Regular;

    public SKTypeface? CreateTypeface(string fontName, bool bold, bool italic)
        => bold ? ReportFonts.Bold : ReportFonts.Regular;
}
