namespace OpGrowth.Sweeps;

/// <summary>A sample of both fitted laws at size N.</summary>
public sealed record CurvePoint(double N, double LogFit, double LinearFit);
