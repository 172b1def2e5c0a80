using System.Globalization;

namespace OpGrowth.Models;

/// <summary>
/// A small, safe arithmetic expression over numbers and parameter names, used for couplings, angles,
/// site indices and parameter defaults in model files: <c>+ - * / ^</c>, parentheses, unary minus,
/// the constant <c>pi</c> and the functions sqrt, exp, log, sin, cos, tan, abs, floor, ceil, round,
/// min, max. No other names, no assignments, no loops: evaluation always terminates.
/// </summary>
internal sealed class Expression
{
    private readonly Node _root;

    private Expression(string text, Node root, IReadOnlyList<string> names)
    {
        Text = text;
        _root = root;
        Names = names;
    }

    /// <summary>The source text.</summary>
    public string Text { get; }

    /// <summary>Parameter names the expression refers to (constants excluded), in first-use order.</summary>
    public IReadOnlyList<string> Names { get; }

    /// <summary>Functions the evaluator knows, with their number of arguments.</summary>
    public static readonly IReadOnlyDictionary<string, int> Functions = new Dictionary<string, int>(StringComparer.Ordinal)
    {
        ["sqrt"] = 1, ["exp"] = 1, ["log"] = 1, ["sin"] = 1, ["cos"] = 1, ["tan"] = 1, ["abs"] = 1,
        ["floor"] = 1, ["ceil"] = 1, ["round"] = 1, ["min"] = 2, ["max"] = 2,
    };

    /// <summary>Named constants.</summary>
    public static readonly IReadOnlyDictionary<string, double> Constants = new Dictionary<string, double>(StringComparer.Ordinal)
    {
        ["pi"] = Math.PI,
    };

    /// <summary>What an expression may contain, for "expected ..." messages.</summary>
    public const string Grammar = "numbers, parameter names, pi, + - * / ^, parentheses and sqrt, exp, log, sin, cos, tan, abs, floor, ceil, round, min, max";

    /// <summary>Parses; on failure returns false with the "found" part of a message (what is wrong and where).</summary>
    public static bool TryParse(string text, out Expression? expression, out string? problem)
    {
        var p = new Parser(text);
        try
        {
            var node = p.ParseExpression();
            p.SkipSpace();
            if (!p.AtEnd) throw p.Fail($"'{p.Rest}' after a complete expression");
            expression = new Expression(text, node, p.Names);
            problem = null;
            return true;
        }
        catch (ParseError e)
        {
            expression = null;
            problem = $"{e.Message} in the expression \"{TomlScalar.Shorten(text)}\"";
            return false;
        }
    }

    /// <summary>Evaluates with the given parameter values; every name must be present (the caller checks <see cref="Names"/>).</summary>
    public double Evaluate(IReadOnlyDictionary<string, double> parameters) => _root.Eval(parameters);

    private sealed class ParseError(string message) : Exception(message);

    private abstract class Node
    {
        public abstract double Eval(IReadOnlyDictionary<string, double> p);
    }

    private sealed class Number(double v) : Node
    {
        public override double Eval(IReadOnlyDictionary<string, double> p) => v;
    }

    private sealed class Name(string name) : Node
    {
        public override double Eval(IReadOnlyDictionary<string, double> p)
            => Constants.TryGetValue(name, out double c) ? c : p[name];
    }

    private sealed class Unary(Node a) : Node
    {
        public override double Eval(IReadOnlyDictionary<string, double> p) => -a.Eval(p);
    }

    private sealed class Binary(char op, Node a, Node b) : Node
    {
        public override double Eval(IReadOnlyDictionary<string, double> p)
        {
            double x = a.Eval(p), y = b.Eval(p);
            return op switch
            {
                '+' => x + y,
                '-' => x - y,
                '*' => x * y,
                '/' => x / y,
                _ => Math.Pow(x, y),
            };
        }
    }

    private sealed class Call(string f, Node[] args) : Node
    {
        public override double Eval(IReadOnlyDictionary<string, double> p)
        {
            double a = args[0].Eval(p);
            return f switch
            {
                "sqrt" => Math.Sqrt(a),
                "exp" => Math.Exp(a),
                "log" => Math.Log(a),
                "sin" => Math.Sin(a),
                "cos" => Math.Cos(a),
                "tan" => Math.Tan(a),
                "abs" => Math.Abs(a),
                "floor" => Math.Floor(a),
                "ceil" => Math.Ceiling(a),
                "round" => Math.Round(a, MidpointRounding.AwayFromZero),
                "min" => Math.Min(a, args[1].Eval(p)),
                _ => Math.Max(a, args[1].Eval(p)),
            };
        }
    }

    private sealed class Parser(string text)
    {
        private int _pos;
        private int _depth;

        public List<string> Names { get; } = [];

        public bool AtEnd => _pos >= text.Length;

        public string Rest => text[_pos..];

        public ParseError Fail(string what) => new(what);

        public void SkipSpace()
        {
            while (_pos < text.Length && char.IsWhiteSpace(text[_pos])) _pos++;
        }

        private bool Eat(char c)
        {
            SkipSpace();
            if (_pos < text.Length && text[_pos] == c)
            {
                _pos++;
                return true;
            }
            return false;
        }

        public Node ParseExpression()
        {
            if (++_depth > 64) throw Fail("parentheses nested more than 64 deep");
            var left = ParseTerm();
            while (true)
            {
                if (Eat('+')) left = new Binary('+', left, ParseTerm());
                else if (Eat('-')) left = new Binary('-', left, ParseTerm());
                else break;
            }
            _depth--;
            return left;
        }

        private Node ParseTerm()
        {
            var left = ParseUnary();
            while (true)
            {
                if (Eat('*')) left = new Binary('*', left, ParseUnary());
                else if (Eat('/')) left = new Binary('/', left, ParseUnary());
                else break;
            }
            return left;
        }

        private Node ParseUnary()
        {
            if (++_depth > 64) throw Fail("signs or powers nested more than 64 deep");
            Node r;
            if (Eat('-')) r = new Unary(ParseUnary());
            else if (Eat('+')) r = ParseUnary();
            else
            {
                var b = ParsePrimary();
                r = Eat('^') ? new Binary('^', b, ParseUnary()) : b;
            }
            _depth--;
            return r;
        }

        private Node ParsePrimary()
        {
            SkipSpace();
            if (AtEnd) throw Fail(_pos == 0 ? "nothing" : "the end of the text where a number, name or '(' belongs");
            char c = text[_pos];
            if (c == '(')
            {
                _pos++;
                var inner = ParseExpression();
                if (!Eat(')')) throw Fail(AtEnd ? "an unclosed '('" : $"'{Rest}' where ')' belongs");
                return inner;
            }
            if (char.IsAsciiDigit(c) || c == '.')
            {
                int start = _pos;
                while (_pos < text.Length && (char.IsAsciiDigit(text[_pos]) || text[_pos] == '.')) _pos++;
                if (_pos < text.Length && (text[_pos] == 'e' || text[_pos] == 'E'))
                {
                    int save = _pos;
                    _pos++;
                    if (_pos < text.Length && (text[_pos] == '+' || text[_pos] == '-')) _pos++;
                    if (_pos < text.Length && char.IsAsciiDigit(text[_pos]))
                    {
                        while (_pos < text.Length && char.IsAsciiDigit(text[_pos])) _pos++;
                    }
                    else _pos = save;
                }
                string num = text[start.._pos];
                if (!double.TryParse(num, NumberStyles.AllowDecimalPoint | NumberStyles.AllowExponent, CultureInfo.InvariantCulture, out double v))
                {
                    throw Fail($"the malformed number '{num}'");
                }
                return new Number(v);
            }
            if (char.IsAsciiLetter(c) || c == '_')
            {
                int start = _pos;
                while (_pos < text.Length && (char.IsAsciiLetterOrDigit(text[_pos]) || text[_pos] == '_')) _pos++;
                string name = text[start.._pos];
                SkipSpace();
                if (_pos < text.Length && text[_pos] == '(')
                {
                    if (!Functions.TryGetValue(name, out int arity)) throw Fail($"the unknown function '{name}'");
                    _pos++;
                    var args = new List<Node>();
                    if (!Eat(')'))
                    {
                        do args.Add(ParseExpression());
                        while (Eat(','));
                        if (!Eat(')')) throw Fail(AtEnd ? $"an unclosed '(' after {name}" : $"'{Rest}' where ',' or ')' belongs");
                    }
                    if (args.Count != arity) throw Fail($"{name} with {args.Count} argument(s) (it takes {arity})");
                    return new Call(name, args.ToArray());
                }
                if (!Constants.ContainsKey(name) && !Names.Contains(name)) Names.Add(name);
                return new Name(name);
            }
            throw Fail($"the character '{c}'");
        }
    }
}
