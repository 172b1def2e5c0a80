using System.Globalization;
using System.Text;
using OpGrowth.Pauli;

namespace OpGrowth.Sweeps;

/// <summary>
/// Probe operators of a plan, written once for every N: a Pauli string in site-indexed form whose
/// site numbers may be integer expressions in braces over N ("Z_0", "Z_{N-1}", "X_{N/2} X_{N/2+1}";
/// + - * / with floor division and parentheses), or "model" / "model:K" for the model file's K-th
/// default probe.
/// </summary>
public static class ProbeTemplate
{
    /// <summary>True for "model" or "model:K".</summary>
    public static bool IsModelProbe(string template, out int k)
    {
        k = 0;
        string t = template.Trim();
        if (t == "model") return true;
        return t.StartsWith("model:", StringComparison.Ordinal)
            && int.TryParse(t.AsSpan(6), NumberStyles.None, CultureInfo.InvariantCulture, out k);
    }

    /// <summary>
    /// Resolves a template at size <paramref name="n"/>: substitutes the brace expressions and checks
    /// the result is a valid Pauli string on N qubits. Returns false with a "found ...; expected ..."
    /// message otherwise.
    /// </summary>
    public static bool TryResolve(string template, int n, out string resolved, out string? error)
    {
        resolved = "";
        if (IsModelProbe(template, out int k))
        {
            resolved = $"model:{k}";
            error = null;
            return true;
        }
        var sb = new StringBuilder();
        int i = 0;
        while (i < template.Length)
        {
            char c = template[i];
            if (c == '}')
            {
                error = $"found an unmatched '}}' in probe '{template}'; expected site expressions such as Z_{{N-1}}";
                return false;
            }
            if (c != '{')
            {
                sb.Append(c);
                i++;
                continue;
            }
            int close = template.IndexOf('}', i + 1);
            if (close < 0)
            {
                error = $"found an unclosed '{{' in probe '{template}'; expected site expressions such as Z_{{N-1}}";
                return false;
            }
            string expr = template[(i + 1)..close];
            if (!IntExpression.TryEvaluate(expr, n, out long v, out string? exprError))
            {
                error = $"found '{{{expr}}}' in probe '{template}' ({exprError}); expected an integer expression in N such as N-1 or N/2";
                return false;
            }
            sb.Append(v.ToString(CultureInfo.InvariantCulture));
            i = close + 1;
        }
        string text = sb.ToString().Trim();
        if (!PauliString.TryParse(text, n, out var s, out string? parseError))
        {
            error = $"probe '{template}' at N={n} gives '{text}': {parseError}";
            return false;
        }
        if (s!.IsIdentity)
        {
            error = $"found the identity as probe '{template}'; expected a non-identity Pauli string";
            return false;
        }
        resolved = s.ToString();
        error = null;
        return true;
    }

    /// <summary>Integer arithmetic over N: + - * / (floor), unary minus, parentheses.</summary>
    private ref struct IntExpression
    {
        private readonly ReadOnlySpan<char> _s;
        private readonly long _n;
        private int _p;
        private string? _error;

        private IntExpression(ReadOnlySpan<char> s, long n)
        {
            _s = s;
            _n = n;
            _p = 0;
            _error = null;
        }

        public static bool TryEvaluate(string text, long n, out long value, out string? error)
        {
            var e = new IntExpression(text, n);
            value = e.Sum();
            e.SkipSpace();
            if (e._error is null && e._p < e._s.Length) e._error = $"unexpected '{e._s[e._p]}'";
            error = e._error;
            return error is null;
        }

        private void SkipSpace()
        {
            while (_p < _s.Length && char.IsWhiteSpace(_s[_p])) _p++;
        }

        private long Sum()
        {
            long v = Product();
            while (_error is null)
            {
                SkipSpace();
                if (_p >= _s.Length || (_s[_p] != '+' && _s[_p] != '-')) return v;
                char op = _s[_p++];
                long r = Product();
                v = op == '+' ? v + r : v - r;
            }
            return v;
        }

        private long Product()
        {
            long v = Atom();
            while (_error is null)
            {
                SkipSpace();
                if (_p >= _s.Length || (_s[_p] != '*' && _s[_p] != '/')) return v;
                char op = _s[_p++];
                long r = Atom();
                if (op == '*') v *= r;
                else if (r == 0)
                {
                    _error = "division by zero";
                    return 0;
                }
                else v = (long)Math.Floor(v / (double)r);
            }
            return v;
        }

        private long Atom()
        {
            SkipSpace();
            if (_p >= _s.Length)
            {
                _error = "an incomplete expression";
                return 0;
            }
            char c = _s[_p];
            if (c == '-')
            {
                _p++;
                return -Atom();
            }
            if (c == '(')
            {
                _p++;
                long v = Sum();
                SkipSpace();
                if (_p >= _s.Length || _s[_p] != ')')
                {
                    _error ??= "a missing ')'";
                    return 0;
                }
                _p++;
                return v;
            }
            if (c == 'N')
            {
                _p++;
                return _n;
            }
            if (char.IsAsciiDigit(c))
            {
                long v = 0;
                while (_p < _s.Length && char.IsAsciiDigit(_s[_p])) v = v * 10 + (_s[_p++] - '0');
                return v;
            }
            _error = $"unexpected '{c}'";
            return 0;
        }
    }
}
