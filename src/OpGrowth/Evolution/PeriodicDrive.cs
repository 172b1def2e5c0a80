using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// A periodic (Floquet, kicked) drive as layers of Pauli rotations exp(-i Angle P / 2). One period is
/// U = L_last ... L_1 L_0 (layer 0 first in time), each layer the product of its rotations in list
/// order (rotation 0 first in time). The Heisenberg operator after one period is U^dagger O U.
/// </summary>
public sealed record PeriodicDrive(IReadOnlyList<IReadOnlyList<DriveRotation>> Layers, double Period = 1.0);
