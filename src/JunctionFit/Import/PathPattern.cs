using System.Collections.Concurrent;
using System.Text;
using System.Text.RegularExpressions;

namespace JunctionFit.Import;

/// <summary>
/// A file-path pattern such as <c>{lot}/{wafer}/die_{x}_{y}.csv</c>. Placeholders: <c>{lot}</c>,
/// <c>{wafer}</c>, <c>{site}</c>, <c>{device}</c> (any text without a slash), <c>{x}</c>, <c>{y}</c>
/// (integers) and <c>*</c> (any text without a slash). The pattern is matched against the end of
/// the path, at a folder boundary, ignoring case; <c>\</c> in the path counts as <c>/</c>.
/// </summary>
internal sealed class PathPattern
{
    private static readonly ConcurrentDictionary<string, PathPattern> Cache = new(StringComparer.Ordinal);
    private static readonly string[] Names = ["lot", "wafer", "site", "device", "x", "y"];
    private readonly Regex _regex;

    private PathPattern(Regex regex) => _regex = regex;

    /// <summary>Compiles a pattern; throws <see cref="ArgumentException"/> when it is malformed.</summary>
    public static PathPattern Create(string pattern)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(pattern);
        if (Cache.TryGetValue(pattern, out PathPattern? cached))
        {
            return cached;
        }

        var sb = new StringBuilder("(?:^|/)");
        var seen = new HashSet<string>(StringComparer.Ordinal);
        string p = pattern.Replace('\\', '/');
        int i = 0;
        while (i < p.Length)
        {
            char c = p[i];
            if (c == '{')
            {
                int close = p.IndexOf('}', i);
                if (close < 0)
                {
                    throw new ArgumentException($"path pattern '{pattern}': '{{' at position {i + 1} is not closed", nameof(pattern));
                }
                string name = p[(i + 1)..close].Trim().ToLowerInvariant();
                if (Array.IndexOf(Names, name) < 0)
                {
                    throw new ArgumentException(
                        $"path pattern '{pattern}': unknown placeholder '{{{name}}}'; use {{lot}}, {{wafer}}, {{site}}, {{device}}, {{x}}, {{y}} or *",
                        nameof(pattern));
                }
                if (!seen.Add(name))
                {
                    throw new ArgumentException($"path pattern '{pattern}': placeholder '{{{name}}}' appears twice", nameof(pattern));
                }
                sb.Append(name is "x" or "y" ? $"(?<{name}>[+-]?[0-9]+)" : $"(?<{name}>[^/]+?)");
                i = close + 1;
            }
            else if (c == '*')
            {
                sb.Append("[^/]*?");
                i++;
            }
            else if (c == '}')
            {
                throw new ArgumentException($"path pattern '{pattern}': '}}' at position {i + 1} has no '{{'", nameof(pattern));
            }
            else
            {
                sb.Append(Regex.Escape(c.ToString()));
                i++;
            }
        }
        sb.Append('$');
        var compiled = new PathPattern(new Regex(sb.ToString(), RegexOptions.IgnoreCase | RegexOptions.CultureInvariant, TimeSpan.FromSeconds(1)));
        if (Cache.Count < 256)
        {
            Cache.TryAdd(pattern, compiled);
        }
        return compiled;
    }

    /// <summary>Matches the path; returns the captured values (lower-case names) or null.</summary>
    public IReadOnlyDictionary<string, string>? Match(string path)
    {
        string normalized = path.Replace('\\', '/');
        Match m;
        try
        {
            m = _regex.Match(normalized);
        }
        catch (RegexMatchTimeoutException)
        {
            return null;
        }
        if (!m.Success)
        {
            return null;
        }
        var values = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (string name in Names)
        {
            Group g = m.Groups[name];
            if (g.Success)
            {
                values[name] = g.Value;
            }
        }
        return values;
    }
}
