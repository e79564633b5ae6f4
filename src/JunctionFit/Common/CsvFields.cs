using System.Globalization;
using System.Text;

namespace JunctionFit.Common;

/// <summary>
/// Writes minimal RFC 4180 CSV records: fields separated by commas, quoted with <c>"</c> when they hold a comma, a quote,
/// a line break or edge spaces, quotes doubled inside (the tables of Reporting; Storage reads them back with its reader).
/// </summary>
internal static class CsvFields
{
    /// <summary>Appends one record and a line feed.</summary>
    public static void WriteRecord(StringBuilder sb, IReadOnlyList<string> fields)
    {
        for (int i = 0; i < fields.Count; i++)
        {
            if (i > 0) sb.Append(',');
            AppendField(sb, fields[i]);
        }
        sb.Append('\n');
    }

    private static void AppendField(StringBuilder sb, string field)
    {
        bool quote = field.Length > 0 && (field.AsSpan().IndexOfAny(",\"\r\n") >= 0 || field[0] == ' ' || field[^1] == ' ');
        if (!quote)
        {
            sb.Append(field);
            return;
        }
        sb.Append('"').Append(field.Replace("\"", "\"\"", StringComparison.Ordinal)).Append('"');
    }

    /// <summary>Shortest round-trip text of a double (invariant), empty for null.</summary>
    public static string Number(double? value) => value is double v ? v.ToString("R", CultureInfo.InvariantCulture) : "";

    /// <summary>Invariant integer text, empty for null.</summary>
    public static string Integer(int? value) => value is int v ? v.ToString(CultureInfo.InvariantCulture) : "";
}
