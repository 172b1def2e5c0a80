using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Sweeps;

/// <summary>The model of a sweep point, built from its file with the point's N, parameters and seed, and its probe.</summary>
public sealed record PointModel(Model Model, PauliString Probe)
{
    /// <summary>Loads the point's model file with its overrides and resolves the probe.</summary>
    public static PointModel Load(SweepPoint point)
    {
        ArgumentNullException.ThrowIfNull(point);
        var model = ModelLoader.Load(point.ModelFile, point.Overrides());
        if (model.N != point.N)
        {
            throw new InputException(point.ModelFile, 0,
                $"found a model of {model.N} qubits when the sweep set N = {point.N}; expected a model whose lattice size is the parameter N (sweep other lattice parameters with [parameters])");
        }
        PauliString probe;
        if (ProbeTemplate.IsModelProbe(point.Probe, out int k))
        {
            if (k >= model.Probes.Count) throw new InputException(point.ModelFile, 0, $"found {model.Probes.Count} default probe(s); expected at least {k + 1} for probe 'model:{k}'");
            probe = model.Probes[k];
        }
        else
        {
            probe = PauliString.Parse(point.Probe, model.N);
        }
        return new PointModel(model, probe);
    }

    /// <summary>Saturation of the mean size of a random operator in the model's measure: 3N/4 qubits, or N of 2N Majoranas.</summary>
    public double SaturationSize => Model.SizeMeasure == SizeMeasure.Majoranas ? Model.N : 0.75 * Model.N;
}
