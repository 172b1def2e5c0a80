using OpGrowth.Pauli;

namespace OpGrowth.Models;

/// <summary>One Pauli rotation exp(-i Angle P / 2) of a periodic drive.</summary>
public sealed record PauliRotation(PauliString Generator, double Angle)
{
    public override string ToString()
        => $"exp(-i {Angle.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}/2 {Generator})";
}
