namespace OpGrowth.Reporting;

/// <summary>
/// A fitted operator front r(t) = v t + c (distance from the origin site), with v carrying its uncertainty and the
/// fit window (<see cref="Measured.Window"/>) and the threshold that defined the front.
/// </summary>
public sealed record FrontFit(Measured Velocity, double Intercept, double Threshold);
