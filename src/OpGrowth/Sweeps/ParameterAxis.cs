namespace OpGrowth.Sweeps;

/// <summary>One swept parameter and its values.</summary>
public sealed record ParameterAxis(string Name, IReadOnlyList<double> Values);
