using Microsoft.Extensions.Logging;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// The runner a sweep uses: routes each point to the engine its options resolve to (synthetic, Pauli
/// or exact). Engines that are not part of this build make every point that needs them an input error
/// before anything runs.
/// </summary>
public sealed partial class PointRunners : IPointRunner
{
    private readonly IPointRunner _synthetic;
    private readonly IPointRunner? _pauli;
    private readonly IPointRunner? _exact;

    public PointRunners(IPointRunner synthetic, IPointRunner? pauli, IPointRunner? exact)
    {
        _synthetic = synthetic;
        _pauli = pauli;
        _exact = exact;
    }

    /// <summary>Every engine this build has, each point using <paramref name="threads"/> threads.</summary>
    public static PointRunners Create(int threads, ILogger? logger = null)
    {
        IPointRunner? pauli = null, exact = null;
        CreatePauli(threads, logger, ref pauli);
        CreateExact(threads, logger, ref exact);
        return new PointRunners(new SyntheticPointRunner(), pauli, exact);
    }

    /// <summary>True when the Pauli engine is wired into this build.</summary>
    public bool HasPauli => _pauli is not null;

    /// <summary>True when the exact engine is wired into this build.</summary>
    public bool HasExact => _exact is not null;

    public long EstimateMemoryBytes(SweepPoint point) => For(point).EstimateMemoryBytes(point);

    public double? EstimateSeconds(SweepPoint point) => For(point).EstimateSeconds(point);

    public PointResult Run(SweepPoint point, CancellationToken cancellationToken) => For(point).Run(point, cancellationToken);

    private IPointRunner For(SweepPoint point) => point.ResolvedEngine switch
    {
        EngineChoice.Synthetic => _synthetic,
        EngineChoice.Pauli => _pauli ?? throw new InputException($"point {point.Index} ({point}) needs the Pauli engine, which this build does not include; expected engine = \"synthetic\" or a build with the evolution engine"),
        EngineChoice.Exact => _exact ?? throw new InputException($"point {point.Index} ({point}) needs the exact engine, which this build does not include; expected engine = \"pauli\" (or exact_max_n below N) or a build with the exact engine"),
        _ => throw new InputException($"point {point.Index}: engine 'auto' was not resolved"),
    };

    static partial void CreatePauli(int threads, ILogger? logger, ref IPointRunner? runner);

    static partial void CreateExact(int threads, ILogger? logger, ref IPointRunner? runner);
}
