using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Key width for the recursion: <see cref="ChainKey32"/> (8 bytes) up to 32 sites, <see cref="ChainKey48"/>
/// (12 bytes) up to 48, otherwise the narrowest general key (<see cref="PauliWidth.Dispatch{TResult,TFunc}"/>).
/// The packed keys hash and order strings as <see cref="Pauli64"/> does, so the choice never changes a result.
/// </summary>
internal static class ChainWidth
{
    public static TResult Dispatch<TResult, TFunc>(int n, TFunc func) where TFunc : IWidthFunc<TResult>
        => n switch
        {
            >= 1 and <= 32 => func.Invoke<ChainKey32>(),
            > 32 and <= 48 => func.Invoke<ChainKey48>(),
            _ => PauliWidth.Dispatch<TResult, TFunc>(n, func),
        };
}
