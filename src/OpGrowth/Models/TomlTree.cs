using System.Globalization;
using OpGrowth.IO;
using Tomlyn;
using Tomlyn.Parsing;

namespace OpGrowth.Models;

/// <summary>A node of the parsed model file with the 1-based line it was written on.</summary>
internal abstract class TomlNode
{
    protected TomlNode(int line) => Line = line;

    /// <summary>1-based line of the value (or of its key when the value has no position of its own).</summary>
    public int Line { get; set; }

    /// <summary>Words for "found ..." messages: "a string", "an integer", "a table", ...</summary>
    public abstract string Describe();
}

/// <summary>A scalar: string, long, double, bool or a TOML date/time.</summary>
internal sealed class TomlScalar : TomlNode
{
    public TomlScalar(object value, int line) : base(line) => Value = value;

    public object Value { get; }

    public override string Describe() => Value switch
    {
        string s => $"the string \"{Shorten(s)}\"",
        long l => $"the integer {l.ToString(CultureInfo.InvariantCulture)}",
        double d => $"the number {d.ToString("R", CultureInfo.InvariantCulture)}",
        bool b => b ? "the boolean true" : "the boolean false",
        _ => "a date/time",
    };

    internal static string Shorten(string s)
    {
        string one = s.Replace("\r", "\\r", StringComparison.Ordinal).Replace("\n", "\\n", StringComparison.Ordinal);
        return one.Length <= 60 ? one : one[..57] + "...";
    }
}

/// <summary>An array (inline, or the array of tables built by [[name]] headers).</summary>
internal sealed class TomlList : TomlNode
{
    public TomlList(int line, bool isTableArray) : base(line) => IsTableArray = isTableArray;

    public bool IsTableArray { get; }

    public List<TomlNode> Items { get; } = [];

    public override string Describe() => IsTableArray ? "a list of [[tables]]" : "an array";
}

/// <summary>A table with its keys in written order.</summary>
internal sealed class TomlTableNode : TomlNode
{
    public TomlTableNode(int line, bool inline) : base(line) => Inline = inline;

    public bool Inline { get; }

    public List<(string Key, int KeyLine, TomlNode Value)> Entries { get; } = [];

    public TomlNode? Get(string key)
    {
        foreach (var e in Entries) if (e.Key == key) return e.Value;
        return null;
    }

    public int KeyLine(string key)
    {
        foreach (var e in Entries) if (e.Key == key) return e.KeyLine;
        return Line;
    }

    public override string Describe() => "a table";
}

/// <summary>
/// Reads a TOML file into <see cref="TomlNode"/>s through Tomlyn's event parser, keeping the line of
/// every key and value so that every later error can name file:line. Duplicate keys (which the event
/// stream passes through) are rejected here.
/// </summary>
internal static class TomlTree
{
    /// <summary>Deepest nesting of tables and dotted keys the TOML reader accepts.</summary>
    private const int MaxNesting = 64;

    public static TomlTableNode Parse(string text, string file)
    {
        TomlParser parser;
        try
        {
            parser = TomlParser.Create(
                text,
                new TomlParserOptions { Mode = TomlParserMode.Strict, DecodeScalars = true },
                new TomlSerializerOptions { SourceName = file });
            var reader = new Reader(parser, file);
            return reader.ReadDocument();
        }
        catch (TomlException ex)
        {
            string msg = ex.Message;
            int cut = msg.IndexOf(": error : ", StringComparison.Ordinal);
            if (cut >= 0) msg = msg[(cut + ": error : ".Length)..];
            int nl = msg.IndexOfAny(['\r', '\n']);
            if (nl >= 0) msg = msg[..nl];
            msg = msg.Trim().TrimEnd('.');
            if (msg.Contains("maximum depth", StringComparison.OrdinalIgnoreCase))
            {
                // The parser's nesting limit: name the line (the deepest dotted header or key) and leave the parser's own setting out.
                var lines = text.Split('\n');
                int deepest = 0, at = 0;
                for (int i = 0; i < lines.Length; i++)
                {
                    int dots = lines[i].Count(c => c == '.');
                    if (dots > deepest) (deepest, at) = (dots, i + 1);
                }
                throw new InputException(file, ex.Line ?? at, $"found a table or key nested {deepest + 1} levels deep; expected at most {MaxNesting} levels (a model file needs only [lattice], [parameters], [[term]] and [[layer]])");
            }
            throw new InputException(file, ex.Line ?? 0, $"found a TOML syntax error ({msg}); expected valid TOML 1.1 (key = value lines, [table] and [[table]] headers)");
        }
        catch (InvalidOperationException ex)
        {
            throw new InputException(file, 0, $"found TOML the reader cannot follow ({ex.Message}); expected valid TOML 1.1");
        }
    }

    private sealed class Reader
    {
        private readonly TomlParser _p;
        private readonly string _file;
        private int _lastLine = 1;

        public Reader(TomlParser p, string file)
        {
            _p = p;
            _file = file;
        }

        private TomlParseEvent Next()
        {
            if (!_p.MoveNext()) throw new InputException(_file, _lastLine, "found the end of the file too early; expected complete TOML");
            var e = _p.Current;
            if (e.Line > 0) _lastLine = e.Line;
            return e;
        }

        public TomlTableNode ReadDocument()
        {
            var e = Next();
            if (e.Kind != TomlParseEventKind.StartDocument) throw Unexpected(e);
            e = Next();
            if (e.Kind == TomlParseEventKind.EndDocument) return new TomlTableNode(1, false);
            if (e.Kind != TomlParseEventKind.StartTable) throw Unexpected(e);
            var root = new TomlTableNode(1, false);
            ReadTableBody(root);
            return root;
        }

        private InputException Unexpected(TomlParseEvent e)
            => new(_file, e.Line > 0 ? e.Line : _lastLine, $"found an unexpected TOML element ({e.Kind}); expected key = value lines and table headers");

        /// <summary>Reads keys until the matching EndTable.</summary>
        private void ReadTableBody(TomlTableNode table)
        {
            while (true)
            {
                var e = Next();
                if (e.Kind == TomlParseEventKind.EndTable) return;
                if (e.Kind != TomlParseEventKind.PropertyName) throw Unexpected(e);
                string key = _p.GetPropertyName() ?? "";
                int keyLine = e.Line > 0 ? e.Line : _lastLine;
                ReadValueInto(table, key, keyLine, Next());
            }
        }

        private void ReadValueInto(TomlTableNode table, string key, int keyLine, TomlParseEvent e)
        {
            int index = table.Entries.FindIndex(x => x.Key == key);
            TomlNode? existing = index >= 0 ? table.Entries[index].Value : null;
            switch (e.Kind)
            {
                case TomlParseEventKind.StartTable:
                {
                    bool inline = e.Line > 0;
                    if (existing is TomlTableNode t && !inline && !t.Inline)
                    {
                        ReadTableBody(t); // [a.b] after [a], or a dotted key into an open table
                        return;
                    }
                    if (existing is TomlList { IsTableArray: true } ta && !inline && ta.Items.Count > 0 && ta.Items[^1] is TomlTableNode last)
                    {
                        ReadTableBody(last); // [a.b] after [[a]] extends the last element
                        return;
                    }
                    if (existing is not null) throw Duplicate(key, keyLine, table.Entries[index].KeyLine);
                    var nt = new TomlTableNode(keyLine, inline);
                    table.Entries.Add((key, keyLine, nt));
                    ReadTableBody(nt);
                    return;
                }
                case TomlParseEventKind.StartArray:
                {
                    bool headerArray = e.Line == 0;
                    if (headerArray && existing is TomlList { IsTableArray: true } old)
                    {
                        ReadArrayItems(old, keyLine);
                        return;
                    }
                    if (existing is not null) throw Duplicate(key, keyLine, table.Entries[index].KeyLine);
                    var list = new TomlList(headerArray ? keyLine : e.Line, headerArray);
                    table.Entries.Add((key, keyLine, list));
                    ReadArrayItems(list, keyLine);
                    return;
                }
                default:
                {
                    var scalar = ReadScalar(e);
                    if (existing is not null) throw Duplicate(key, keyLine, table.Entries[index].KeyLine);
                    table.Entries.Add((key, keyLine, scalar));
                    return;
                }
            }
        }

        private void ReadArrayItems(TomlList list, int keyLine)
        {
            while (true)
            {
                var e = Next();
                switch (e.Kind)
                {
                    case TomlParseEventKind.EndArray:
                        return;
                    case TomlParseEventKind.StartTable:
                    {
                        var t = new TomlTableNode(e.Line > 0 ? e.Line : 0, e.Line > 0);
                        ReadTableBody(t);
                        if (t.Line == 0) t.Line = t.Entries.Count > 0 ? Math.Max(1, t.Entries[0].KeyLine - 1) : keyLine;
                        list.Items.Add(t);
                        break;
                    }
                    case TomlParseEventKind.StartArray:
                    {
                        var inner = new TomlList(e.Line > 0 ? e.Line : keyLine, false);
                        ReadArrayItems(inner, keyLine);
                        list.Items.Add(inner);
                        break;
                    }
                    default:
                        list.Items.Add(ReadScalar(e));
                        break;
                }
            }
        }

        private TomlScalar ReadScalar(TomlParseEvent e)
        {
            int line = e.Line > 0 ? e.Line : _lastLine;
            return e.Kind switch
            {
                TomlParseEventKind.String => new TomlScalar(_p.GetString() ?? "", line),
                TomlParseEventKind.Integer => new TomlScalar(e.GetInt64(), line),
                TomlParseEventKind.Float => new TomlScalar(e.GetDouble(), line),
                TomlParseEventKind.Boolean => new TomlScalar(e.GetBoolean(), line),
                TomlParseEventKind.DateTime => new TomlScalar(e.GetTomlDateTime(), line),
                _ => throw Unexpected(e),
            };
        }

        private InputException Duplicate(string key, int line, int firstLine)
            => new(_file, line, $"found key '{key}' a second time (first at line {firstLine}); expected each key once per table");
    }
}
