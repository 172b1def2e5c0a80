namespace OpGrowth.Diagnosis;

/// <summary>The battery's conclusion: does the model scramble, and if not, the leading mechanism.</summary>
/// <param name="Outcome">Scrambles, fails, or inconclusive.</param>
/// <param name="Leading">The leading mechanism.</param>
/// <param name="Reason">One sentence naming the evidence.</param>
/// <param name="Supporting">Numbers of the tests the conclusion rests on.</param>
/// <param name="Others">Further mechanisms with some support.</param>
public sealed record OverallVerdict(TestOutcome Outcome, Mechanism Leading, string Reason, IReadOnlyList<int> Supporting, IReadOnlyList<Mechanism> Others)
{
    /// <summary>Display name of the leading mechanism.</summary>
    public string LeadingName => MechanismNames.Of(Leading);
}
