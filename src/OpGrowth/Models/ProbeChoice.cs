using System.Globalization;
using OpGrowth.IO;
using OpGrowth.Pauli;

namespace OpGrowth.Models;

/// <summary>
/// The operator a command evolves, as the user names it with --probe: the index of one of the model's
/// probes ("0", "1") or a Pauli string on the model's qubits ("Z_0", "X_3 X_4"); empty means the model's
/// first probe. Every command resolves --probe here, so the option means the same thing everywhere.
/// </summary>
public static class ProbeChoice
{
    /// <summary>Resolves <paramref name="text"/> on <paramref name="model"/> (null or empty: the first probe).</summary>
    public static PauliString Resolve(Model model, string? text, string option = "--probe")
    {
        ArgumentNullException.ThrowIfNull(model);
        if (string.IsNullOrWhiteSpace(text)) return model.Probes[0];
        string t = text.Trim();
        if (int.TryParse(t, NumberStyles.None, CultureInfo.InvariantCulture, out int idx))
        {
            if (idx >= model.Probes.Count)
                throw new InputException($"{option} {t}: found probe index {idx}, but the model has {model.Probes.Count} probe(s); expected an index 0..{model.Probes.Count - 1} or a Pauli string such as Z_0");
            return model.Probes[idx];
        }
        if (!PauliString.TryParse(t, model.N, out var s, out string? error)) throw new InputException($"{option} '{t}': {error}");
        if (s!.IsIdentity) throw new InputException($"{option} '{t}': found the identity; expected a non-identity Pauli string such as Z_0");
        return s;
    }

    /// <summary>True when <paramref name="text"/> names a model probe by index (so a smaller member of the family has it too).</summary>
    public static bool IsIndex(string? text, out int index)
    {
        index = 0;
        if (string.IsNullOrWhiteSpace(text)) return true;
        return int.TryParse(text.Trim(), NumberStyles.None, CultureInfo.InvariantCulture, out index);
    }
}
