using System.Text.RegularExpressions;
using OpGrowth.Cli;

namespace OpGrowth.Tests.Cli;

/// <summary>
/// The documentation shows what the code does: every complete model file in README.md and docs/*.md (a
/// ```toml block with a [lattice] table and [[term]] or [[layer]] blocks, or a [circuit] table) passes 'opgrowth check', and every
/// command line quoted after "opgrowth " names a command and options that exist.
/// </summary>
public class DocumentationTests
{
    public static IEnumerable<object[]> ModelExamples()
    {
        foreach (string file in Documents())
        {
            string text = File.ReadAllText(file);
            foreach (Match m in Regex.Matches(text, "```toml\n(.*?)```", RegexOptions.Singleline))
            {
                string body = m.Groups[1].Value;
                if (!body.Contains("[lattice]", StringComparison.Ordinal) || !(body.Contains("[[term]]", StringComparison.Ordinal) || body.Contains("[[layer]]", StringComparison.Ordinal) || body.Contains("[circuit]", StringComparison.Ordinal))) continue;
                int line = text[..m.Index].Count(c => c == '\n') + 1;
                yield return [Path.GetRelativePath(RepoRoot(), file), line];
            }
        }
    }

    [Fact]
    public void Documents_ContainModelExamples()
    {
        Assert.Contains(ModelExamples(), e => (string)e[0] == "README.md");
    }

    [Theory]
    [MemberData(nameof(ModelExamples))]
    public void ModelExample_PassesCheck(string document, int line)
    {
        string text = File.ReadAllText(Path.Combine(RepoRoot(), document));
        int start = text.IndexOf('\n', IndexOfLine(text, line)) + 1;
        string body = text[start..text.IndexOf("```", start, StringComparison.Ordinal)];
        string file = Path.Combine(Path.GetTempPath(), $"opgrowth-doc-example-{Guid.NewGuid():N}.toml");
        File.WriteAllText(file, body);
        try
        {
            var o = new StringWriter();
            var e = new StringWriter();
            int code = Program.Run(["check", file, "-q"], o, e);
            Assert.True(code == 0, $"{document}:{line}: {e}");
        }
        finally
        {
            File.Delete(file);
        }
    }

    public static IEnumerable<object[]> CommandLines()
    {
        // the examples every --help prints
        foreach (var (command, lines) in OpGrowth.Cli.CommandHelp.Examples)
            for (int i = 0; i < lines.Length; i++)
            {
                string l = lines[i];
                int at = l.IndexOf(" #", StringComparison.Ordinal);
                if (at >= 0) l = l[..at].Trim();
                yield return ["CommandHelp." + command, i + 1, l];
            }
        foreach (string file in Documents())
        {
            var lines = File.ReadAllLines(file);
            bool inCode = false;
            for (int i = 0; i < lines.Length; i++)
            {
                if (lines[i].TrimStart().StartsWith("```", StringComparison.Ordinal))
                {
                    inCode = !inCode;
                    continue;
                }
                if (!inCode) continue;
                string l = lines[i].Trim();
                if (!l.StartsWith("opgrowth ", StringComparison.Ordinal)) continue;
                // Continued lines (trailing backslash) are joined; synopses with [optional] parts or A|B choices are not command lines.
                int j = i;
                while (l.EndsWith('\\') && j + 1 < lines.Length) l = l[..^1] + " " + lines[++j].Trim();
                foreach (string cut in new[] { " #", " > ", " 2>" })
                {
                    int at = l.IndexOf(cut, StringComparison.Ordinal);
                    if (at >= 0) l = l[..at].Trim();
                }
                if (l.Contains('[', StringComparison.Ordinal) || l.Contains('|', StringComparison.Ordinal) || l.Contains("...", StringComparison.Ordinal)) continue;
                yield return [Path.GetRelativePath(RepoRoot(), file), i + 1, l];
            }
        }
    }

    [Theory]
    [MemberData(nameof(CommandLines))]
    public void QuotedCommandLine_Parses(string document, int line, string commandLine)
    {
        // Placeholders (DIR, K, $SLURM_ARRAY_TASK_ID) stand for values: any value parses where a placeholder does.
        var tokens = Regex.Matches(commandLine, "\"([^\"]*)\"|'([^']*)'|(\\S+)").Select(m => m.Groups[1].Success ? m.Groups[1].Value : m.Groups[2].Success ? m.Groups[2].Value : m.Groups[3].Value)
            .Skip(1).Select(t => Regex.IsMatch(t, "^([A-Z][A-Z_]*|\\$[A-Z_]+|\"\\$[A-Z_]+\")$") ? "1" : t).ToArray();
        var parse = Program.BuildRoot().Parse(tokens);
        Assert.True(parse.Errors.Count == 0, $"{document}:{line}: '{commandLine}': {string.Join("; ", parse.Errors.Select(e => e.Message))}");
    }

    private static int IndexOfLine(string text, int line)
    {
        int i = 0;
        for (int l = 1; l < line; l++) i = text.IndexOf('\n', i) + 1;
        return i;
    }

    private static IEnumerable<string> Documents()
        => new[] { Path.Combine(RepoRoot(), "README.md") }.Concat(Directory.GetFiles(Path.Combine(RepoRoot(), "docs"), "*.md").Order(StringComparer.Ordinal));

    internal static string RepoRoot()
    {
        var d = new DirectoryInfo(AppContext.BaseDirectory);
        while (d is not null && !File.Exists(Path.Combine(d.FullName, "OpGrowth.sln"))) d = d.Parent;
        return d?.FullName ?? throw new InvalidOperationException("repository root not found");
    }
}
