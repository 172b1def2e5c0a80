namespace OpGrowth.Reporting;

/// <summary>How report.html carries its figures (both are self-contained).</summary>
public enum HtmlFigureMode
{
    /// <summary>PNG as a base64 data URI in an &lt;img&gt; (looks the same everywhere).</summary>
    Png,

    /// <summary>The SVG inline (sharp when printed; text drawn by the browser's font).</summary>
    Svg,
}
