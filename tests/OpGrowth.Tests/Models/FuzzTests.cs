using System.Text;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Tests.Models;

/// <summary>
/// Mutates every shipped model at random (fixed seeds) and asserts that loading either succeeds or
/// fails with a one-line InputException: never another exception type.
/// </summary>
public class FuzzTests
{
    private static readonly string[] Junk =
    [
        "foo = 1", "[lattice]", "[[term]]", "[[layer]]", "coupling = \"normal(0,1)\"", "seed = -1", "sites = [[0, 99]]",
        "pauli = \"XQ\"", "on = \"plaquettes\"", "majorana = [[0, 0]]", "probes = [\"chi_99\"]", "symmetries = [\"translation\"]",
        "N = \"N\"", "x = inf", "= 3", "[parameters", "period = 0", "rotations = [ { pauli = \"X\" } ]", "distance = 0",
        "coupling = \"J/0\"", "kind = \"edges\"", "edges = [[0, 1], [0, 1]]", "description = \"\"\"a\nb\"\"\"", "name = \"\"",
    ];

    private const string Chars = "=[]{}\",.#_-+*/^()0123456789 abcXYZIN\n\t";

    private static string Mutate(string text, Random rng)
    {
        var lines = text.Split('\n').ToList();
        int edits = 1 + rng.Next(3);
        for (int e = 0; e < edits; e++)
        {
            switch (rng.Next(7))
            {
                case 0 when lines.Count > 1:
                    lines.RemoveAt(rng.Next(lines.Count));
                    break;
                case 1:
                    lines.Insert(rng.Next(lines.Count + 1), lines[rng.Next(lines.Count)]);
                    break;
                case 2:
                {
                    int a = rng.Next(lines.Count), b = rng.Next(lines.Count);
                    (lines[a], lines[b]) = (lines[b], lines[a]);
                    break;
                }
                case 3:
                    lines.Insert(rng.Next(lines.Count + 1), Junk[rng.Next(Junk.Length)]);
                    break;
                case 4:
                {
                    int i = rng.Next(lines.Count);
                    if (lines[i].Length == 0) break;
                    var sb = new StringBuilder(lines[i]);
                    int k = rng.Next(sb.Length);
                    char c = Chars[rng.Next(Chars.Length)];
                    // Digits only replace digits so sizes stay within a few times the original.
                    if (char.IsAsciiDigit(c) && !char.IsAsciiDigit(sb[k])) c = 'Q';
                    sb[k] = c;
                    lines[i] = sb.ToString();
                    break;
                }
                case 5:
                {
                    int i = rng.Next(lines.Count);
                    if (lines[i].Length > 0) lines[i] = lines[i][..rng.Next(lines[i].Length)];
                    break;
                }
                default:
                {
                    int i = rng.Next(lines.Count);
                    int k = rng.Next(lines[i].Length + 1);
                    lines[i] = lines[i].Insert(k, Chars[rng.Next(Chars.Length)].ToString());
                    break;
                }
            }
        }
        return string.Join('\n', lines);
    }

    [Theory]
    [MemberData(nameof(ModelTestFiles.ShippedNames), MemberType = typeof(ModelTestFiles))]
    public void Parse_RandomMutationsOfShippedModel_OnlyInputExceptions(string name)
    {
        string path = ShippedModels.Resolve(name);
        string text = File.ReadAllText(path);
        var rng = new Random(name.Aggregate(17, (h, c) => h * 31 + c)); // fixed seed per file
        int failures = 0;
        for (int trial = 0; trial < 150; trial++)
        {
            string mutated = Mutate(text, rng);
            try
            {
                ModelLoader.Parse(mutated, "fuzz.toml");
            }
            catch (InputException ex)
            {
                failures++;
                Assert.DoesNotContain('\n', ex.Message);
                Assert.StartsWith("fuzz.toml", ex.Message);
                Assert.Contains("found", ex.Message);
                Assert.Contains("expected", ex.Message);
            }
            catch (Exception ex)
            {
                Assert.Fail($"trial {trial}: {ex.GetType().Name}: {ex.Message}\n--- mutated file ---\n{mutated}");
            }
        }
        Assert.True(failures > 0, "no mutation was rejected: the fuzzer is not exercising errors");
    }

    [Fact]
    public void Parse_CharacterLevelMutationsOfAllShippedModels_OnlyInputExceptions()
    {
        // Edits anywhere in the text (replace, delete a run, insert, copy a run elsewhere), 1 to 6 per file.
        const string chars = "=[]{}\",.'#_-+*/^()0123456789 abcXYZIN\n\t\\\u00e9e";
        var files = ModelTestFiles.Shipped.Select(File.ReadAllText).ToArray();
        var rng = new Random(4242);
        for (int trial = 0; trial < 600; trial++)
        {
            var sb = new StringBuilder(files[rng.Next(files.Length)]);
            int edits = 1 + rng.Next(6);
            for (int e = 0; e < edits; e++)
            {
                int k = rng.Next(sb.Length);
                switch (rng.Next(4))
                {
                    case 0:
                        sb[k] = chars[rng.Next(chars.Length)];
                        break;
                    case 1:
                        sb.Remove(k, Math.Min(sb.Length - k, rng.Next(1, 20)));
                        break;
                    case 2:
                        sb.Insert(k, chars[rng.Next(chars.Length)]);
                        break;
                    default:
                    {
                        int a = rng.Next(sb.Length);
                        sb.Insert(k, sb.ToString(a, Math.Min(sb.Length - a, rng.Next(1, 40))));
                        break;
                    }
                }
                if (sb.Length == 0) sb.Append('x');
            }
            string mutated = sb.ToString();
            try
            {
                ModelLoader.Parse(mutated, "fuzz.toml");
            }
            catch (InputException ex)
            {
                Assert.DoesNotContain('\n', ex.Message);
                Assert.StartsWith("fuzz.toml", ex.Message);
            }
            catch (Exception ex)
            {
                Assert.Fail($"trial {trial}: {ex.GetType().Name}: {ex.Message}\n--- mutated file ---\n{mutated}");
            }
        }
    }

    [Fact]
    public void Parse_RandomOverrides_OnlyInputExceptions()
    {
        string path = ShippedModels.Resolve("mixed-field-ising");
        var rng = new Random(2024);
        string[] values = ["0", "-1", "1e400", "N/0", "sqrt(-1)", "2^10", "J*", "pi", "1.5", "30", "(", "h h", "nan", "inf"];
        string[] names = ["N", "J", "g", "h", "q"];
        for (int trial = 0; trial < 200; trial++)
        {
            var set = new Dictionary<string, string> { [names[rng.Next(names.Length)]] = values[rng.Next(values.Length)] };
            try
            {
                ModelLoader.Load(path, set);
            }
            catch (InputException ex)
            {
                Assert.DoesNotContain('\n', ex.Message);
            }
        }
    }
}
