using System.Globalization;
using System.Text.Json;
using System.Text.Json.Serialization;

namespace OpGrowth.IO;

/// <summary>
/// JSON has no NaN or infinity: every result file writes a non-finite number as <c>null</c> (a value that
/// could not be determined), and reads <c>null</c> back as NaN. Older files that spelled them out as strings
/// ("NaN", "Infinity") still read.
/// </summary>
public sealed class NonFiniteAsNull : JsonConverter<double>
{
    /// <summary>Receive JSON null for a double (it means NaN).</summary>
    public override bool HandleNull => true;

    public override double Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options)
    {
        switch (reader.TokenType)
        {
            case JsonTokenType.Null:
                return double.NaN;
            case JsonTokenType.String:
                string s = reader.GetString() ?? "";
                return s switch
                {
                    "NaN" => double.NaN,
                    "Infinity" => double.PositiveInfinity,
                    "-Infinity" => double.NegativeInfinity,
                    _ => double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out double v) ? v : throw new JsonException($"found \"{s}\"; expected a number"),
                };
            default:
                return reader.GetDouble();
        }
    }

    public override void Write(Utf8JsonWriter writer, double value, JsonSerializerOptions options)
    {
        ArgumentNullException.ThrowIfNull(writer);
        if (double.IsFinite(value)) writer.WriteNumberValue(value);
        else writer.WriteNullValue();
    }
}
