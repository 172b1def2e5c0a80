using System.Text.Json;
using OpGrowth.Cli;
using OpGrowth.Tests.Models;

namespace OpGrowth.Tests.Cli;

/// <summary>The executable's behaviour, run in-process through Program.Run with private writers.</summary>
public class CliTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        int code = Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    [Fact]
    public void Help_IsShortListsRunFirstWithExamplesAndExitCodes()
    {
        var (code, output, _) = Run("--help");
        Assert.Equal(0, code);
        Assert.Contains("Examples:", output);
        Assert.Contains("opgrowth run ", output);
        Assert.Contains("2 invalid input", output);
        Assert.Contains("143 terminated (SIGTERM)", output);
        var commands = output.Split('\n').SkipWhile(l => !l.StartsWith("Commands:", StringComparison.Ordinal)).Skip(1).TakeWhile(l => l.Trim().Length > 0).ToList();
        Assert.StartsWith("  run ", commands[0]);
        Assert.Equal(Program.BuildRoot().Subcommands.Count, commands.Count); // every command listed, one line each
        Assert.True(output.Split('\n').Length < 40, "the top-level help stays short");
    }

    [Theory]
    [InlineData("run")]
    [InlineData("models")]
    [InlineData("check")]
    [InlineData("evolve")]
    [InlineData("lanczos")]
    [InlineData("exact")]
    [InlineData("compare")]
    [InlineData("diagnose")]
    [InlineData("sweep")]
    [InlineData("collect")]
    [InlineData("front")]
    [InlineData("ensemble")]
    public void EveryCommandHelp_HasExamples(string command)
    {
        var (code, output, _) = Run(command, "--help");
        Assert.Equal(0, code);
        Assert.Contains("Examples:", output);
        Assert.Contains($"opgrowth {command}", output);
    }

    [Theory]
    [InlineData("run")]
    [InlineData("evolve")]
    [InlineData("lanczos")]
    [InlineData("exact")]
    [InlineData("compare")]
    [InlineData("sweep")]
    public void SharedOptions_MeanTheSameEverywhere(string command)
    {
        // One name for the evolved operator, and the same --threads and --memory defaults in readable units.
        var (_, output, _) = Run(command, "--help");
        Assert.Contains("--probe", output);
        Assert.Contains($"--threads <threads>", output);
        Assert.Contains($"[default: {Environment.ProcessorCount}, every core]", output);
        if (command is not ("exact" or "compare"))
            Assert.Contains($"[default: {OpGrowth.Evolution.MemoryBudget.Format(OpGrowth.Evolution.MemoryBudget.DefaultBytes())}, half of this machine's memory]", output);
    }

    [Fact]
    public void UsageError_IsOneLineWithoutTypeNames()
    {
        var (code, output, err) = Run("evolve", "xxz", "--time", "abc");
        Assert.Equal(ExitCodes.Usage, code);
        Assert.Equal("", output);
        var line = Assert.Single(err.Split('\n', StringSplitOptions.RemoveEmptyEntries));
        Assert.StartsWith("error: ", line);
        Assert.DoesNotContain("System.", line);
        Assert.Contains("--help", line);
    }

    [Fact]
    public void CheckHelp_ShowsOnlyItsExamples()
    {
        var (code, output, _) = Run("check", "--help");
        Assert.Equal(0, code);
        Assert.Contains("--set", output);
        Assert.Contains("opgrowth check demo/tilted-chain --json", output);
        Assert.DoesNotContain("opgrowth models ", output);
    }

    [Fact]
    public void Check_ShippedModel_PrintsSummaryAndExitsZero()
    {
        var (code, output, err) = Run("check", "mixed-field-ising");
        Assert.True(code == 0, err);
        Assert.Contains("terms        59 (locality 2)", output);
        Assert.Contains("symmetries   reflection, time-reversal (verified)", output);
    }

    [Fact]
    public void Check_Json_ParsesAndCarriesTheSummary()
    {
        var (code, output, err) = Run("check", "demo/heisenberg-cluster", "--json", "--set", "N=10", "--set", "seed=3");
        Assert.True(code == 0, err);
        using var doc = JsonDocument.Parse(output);
        var r = doc.RootElement;
        Assert.Equal(10, r.GetProperty("qubits").GetInt32());
        Assert.Equal(3 * 45, r.GetProperty("terms").GetInt32());
        Assert.Equal(2, r.GetProperty("locality").GetInt32());
        Assert.Equal(3, r.GetProperty("seeds")[0].GetInt64());
        Assert.True(r.GetProperty("disordered").GetBoolean());
        Assert.Equal("all-to-all", r.GetProperty("lattice").GetProperty("kind").GetString());
        Assert.True(r.GetProperty("normPerSite").GetDouble() > 0);
        Assert.Equal(JsonValueKind.Null, r.GetProperty("drive").ValueKind);
    }

    [Fact]
    public void Check_DrivenModel_JsonHasLayers()
    {
        var (code, output, err) = Run("check", "kicked-ising", "--json");
        Assert.True(code == 0, err);
        using var doc = JsonDocument.Parse(output);
        var drive = doc.RootElement.GetProperty("drive");
        Assert.Equal(2, drive.GetProperty("layers").GetArrayLength());
    }

    [Fact]
    public void Check_MalformedFile_ExitsTwoWithOneLineOnStderr()
    {
        string path = Path.Combine(ModelTestFiles.MalformedDirectory, "bad-pauli-letter.toml");
        var (code, output, err) = Run("check", path);
        Assert.Equal(2, code);
        Assert.Equal("", output);
        var lines = err.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Single(lines);
        Assert.StartsWith($"error: {path}:", lines[0]);
        Assert.Contains("found the letter 'Q'", lines[0]);
    }

    [Fact]
    public void Check_BadSet_ExitsTwo()
    {
        var (code, _, err) = Run("check", "xxz", "--set", "W");
        Assert.Equal(2, code);
        Assert.Contains("expected --set NAME=VALUE", err);
        Assert.Single(err.Split('\n', StringSplitOptions.RemoveEmptyEntries));
    }

    [Fact]
    public void Check_UnknownModel_ExitsTwo()
    {
        var (code, _, err) = Run("check", "no-such-model");
        Assert.Equal(2, code);
        Assert.Contains("found neither a file nor a shipped model", err);
    }

    [Fact]
    public void UsageErrors_ExitOne()
    {
        Assert.Equal(1, Run("check").Code);
        Assert.Equal(1, Run("check", "xxz", "--no-such-option").Code);
        Assert.Equal(1, Run("no-such-command").Code);
    }

    [Fact]
    public void Models_ListsEveryShippedModel()
    {
        var (code, output, err) = Run("models");
        Assert.True(code == 0, err);
        Assert.Contains("mixed-field-ising", output);
        Assert.Contains("demo/heisenberg-cluster", output);
        var (jcode, json, _) = Run("models", "--json");
        Assert.Equal(0, jcode);
        using var doc = JsonDocument.Parse(json);
        Assert.Equal(ModelTestFiles.Shipped.Count, doc.RootElement.GetProperty("models").GetArrayLength());
    }
}
