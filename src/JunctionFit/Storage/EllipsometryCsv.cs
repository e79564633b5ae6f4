using System.Collections.Immutable;
using System.Globalization;
using System.Text.RegularExpressions;
using JunctionFit.Common;
using JunctionFit.Import;

namespace JunctionFit.Storage;

/// <summary>
/// Reads an ellipsometry table. Accepted layouts (header names case-insensitive, any column order, extra columns ignored):
/// <list type="bullet">
/// <item>per wafer: <c>lot,wafer,thickness_nm</c>;</item>
/// <item>per site: <c>lot,wafer,die_x,die_y,thickness_nm</c> (or <c>x,y</c> for <c>die_x,die_y</c>);</item>
/// <item>per site: <c>lot,wafer,die,thickness_nm</c> with the die as two integers, for example <c>3_5</c>, <c>"3,5"</c>,
/// <c>(3, 5)</c>, <c>3x5</c> or <c>3/5</c> (x first).</item>
/// </list>
/// The delimiter is a comma, or a semicolon or tab when the header holds one of those and no comma. Blank lines and
/// lines starting with <c>#</c> are skipped. Thickness in nm, finite and greater than zero.
/// </summary>
public static partial class EllipsometryCsv
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Reads the file.</summary>
    /// <param name="path">The file.</param>
    /// <returns>Rows in file order, each with its line number.</returns>
    /// <exception cref="ResultsFormatException">Empty file, missing column, or a bad cell.</exception>
    /// <exception cref="IOException">The file cannot be opened.</exception>
    public static ImmutableArray<EllipsometryRow> Read(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        using var reader = new StreamReader(path, AtomicFile.Utf8NoBom, detectEncodingFromByteOrderMarks: true);
        return Read(reader, path);
    }

    /// <summary>Reads an ellipsometry table from <paramref name="reader"/>.</summary>
    /// <param name="reader">The text.</param>
    /// <param name="path">Name used in error messages.</param>
    /// <returns>Rows in file order.</returns>
    /// <exception cref="ResultsFormatException">Empty text, missing column, or a bad cell.</exception>
    public static ImmutableArray<EllipsometryRow> Read(TextReader reader, string path)
    {
        ArgumentNullException.ThrowIfNull(reader);
        ArgumentNullException.ThrowIfNull(path);
        string text = reader.ReadToEnd();
        char delimiter = DetectDelimiter(text);
        var records = CsvText.Read(new StringReader(text), path, delimiter)
            .Where(r => !r.Fields[0].TrimStart().StartsWith('#'));
        using var e = records.GetEnumerator();
        if (!e.MoveNext())
        {
            throw new ResultsFormatException(path, 1, "the file is empty; an ellipsometry table starts with a header line such as lot,wafer,thickness_nm");
        }
        var header = e.Current;
        var index = new Dictionary<string, int>(StringComparer.OrdinalIgnoreCase);
        for (int i = 0; i < header.Fields.Length; i++)
        {
            string name = header.Fields[i].Trim();
            if (name.Length > 0 && !index.TryAdd(name, i))
            {
                throw new ResultsFormatException(path, header.Line, $"column '{name}' appears twice", i + 1, header.Raw);
            }
        }
        int? Col(params string[] names)
        {
            foreach (string n in names) if (index.TryGetValue(n, out int c)) return c;
            return null;
        }
        int? lotCol = Col("lot"), waferCol = Col("wafer"), thicknessCol = Col("thickness_nm");
        int? xCol = Col("die_x", "x"), yCol = Col("die_y", "y"), dieCol = Col("die");
        var missing = new List<string>();
        if (lotCol is null) missing.Add("'lot'");
        if (waferCol is null) missing.Add("'wafer'");
        if (thicknessCol is null) missing.Add("'thickness_nm'");
        if ((xCol is null) != (yCol is null)) missing.Add(xCol is null ? "'die_x'" : "'die_y'");
        if (missing.Count > 0)
        {
            throw new ResultsFormatException(path, header.Line,
                $"missing column{(missing.Count == 1 ? "" : "s")} {string.Join(", ", missing)}; expected lot,wafer,thickness_nm, optionally with die_x,die_y or die",
                rawText: header.Raw);
        }
        bool perSite = xCol is not null || dieCol is not null;

        var rows = ImmutableArray.CreateBuilder<EllipsometryRow>();
        while (e.MoveNext())
        {
            var r = e.Current;
            if (r.Fields.Length < header.Fields.Length)
            {
                throw new ResultsFormatException(path, r.Line,
                    string.Create(Inv, $"{r.Fields.Length} fields, but the header has {header.Fields.Length}"), rawText: r.Raw);
            }
            string lot = Required(r, lotCol!.Value, "lot", path);
            string wafer = Required(r, waferCol!.Value, "wafer", path);
            double thickness = Thickness(r, thicknessCol!.Value, path);
            int? x = null, y = null;
            if (perSite)
            {
                if (xCol is int xc && yCol is int yc)
                {
                    x = Integer(r, xc, "die_x", path);
                    y = Integer(r, yc, "die_y", path);
                }
                else
                {
                    (x, y) = Die(r, dieCol!.Value, path);
                }
            }
            rows.Add(new EllipsometryRow(lot, wafer, x, y, thickness, r.Line));
        }
        return rows.ToImmutable();
    }

    private static char DetectDelimiter(string text)
    {
        foreach (string line in text.Split('\n'))
        {
            string t = line.Trim();
            if (t.Length == 0 || t.StartsWith('#')) continue;
            if (t.Contains(',', StringComparison.Ordinal)) return ',';
            if (t.Contains(';', StringComparison.Ordinal)) return ';';
            if (t.Contains('\t', StringComparison.Ordinal)) return '\t';
            return ',';
        }
        return ',';
    }

    private static string Required(CsvText.Record r, int col, string name, string path)
    {
        string s = r.Fields[col].Trim();
        if (s.Length == 0) throw new ResultsFormatException(path, r.Line, $"the '{name}' cell is empty", col + 1, r.Raw);
        return s;
    }

    private static double Thickness(CsvText.Record r, int col, string path)
    {
        string s = Required(r, col, "thickness_nm", path);
        if (!double.TryParse(s, NumberStyles.Float, Inv, out double v))
        {
            throw new ResultsFormatException(path, r.Line, $"'{s}' in column thickness_nm is not a number", col + 1, r.Raw);
        }
        if (!double.IsFinite(v) || v <= 0)
        {
            throw new ResultsFormatException(path, r.Line, $"thickness {s} nm must be a finite number greater than zero", col + 1, r.Raw);
        }
        return v;
    }

    private static int Integer(CsvText.Record r, int col, string name, string path)
    {
        string s = Required(r, col, name, path);
        if (int.TryParse(s, NumberStyles.Integer, Inv, out int v)) return v;
        throw new ResultsFormatException(path, r.Line, $"'{s}' in column {name} is not a whole number", col + 1, r.Raw);
    }

    private static (int X, int Y) Die(CsvText.Record r, int col, string path)
    {
        string s = Required(r, col, "die", path);
        var m = DiePattern().Match(s);
        if (!m.Success)
        {
            throw new ResultsFormatException(path, r.Line, $"die '{s}' is not two whole numbers such as 3_5, 3,5 or (3, 5)", col + 1, r.Raw);
        }
        return (int.Parse(m.Groups[1].Value, Inv), int.Parse(m.Groups[2].Value, Inv));
    }

    [GeneratedRegex(@"^\(?\s*(-?\d{1,6})\s*(?:[_,;/xX]|\s)\s*(-?\d{1,6})\s*\)?$")]
    private static partial Regex DiePattern();
}
