namespace OpGrowth.Pauli;

/// <summary>A computation generic over the key width; <see cref="PauliWidth.Dispatch{TResult,TFunc}"/> picks the width.</summary>
public interface IWidthFunc<out TResult>
{
    TResult Invoke<T>() where T : unmanaged, IPauliKey<T>;
}

/// <summary>Chooses the narrowest key type for N qubits, once per computation (not per operation).</summary>
public static class PauliWidth
{
    /// <summary>Largest N any key type holds.</summary>
    public const int MaxQubits = 1024;

    /// <summary>Runs <paramref name="func"/> specialised for the narrowest key that holds N qubits.</summary>
    public static TResult Dispatch<TResult, TFunc>(int n, TFunc func) where TFunc : IWidthFunc<TResult>
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        return n switch
        {
            <= 64 => func.Invoke<Pauli64>(),
            <= 128 => func.Invoke<Pauli128>(),
            <= 256 => func.Invoke<PauliWide<Words4>>(),
            <= 512 => func.Invoke<PauliWide<Words8>>(),
            <= 1024 => func.Invoke<PauliWide<Words16>>(),
            _ => throw new ArgumentOutOfRangeException(nameof(n), n, $"At most {MaxQubits} qubits are supported."),
        };
    }

    /// <summary>Bytes of one key for N qubits.</summary>
    public static int KeyBytes(int n) => n switch
    {
        <= 64 => 16,
        <= 128 => 32,
        <= 256 => 64,
        <= 512 => 128,
        _ => 256,
    };
}
