namespace OpGrowth.Sweeps;

/// <summary>One t*(N) series (fixed model, parameters, probe and engine options) with its fits and plot-ready curves.</summary>
public sealed record SeriesFit
{
    /// <summary>Series key.</summary>
    public required string Group { get; init; }

    /// <summary>Model label.</summary>
    public required string Model { get; init; }

    /// <summary>Parameter values.</summary>
    public required SortedDictionary<string, double> Parameters { get; init; }

    /// <summary>Probe template.</summary>
    public required string Probe { get; init; }

    /// <summary>Engine(s).</summary>
    public required string Engine { get; init; }

    /// <summary>Disorder averages by N (the fitted data, with their separate errors).</summary>
    public required IReadOnlyList<DisorderAverage> Data { get; init; }

    /// <summary>Both fits and which the data prefer; null with fewer than three sizes.</summary>
    public FitComparison? Comparison { get; init; }

    /// <summary>t*(N_max) / t*(N_min).</summary>
    public double? TStarRatio { get; init; }

    /// <summary>N_max / N_min.</summary>
    public double? SizeRatio { get; init; }

    /// <summary>Both fitted laws sampled between N_min and N_max, for plotting.</summary>
    public required IReadOnlyList<CurvePoint> Curve { get; init; }

    /// <summary>Remarks (left-out sizes, too few sizes).</summary>
    public string? Note { get; init; }

    /// <summary>Human-readable label: model, parameters, probe.</summary>
    public string Label => string.Join(' ', new[] { Model }.Concat(Parameters.Select(kv => $"{kv.Key}={EngineSettings.F(kv.Value)}")).Append(Probe));
}
