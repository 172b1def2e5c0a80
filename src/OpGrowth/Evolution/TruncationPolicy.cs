namespace OpGrowth.Evolution;

/// <summary>
/// How the evolving operator is kept finite. Every rule books the weight it removes (sum of c^2).
/// What each rule biases:
/// <list type="bullet">
/// <item><see cref="Threshold"/> (drop |c| &lt; eps): removes the many small coefficients of large,
/// late strings first, so late-time mean size and the saturation plateau are biased low; the front
/// (leading edge) is affected little while its coefficients stay above eps.</item>
/// <item><see cref="MaxStrings"/> / <see cref="MemoryBytes"/> (keep the M largest |c|): same direction
/// as the threshold but with an adaptive cut; once the operator has spread, weight is lost every
/// step and the late-time size distribution is biased towards the strings that carry most weight.</item>
/// <item><see cref="MaxSize"/> (drop strings larger than K): suppresses size growth by construction;
/// mean size, the saturation value and growth rates are all biased low (t* late), and the size can never exceed K.
/// Use it only to study early times or short strings.</item>
/// <item><see cref="DampingRate"/> (dissipation-assisted operator evolution: multiply c_S by
/// exp(-gamma (size(S) - l*)) for size(S) &gt; l* per unit of time): keeps short-string (hydrodynamic)
/// autocorrelations accurate while removing long strings; biases mean size, OTOCs and the front
/// downward once strings longer than l* carry weight.
/// Source: T. Rakovszky, C. W. von Keyserlingk, F. Pollmann, Phys. Rev. B 105, 075131 (2022).</item>
/// </list>
/// </summary>
public sealed record TruncationPolicy
{
    /// <summary>Drop strings with |c| below this after every pass (0: off).</summary>
    public double Threshold { get; init; }

    /// <summary>Keep at most this many strings (largest |c|) after every pass; null: derived from <see cref="MemoryBytes"/>.</summary>
    public long? MaxStrings { get; init; }

    /// <summary>Memory budget in bytes for the run's arrays; null: half of the machine's memory.</summary>
    public long? MemoryBytes { get; init; }

    /// <summary>Drop strings with more than this many non-identity sites (null: off).</summary>
    public int? MaxSize { get; init; }

    /// <summary>DAOE damping rate gamma per unit time (0: off).</summary>
    public double DampingRate { get; init; }

    /// <summary>DAOE size l* above which strings are damped.</summary>
    public int DampingMinSize { get; init; }

    /// <summary>
    /// Branches of a grouped rotation pass whose amplitude is below this fraction of the current cut
    /// (the weakest kept |c|, or the threshold) are not generated; the norm this loses is booked as
    /// discarded weight. Pruning before the contributions to a string are summed can break the
    /// interference that keeps a rotation unitary: at 0.1 the mixed-field Ising chain (128 sites,
    /// 10^5 strings) gained norm (||O||^2 &gt; 1) and ran away; at 0.01 and 0.001 it stayed unitary to
    /// 1e-6 (norm^2 + discarded = 1). Default 0.01; 0 disables pruning (slower, exact passes).
    /// </summary>
    public double PassPruneFraction { get; init; } = 0.01;

    /// <summary>True when nothing is truncated (exact evolution up to rounding).</summary>
    public bool IsExact => Threshold == 0 && MaxStrings is null && MemoryBytes is null && MaxSize is null && DampingRate == 0;

    /// <summary>No truncation at all (memory still limited by the machine).</summary>
    public static TruncationPolicy None => new() { MemoryBytes = null };
}
