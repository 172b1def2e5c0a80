using Microsoft.Extensions.Logging;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>Settings of an exact OTOC run (see <see cref="ExactOtoc"/>).</summary>
public sealed record ExactOtocOptions
{
    /// <summary>The evolved operator W (a Pauli string); W(t) = e^{iHt} W e^{-iHt}.</summary>
    public required PauliString Operator { get; init; }

    /// <summary>Time grid (non-negative, ascending).</summary>
    public required IReadOnlyList<double> Times { get; init; }

    /// <summary>
    /// Sites j for which F is computed against V = X_j, Y_j and Z_j (site-resolved OTOCs); null = every
    /// site; empty = none.
    /// </summary>
    public IReadOnlyList<int>? Sites { get; init; }

    /// <summary>Further probes V (any Pauli strings; single-site ones are better given through <see cref="Sites"/>).</summary>
    public IReadOnlyList<PauliString> Probes { get; init; } = [];

    /// <summary>
    /// Also estimate the mean operator size n(t) for all sites at once with a random-sign probe (beta = 0
    /// only; two propagations per time instead of two per site). Used when not every site is resolved.
    /// </summary>
    public bool EstimateMeanSize { get; init; }

    /// <summary>Inverse temperature; 0 = infinite temperature. The regularised OTOC Tr(y W(t) y V y W(t) y V), y = rho^{1/4}.</summary>
    public double Beta { get; init; }

    /// <summary>Trace evaluation.</summary>
    public OtocMethod Method { get; init; } = OtocMethod.Auto;

    /// <summary>Random states per estimate (typicality).</summary>
    public int Samples { get; init; } = 4;

    /// <summary>Seed of the random states.</summary>
    public int Seed { get; init; } = 1;

    /// <summary>Error tolerance of each propagation (relative norm of the state error).</summary>
    public double Tolerance { get; init; } = 1e-8;

    /// <summary>Worker threads for the state-vector kernels (0 = all cores).</summary>
    public int Threads { get; init; }

    /// <summary>Window of the growth-rate fit on C(t) = 1 - F(t)/F(0): lower and upper value (common practice: before saturation).</summary>
    public (double Low, double High) FitRange { get; init; } = (1e-3, 0.3);

    /// <summary>Progress log (optional).</summary>
    public ILogger? Logger { get; init; }

    /// <summary>Allow dense diagonalisation above N = 10 (slow; up to 13).</summary>
    public bool AllowLargeDense { get; init; }
}
