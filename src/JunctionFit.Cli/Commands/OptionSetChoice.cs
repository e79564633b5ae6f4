using System.CommandLine;
using JunctionFit.Cli.Support;
using JunctionFit.Results;
using JunctionFit.Storage;

namespace JunctionFit.Cli.Commands;

/// <summary>
/// <c>--option-set N|TEXT</c> of the commands that pool stored rows (drift, thickness): rows of different option sets are
/// never pooled silently; with more than one set the command stops (exit 2) naming the sets unless one is chosen.
/// </summary>
internal static class OptionSetChoice
{
    public const string Name = "--option-set";

    public static Option<string?> CreateOption() => new(Name)
    {
        Description = "use only the rows of this option set: its number as listed when several are found, a prefix of its options hash " +
                      "(6 or more hex digits), or name=value lines of its options text separated by ';'",
    };

    /// <summary>The rows of the one option set among <paramref name="rows"/>, or of the chosen one; a usage error naming the sets otherwise.</summary>
    public static IReadOnlyList<ResultRow> Pool(string command, IReadOnlyList<ResultRow> rows, string? choice)
    {
        var groups = OptionSets.Of(rows);
        if (choice is not null)
        {
            if (!OptionSets.TryChoose(groups, choice, out var chosen, out string? reason))
            {
                throw new UsageException($"{Name}: {reason}; the sets are: {List(groups)}");
            }
            return OptionSets.RowsOf(rows, chosen!);
        }
        if (groups.Length <= 1) return rows;
        throw new UsageException($"{command}: the results hold {groups.Length} option sets and rows of different options are not pooled; " +
                                 $"choose one with {Name} N (or a hash prefix, or name=value): {List(groups)}");
    }

    /// <summary>One line per set, for standard error.</summary>
    public static string List(IReadOnlyList<OptionSetGroup> groups) => string.Join("", groups.Select(g => Environment.NewLine + "  " + g.Describe()));
}
