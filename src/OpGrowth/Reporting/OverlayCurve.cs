namespace OpGrowth.Reporting;

/// <summary>One more quantity from both engines in a Pauli-versus-exact figure (e.g. an OTOC F_j(t)).</summary>
public sealed record OverlayCurve(string Label, double[] Pauli, double[] Exact);
