using OpGrowth.Models;

namespace OpGrowth.Tests.Models;

public class ExpressionTests
{
    private static double Eval(string text, params (string, double)[] p)
    {
        Assert.True(Expression.TryParse(text, out var e, out string? problem), problem);
        return e!.Evaluate(p.ToDictionary(x => x.Item1, x => x.Item2));
    }

    [Theory]
    [InlineData("1 + 2 * 3", 7)]
    [InlineData("(1 + 2) * 3", 9)]
    [InlineData("2 ^ 3 ^ 2", 512)] // right-associative
    [InlineData("-2 ^ 2", -4)]     // the sign applies after the power, as in mathematics
    [InlineData("2 ^ -1", 0.5)]
    [InlineData("8 / 4 / 2", 1)]   // left-associative
    [InlineData("1e-3 * 1E3", 1)]
    [InlineData("sqrt(16) + abs(-1) + floor(2.7) + ceil(0.2) + round(2.5)", 4 + 1 + 2 + 1 + 3)]
    [InlineData("min(3, 4) + max(3, 4)", 7)]
    [InlineData("cos(pi)", -1)]
    [InlineData("- - 3", 3)]
    public void Evaluate_Arithmetic_MatchesHandValue(string text, double expected)
        => Assert.Equal(expected, Eval(text), 12);

    [Fact]
    public void Evaluate_ParametersAndNames()
    {
        Assert.Equal(0.25, Eval("J/sqrt(N)", ("J", 1), ("N", 16)), 15);
        Assert.True(Expression.TryParse("a*b + a + pi", out var e, out _));
        Assert.Equal(["a", "b"], e!.Names);
    }

    [Theory]
    [InlineData("")]
    [InlineData("1 +")]
    [InlineData("(1")]
    [InlineData("1)")]
    [InlineData("foo(1)")]
    [InlineData("sqrt(1, 2)")]
    [InlineData("1.2.3")]
    [InlineData("2 $ 3")]
    public void TryParse_Malformed_ReturnsProblem(string text)
    {
        Assert.False(Expression.TryParse(text, out _, out string? problem));
        Assert.False(string.IsNullOrEmpty(problem));
    }

    [Fact]
    public void TryParse_DeepNesting_FailsCleanly()
    {
        Assert.False(Expression.TryParse(new string('(', 500) + "1" + new string(')', 500), out _, out _));
        Assert.False(Expression.TryParse(string.Concat(Enumerable.Repeat("-", 500)) + "1", out _, out _));
    }
}
