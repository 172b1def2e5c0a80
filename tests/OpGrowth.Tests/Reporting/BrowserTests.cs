using System.Diagnostics;
using OpGrowth.Reporting;
using SkiaSharp;
using Xunit.Abstractions;

namespace OpGrowth.Tests.Reporting;

/// <summary>
/// Optional: a headless Chromium screenshot of report.html shows text and the embedded figures. Passes with a
/// note when no Chromium is installed (Debian package "chromium"); network features are switched off so the
/// page must render from the file alone.
/// </summary>
[Trait("Category", "Browser")]
public class BrowserTests : IClassFixture<ReportFixture>
{
    private readonly ReportFixture _fx;
    private readonly ITestOutputHelper _out;

    public BrowserTests(ReportFixture fx, ITestOutputHelper output)
    {
        _fx = fx;
        _out = output;
    }

    internal static string? FindChromium()
    {
        foreach (string name in new[] { "chromium", "chromium-browser", "google-chrome" })
            foreach (string dir in (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator))
            {
                string candidate = Path.Combine(dir, name);
                if (File.Exists(candidate)) return candidate;
            }
        return null;
    }

    [Fact]
    public async Task Screenshot_ReportHtml_ShowsTextAndFigures()
    {
        string? chromium = FindChromium();
        if (chromium is null)
        {
            _out.WriteLine("Skipped in effect: no chromium on PATH (install the Debian package 'chromium' to run this check).");
            return;
        }
        string dir = Directory.CreateTempSubdirectory("opg-browser-").FullName;
        string profile = Directory.CreateTempSubdirectory("opg-chromium-profile-").FullName;
        try
        {
            ReportFiles files = ReportWriter.Write(_fx.Document(), dir);
            string shot = Path.Combine(dir, "screenshot.png");
            var psi = new ProcessStartInfo(chromium)
            {
                RedirectStandardError = true,
                RedirectStandardOutput = true,
                UseShellExecute = false,
            };
            foreach (string a in new[]
            {
                "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
                "--disable-background-networking", "--disable-component-update", "--disable-sync",
                "--hide-scrollbars", "--window-size=1000,2600", "--user-data-dir=" + profile,
                "--screenshot=" + shot, new Uri(files.Html!).AbsoluteUri,
            }) psi.ArgumentList.Add(a);
            using Process p = Process.Start(psi)!;
            Task<string> stderr = p.StandardError.ReadToEndAsync();
            Task<string> stdout = p.StandardOutput.ReadToEndAsync();
            using (var cts = new CancellationTokenSource(TimeSpan.FromSeconds(90)))
            {
                try { await p.WaitForExitAsync(cts.Token); }
                catch (OperationCanceledException)
                {
                    p.Kill(entireProcessTree: true);
                    Assert.Fail("chromium did not finish within 90 s");
                }
            }
            string err = await stderr;
            await stdout;
            _out.WriteLine(err.Length > 2000 ? err[..2000] : err);
            Assert.True(File.Exists(shot), "chromium wrote no screenshot");

            byte[] png = File.ReadAllBytes(shot);
            int ink = PixelProbe.InkPixels(png, 0, 1, 0, 0.15);
            Assert.True(ink > 500, $"page top has {ink} dark pixels: no text rendered?");
            // The embedded figures bring the palette's deep blue (#1F4E8C) and amber (#D9822B) onto the page.
            using SKBitmap bmp = SKBitmap.Decode(png);
            int blue = 0, amber = 0;
            for (int y = 0; y < bmp.Height; y += 2)
                for (int x = 0; x < bmp.Width; x += 2)
                {
                    SKColor c = bmp.GetPixel(x, y);
                    if (Near(c, 0x1F, 0x4E, 0x8C)) blue++;
                    if (Near(c, 0xD9, 0x82, 0x2B)) amber++;
                }
            _out.WriteLine($"screenshot {bmp.Width}x{bmp.Height}: {ink} dark pixels in the top band, {blue} blue and {amber} amber samples");
            Assert.True(blue > 50 && amber > 20, $"figures not visible: {blue} blue, {amber} amber samples");
        }
        finally
        {
            Directory.Delete(dir, true);
            Directory.Delete(profile, true);
        }
    }

    private static bool Near(SKColor c, int r, int g, int b) => Math.Abs(c.Red - r) < 24 && Math.Abs(c.Green - g) < 24 && Math.Abs(c.Blue - b) < 24;
}
