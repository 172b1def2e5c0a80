using ScottPlot;

namespace OpGrowth.Reporting;

/// <summary>The sequential heatmap scale of <see cref="ChartStyle.HeatmapHex"/>, linearly interpolated in RGB.</summary>
internal sealed class HeatScale : IColormap
{
    private readonly Color[] _stops = ChartStyle.HeatmapHex.Select(Color.FromHex).ToArray();

    public string Name => "OpGrowth ink";

    public Color GetColor(double position)
    {
        if (double.IsNaN(position)) return ChartStyle.MissingCell;
        double p = Math.Clamp(position, 0.0, 1.0) * (_stops.Length - 1);
        int i = Math.Min((int)p, _stops.Length - 2);
        return Color.InterpolateRgb(_stops[i], _stops[i + 1], p - i);
    }
}
