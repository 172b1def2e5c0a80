using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Tests.Models;

/// <summary>
/// Each file in Malformed/ holds one error kind. Its first line, "# expect: LINE: FRAGMENT", gives the
/// line the message must name and a fragment the one-line message must contain.
/// </summary>
public class MalformedCorpusTests
{
    [Fact]
    public void Corpus_HasAtLeastThirtyErrorKinds()
    {
        Assert.True(ModelTestFiles.MalformedNames().Count() >= 30);
    }

    [Theory]
    [MemberData(nameof(ModelTestFiles.MalformedNames), MemberType = typeof(ModelTestFiles))]
    public void Load_MalformedFile_ThrowsOneLineInputExceptionAtExpectedLine(string name)
    {
        string path = Path.Combine(ModelTestFiles.MalformedDirectory, name + ".toml");
        string first = File.ReadLines(path).First();
        Assert.StartsWith("# expect: ", first);
        string spec = first["# expect: ".Length..];
        int colon = spec.IndexOf(':', StringComparison.Ordinal);
        int line = int.Parse(spec[..colon], System.Globalization.CultureInfo.InvariantCulture);
        string fragment = spec[(colon + 1)..].Trim();

        var ex = Assert.Throws<InputException>(() => ModelLoader.Load(path));
        Assert.DoesNotContain('\n', ex.Message);
        Assert.Equal(path, ex.File);
        Assert.Equal(line, ex.Line);
        Assert.StartsWith($"{path}:{line}: found ", ex.Message);
        Assert.Contains("; expected ", ex.Message);
        Assert.Contains(fragment, ex.Message);
    }
}
