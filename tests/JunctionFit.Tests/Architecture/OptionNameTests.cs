using System.CommandLine;
using JunctionFit.Cli;
using JunctionFit.Cli.Support;
using JunctionFit.Common;
using JunctionFit.Fitting;
using JunctionFit.Tests.Fitting;
using Mono.Cecil;
using Mono.Cecil.Cil;
using Xunit;

namespace JunctionFit.Tests.Architecture;

/// <summary>
/// Command-line option names stay in the CLI assembly: the library writes structured remedies (<see cref="Remedy"/>) and the
/// CLI words them (OptionWords). Checked on the compiled library: every string literal and string constant of every type,
/// against every option of the real command tree (common practice, no source).
/// </summary>
public class OptionNameTests
{
    private static IReadOnlyList<string> OptionNames()
    {
        var names = new SortedSet<string>(StringComparer.Ordinal);
        void Walk(Command command)
        {
            foreach (var option in command.Options)
            {
                foreach (string name in option.Aliases.Append(option.Name)) if (name.StartsWith("--", StringComparison.Ordinal)) names.Add(name);
            }
            foreach (var sub in command.Subcommands) Walk(sub);
        }
        Walk(CliApp.BuildRoot(new CliContext(TextWriter.Null, TextWriter.Null)));
        return [.. names];
    }

    /// <summary>(type, text) of every string literal and string constant in an assembly.</summary>
    private static List<(string Type, string Text)> Strings(string assemblyPath)
    {
        var found = new List<(string, string)>();
        using var module = ModuleDefinition.ReadModule(assemblyPath);
        foreach (var type in module.GetTypes())
        {
            foreach (var field in type.Fields) if (field.HasConstant && field.Constant is string c) found.Add((type.FullName, c));
            foreach (var method in type.Methods)
            {
                if (!method.HasBody) continue;
                foreach (var instruction in method.Body.Instructions)
                {
                    if (instruction.OpCode == OpCodes.Ldstr) found.Add((type.FullName, (string)instruction.Operand));
                }
            }
        }
        return found;
    }

    /// <summary>The options named in <paramref name="text"/>: <c>--name</c> not followed by a letter, digit or '-'.</summary>
    private static IEnumerable<string> Named(string text, IReadOnlyList<string> options) =>
        options.Where(o =>
        {
            for (int at = text.IndexOf(o, StringComparison.Ordinal); at >= 0; at = text.IndexOf(o, at + 1, StringComparison.Ordinal))
            {
                int end = at + o.Length;
                if (end == text.Length || !(char.IsLetterOrDigit(text[end]) || text[end] == '-')) return true;
            }
            return false;
        });

    private static List<string> Offences(string assemblyPath)
    {
        var options = OptionNames();
        return [.. Strings(assemblyPath).SelectMany(s => Named(s.Text, options).Select(o => $"{s.Type}: {o} in \"{s.Text}\""))];
    }

    [Fact]
    public void LibraryStrings_NameNoCommandLineOption()
    {
        var offences = Offences(typeof(FitOptions).Assembly.Location);
        Assert.True(offences.Count == 0, "the library names command-line options (write a Remedy instead):\n" + string.Join("\n", offences));
    }

    [Fact]
    public void OptionScan_PointedAtTheCli_FindsItsOwnOptions()
    {
        // The scanner can fail: the CLI's own strings name options (its messages and the words of the remedies).
        var offences = Offences(typeof(CliApp).Assembly.Location);
        Assert.Contains(offences, o => o.StartsWith("JunctionFit.Cli.Support.OptionWords", StringComparison.Ordinal) && o.Contains("--area-from-file", StringComparison.Ordinal));
        Assert.True(OptionNames().Count > 40, "the command tree lists its options");
    }

    [Fact]
    public void OptionWords_EveryRemedyKind_IsAnOptionOfTheTool()
    {
        var options = OptionNames();
        foreach (var kind in Enum.GetValues<RemedyKind>())
        {
            string words = OptionWords.Flag(new Remedy(kind));
            string option = kind == RemedyKind.FitJsonOutput ? words.Split(' ')[1] : words.Split(' ')[0];
            Assert.True(options.Contains(option), $"{kind} is worded as {words}, which is no option of the tool");
        }
    }

    [Fact]
    public void Remedy_WordAndFind_ReplaceEachPlaceholderOnce()
    {
        string text = $"fix the area ({Remedy.GiveArea} or {Remedy.AreaFromFile}), or hold a parameter fixed ({Remedy.Fix("thickness=NM")}); {{not a placeholder}}";
        Assert.Equal([Remedy.GiveArea, Remedy.AreaFromFile, Remedy.Fix("thickness=NM")], Remedy.Find(text));
        Assert.Equal("fix the area (--area or --area-from-file), or hold a parameter fixed (--fix thickness=NM); {not a placeholder}", OptionWords.Word(text));
        Assert.Equal("{{remedy:NoSuchKind}} {{remedy:1}}", OptionWords.Word("{{remedy:NoSuchKind}} {{remedy:1}}"));
        Assert.Null(OptionWords.Word((string?)null));
    }

    [Fact]
    public void FitResult_FromTheCli_HasItsRemediesWordedAsOptions()
    {
        // The area-free case of JunctionFitterTests: the library's warning holds the remedy, the CLI's wording the option.
        var curve = JunctionFitterTests.Simulate(2.0, 1.5, 100, 0.01, seed: 31, fromV: -1.2, toV: 1.2);
        var result = JunctionFitter.Fit(curve, new JunctionFit.Physics.JunctionCurrentModel(JunctionFit.Physics.SimmonsRectangularModel.Instance), FitOptions.Default);
        string raw = Assert.Single(result.Warnings, w => w.StartsWith("not identifiable", StringComparison.Ordinal));
        Assert.DoesNotContain("--area", raw, StringComparison.Ordinal);
        string worded = Assert.Single(OptionWords.Word(result).Warnings, w => w.StartsWith("not identifiable", StringComparison.Ordinal));
        Assert.Contains("(--area", worded, StringComparison.Ordinal);
        Assert.DoesNotContain("{{remedy:", worded, StringComparison.Ordinal);
    }
}
