namespace OpGrowth.Diagnosis;

/// <summary>
/// The verdict of one test of the battery: the measured figure, the threshold it was compared with and
/// where that threshold comes from (a paper, or "common practice"), a one-sentence reason, and the
/// mechanisms the result points to.
/// </summary>
public sealed record TestVerdict
{
    /// <summary>Test number 1..6 (battery order).</summary>
    public required int Number { get; init; }

    /// <summary>Short name, e.g. "level statistics".</summary>
    public required string Name { get; init; }

    /// <summary>The verdict.</summary>
    public required TestOutcome Outcome { get; init; }

    /// <summary>The figure as measured, with its error or window, e.g. "&lt;r&gt; = 0.531 +- 0.004 (N = 12)".</summary>
    public required string Figure { get; init; }

    /// <summary>The threshold the figure was compared with.</summary>
    public required string Threshold { get; init; }

    /// <summary>Where the threshold or reference value comes from.</summary>
    public required string Source { get; init; }

    /// <summary>One sentence in the trade's words.</summary>
    public required string Reason { get; init; }

    /// <summary>Mechanisms this result supports (may be empty).</summary>
    public IReadOnlyList<Mechanism> Evidence { get; init; } = [];

    /// <summary>Further remarks: warnings, skipped parts, finite-size caveats.</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>Wall time of the test in seconds.</summary>
    public double Seconds { get; init; }

    /// <summary>A verdict for a test that did not run (not applicable, skipped, or failed to run).</summary>
    /// <summary>A verdict of a test whose figure, threshold, source and notes are settled: only the outcome, reason and evidence vary.</summary>
    public static TestVerdict Of(int number, string name, string figure, string threshold, string source, IReadOnlyList<string>? notes,
        TestOutcome outcome, string reason, IReadOnlyList<Mechanism> evidence) => new()
    {
        Number = number,
        Name = name,
        Outcome = outcome,
        Figure = figure,
        Threshold = threshold,
        Source = source,
        Reason = reason,
        Evidence = evidence,
        Notes = notes ?? [],
    };

    public static TestVerdict NotRun(int number, string name, string reason, double seconds = 0) => new()
    {
        Number = number,
        Name = name,
        Outcome = TestOutcome.NotRun,
        Figure = "not measured",
        Threshold = "-",
        Source = "-",
        Reason = reason,
        Seconds = seconds,
    };
}
