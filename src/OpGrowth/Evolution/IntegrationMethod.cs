namespace OpGrowth.Evolution;

/// <summary>How a time step is taken.</summary>
public enum IntegrationMethod
{
    /// <summary>
    /// Second-order Trotter-Suzuki (symmetric) splitting over commuting groups; norm-preserving;
    /// global error O(dt^2). Source: M. Suzuki, Phys. Lett. A 146, 319 (1990).
    /// </summary>
    Trotter2,

    /// <summary>
    /// Fourth-order Suzuki fractal splitting S4(dt) = S2(p dt)^2 S2((1-4p) dt) S2(p dt)^2,
    /// p = 1/(4 - 4^{1/3}); norm-preserving; global error O(dt^4).
    /// Source: M. Suzuki, J. Math. Phys. 32, 400 (1991).
    /// </summary>
    Trotter4,

    /// <summary>Classical fourth-order Runge-Kutta on dO/dt = i[H, O]; not norm-preserving (cross-check); global error O(dt^4).</summary>
    Rk4,

    /// <summary>Taylor series of exp(dt L) summed until the next term is below double precision: exact to rounding (reference).</summary>
    Taylor,
}
