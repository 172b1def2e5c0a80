using ScottPlot;

namespace OpGrowth.Reporting;

/// <summary>
/// The house look of every OpGrowth figure: white background, near-black text, light grid, and a short palette
/// chosen for us. Series are told apart by colour and by line pattern, so a figure stays readable for readers
/// with red-green colour blindness and on a greyscale print-out.
/// </summary>
/// <remarks>
/// Palette order (hex): deep blue, amber, charcoal, sky, plum, ochre. Blue against amber is the main contrast
/// (it survives the common forms of colour blindness); the others differ in lightness as well as hue.
/// The heatmap scale runs from white (zero) through pale and mid blue to a dark navy: lightness falls
/// monotonically, so the order of values survives colour blindness and greyscale printing.
/// </remarks>
public static class ChartStyle
{
    /// <summary>Series colours, in order of use.</summary>
    public static IReadOnlyList<string> SeriesHex { get; } =
        ["#1F4E8C", "#D9822B", "#333333", "#5BA3D0", "#9C3F78", "#8A7A1A"];

    /// <summary>Line patterns cycled together with <see cref="SeriesHex"/> (greyscale-safe).</summary>
    internal static readonly LinePattern[] SeriesPatterns =
        [LinePattern.Solid, LinePattern.Dashed, LinePattern.Solid, LinePattern.Dotted, LinePattern.DenselyDashed, LinePattern.Dashed];

    internal static readonly MarkerShape[] SeriesMarkers =
        [MarkerShape.FilledCircle, MarkerShape.FilledSquare, MarkerShape.FilledTriangleUp, MarkerShape.OpenCircle, MarkerShape.FilledDiamond, MarkerShape.OpenSquare];

    /// <summary>Colour stops of the sequential heatmap scale, low to high.</summary>
    public static IReadOnlyList<string> HeatmapHex { get; } =
        ["#FFFFFF", "#DDE9F4", "#9DC1E1", "#5A90C6", "#2A5C9B", "#13335F", "#07162B"];

    internal static readonly Color Background = Colors.White;
    internal static readonly Color Ink = Color.FromHex("#1A1A1A");
    internal static readonly Color Frame = Color.FromHex("#555555");
    internal static readonly Color Grid = Color.FromHex("#E3E3E3");
    internal static readonly Color Muted = Color.FromHex("#5E5E5E");
    internal static readonly Color Reference = Color.FromHex("#7A7A7A");
    /// <summary>Fits and fronts: amber, visible on white and on the dark end of the heatmap scale.</summary>
    internal static readonly Color Fit = Color.FromHex("#D9822B");
    internal static readonly Color WindowFill = Color.FromHex("#D9822B").WithAlpha(0.12);
    internal static readonly Color MissingCell = Color.FromHex("#C8C8C8");

    internal const float TitleSize = 15f;
    internal const float CaptionSize = 11.5f;
    internal const float AxisLabelSize = 13f;
    internal const float TickLabelSize = 11f;
    internal const float LegendSize = 11f;

    internal static Color Series(int i) => Color.FromHex(SeriesHex[i % SeriesHex.Count]);
    internal static LinePattern Pattern(int i) => SeriesPatterns[i % SeriesPatterns.Length];
    internal static MarkerShape Marker(int i) => SeriesMarkers[i % SeriesMarkers.Length];
}
