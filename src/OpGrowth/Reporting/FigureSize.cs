namespace OpGrowth.Reporting;

/// <summary>Pixel size of a rendered figure. <paramref name="Scale"/> multiplies the PNG resolution (2 for print).</summary>
public readonly record struct FigureSize(int Width, int Height, double Scale = 1.0)
{
    /// <summary>The size used in reports.</summary>
    public static FigureSize Report => new(840, 520, 1.5);

    /// <summary>A small size for tests and previews.</summary>
    public static FigureSize Small => new(420, 300, 1.0);

    internal void Validate()
    {
        if (Width < 200 || Width > 8000) throw new ArgumentOutOfRangeException(nameof(Width), Width, "expected 200..8000 pixels");
        if (Height < 150 || Height > 8000) throw new ArgumentOutOfRangeException(nameof(Height), Height, "expected 150..8000 pixels");
        if (!(Scale >= 0.5 && Scale <= 4)) throw new ArgumentOutOfRangeException(nameof(Scale), Scale, "expected 0.5..4");
    }
}
