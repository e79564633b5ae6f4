using System.Text;
using JunctionFit.Common;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Cli.Support;

/// <summary>
/// The command-line words of the library's structured remedies (<see cref="Remedy"/>): each kind is the option that does it.
/// Option names live here and in the commands only; the library writes placeholders, and everything the tool prints or
/// stores from a fit is worded once, here.
/// </summary>
internal static class OptionWords
{
    /// <summary>The option (with its argument) that carries out <paramref name="remedy"/>.</summary>
    public static string Flag(Remedy remedy)
    {
        string option = remedy.Kind switch
        {
            RemedyKind.GiveArea => "--area",
            RemedyKind.AreaFromFile => "--area-from-file",
            RemedyKind.BiasWindow => "--bias-window",
            RemedyKind.Polarity => "--polarity",
            RemedyKind.FixParameter => "--fix",
            RemedyKind.FreeParameter => "--free",
            RemedyKind.MassRatio => "--mass-ratio",
            RemedyKind.VoltageUnit => "--voltage-unit",
            RemedyKind.CurrentUnit => "--current-unit",
            RemedyKind.CurrentColumn => "--current-column",
            RemedyKind.VoltageColumn => "--voltage-column",
            RemedyKind.ReadAsCv => "--cv",
            RemedyKind.MisfitTolerance => "--misfit-tolerance",
            RemedyKind.Noise => "--noise",
            RemedyKind.KeepCompliance => "--keep-compliance",
            RemedyKind.KeepSettling => "--keep-settling",
            RemedyKind.SweepDirection => "--sweep-direction",
            RemedyKind.Doping => "--doping",
            RemedyKind.PathPattern => "--path-pattern",
            RemedyKind.MaxBias => "--max-bias",
            RemedyKind.MaxField => "--max-field",
            RemedyKind.FitJsonOutput => "fit --json",
            RemedyKind.Refit => "--force",
            RemedyKind.Lease => "--lease",
            _ => throw new ArgumentOutOfRangeException(nameof(remedy), remedy.Kind, "no option words this remedy"),
        };
        return remedy.Argument is null ? option : option + " " + remedy.Argument;
    }

    /// <summary>A message with its remedies worded as options.</summary>
    public static string? Word(string? text) => Remedy.Word(text, Flag);

    /// <summary>Every text of a fit result worded as options (before it is printed, written or stored).</summary>
    public static FitResult Word(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        return result.WithRemediesWorded(Flag);
    }

    /// <summary>Every text of a report section worded as options (a section the library built from messages, before it is written).</summary>
    public static HtmlReportSection Word(HtmlReportSection section)
    {
        ArgumentNullException.ThrowIfNull(section);
        return section with
        {
            Paragraphs = [.. section.Paragraphs.Select(p => Word(p)!)],
            Tables = [.. section.Tables.Select(t => t with
            {
                Caption = Word(t.Caption)!,
                Rows = [.. t.Rows.Select(r => (IReadOnlyList<string>)[.. r.Select(cell => Word(cell)!)])],
            })],
            Images = [.. section.Images.Select(i => i with { Caption = Word(i.Caption)! })],
        };
    }

    /// <summary>A writer that words every remedy in what passes through it (standard output and error).</summary>
    internal sealed class Writer(TextWriter inner) : TextWriter
    {
        /// <summary>The writer worded into.</summary>
        public TextWriter Inner { get; } = inner;

        public override Encoding Encoding => Inner.Encoding;

        public override IFormatProvider FormatProvider => Inner.FormatProvider;

        public override string NewLine
        {
            get => Inner.NewLine;
#pragma warning disable CS8765 // the base setter accepts null; the inner writer does the same
            set => Inner.NewLine = value;
#pragma warning restore CS8765
        }

        public override void Write(char value) => Inner.Write(value);

        public override void Write(string? value) => Inner.Write(Word(value));

        public override void Write(char[] buffer, int index, int count) => Write(new string(buffer, index, count));

        public override void WriteLine(string? value) => Inner.WriteLine(Word(value));

        public override void WriteLine() => Inner.WriteLine();

        public override void Flush() => Inner.Flush();

        protected override void Dispose(bool disposing)
        {
            if (disposing) Inner.Flush();
            base.Dispose(disposing);
        }
    }
}
