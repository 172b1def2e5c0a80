using OpGrowth.Models;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Builds a smaller member of the same model family: the model at size <paramref name="n"/> (for a file
/// model, its <c>N</c> parameter overridden), and for disordered models realisation number
/// <paramref name="realization"/> (0 = the model's own seed). Returns null when the family cannot be resized.
/// </summary>
public delegate Model? SmallerMember(int n, int realization);
