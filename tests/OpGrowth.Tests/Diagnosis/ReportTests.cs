using System.Text.Json;
using OpGrowth.Cli;
using OpGrowth.Diagnosis;

namespace OpGrowth.Tests.Diagnosis;

/// <summary>The report's JSON and text forms, the family resizer, and the command line.</summary>
public class ReportTests
{
    private static DiagnosisReport Sample()
    {
        var tests = Enumerable.Range(1, 6).Select(n => new TestVerdict
        {
            Number = n,
            Name = $"test {n}",
            Outcome = n == 2 ? TestOutcome.Fails : TestOutcome.Scrambles,
            Figure = n == 6 ? "lambda/(2 pi T) = NaN" : "figure",
            Threshold = "threshold",
            Source = "source",
            Reason = "a reason that is long enough to wrap in the table's reason column when it is printed for people",
            Evidence = [Mechanism.Scrambles],
            Notes = ["a note"],
        }).ToArray();
        return new DiagnosisReport
        {
            Model = "sample",
            N = 12,
            Lattice = "chain",
            Epsilon = 1.5,
            MotionScale = 1.0,
            Probes = ["Z_6"],
            Tests = tests,
            Overall = new OverallVerdict(TestOutcome.Fails, Mechanism.FreeFermions, "because", [2], [Mechanism.Localized]),
            Caveats = ["finite size"],
            Settings = new DiagnosisSettings(12, 10, 2, 12, 12, [0.5, 1, 2], 24, 200000, 65536, 24, 2),
            Seconds = double.NaN,
        };
    }

    [Fact]
    public void ToJson_SampleReport_ParsesWithNamedOutcomes()
    {
        using var doc = JsonDocument.Parse(Sample().ToJson());
        var r = doc.RootElement;
        Assert.Equal("fails", r.GetProperty("overall").GetProperty("outcome").GetString());
        Assert.Equal("freeFermions", r.GetProperty("overall").GetProperty("leading").GetString());
        Assert.Equal("free fermions", r.GetProperty("overall").GetProperty("leadingName").GetString());
        Assert.Equal(6, r.GetProperty("tests").GetArrayLength());
        Assert.Equal(JsonValueKind.Null, r.GetProperty("seconds").ValueKind); // non-finite numbers are written as null
    }

    [Fact]
    public void ToText_SampleReport_HasTableOverallAndSources()
    {
        string text = Sample().ToText(100);
        Assert.Contains("OVERALL: FAILS - leading mechanism: free fermions", text);
        Assert.Contains("thresholds and sources:", text);
        Assert.All(text.Split('\n'), line => Assert.True(line.TrimEnd('\r').Length <= 100, $"line too long: {line}"));
    }

    private static (int Code, string Out, string Err) Cli(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        int code = Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    [Fact]
    public void Diagnose_TinyModelJson_RunsAllSevenTests()
    {
        var (code, output, err) = Cli("diagnose", "mixed-field-ising", "--set", "N=6", "--effort", "quick", "--level-n", "6",
            "--cluster-n", "5", "--thermal-n", "6", "--betas", "1", "--threads", "2", "--json");
        Assert.True(code == 0, err);
        using var doc = JsonDocument.Parse(output);
        Assert.Equal(7, doc.RootElement.GetProperty("tests").GetArrayLength());
        Assert.Contains(doc.RootElement.GetProperty("overall").GetProperty("outcome").GetString(), new[] { "scrambles", "fails", "inconclusive" });
    }

    [Fact]
    public void Diagnose_BadEffort_ExitsWithInputError()
    {
        var (code, _, err) = Cli("diagnose", "mixed-field-ising", "--effort", "lots");
        Assert.Equal(1, code); // a usage error, as for every command's --effort
        Assert.Contains("lots", err);
        Assert.Contains("quick", err);
    }
}
