namespace OpGrowth.Reporting;

/// <summary>
/// One row of the verdict table: which test, the number it looked at, the threshold it compared with, the outcome
/// (e.g. "scrambles", "does not", "inconclusive") and the reason in one sentence.
/// </summary>
public sealed record VerdictRow(string Test, Measured Figure, string Threshold, string Verdict, string Reason);
