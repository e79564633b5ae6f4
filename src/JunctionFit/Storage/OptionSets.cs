using System.Collections.Immutable;
using System.Globalization;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>One option set among result rows: the canonical options text that made them, and how many rows it made.</summary>
/// <param name="Number">1-based number, in order of first appearance among the rows.</param>
/// <param name="OptionsText">The canonical options text (<see cref="JunctionFit.Fitting.FitOptionsText.Canonical"/>); null for rows that do not record it.</param>
/// <param name="OptionsHash">SHA-256 of the text (the database key's options hash); null when the text is unknown.</param>
/// <param name="Rows">Rows made with it.</param>
/// <param name="DistinctLines">The <c>name=value</c> lines of the text that not every set of the rows has: what tells it apart.</param>
public sealed record OptionSetGroup(int Number, string? OptionsText, string? OptionsHash, int Rows, ImmutableArray<string> DistinctLines)
{
    /// <summary>The set in one line: number, short hash, rows and what tells it apart.</summary>
    /// <returns>For example <c>option set 2 (3f9c2a1b04d7, 18 rows): extra.temperature_from_file=false</c>.</returns>
    public string Describe()
    {
        string id = OptionsHash is null ? "options not recorded" : OptionsHash[..12];
        string rows = Rows == 1 ? "1 row" : string.Create(CultureInfo.InvariantCulture, $"{Rows} rows");
        string apart = DistinctLines.Length > 0 ? string.Join(ResultSchema.OptionLineSeparator, DistinctLines)
            : OptionsText is null ? "rows written before option sets were recorded" : "the options every set shares";
        return string.Create(CultureInfo.InvariantCulture, $"option set {Number} ({id}, {rows}): {apart}");
    }
}

/// <summary>
/// The option sets among result rows, so that rows of different options are never pooled silently: <see cref="Of"/> groups
/// rows by their <see cref="ResultRow.OptionSet"/>, <see cref="TryChoose"/> picks the one a user names.
/// </summary>
public static class OptionSets
{
    /// <summary>The option sets of <paramref name="rows"/>, in order of first appearance (rows without a recorded set form one group).</summary>
    /// <param name="rows">Rows.</param>
    /// <returns>The sets.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="rows"/> is null.</exception>
    public static ImmutableArray<OptionSetGroup> Of(IEnumerable<ResultRow> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var order = new List<string?>();
        var counts = new Dictionary<string, int>(StringComparer.Ordinal);
        int unknown = 0;
        foreach (var row in rows)
        {
            if (row.OptionSet is not string text)
            {
                if (unknown++ == 0) order.Add(null);
                continue;
            }
            if (counts.TryGetValue(text, out int n)) counts[text] = n + 1;
            else
            {
                counts[text] = 1;
                order.Add(text);
            }
        }
        var lineSets = order.Select(t => t is null ? [] : new HashSet<string>(Lines(t), StringComparer.Ordinal)).ToList();
        var shared = lineSets.Count == 0 ? [] : lineSets.Skip(1).Aggregate(new HashSet<string>(lineSets[0], StringComparer.Ordinal), (acc, s) => { acc.IntersectWith(s); return acc; });
        var groups = ImmutableArray.CreateBuilder<OptionSetGroup>(order.Count);
        for (int i = 0; i < order.Count; i++)
        {
            string? text = order[i];
            var distinct = text is null ? [] : Lines(text).Where(l => !shared.Contains(l)).ToImmutableArray();
            groups.Add(new OptionSetGroup(i + 1, text, text is null ? null : ResultIdentity.OptionsHash(text), text is null ? unknown : counts[text], distinct));
        }
        return groups.MoveToImmutable();
    }

    /// <summary>
    /// The set that <paramref name="choice"/> names: its number (as <see cref="Of"/> lists them), a prefix of at least
    /// 6 hexadecimal digits of its options hash, or <c>name=value</c> lines (separated by <c>;</c>) that its options text
    /// holds and no other set's does.
    /// </summary>
    /// <param name="groups">Sets from <see cref="Of"/>.</param>
    /// <param name="choice">What the user typed.</param>
    /// <param name="chosen">The set, when exactly one matches.</param>
    /// <param name="reason">Why none was chosen, in words; null when one was.</param>
    /// <returns>True when exactly one set matches.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    public static bool TryChoose(IReadOnlyList<OptionSetGroup> groups, string choice, out OptionSetGroup? chosen, out string? reason)
    {
        ArgumentNullException.ThrowIfNull(groups);
        ArgumentNullException.ThrowIfNull(choice);
        string c = choice.Trim();
        List<OptionSetGroup> matches;
        if (int.TryParse(c, NumberStyles.None, CultureInfo.InvariantCulture, out int number))
        {
            matches = [.. groups.Where(g => g.Number == number)];
        }
        else if (c.Length >= 6 && c.All(char.IsAsciiHexDigit))
        {
            matches = [.. groups.Where(g => g.OptionsHash is string h && h.StartsWith(c.ToLowerInvariant(), StringComparison.Ordinal))];
        }
        else
        {
            var wanted = c.Split(';', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
            matches = wanted.Length == 0 ? [] : [.. groups.Where(g => g.OptionsText is string t && wanted.All(w => Lines(t).Contains(w, StringComparer.Ordinal)))];
        }
        chosen = matches.Count == 1 ? matches[0] : null;
        reason = matches.Count switch
        {
            1 => null,
            0 => $"'{choice}' names none of the {groups.Count} option set(s) found",
            _ => string.Create(CultureInfo.InvariantCulture, $"'{choice}' names {matches.Count} option sets ({string.Join(", ", matches.Select(m => m.Number))})"),
        };
        return chosen is not null;
    }

    /// <summary>The rows of <paramref name="group"/>.</summary>
    /// <param name="rows">Rows.</param>
    /// <param name="group">A set from <see cref="Of"/> of the same rows.</param>
    /// <returns>Its rows, in order.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    public static ImmutableArray<ResultRow> RowsOf(IEnumerable<ResultRow> rows, OptionSetGroup group)
    {
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(group);
        return [.. rows.Where(r => string.Equals(r.OptionSet, group.OptionsText, StringComparison.Ordinal))];
    }

    private static string[] Lines(string text) => text.Split('\n');
}
