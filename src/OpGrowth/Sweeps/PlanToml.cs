using System.Globalization;
using OpGrowth.IO;
using Tomlyn.Parsing;
using Tomlyn.Syntax;

namespace OpGrowth.Sweeps;

/// <summary>A value read from a sweep plan, with the 1-based line it was written on.</summary>
internal sealed record PlanValue(object Value, int Line)
{
    /// <summary>Words for "found ..." messages.</summary>
    public string Describe() => Value switch
    {
        string s => $"the string \"{(s.Length <= 40 ? s : s[..37] + "...")}\"",
        long l => $"the integer {l.ToString(CultureInfo.InvariantCulture)}",
        double d => $"the number {d.ToString("R", CultureInfo.InvariantCulture)}",
        bool b => b ? "true" : "false",
        List<PlanValue> => "an array",
        PlanTable => "a table",
        _ => "a date/time",
    };
}

/// <summary>A table of a sweep plan: keys in written order with their lines.</summary>
internal sealed class PlanTable
{
    public PlanTable(int line) => Line = line;

    public int Line { get; }

    public List<(string Key, PlanValue Value)> Entries { get; } = [];

    public PlanValue? Get(string key)
    {
        foreach (var e in Entries) if (e.Key == key) return e.Value;
        return null;
    }
}

/// <summary>
/// Reads a plan's TOML into <see cref="PlanTable"/>s through Tomlyn's syntax tree, keeping the line of every
/// key so each later error can name file:line. Dotted keys and arrays of tables are not part of the plan
/// schema and are rejected here; duplicate keys and tables too.
/// </summary>
internal static class PlanToml
{
    public static PlanTable Parse(string text, string file)
    {
        DocumentSyntax doc;
        try
        {
            doc = SyntaxParser.Parse(text, file, validate: true);
        }
        catch (Exception ex) when (ex is not InputException)
        {
            throw new InputException(file, 0, $"found TOML that cannot be parsed ({OneLine(ex.Message)}); expected valid TOML");
        }
        if (doc.HasErrors)
        {
            var d = doc.Diagnostics.First(x => x.Kind == DiagnosticMessageKind.Error);
            throw new InputException(file, d.Span.Start.Line + 1, $"found a TOML syntax error ({OneLine(d.Message)}); expected key = value lines and [table] headers");
        }
        var root = new PlanTable(1);
        foreach (var kv in doc.KeyValues) AddKeyValue(root, kv, file);
        foreach (var t in doc.Tables)
        {
            int line = t.Span.Start.Line + 1;
            if (t is TableArraySyntax)
            {
                throw new InputException(file, line, "found an array of tables [[...]]; expected plain [table] headers (a sweep plan has [model], [parameters], [engine], [synthetic])");
            }
            string name = KeyName(t.Name, file, line);
            if (root.Get(name) is not null)
            {
                throw new InputException(file, line, $"found [{name}] a second time; expected each table once");
            }
            var table = new PlanTable(line);
            root.Entries.Add((name, new PlanValue(table, line)));
            foreach (var item in t.Items)
            {
                if (item is KeyValueSyntax kv) AddKeyValue(table, kv, file);
            }
        }
        return root;
    }

    private static void AddKeyValue(PlanTable table, KeyValueSyntax kv, string file)
    {
        int line = kv.Span.Start.Line + 1;
        string key = KeyName(kv.Key, file, line);
        if (table.Get(key) is not null) throw new InputException(file, line, $"found the key '{key}' a second time; expected each key once per table");
        table.Entries.Add((key, Convert(kv.Value, file, line)));
    }

    private static string KeyName(KeySyntax? key, string file, int line)
    {
        if (key is null) throw new InputException(file, line, "found a key without a name; expected name = value");
        if (key.DotKeys is { ChildrenCount: > 0 })
        {
            throw new InputException(file, line, $"found the dotted key '{key.ToString().Trim()}'; expected plain keys inside [table] headers");
        }
        return key.Key switch
        {
            BareKeySyntax b => b.Key?.Text ?? "",
            StringValueSyntax s => s.Value ?? "",
            _ => key.ToString().Trim(),
        };
    }

    private static PlanValue Convert(ValueSyntax? v, string file, int line)
    {
        int l = v is null ? line : v.Span.Start.Line + 1;
        switch (v)
        {
            case StringValueSyntax s: return new PlanValue(s.Value ?? "", l);
            case IntegerValueSyntax i: return new PlanValue(i.Value, l);
            case FloatValueSyntax f: return new PlanValue(f.Value, l);
            case BooleanValueSyntax b: return new PlanValue(b.Value, l);
            case ArraySyntax a:
            {
                var list = new List<PlanValue>();
                foreach (var item in a.Items) list.Add(Convert(item.Value, file, l));
                return new PlanValue(list, l);
            }
            case InlineTableSyntax t:
            {
                var table = new PlanTable(l);
                foreach (var item in t.Items)
                {
                    if (item.KeyValue is { } kv) AddKeyValue(table, kv, file);
                }
                return new PlanValue(table, l);
            }
            case DateTimeValueSyntax: return new PlanValue(DateTime.MinValue, l);
            default: throw new InputException(file, l, "found a value the plan reader does not know; expected a number, string, boolean, array or inline table");
        }
    }

    private static string OneLine(string s)
    {
        int nl = s.IndexOfAny(['\r', '\n']);
        return (nl >= 0 ? s[..nl] : s).Trim().TrimEnd('.');
    }
}
