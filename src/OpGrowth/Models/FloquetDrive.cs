namespace OpGrowth.Models;

/// <summary>
/// A periodic drive: one period applies the layers in order (layer 0 first in time), and inside a layer
/// the rotations in listed order (first listed first in time), so U(T) = ... R_2 R_1 R_0.
/// </summary>
public sealed class FloquetDrive
{
    public FloquetDrive(IReadOnlyList<IReadOnlyList<PauliRotation>> layers, double period = 1.0)
    {
        ArgumentNullException.ThrowIfNull(layers);
        if (layers.Count == 0) throw new ArgumentException("A drive needs at least one layer.", nameof(layers));
        if (!(period > 0) || !double.IsFinite(period)) throw new ArgumentOutOfRangeException(nameof(period), period, "The period must be positive and finite.");
        Layers = layers;
        Period = period;
    }

    /// <summary>Layers of rotations, layer 0 first in time.</summary>
    public IReadOnlyList<IReadOnlyList<PauliRotation>> Layers { get; }

    /// <summary>Duration of one period (time unit for rates and velocities; 1 unless the file says otherwise).</summary>
    public double Period { get; }

    /// <summary>Total number of rotations in one period.</summary>
    public int RotationCount => Layers.Sum(l => l.Count);
}
