using System.Globalization;
using System.Text;
using OpGrowth.IO;

namespace OpGrowth.Reporting;

/// <summary>
/// Writes numeric series as CSV (comma separated, header line, invariant culture, shortest round-trip numbers,
/// NaN/Infinity spelled out), atomically. Columns are equally long; a text cell containing a comma or quote is quoted.
/// </summary>
public static class CsvTable
{
    /// <summary>Writes columns of numbers under the given headers.</summary>
    public static void Write(string path, IReadOnlyList<string> headers, IReadOnlyList<double[]> columns)
        => AtomicFile.WriteAllText(path, Format(headers, columns));

    /// <summary>The CSV text for <see cref="Write"/>.</summary>
    public static string Format(IReadOnlyList<string> headers, IReadOnlyList<double[]> columns)
    {
        ArgumentNullException.ThrowIfNull(headers);
        ArgumentNullException.ThrowIfNull(columns);
        if (headers.Count != columns.Count)
            throw new ArgumentException($"CSV has {headers.Count} headers and {columns.Count} columns; expected one header per column.");
        int rows = columns.Count == 0 ? 0 : columns[0].Length;
        for (int c = 0; c < columns.Count; c++)
            if (columns[c].Length != rows)
                throw new ArgumentException($"CSV column '{headers[c]}' has {columns[c].Length} values; expected {rows} like the first column.");
        var sb = new StringBuilder((rows + 1) * Math.Max(1, columns.Count) * 12);
        sb.AppendJoin(',', headers.Select(Quote)).Append('\n');
        for (int r = 0; r < rows; r++)
        {
            for (int c = 0; c < columns.Count; c++)
            {
                if (c > 0) sb.Append(',');
                sb.Append(columns[c][r].ToString("R", CultureInfo.InvariantCulture));
            }
            sb.Append('\n');
        }
        return sb.ToString();
    }

    private static string Quote(string cell)
        => cell.AsSpan().IndexOfAny(",\"\n\r") < 0 ? cell : "\"" + cell.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";
}
