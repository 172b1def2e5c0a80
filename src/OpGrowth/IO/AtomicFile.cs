using System.Text;
using System.Text.Json;

namespace OpGrowth.IO;

/// <summary>
/// Writes files so that a crash or kill never leaves a half-written result: the content goes to a
/// temporary file in the same folder, is flushed to disk, then renamed over the target (rename is
/// atomic on POSIX file systems).
/// </summary>
public static class AtomicFile
{
    /// <summary>JSON settings shared by every result file: indented, camelCase keys, non-finite numbers as null (<see cref="NonFiniteAsNull"/>).</summary>
    public static readonly JsonSerializerOptions Json = new()
    {
        WriteIndented = true,
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        DictionaryKeyPolicy = null,
        Converters = { new NonFiniteAsNull() },
    };

    /// <summary>Writes bytes atomically.</summary>
    public static void WriteAllBytes(string path, ReadOnlySpan<byte> bytes)
    {
        string full = Path.GetFullPath(path);
        string dir = Path.GetDirectoryName(full)!;
        Directory.CreateDirectory(dir);
        string tmp = Path.Combine(dir, $".{Path.GetFileName(full)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        try
        {
            using (var fs = new FileStream(tmp, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16))
            {
                fs.Write(bytes);
                fs.Flush(flushToDisk: true);
            }
            File.Move(tmp, full, overwrite: true);
        }
        finally
        {
            if (File.Exists(tmp)) File.Delete(tmp);
        }
    }

    /// <summary>Writes text (UTF-8, no BOM) atomically.</summary>
    public static void WriteAllText(string path, string text) => WriteAllBytes(path, Encoding.UTF8.GetBytes(text));

    /// <summary>Serialises a value as JSON and writes it atomically.</summary>
    public static void WriteJson<TValue>(string path, TValue value)
        => WriteAllBytes(path, JsonSerializer.SerializeToUtf8Bytes(value, Json));

    /// <summary>Writes through a stream callback into a temporary file, then renames (for large binary checkpoints).</summary>
    public static void Write(string path, Action<Stream> write)
    {
        string full = Path.GetFullPath(path);
        string dir = Path.GetDirectoryName(full)!;
        Directory.CreateDirectory(dir);
        string tmp = Path.Combine(dir, $".{Path.GetFileName(full)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        try
        {
            using (var fs = new FileStream(tmp, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 20))
            {
                write(fs);
                fs.Flush(flushToDisk: true);
            }
            File.Move(tmp, full, overwrite: true);
        }
        finally
        {
            if (File.Exists(tmp)) File.Delete(tmp);
        }
    }
}
