using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Serialization;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Everything the battery found: one verdict per test, the overall verdict with its leading mechanism,
/// the measured data behind each test, and the sizes and budgets used. <see cref="ToJson"/> is for
/// machines, <see cref="ToText"/> for people.
/// </summary>
public sealed record DiagnosisReport
{
    /// <summary>Model name.</summary>
    public required string Model { get; init; }

    /// <summary>Size of the model as given.</summary>
    public required int N { get; init; }

    /// <summary>Lattice kind.</summary>
    public required string Lattice { get; init; }

    /// <summary>Local energy scale epsilon = sqrt(||H||^2/N) (time unit 1/epsilon).</summary>
    public required double Epsilon { get; init; }

    /// <summary>Motion scale (couplings on two or more sites per site); evolution times are in units of its inverse.</summary>
    public required double MotionScale { get; init; }

    /// <summary>Probes used (the first is the main probe).</summary>
    public required IReadOnlyList<string> Probes { get; init; }

    /// <summary>Per-test verdicts, in battery order.</summary>
    public required IReadOnlyList<TestVerdict> Tests { get; init; }

    /// <summary>The overall verdict.</summary>
    public required OverallVerdict Overall { get; init; }

    /// <summary>Caveats that apply to the whole battery (finite size, truncation).</summary>
    public required IReadOnlyList<string> Caveats { get; init; }

    /// <summary>Options used (sizes, budgets).</summary>
    public required DiagnosisSettings Settings { get; init; }

    /// <summary>Total wall time in seconds.</summary>
    public required double Seconds { get; init; }

    /// <summary>Test 1 data.</summary>
    public LevelFindings? Levels { get; init; }

    /// <summary>Test 2 data.</summary>
    public LanczosFindings? Lanczos { get; init; }

    /// <summary>Tests 3 and 4 data.</summary>
    public SpreadingFindings? Spreading { get; init; }

    /// <summary>Test 5 data.</summary>
    public ConservedFindings? Conserved { get; init; }

    /// <summary>Test 6 data.</summary>
    public ThermalFindings? Thermal { get; init; }

    /// <summary>Test 7 data (term structure).</summary>
    public StructureFindings? Structure { get; init; }

    private static readonly JsonSerializerOptions Json = new()
    {
        WriteIndented = true,
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        Converters = { new JsonStringEnumConverter(JsonNamingPolicy.CamelCase), new NonFiniteAsNull(), new NullableNonFiniteAsNull() },
    };

    /// <summary>The report as indented JSON (enums as camel-case strings, NaN and infinities as null).</summary>
    public string ToJson() => JsonSerializer.Serialize(this, Json);

    /// <summary>The report as a text table with the details below it.</summary>
    public string ToText(int width = 120)
    {
        var inv = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        Wrap(sb, string.Create(inv, $"diagnosis of {Model}: N = {N} ({Lattice}), probes {string.Join(", ", Probes)}, epsilon = {Epsilon:0.###}, motion scale {MotionScale:0.###}, {Seconds:0} s"), width, "  ");
        Wrap(sb, string.Create(inv, $"small members: level statistics N = {Settings.LevelN}, conserved quantities N = {Settings.ClusterN}, operator size N = {Settings.SizeN}, finite temperature N = {Settings.ThermalN}"), width, "  ");
        sb.AppendLine();
        int wNum = 2, wName = 20, wVerdict = 12;
        int rest = Math.Max(40, width - wNum - wName - wVerdict - 8);
        int wFigure = rest * 45 / 100, wReason = rest - wFigure;
        var table = new TextTable([wNum, wName, wVerdict, wFigure, wReason]);
        table.Row(["#", "test", "verdict", "figure", "reason"]);
        table.Rule();
        foreach (var t in Tests)
        {
            table.Row([t.Number.ToString(inv), t.Name, MechanismNames.Of(t.Outcome), t.Figure, t.Reason]);
            table.Rule();
        }
        sb.Append(table);
        sb.AppendLine();
        string head = Overall.Outcome switch
        {
            TestOutcome.Scrambles => "OVERALL: SCRAMBLES",
            TestOutcome.Fails => $"OVERALL: FAILS - leading mechanism: {Overall.LeadingName}",
            _ => Overall.Leading == Mechanism.Undetermined ? "OVERALL: INCONCLUSIVE" : $"OVERALL: INCONCLUSIVE - leaning towards: {Overall.LeadingName}",
        };
        sb.Append(head).AppendLine();
        Wrap(sb, Overall.Supporting.Count > 0 ? $"  {Overall.Reason} (tests {string.Join(", ", Overall.Supporting)})." : $"  {Overall.Reason}.", width, "  ");
        if (Overall.Others.Count > 0) Wrap(sb, $"  also seen: {string.Join(", ", Overall.Others.Select(MechanismNames.Of))}", width, "  ");
        sb.AppendLine();
        sb.AppendLine("thresholds and sources:");
        foreach (var t in Tests)
        {
            if (t.Threshold == "-") continue;
            Wrap(sb, $"  {t.Number}. {t.Threshold}. Source: {t.Source}.", width, "     ");
        }
        var notes = Tests.SelectMany(t => t.Notes.Select(n => (t.Number, n))).ToList();
        if (notes.Count > 0)
        {
            sb.AppendLine();
            sb.AppendLine("notes:");
            foreach (var (num, n) in notes) Wrap(sb, $"  {num}. {n}", width, "     ");
        }
        if (Caveats.Count > 0)
        {
            sb.AppendLine();
            sb.AppendLine("caveats:");
            foreach (var c in Caveats) Wrap(sb, $"  - {c}", width, "    ");
        }
        sb.AppendLine();
        Wrap(sb, "time per test: " + string.Join(", ", Tests.Select(t => string.Create(inv, $"{t.Number}: {t.Seconds:0} s"))), width, "  ");
        return sb.ToString();
    }

    private static void Wrap(StringBuilder sb, string text, int width, string indent)
    {
        foreach (var line in TextTable.WrapText(text, width, indent)) sb.AppendLine(line);
    }
}

/// <summary>The sizes and budgets a report was made with.</summary>
/// <param name="LevelN">Small size for level statistics.</param>
/// <param name="ClusterN">Cluster size of the conserved-quantity search.</param>
/// <param name="MaxWeight">Largest string weight of that search.</param>
/// <param name="SizeN">Small size of the exact operator-size run.</param>
/// <param name="ThermalN">Small size at finite temperature.</param>
/// <param name="BetaEpsilon">Temperatures as beta epsilon.</param>
/// <param name="LanczosDepth">Lanczos depth requested.</param>
/// <param name="LanczosMaxStrings">Lanczos string budget (truncated runs).</param>
/// <param name="EvolutionMaxStrings">Evolution string budget of the main probe.</param>
/// <param name="EvolutionTime">Evolution time in units of 1/epsilon.</param>
/// <param name="Threads">Threads.</param>
public sealed record DiagnosisSettings(int LevelN, int ClusterN, int MaxWeight, int SizeN, int ThermalN, IReadOnlyList<double> BetaEpsilon,
    int LanczosDepth, long LanczosMaxStrings, long EvolutionMaxStrings, double EvolutionTime, int Threads);

/// <summary>Writes NaN and infinities as JSON null (a number that is not a number is no value).</summary>
internal sealed class NonFiniteAsNull : JsonConverter<double>
{
    public override double Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options)
        => reader.TokenType == JsonTokenType.Null ? double.NaN : reader.GetDouble();

    public override void Write(Utf8JsonWriter writer, double value, JsonSerializerOptions options)
    {
        if (double.IsFinite(value)) writer.WriteNumberValue(value);
        else writer.WriteNullValue();
    }
}

/// <summary>The same for nullable doubles.</summary>
internal sealed class NullableNonFiniteAsNull : JsonConverter<double?>
{
    public override double? Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options)
        => reader.TokenType == JsonTokenType.Null ? null : reader.GetDouble();

    public override void Write(Utf8JsonWriter writer, double? value, JsonSerializerOptions options)
    {
        if (value is double v && double.IsFinite(v)) writer.WriteNumberValue(v);
        else writer.WriteNullValue();
    }
}
