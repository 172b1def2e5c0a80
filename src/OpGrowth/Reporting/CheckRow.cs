namespace OpGrowth.Reporting;

/// <summary>A consistency check (e.g. Pauli against exact, norm conservation): the number, the tolerance, pass or fail.</summary>
public sealed record CheckRow(string Name, Measured Figure, string Tolerance, bool Passed);
