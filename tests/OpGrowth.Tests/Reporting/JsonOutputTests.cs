using System.Text.Json;
using OpGrowth.IO;

namespace OpGrowth.Tests.Reporting;

/// <summary>One JSON style in every result file: camelCase keys, and null where a number is not finite.</summary>
public class JsonOutputTests
{
    private sealed record Sample(double A, double B, double C, double? D, double[] E);

    [Fact]
    public void NonFiniteNumbers_AreWrittenAsNullAndReadBackAsNaN()
    {
        // JSON (RFC 8259, section 6) has no NaN or infinity; null is the value "not determined".
        string json = JsonSerializer.Serialize(new Sample(double.NaN, double.PositiveInfinity, 1.5, double.NaN, [double.NegativeInfinity, 2]), AtomicFile.Json);
        using var doc = JsonDocument.Parse(json);
        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("a").ValueKind);
        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("b").ValueKind);
        Assert.Equal(1.5, doc.RootElement.GetProperty("c").GetDouble());
        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("d").ValueKind);
        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("e")[0].ValueKind);
        Assert.DoesNotContain("NaN", json);
        Assert.DoesNotContain("Infinity", json);
        var back = JsonSerializer.Deserialize<Sample>(json, AtomicFile.Json)!;
        Assert.True(double.IsNaN(back.A));
        Assert.Equal(1.5, back.C);
        // Files written before the change spelled them out; they still read.
        var old = JsonSerializer.Deserialize<Sample>("""{"a":"NaN","b":"Infinity","c":1,"d":null,"e":["-Infinity"]}""", AtomicFile.Json)!;
        Assert.True(double.IsNaN(old.A) && double.IsPositiveInfinity(old.B) && double.IsNegativeInfinity(old.E[0]));
    }

    /// <summary>Asserts that no property name in a JSON document has an underscore, except inside user-named dictionaries.</summary>
    internal static void AssertCamelCase(string json, string what, params string[] userDictionaries)
    {
        using var doc = JsonDocument.Parse(json);
        void Walk(JsonElement e, string path)
        {
            if (e.ValueKind == JsonValueKind.Object)
            {
                foreach (var p in e.EnumerateObject())
                {
                    Assert.False(p.Name.Contains('_', StringComparison.Ordinal), $"{what}: key '{p.Name}' at {path} is not camelCase");
                    if (!userDictionaries.Contains(p.Name)) Walk(p.Value, path + "." + p.Name);
                }
            }
            else if (e.ValueKind == JsonValueKind.Array)
            {
                int i = 0;
                foreach (var x in e.EnumerateArray()) Walk(x, $"{path}[{i++}]");
            }
        }
        Walk(doc.RootElement, "$");
    }
}
