using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Cli.Commands;

/// <summary><c>opgrowth models</c>: lists the shipped model files (name, qubits, description, file).</summary>
internal static class ModelsCommand
{
    public static Command Create()
    {
        var json = new Option<bool>("--json") { Description = "Write the list as JSON on stdout." };
        var cmd = new Command("models", "List the shipped models: name (use it as MODEL), qubits at the default parameters, description, file.")
        {
            json,
        };
        cmd.SetAction(pr => CliHost.Run(ct => Execute(pr.GetValue(json), ct)));
        return cmd;
    }

    private static int Execute(bool asJson, CancellationToken ct)
    {
        string dir = ShippedModels.Directory;
        var rows = new List<(string Name, Model Model, string File)>();
        foreach (var f in ShippedModels.Files)
        {
            ct.ThrowIfCancellationRequested();
            string rel = Path.GetRelativePath(dir, f).Replace('\\', '/');
            rows.Add((ShippedModels.NameOf(f), ModelLoader.Load(f), rel));
        }
        var output = CliHost.Out;
        if (asJson)
        {
            using var ms = new MemoryStream();
            using (var w = new Utf8JsonWriter(ms, new JsonWriterOptions { Indented = true }))
            {
                w.WriteStartObject();
                w.WriteString("directory", dir);
                w.WriteStartArray("models");
                foreach (var (name, m, file) in rows)
                {
                    w.WriteStartObject();
                    w.WriteString("name", name);
                    w.WriteString("declaredName", m.Name);
                    w.WriteNumber("qubits", m.N);
                    w.WriteString("description", m.Description);
                    w.WriteString("file", file);
                    w.WriteBoolean("driven", m.IsDriven);
                    w.WriteBoolean("disordered", m.IsDisordered);
                    w.WriteEndObject();
                }
                w.WriteEndArray();
                w.WriteEndObject();
            }
            output.WriteLine(System.Text.Encoding.UTF8.GetString(ms.ToArray()));
            return ExitCodes.Ok;
        }
        int wName = Math.Max(4, rows.Max(r => r.Name.Length));
        output.WriteLine($"{"name".PadRight(wName)}  {"N",3}  description");
        foreach (var (name, m, _) in rows)
        {
            output.WriteLine($"{name.PadRight(wName)}  {m.N.ToString(CultureInfo.InvariantCulture),3}  {m.Description}");
        }
        output.WriteLine();
        output.WriteLine($"{rows.Count} models in {dir}");
        return ExitCodes.Ok;
    }
}
