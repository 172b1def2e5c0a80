using System.Xml.Linq;
using OpGrowth.Reporting;
using ScottPlot;

namespace OpGrowth.Tests.Reporting;

/// <summary>
/// Every chart function renders a PNG that carries text and an SVG that parses as XML and names its axes.
/// "Carries text" is checked on pixels: the title band, the caption band and the left band (rotated y label) must
/// contain dark pixels. Nothing else is drawn there, so a render without a usable font (the failure mode of the
/// plotting library on machines without system fonts) fails these checks. Threshold 30 pixels: one short word at
/// 11 px is several hundred dark pixels, anti-aliasing noise is none (white background).
/// </summary>
public class ChartTests
{
    private const int MinInk = 30;

    public static TheoryData<string> Kinds => new()
    {
        "size-distribution", "mean-size", "light-cone", "lanczos", "krylov", "pauli-vs-exact", "tstar-scaling", "lines",
    };

    internal static (FigureImage Figure, string XLabel, string YLabel) Render(string kind) => kind switch
    {
        "size-distribution" => (Charts.SizeDistribution(SampleData.Size(), FigureSize.Small), AxisText.Time, "operator size k (qubits)"),
        "mean-size" => (Charts.MeanSize(SampleData.Mean(), FigureSize.Small), AxisText.Time, "mean size n(t) (qubits)"),
        "light-cone" => (Charts.LightCone(SampleData.Cone(), FigureSize.Small), "site j", AxisText.Time),
        "lanczos" => (Charts.Lanczos(SampleData.Lanczos(), FigureSize.Small), "Lanczos index n", "b_n (energy)"),
        "krylov" => (Charts.Krylov(SampleData.Krylov(), FigureSize.Small), AxisText.Time, "C(t)"),
        "pauli-vs-exact" => (Charts.PauliVersusExact(SampleData.Overlay(), FigureSize.Small), AxisText.Time, "Pauli - exact"),
        "tstar-scaling" => (Charts.ScramblingTime(SampleData.Scaling(), FigureSize.Small), "system size N (qubits)", "t* (1/energy)"),
        "lines" => (Charts.Lines(SampleData.Lines(), FigureSize.Small), "time t (1/energy)", "discarded weight"),
        _ => throw new ArgumentOutOfRangeException(nameof(kind), kind, "unknown chart kind"),
    };

    [Theory]
    [MemberData(nameof(Kinds))]
    public void Chart_SmallRender_PngCarriesTextAndSvgNamesAxes(string kind)
    {
        (FigureImage f, string xLabel, string yLabel) = Render(kind);

        Assert.True(f.Png.Length > 2000, $"{kind}: PNG only {f.Png.Length} bytes");
        Assert.Equal((420, 300), PixelProbe.Size(f.Png));
        int title = PixelProbe.InkPixels(f.Png, 0, 1, 0, 0.10);
        int caption = PixelProbe.InkPixels(f.Png, 0, 1, 0.90, 1);
        int left = PixelProbe.InkPixels(f.Png, 0, 0.15, 0.2, 0.8);   // y label and tick labels; the frame starts further right
        Assert.True(title > MinInk, $"{kind}: title band has {title} dark pixels");
        Assert.True(caption > MinInk, $"{kind}: caption band has {caption} dark pixels");
        Assert.True(left > MinInk, $"{kind}: left band (y label) has {left} dark pixels");

        XDocument svg = XDocument.Parse(f.Svg);
        XNamespace ns = "http://www.w3.org/2000/svg";
        Assert.Equal(ns + "svg", svg.Root!.Name);
        var texts = svg.Descendants(ns + "text").Select(t => t.Value.Trim()).ToHashSet();
        Assert.Contains(f.Title, texts);
        Assert.Contains(xLabel, texts);
        Assert.Contains(yLabel, texts);
        Assert.DoesNotContain("#0102", f.Svg, StringComparison.Ordinal);   // dash tags all restored
        Assert.All(svg.Descendants(ns + "text"), t => Assert.Equal(ReportFonts.Family, (string?)t.Attribute("font-family")));
    }

    [Fact]
    public void MeanSize_DashedReferenceLines_KeepDashesInSvg()
    {
        FigureImage f = Charts.MeanSize(SampleData.Mean(), FigureSize.Small);
        Assert.Contains("stroke-dasharray", f.Svg, StringComparison.Ordinal);
    }

    [Fact]
    public void LightCone_Svg_HeatmapImageIsNotSmoothed()
    {
        FigureImage f = Charts.LightCone(SampleData.Cone(), FigureSize.Small);
        Assert.Contains("<image image-rendering=\"optimizeSpeed\" style=\"image-rendering:pixelated\"", f.Svg, StringComparison.Ordinal);
    }

    [Fact]
    public void FigureImage_Save_WritesPngAndSvg()
    {
        FigureImage f = Charts.Lines(SampleData.Lines(), FigureSize.Small);
        string dir = Directory.CreateTempSubdirectory("opg-fig-").FullName;
        try
        {
            (string png, string svg) = f.Save(dir);
            Assert.Equal(f.Png, File.ReadAllBytes(png));
            Assert.Equal(f.Svg, File.ReadAllText(svg));
            Assert.Equal("discarded.png", Path.GetFileName(png));
        }
        finally { Directory.Delete(dir, true); }
    }

    [Fact]
    public void MeanSize_LengthMismatch_ThrowsWithCounts()
    {
        var bad = new MeanSizeSeries([0, 1, 2], [1, 2], 6);
        var ex = Assert.Throws<ArgumentException>(() => Charts.MeanSize(bad, FigureSize.Small));
        Assert.Contains("has 2 values; expected 3", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void LightCone_WrongMapShape_Throws()
    {
        var bad = new LightConeMap([0, 1], [0, 1, 2], new double[2, 2]);
        Assert.Throws<ArgumentException>(() => Charts.LightCone(bad, FigureSize.Small));
    }

    [Fact]
    public void Render_BadFigureName_Throws()
        => Assert.Throws<ArgumentException>(() => Charts.Krylov(SampleData.Krylov(), FigureSize.Small, name: "../escape"));

    [Fact]
    public void ReportFonts_ShippedFaces_LoadAndCoverSymbolsUsedInLabels()
    {
        Assert.Equal(ReportFonts.Family, ReportFonts.Regular.FamilyName);
        Assert.True(ReportFonts.Bold.IsBold);
        Assert.True(ReportFonts.Regular.ContainsGlyphs("±αρφΣ²·χ∞→"));
        Assert.Contains("Bitstream", ReportFonts.LicenseText, StringComparison.Ordinal);
        ReportFonts.EnsureRegistered();
        // Any family the plotting library asks for resolves to the shipped face, never to a system font.
        Assert.Equal(ReportFonts.Family, Fonts.GetTypeface("Some Missing Font", false, false).FamilyName);
    }

    [Fact]
    public void Log10Ticks_FiveDecades_MajorsAtDecadesLabelledOneEN()
    {
        Tick[] ticks = Log10Ticks.Generate(-3.2, 1.5, 400, vertical: true);
        string[] majors = ticks.Where(t => t.IsMajor).Select(t => t.Label).ToArray();
        Assert.Equal(["1e-3", "1e-2", "1e-1", "1e0", "1e1"], majors);
        // Minor ticks sit at log10(m * 10^k) for m = 2..9, e.g. at log10(2e-3).
        Assert.Contains(ticks, t => !t.IsMajor && Math.Abs(t.Position - Math.Log10(2e-3)) < 1e-12);
    }

    [Fact]
    public void Log10Ticks_UnderTwoDecades_AlsoLabelsTwoAndFive()
    {
        string[] majors = Log10Ticks.Generate(-1.1, 0.2, 400, vertical: true).Where(t => t.IsMajor).Select(t => t.Label).ToArray();
        Assert.Equal(["1e-1", "2e-1", "5e-1", "1e0"], majors);
    }

    [Fact]
    public void ResampleColumns_UnevenTimes_HoldsEachSampleUntilTheNext()
    {
        double[] xs = [0, 1, 1.5, 4];
        var v = new double[1, 4] { { 10, 20, 30, 40 } };
        (double x0, double dx, double[,] grid) = HeatmapKit.ResampleColumns(xs, v);
        Assert.Equal(0, x0);
        Assert.Equal(0.5, dx, 12);
        Assert.Equal(9, grid.GetLength(1));
        double[] row = Enumerable.Range(0, 9).Select(c => grid[0, c]).ToArray();
        Assert.Equal([10, 10, 20, 30, 30, 30, 30, 30, 40], row);
    }

    [Fact]
    public void HeatmapKit_Add_CellCentresSitOnDataCoordinates()
    {
        using Plot plot = PlotKit.NewPanel("x", "y");
        double[] xs = [0, 0.5, 1.0, 1.5];
        double[] ys = [0, 1, 2];
        var map = HeatmapKit.Add(plot, xs, ys, new double[3, 4], 0, 1, "v", false);
        CoordinateRect drawn = map.GetAlignedExtent();
        Assert.Equal(-0.25, drawn.Left, 9);
        Assert.Equal(1.75, drawn.Right, 9);
        Assert.Equal(-0.5, drawn.Bottom, 9);
        Assert.Equal(2.5, drawn.Top, 9);
    }

    [Fact]
    public void HeatmapKit_Add_SingleRowAndColumn_CentredOnTheirCoordinates()
    {
        using Plot plot = PlotKit.NewPanel("x", "y");
        var map = HeatmapKit.Add(plot, [2.0], [3.0], new double[1, 1] { { 0.5 } }, 0, 1, "v", false);
        CoordinateRect drawn = map.GetAlignedExtent();
        Assert.Equal(1.5, drawn.Left, 9);
        Assert.Equal(2.5, drawn.Right, 9);
        Assert.Equal(2.5, drawn.Bottom, 9);
        Assert.Equal(3.5, drawn.Top, 9);
    }

    [Theory]
    [InlineData(+1, Alignment.UpperLeft)]   // rising line leaves the upper-left corner empty
    [InlineData(-1, Alignment.UpperRight)]  // falling line: upper-left is occupied, lower-right too
    public void ShowLegendAuto_SingleLine_PicksAnEmptyCorner(int slope, Alignment expected)
    {
        using Plot plot = PlotKit.NewPanel("x", "y");
        double[] x = Enumerable.Range(0, 50).Select(i => i / 49.0).ToArray();
        PlotKit.Line(plot, x, x.Select(v => slope * v).ToArray(), "line", 0);
        Assert.Equal(expected, PlotKit.BestLegendCorner(plot, 600, 400));
    }
}
