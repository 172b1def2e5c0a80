using System.Reflection;
using ScottPlot;
using SkiaSharp;

namespace OpGrowth.Reporting;

/// <summary>
/// The typeface every figure uses: DejaVu Sans (regular and bold), shipped inside the assembly as embedded
/// resources (license: Reporting/Fonts/LICENSE-DejaVu.txt). Rendering never looks at system fonts: on a machine
/// without any installed font the plotting library would otherwise draw no text at all, silently.
/// </summary>
public static class ReportFonts
{
    /// <summary>Family name registered with the plotting library and written into SVG files.</summary>
    public const string Family = "DejaVu Sans";

    private const string RegularResource = "OpGrowth.Reporting.Fonts.DejaVuSans.ttf";
    private const string BoldResource = "OpGrowth.Reporting.Fonts.DejaVuSans-Bold.ttf";
    private const string LicenseResource = "OpGrowth.Reporting.Fonts.LICENSE-DejaVu.txt";

    private static readonly Lazy<SKTypeface> s_regular = new(() => Load(RegularResource), LazyThreadSafetyMode.ExecutionAndPublication);
    private static readonly Lazy<SKTypeface> s_bold = new(() => Load(BoldResource), LazyThreadSafetyMode.ExecutionAndPublication);
    private static readonly object s_gate = new();
    private static bool s_registered;

    /// <summary>The regular face (loaded once from the assembly).</summary>
    public static SKTypeface Regular => s_regular.Value;

    /// <summary>The bold face (loaded once from the assembly).</summary>
    public static SKTypeface Bold => s_bold.Value;

    /// <summary>The font license text shipped with the font files.</summary>
    public static string LicenseText
    {
        get
        {
            using Stream s = OpenResource(LicenseResource);
            using var reader = new StreamReader(s);
            return reader.ReadToEnd();
        }
    }

    /// <summary>
    /// Registers the shipped faces with the plotting library (first in its resolver list) and makes them the
    /// default sans-serif font. Idempotent and thread-safe; every chart function calls it.
    /// </summary>
    public static void EnsureRegistered()
    {
        if (Volatile.Read(ref s_registered)) return;
        lock (s_gate)
        {
            if (s_registered) return;
            Fonts.FontResolvers.Insert(0, new EmbeddedFontResolver());
            Fonts.Default = Family;
            Fonts.Sans = Family;
            Volatile.Write(ref s_registered, true);
        }
    }

    private static SKTypeface Load(string resource)
    {
        using Stream s = OpenResource(resource);
        using var ms = new MemoryStream();
        s.CopyTo(ms);
        using SKData data = SKData.CreateCopy(ms.ToArray());
        return SKTypeface.FromData(data)
            ?? throw new InvalidOperationException($"The shipped font resource '{resource}' could not be decoded.");
    }

    private static Stream OpenResource(string name)
        => typeof(ReportFonts).Assembly.GetManifestResourceStream(name)
           ?? throw new InvalidOperationException($"The shipped resource '{name}' is missing from {typeof(ReportFonts).Assembly.GetName().Name}.");
}
