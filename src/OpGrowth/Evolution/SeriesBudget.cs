namespace OpGrowth.Evolution;

/// <summary>One budget of the budget series (the resolved truncation knobs of one run).</summary>
/// <param name="Index">0 = the run at the full budget; 1 = half; 2 = a quarter.</param>
/// <param name="Threshold">Coefficient threshold (0: off).</param>
/// <param name="MaxStrings">String cap (null: none).</param>
/// <param name="MaxSize">Size cap (null: none).</param>
/// <param name="DampingRate">DAOE rate (0: off).</param>
/// <param name="DampingMinSize">DAOE l*.</param>
/// <param name="MemoryBytes">Byte budget for the arrays.</param>
public sealed record SeriesBudget(int Index, double Threshold, long? MaxStrings, int? MaxSize, double DampingRate, int DampingMinSize, long MemoryBytes)
{
    /// <summary>True when any rule can remove weight.</summary>
    public bool IsTruncating => Threshold > 0 || MaxStrings is not null || MaxSize is not null || DampingRate > 0;
}
