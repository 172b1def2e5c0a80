namespace OpGrowth.Pauli;

/// <summary>
/// A linear map on operators defined string by string: for one input string with coefficient c,
/// emit the (string, coefficient) contributions of its image. Implement as a readonly struct so
/// the JIT inlines <see cref="Apply"/> into the driver loop (<see cref="PauliMapper"/>).
/// </summary>
public interface IPauliMap<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Emits the image of coefficient * key into <paramref name="sink"/>.</summary>
    void Apply(in T key, double coefficient, EmitBuffer<T> sink);
}
