using OpGrowth.Reporting;

namespace OpGrowth.Tests.Reporting;

/// <summary>A sample report with three small figures, rendered once per test class.</summary>
public sealed class ReportFixture
{
    public ReportFixture()
    {
        Figures =
        [
            Charts.MeanSize(SampleData.Mean(), FigureSize.Small),
            Charts.LightCone(SampleData.Cone(), FigureSize.Small),
            Charts.Lines(SampleData.Lines(), FigureSize.Small),
        ];
    }

    public IReadOnlyList<FigureImage> Figures { get; }

    /// <summary>A document that uses every section; text includes characters that need escaping.</summary>
    public ReportDocument Document()
    {
        var doc = new ReportDocument("Scrambling report: ring of 8 <test> sites")
        {
            Subtitle = "Does it scramble, how fast, and can the answer be trusted?",
            VerdictSummary = "Scrambles: the operator front moves at v_B = 1.49 ± 0.05 and t* = 2.6 ± 0.1; all checks passed.",
            Created = new DateTimeOffset(2030, 1, 2, 3, 4, 5, TimeSpan.Zero),
        };
        doc.AddModel("model", "demo-ring.toml")
           .AddModel("sites N", "8 (qubits)")
           .AddModel("Hamiltonian", "Σ_j (X_j X_{j+1} + 0.5 Z_j) | piped & <tagged>");
        doc.Headlines.Add(new HeadlineFigure("butterfly velocity v_B", new Measured(1.49, 0.05, "front speed at threshold 0.5", new FitWindow(0.5, 3), "sites/time"), true));
        doc.Headlines.Add(new HeadlineFigure("scrambling time t*", new Measured(2.6, 0.1, "first time n(t) = 3N/8"), false) { Note = "budget 1e4 differs by 0.3" });
        doc.Verdicts.Add(new VerdictRow("operator growth", new Measured(5.9, 0.1, "late-time mean size"), "> 0.9 × 3N/4", "scrambles", "mean size reaches 98% of saturation"));
        doc.Checks.Add(new CheckRow("Pauli vs exact OTOC", Measured.Exact(3.2e-9, "max |difference| over t in [0, 6]"), "1e-6", true));
        doc.Checks.Add(new CheckRow("norm conservation", Measured.Exact(1e-3, "1 - ||O(t)||² at t = 6"), "1e-4", false));
        doc.Cautions.Add("Truncation bias: kept strings carry 99.9% of the weight at t = 6; results after that are biased low.");
        doc.Cautions.Add("Infinite temperature: an experiment at finite temperature sees a slower front.");
        foreach (FigureImage f in Figures) doc.Figures.Add(f);
        doc.DataFiles.Add(new DataFileEntry("data/mean-size.csv", "t, n(t), uncertainty"));
        doc.DataFiles.Add(new DataFileEntry("results.json", "every number with its window"));
        return doc;
    }
}
