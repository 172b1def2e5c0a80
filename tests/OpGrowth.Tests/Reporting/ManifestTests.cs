using System.Text;
using System.Text.Json;
using OpGrowth.Reporting;

namespace OpGrowth.Tests.Reporting;

/// <summary>manifest.json: hashes against the published SHA-256 test vector, and verification of written files.</summary>
public class ManifestTests
{
    [Fact]
    public void Sha256OfFile_Abc_MatchesPublishedTestVector()
    {
        // Source: NIST FIPS 180-2, Appendix B.1 (SHA-256 of "abc").
        string path = Path.GetTempFileName();
        try
        {
            File.WriteAllBytes(path, Encoding.ASCII.GetBytes("abc"));
            Assert.Equal("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", ManifestWriter.Sha256OfFile(path));
        }
        finally { File.Delete(path); }
    }

    [Fact]
    public void Write_ThenVerify_AllFilesMatchUntilOneChanges()
    {
        string dir = Directory.CreateTempSubdirectory("opg-manifest-").FullName;
        try
        {
            Directory.CreateDirectory(Path.Combine(dir, "data"));
            File.WriteAllText(Path.Combine(dir, "report.md"), "# report\n");
            File.WriteAllText(Path.Combine(dir, "data", "series.csv"), "t,n\n0,1\n");
            string model = Path.Combine(dir, "model.toml");
            File.WriteAllText(model, "n = 8\n");
            var manifest = new RunManifest
            {
                Command = "run",
                ModelFile = "model.toml",
                ModelSha256 = ManifestWriter.Sha256OfFile(model),
                Options = new Dictionary<string, object?> { ["budget"] = 100000, ["dt"] = 0.05, ["method"] = "trotter2" },
                Seeds = [7, 11],
                Threads = 2,
                TimingsSeconds = new Dictionary<string, double> { ["evolution"] = 12.5, ["report"] = 1.25 },
            };
            string path = ManifestWriter.Write(dir, manifest, ["report.md", "data\\series.csv", "model.toml", "report.md", "manifest.json"]);

            Assert.Empty(ManifestWriter.Verify(path));
            RunManifest back = ManifestWriter.Read(path);
            Assert.Equal(["data/series.csv", "model.toml", "report.md"], back.Files.Select(f => f.Path));
            Assert.Equal(manifest.ModelSha256, back.ModelSha256);
            Assert.Equal([7L, 11L], back.Seeds);
            Assert.Equal(2, back.Threads);
            Assert.Equal(12.5, back.TimingsSeconds["evolution"]);
            Assert.Equal(100000, ((JsonElement)back.Options!).GetProperty("budget").GetInt32());
            Assert.Equal(ReportWriter.ToolVersion, back.ToolVersion);
            Assert.True(back.Machine.ContainsKey("processors"));

            File.AppendAllText(Path.Combine(dir, "data", "series.csv"), "1,2\n");
            File.Delete(Path.Combine(dir, "report.md"));
            IReadOnlyList<string> problems = ManifestWriter.Verify(path);
            Assert.Equal(2, problems.Count);
            Assert.Contains(problems, p => p.StartsWith("data/series.csv: size", StringComparison.Ordinal));
            Assert.Contains("report.md: missing", problems);
        }
        finally { Directory.Delete(dir, true); }
    }

    [Fact]
    public void Write_SameSizeEdit_DetectedByHash()
    {
        string dir = Directory.CreateTempSubdirectory("opg-manifest-").FullName;
        try
        {
            File.WriteAllText(Path.Combine(dir, "a.txt"), "1234");
            string path = ManifestWriter.Write(dir, new RunManifest(), ["a.txt"]);
            File.WriteAllText(Path.Combine(dir, "a.txt"), "1243");
            Assert.Contains("SHA-256", Assert.Single(ManifestWriter.Verify(path)), StringComparison.Ordinal);
        }
        finally { Directory.Delete(dir, true); }
    }

    [Fact]
    public void Describe_PathOutsideFolder_Throws()
        => Assert.Throws<ArgumentException>(() => ManifestWriter.Describe(Path.GetTempPath(), "../etc/passwd"));
}
