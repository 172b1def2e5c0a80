using System.Globalization;
using ScottPlot;

namespace OpGrowth.Reporting;

/// <summary>
/// Ticks for an axis that carries log10 of the plotted quantity (the plotting library has no true log axis):
/// major ticks at whole decades labelled <c>1eN</c>, minor ticks at 2..9 times a decade; when fewer than two
/// decades are visible, 2x and 5x a decade are labelled too (<c>2eN</c>, <c>5eN</c>).
/// </summary>
internal sealed class Log10Ticks : ITickGenerator
{
    private static readonly double[] s_mantissaLogs = Enumerable.Range(2, 8).Select(m => Math.Log10(m)).ToArray();

    public Tick[] Ticks { get; set; } = [];

    public int MaxTickCount { get; set; } = 2000;

    public void Regenerate(CoordinateRange range, Edge edge, PixelLength size, Paint paint, LabelStyle labelStyle)
        => Ticks = Generate(range.Min, range.Max, size.Length, edge is Edge.Left or Edge.Right);

    internal static Tick[] Generate(double lo, double hi, float pixels, bool vertical)
    {
        if (!(double.IsFinite(lo) && double.IsFinite(hi)) || hi <= lo) return [];
        double decades = hi - lo;
        double perLabel = vertical ? 34.0 : 60.0;
        int maxLabels = Math.Max(2, (int)(pixels / perLabel));
        int step = Math.Max(1, (int)Math.Ceiling(decades / maxLabels));
        bool labelHalves = decades < 2.0 && pixels / Math.Max(decades, 1e-9) > 3 * perLabel;
        var ticks = new List<Tick>();
        int first = (int)Math.Floor(lo), last = (int)Math.Ceiling(hi);
        if (last - first > 400) return [];   // absurd range: leave the axis bare rather than allocate
        for (int k = first; k <= last; k++)
        {
            if (k >= lo && k <= hi)
            {
                if (k % step == 0) ticks.Add(Tick.Major(k, Label(1, k)));
                else ticks.Add(Tick.Minor(k));
            }
            if (step > 2) continue;         // with sparse labels the 2..9 minor ticks would be clutter
            for (int m = 0; m < s_mantissaLogs.Length; m++)
            {
                double p = k + s_mantissaLogs[m];
                if (p < lo || p > hi) continue;
                int mantissa = m + 2;
                if (labelHalves && (mantissa == 2 || mantissa == 5)) ticks.Add(Tick.Major(p, Label(mantissa, k)));
                else ticks.Add(Tick.Minor(p));
            }
        }
        return ticks.ToArray();
    }

    internal static string Label(int mantissa, int exponent)
        => string.Create(CultureInfo.InvariantCulture, $"{mantissa}e{exponent}");
}
