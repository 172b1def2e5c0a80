using OpGrowth.Reporting;

namespace OpGrowth.Tests.Reporting;

/// <summary>
/// Rounding of reported numbers. Expected strings follow the Particle Data Group rule for quoting errors
/// (three leading digits of the uncertainty: 100-354 keep two significant digits, 355-949 one, 950-999 round up
/// to two). Source: Particle Data Group, Review of Particle Physics, introduction (from memory).
/// Exact string comparison: formatting is deterministic.
/// </summary>
public class NumberFormatTests
{
    [Theory]
    [InlineData(1.234, 0.056, "1.23 ± 0.06")]      // 560 -> one digit
    [InlineData(1.234, 0.0123, "1.234 ± 0.012")]   // 123 -> two digits
    [InlineData(1.2346, 0.0354, "1.235 ± 0.035")]  // 354 -> two digits (upper edge)
    [InlineData(1.2346, 0.0355, "1.23 ± 0.04")]    // 355 -> one digit (lower edge)
    [InlineData(2.5, 0.97, "2.5 ± 1.0")]           // 970 -> rounds up to 1000, two digits
    [InlineData(0.7512, 0.0004, "0.7512 ± 0.0004")]
    [InlineData(1234.5, 56, "1230 ± 60")]          // uncertainty above 10: both rounded to tens
    [InlineData(-3.14159, 0.021, "-3.142 ± 0.021")]
    [InlineData(-0.0004, 0.01, "0.000 ± 0.010")]   // no "-0"
    [InlineData(1.5e-6, 2.3e-8, "(1.500 ± 0.023)e-6")]
    [InlineData(123456, 789, "(1.235 ± 0.008)e5")]
    [InlineData(0.75, 0, "0.75 ± 0")]
    public void ValueWithUncertainty_Examples_RoundAsDocumented(double value, double uncertainty, string expected)
        => Assert.Equal(expected, NumberFormat.ValueWithUncertainty(value, uncertainty));

    [Fact]
    public void ValueWithUncertainty_NotEstimated_SaysSo()
    {
        Assert.Equal("1.235 (uncertainty not estimated)", NumberFormat.ValueWithUncertainty(1.23456, double.NaN));
        Assert.Equal("n/a", NumberFormat.ValueWithUncertainty(double.NaN, 0.1));
    }

    [Fact]
    public void ValueWithUncertainty_NegativeUncertainty_Throws()
        => Assert.Throws<ArgumentOutOfRangeException>(() => NumberFormat.ValueWithUncertainty(1, -0.1));

    [Theory]
    [InlineData(0.5, "0.5")]
    [InlineData(2.5, "2.5")]
    [InlineData(1200, "1200")]
    [InlineData(3.14159265, "3.142")]
    [InlineData(1.5e-6, "1.5e-6")]
    [InlineData(2.0e7, "2e7")]
    [InlineData(0.00099996, "1e-3")]
    [InlineData(0, "0")]
    [InlineData(-0.25, "-0.25")]
    public void Number_Examples_TrimmedToFourSignificantDigits(double x, string expected)
        => Assert.Equal(expected, NumberFormat.Number(x));

    [Fact]
    public void Window_TwoEnds_PrintsBracketed() => Assert.Equal("[0.5, 2.5]", NumberFormat.Window(0.5, 2.5));

    [Theory]
    [InlineData(950, "950")]
    [InlineData(100_000, "1e5")]
    [InlineData(250_000, "2.5e5")]
    [InlineData(1_000_000, "1e6")]
    public void Count_Examples_UseExponentWhenLarge(long n, string expected) => Assert.Equal(expected, NumberFormat.Count(n));

    [Fact]
    public void Duration_Examples_PickReadableUnits()
    {
        Assert.Equal("850 ms", NumberFormat.Duration(TimeSpan.FromMilliseconds(850)));
        Assert.Equal("12.3 s", NumberFormat.Duration(TimeSpan.FromSeconds(12.34)));
        Assert.Equal("4 min 05 s", NumberFormat.Duration(TimeSpan.FromSeconds(245)));
        Assert.Equal("2 h 03 min", NumberFormat.Duration(TimeSpan.FromMinutes(123)));
    }

    [Fact]
    public void Measured_Format_CarriesUncertaintyDefinitionAndWindow()
    {
        var v = new Measured(1.234, 0.056, "butterfly velocity from the front fit", new FitWindow(0.5, 2.5), "sites/time");
        Assert.Equal("1.23 ± 0.06 sites/time", v.FormatValue());
        Assert.Equal("butterfly velocity from the front fit; t in [0.5, 2.5]", v.FormatContext());
        Assert.Equal("1.23 ± 0.06 sites/time (butterfly velocity from the front fit; t in [0.5, 2.5])", v.ToString());
    }

    [Fact]
    public void Measured_Exact_PrintsWithoutPlusMinus()
        => Assert.Equal("9 (saturation 3N/4, N = 12)", Measured.Exact(9, "saturation 3N/4, N = 12").ToString());

    [Fact]
    public void Measured_WithoutDefinition_Throws()
        => Assert.Throws<ArgumentException>(() => new Measured(1, 0.1, " "));

    [Fact]
    public void FitWindow_Reversed_Throws() => Assert.Throws<ArgumentException>(() => new FitWindow(2, 1));

    [Fact]
    public void CsvTable_Format_WritesHeaderAndRoundTripNumbers()
    {
        string csv = CsvTable.Format(["t", "n(t), qubits"], [[0, 0.1], [1, 1.0 / 3]]);
        Assert.Equal("t,\"n(t), qubits\"\n0,1\n0.1,0.3333333333333333\n", csv);
    }
}
