using System.Text;

namespace OpGrowth.Diagnosis;

/// <summary>A plain-text table with fixed column widths; long cells wrap at word boundaries.</summary>
internal sealed class TextTable(int[] widths)
{
    private readonly StringBuilder _sb = new();

    public void Row(IReadOnlyList<string> cells)
    {
        var wrapped = cells.Select((c, i) => WrapCell(c, widths[i])).ToArray();
        int lines = wrapped.Max(w => w.Count);
        for (int l = 0; l < lines; l++)
        {
            for (int i = 0; i < widths.Length; i++)
            {
                string part = l < wrapped[i].Count ? wrapped[i][l] : string.Empty;
                _sb.Append(part.PadRight(widths[i]));
                if (i < widths.Length - 1) _sb.Append("  ");
            }
            TrimEnd();
            _sb.AppendLine();
        }
    }

    public void Rule() => _sb.AppendLine(new string('-', widths.Sum() + 2 * (widths.Length - 1)));

    public override string ToString() => _sb.ToString();

    private void TrimEnd()
    {
        int n = _sb.Length;
        while (n > 0 && _sb[n - 1] == ' ') n--;
        _sb.Length = n;
    }

    private static List<string> WrapCell(string text, int width)
    {
        var lines = new List<string>();
        var line = new StringBuilder();
        foreach (var word in text.Split(' ', StringSplitOptions.RemoveEmptyEntries))
        {
            var w = word;
            while (w.Length > width)
            {
                if (line.Length > 0) { lines.Add(line.ToString()); line.Clear(); }
                lines.Add(w[..width]);
                w = w[width..];
            }
            if (line.Length + (line.Length > 0 ? 1 : 0) + w.Length > width)
            {
                lines.Add(line.ToString());
                line.Clear();
            }
            if (line.Length > 0) line.Append(' ');
            line.Append(w);
        }
        if (line.Length > 0 || lines.Count == 0) lines.Add(line.ToString());
        return lines;
    }

    /// <summary>Wraps a paragraph to <paramref name="width"/> (keeping its leading spaces), continuing lines with <paramref name="indent"/>.</summary>
    public static IEnumerable<string> WrapText(string text, int width, string indent)
    {
        string lead = text[..(text.Length - text.TrimStart().Length)];
        var lines = new List<string>();
        var line = new StringBuilder(lead);
        int start = lead.Length;
        foreach (var word in text.Split(' ', StringSplitOptions.RemoveEmptyEntries))
        {
            if (line.Length > start && line.Length + 1 + word.Length > width)
            {
                lines.Add(line.ToString());
                line.Clear().Append(indent);
                start = indent.Length;
            }
            if (line.Length > start) line.Append(' ');
            line.Append(word);
        }
        lines.Add(line.ToString());
        return lines;
    }
}
