using System.Text.RegularExpressions;
using OpGrowth.Cli;

namespace OpGrowth.Tests.Cli;

/// <summary>
/// A corpus of hostile command lines and files (Hostile/cases.txt): each must end, quickly, with the documented
/// exit code and exactly one clear line on stderr (run with -q so no log line precedes it), name file:line when a
/// file is at fault, and never print a stack trace.
/// </summary>
public class HostileInputTests
{
    private static readonly string Folder = FindUp(Path.Combine("tests", "OpGrowth.Tests", "Cli", "Hostile"));

    /// <summary>Longest a refusal may take: every case is refused before any heavy work.</summary>
    private static readonly TimeSpan Limit = TimeSpan.FromSeconds(60);

    public static IEnumerable<object[]> Cases()
        => File.ReadLines(Path.Combine(Folder, "cases.txt"))
            .Where(l => l.Trim().Length > 0 && !l.TrimStart().StartsWith('#'))
            .Select(l => new object[] { l.Trim() });

    [Fact]
    public void Corpus_CoversTheReportedCases()
    {
        var lines = Cases().Select(c => (string)c[0]).ToList();
        Assert.True(lines.Count >= 40, $"only {lines.Count} cases");
        foreach (string must in new[] { "--time 1e308", "--dt 1e-12", "--depth 100000000", "--threads 100000", "--out ''", "--fit-from 20 --fit-to 3",
                     "--probe ''", "--resume", "collect {tmp}", "@unknown-param.sweep", "@plain-probe.toml", "@small-square.toml", "@deep-header.toml", "@big-a2a.toml", "@a2a-1025.toml", "@tiny-period.toml" })
            Assert.Contains(lines, l => l.Contains(must, StringComparison.Ordinal));
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public async Task HostileInput_EndsWithOneClearLine(string line)
    {
        var parts = line.Split('|', 4, StringSplitOptions.TrimEntries);
        int expected = int.Parse(parts[0], System.Globalization.CultureInfo.InvariantCulture);
        string? fileAtFault = parts[1] == "-" ? null : Path.Combine(Folder, parts[1]);
        string fragment = parts[2];
        string tmp = Path.Combine(Path.GetTempPath(), "opgrowth-hostile-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(tmp);
        try
        {
            var args = parts[3].Split(' ', StringSplitOptions.RemoveEmptyEntries)
                .Select(t => t == "''" ? "" : t.StartsWith('@') ? Path.Combine(Folder, t[1..]) : t.Replace("{tmp}", tmp, StringComparison.Ordinal))
                .Append("-q").ToArray();
            var o = new StringWriter();
            var e = new StringWriter();
            var run = Task.Run(() => Program.Run(args, o, e));
            Assert.True(await Task.WhenAny(run, Task.Delay(Limit)) == run, $"did not end within {Limit.TotalSeconds} s: {line}");
            int code = await run;
            string err = e.ToString();
            var lines = err.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            Assert.True(code == expected, $"exit {code}, expected {expected}: {err}");
            var only = Assert.Single(lines);
            Assert.DoesNotContain("   at ", err);
            Assert.DoesNotContain("Exception", err);
            Assert.Contains(fragment, only);
            Assert.StartsWith("error: ", only);
            if (fileAtFault is not null)
                Assert.Matches("^error: " + Regex.Escape(fileAtFault) + @":[1-9][0-9]*: found ", only);
        }
        finally
        {
            Directory.Delete(tmp, true);
        }
    }

    private static string FindUp(string relative)
    {
        var d = new DirectoryInfo(AppContext.BaseDirectory);
        while (d is not null && !Directory.Exists(Path.Combine(d.FullName, relative))) d = d.Parent;
        return d is null ? throw new DirectoryNotFoundException(relative) : Path.Combine(d.FullName, relative);
    }
}
