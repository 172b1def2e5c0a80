using SkiaSharp;

namespace OpGrowth.Tests.Reporting;

/// <summary>Reads rendered PNGs back to look for drawn text.</summary>
internal static class PixelProbe
{
    /// <summary>
    /// Number of "ink" pixels (luminance below 150 of 255; the background is white and the text colours are
    /// #1A1A1A and #5E5E5E) in the rectangle [x0, x1) x [y0, y1) given as fractions of the image size.
    /// </summary>
    internal static int InkPixels(byte[] png, double x0, double x1, double y0, double y1)
    {
        using SKBitmap bmp = SKBitmap.Decode(png) ?? throw new InvalidOperationException("PNG did not decode");
        int ax = (int)(x0 * bmp.Width), bx = (int)(x1 * bmp.Width), ay = (int)(y0 * bmp.Height), by = (int)(y1 * bmp.Height);
        int count = 0;
        for (int y = ay; y < by; y++)
            for (int x = ax; x < bx; x++)
            {
                SKColor c = bmp.GetPixel(x, y);
                double lum = 0.2126 * c.Red + 0.7152 * c.Green + 0.0722 * c.Blue;
                if (lum < 150) count++;
            }
        return count;
    }

    internal static (int Width, int Height) Size(byte[] png)
    {
        using SKBitmap bmp = SKBitmap.Decode(png) ?? throw new InvalidOperationException("PNG did not decode");
        return (bmp.Width, bmp.Height);
    }
}
