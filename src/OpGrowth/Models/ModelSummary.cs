using System.Globalization;
using System.Text;
using System.Text.Json;

namespace OpGrowth.Models;

/// <summary>
/// What "check" reports about a model: size, terms, locality, norm per site, symmetries, seeds,
/// lattice, probes and drive; as aligned text or as JSON.
/// </summary>
public sealed class ModelSummary
{
    private ModelSummary(Model model) => Model = model;

    public Model Model { get; }

    /// <summary>Number of Hamiltonian terms (for a drive: distinct generators of the averaged Hamiltonian).</summary>
    public int Terms => Model.Hamiltonian.Terms.Count;

    /// <summary>Largest number of qubits a term acts on.</summary>
    public int Locality => Model.Hamiltonian.Locality;

    /// <summary>Largest Majorana count of a term (Majorana models), else 0.</summary>
    public int MajoranaLocality => Model.SizeMeasure == SizeMeasure.Majoranas && Terms > 0
        ? Model.Hamiltonian.Terms.Max(t => JordanWigner.MajoranaWeight(t.String)) : 0;

    /// <summary>||H||^2 = Tr(H^2)/2^N = sum of squared coefficients.</summary>
    public double NormSquared => Model.Hamiltonian.FrobeniusNormSquared;

    /// <summary>||H||^2 / N: intensive for an extensive Hamiltonian.</summary>
    public double NormSquaredPerSite => NormSquared / Model.N;

    /// <summary>sqrt(||H||^2 / N), the Frobenius norm per site in energy units.</summary>
    public double NormPerSite => Math.Sqrt(NormSquaredPerSite);

    public static ModelSummary Of(Model model)
    {
        ArgumentNullException.ThrowIfNull(model);
        return new ModelSummary(model);
    }

    private static string F(double v) => v.ToString("G6", CultureInfo.InvariantCulture);

    /// <summary>Human-readable summary, one item per line.</summary>
    public string ToText()
    {
        var m = Model;
        var sb = new StringBuilder();
        void Row(string k, string v) => sb.Append(k.PadRight(13)).Append(v).Append('\n');
        Row("model", m.Name);
        Row("description", m.Description);
        if (m.SourceFile is not null) Row("file", m.SourceFile);
        Row("lattice", m.Lattice.ToString());
        Row("qubits", m.N.ToString(CultureInfo.InvariantCulture) + (m.SizeMeasure == SizeMeasure.Majoranas ? $" ({m.MajoranaCount} Majoranas; size counted in Majoranas)" : " (size counted in qubits)"));
        Row("parameters", m.Parameters.Count == 0 ? "none" : string.Join(", ", m.Parameters.Select(p => $"{p.Key}={F(p.Value)}")));
        Row(m.IsDriven ? "generators" : "terms", Terms.ToString(CultureInfo.InvariantCulture) + $" (locality {Locality}{(m.SizeMeasure == SizeMeasure.Majoranas ? $" qubits, {MajoranaLocality} Majoranas" : "")})");
        Row("norm", $"||H||^2/N = {F(NormSquaredPerSite)}, ||H||/sqrt(N) = {F(NormPerSite)}" + (m.IsDriven ? " (period-averaged generator)" : ""));
        Row("symmetries", m.Symmetries.Count == 0 ? "none declared" : string.Join(", ", m.Symmetries) + " (verified)");
        Row("disorder", m.IsDisordered ? "random couplings, seeds " + string.Join(", ", m.Seeds) : "none");
        Row("uniform", m.IsTranslationInvariant ? "yes (translation-invariant couplings)" : "no");
        Row("probes", string.Join(", ", m.Probes.Select(p => p.ToString())));
        if (m.Drive is { } d)
        {
            Row("drive", $"{d.Layers.Count} layers per period {F(d.Period)}, {d.RotationCount} rotations ({string.Join(" + ", d.Layers.Select(l => l.Count))})");
        }
        else Row("drive", "none (time-independent Hamiltonian)");
        return sb.ToString();
    }

    /// <summary>Writes the summary as one JSON object.</summary>
    public void WriteJson(Utf8JsonWriter w)
    {
        ArgumentNullException.ThrowIfNull(w);
        var m = Model;
        w.WriteStartObject();
        w.WriteString("name", m.Name);
        w.WriteString("description", m.Description);
        if (m.SourceFile is null) w.WriteNull("file");
        else w.WriteString("file", m.SourceFile);
        w.WriteNumber("qubits", m.N);
        w.WriteString("sizeMeasure", m.SizeMeasure == SizeMeasure.Majoranas ? "majoranas" : "qubits");
        w.WriteNumber("majoranas", m.MajoranaCount);
        w.WriteStartObject("lattice");
        w.WriteString("kind", m.Lattice.Kind);
        w.WriteNumber("sites", m.Lattice.N);
        w.WriteNumber("bonds", m.Lattice.Edges.Count);
        w.WriteBoolean("periodic", m.Lattice.Periodic);
        w.WriteNumber("width", m.Lattice.Width);
        w.WriteNumber("height", m.Lattice.Height);
        w.WriteNumber("diameter", m.Lattice.Diameter);
        w.WriteEndObject();
        w.WriteStartObject("parameters");
        foreach (var p in m.Parameters) Number(w, p.Key, p.Value);
        w.WriteEndObject();
        w.WriteNumber("terms", Terms);
        w.WriteNumber("locality", Locality);
        w.WriteNumber("majoranaLocality", MajoranaLocality);
        Number(w, "normSquared", NormSquared);
        Number(w, "normSquaredPerSite", NormSquaredPerSite);
        Number(w, "normPerSite", NormPerSite);
        w.WriteStartArray("symmetries");
        foreach (var s in m.Symmetries) w.WriteStringValue(s);
        w.WriteEndArray();
        w.WriteBoolean("disordered", m.IsDisordered);
        w.WriteStartArray("seeds");
        foreach (var s in m.Seeds) w.WriteNumberValue(s);
        w.WriteEndArray();
        w.WriteBoolean("translationInvariant", m.IsTranslationInvariant);
        w.WriteStartArray("probes");
        foreach (var p in m.Probes) w.WriteStringValue(p.ToString());
        w.WriteEndArray();
        if (m.Drive is { } d)
        {
            w.WriteStartObject("drive");
            Number(w, "period", d.Period);
            w.WriteStartArray("layers");
            foreach (var l in d.Layers) w.WriteNumberValue(l.Count);
            w.WriteEndArray();
            w.WriteNumber("rotations", d.RotationCount);
            w.WriteEndObject();
        }
        else w.WriteNull("drive");
        w.WriteEndObject();
    }

    /// <summary>A number, or null when it is not finite (JSON has no NaN or infinity).</summary>
    private static void Number(Utf8JsonWriter w, string name, double value)
    {
        if (double.IsFinite(value)) w.WriteNumber(name, value);
        else w.WriteNull(name);
    }

    /// <summary>The JSON object as an indented string.</summary>
    public string ToJson()
    {
        using var ms = new MemoryStream();
        using (var w = new Utf8JsonWriter(ms, new JsonWriterOptions { Indented = true }))
        {
            WriteJson(w);
        }
        return Encoding.UTF8.GetString(ms.ToArray());
    }
}
