using OpGrowth.IO;

namespace OpGrowth.Reporting;

/// <summary>
/// One rendered figure: a PNG and an SVG of the same drawing, with the title and one-line caption that are also
/// drawn inside the image. <see cref="Name"/> is the file stem (letters, digits, '-', '_').
/// </summary>
public sealed record FigureImage(string Name, string Title, string Caption, byte[] Png, string Svg, int Width, int Height)
{
    /// <summary>File name of the PNG (<c>Name.png</c>).</summary>
    public string PngFileName => Name + ".png";

    /// <summary>File name of the SVG (<c>Name.svg</c>).</summary>
    public string SvgFileName => Name + ".svg";

    /// <summary>Writes <c>Name.png</c> and <c>Name.svg</c> into <paramref name="folder"/> atomically; returns both paths.</summary>
    public (string PngPath, string SvgPath) Save(string folder)
    {
        string png = Path.Combine(folder, PngFileName);
        string svg = Path.Combine(folder, SvgFileName);
        AtomicFile.WriteAllBytes(png, Png);
        AtomicFile.WriteAllText(svg, Svg);
        return (png, svg);
    }

    internal static string CheckName(string name)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(name);
        foreach (char c in name)
        {
            if (!(char.IsAsciiLetterOrDigit(c) || c == '-' || c == '_'))
                throw new ArgumentException($"Figure name '{name}' contains '{c}'; expected letters, digits, '-' or '_'.", nameof(name));
        }
        return name;
    }
}
