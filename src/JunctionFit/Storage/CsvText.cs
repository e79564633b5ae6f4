using System.Text;

namespace JunctionFit.Storage;

/// <summary>
/// Minimal RFC 4180 CSV reader: fields separated by a delimiter, quoted with <c>"</c>, quotes doubled inside; it reports the
/// line each record starts on. The writing half is <see cref="JunctionFit.Common.CsvFields"/>.
/// </summary>
internal static class CsvText
{
    /// <summary>One record and the 1-based line it starts on.</summary>
    internal readonly record struct Record(string[] Fields, int Line, string Raw);

    /// <summary>Reads records; blank lines are skipped. Throws on an unterminated quote.</summary>
    public static IEnumerable<Record> Read(TextReader reader, string path, char delimiter)
    {
        int lineNumber = 0;
        string? line;
        while ((line = reader.ReadLine()) is not null)
        {
            lineNumber++;
            if (line.Length == 0) continue;
            int start = lineNumber;
            var fields = new List<string>();
            var field = new StringBuilder();
            var raw = new StringBuilder(line);
            bool inQuotes = false;
            int i = 0;
            while (true)
            {
                if (i >= line.Length)
                {
                    if (!inQuotes) break;
                    string? next = reader.ReadLine();
                    if (next is null) throw new ResultsFormatException(path, start, "a quoted field is not closed before the end of the file", rawText: raw.ToString());
                    lineNumber++;
                    field.Append('\n');
                    raw.Append('\n').Append(next);
                    line = next;
                    i = 0;
                    continue;
                }
                char c = line[i];
                if (inQuotes)
                {
                    if (c == '"')
                    {
                        if (i + 1 < line.Length && line[i + 1] == '"')
                        {
                            field.Append('"');
                            i += 2;
                            continue;
                        }
                        inQuotes = false;
                    }
                    else
                    {
                        field.Append(c);
                    }
                }
                else if (c == '"' && field.Length == 0)
                {
                    inQuotes = true;
                }
                else if (c == delimiter)
                {
                    fields.Add(field.ToString());
                    field.Clear();
                }
                else
                {
                    field.Append(c);
                }
                i++;
            }
            fields.Add(field.ToString());
            yield return new Record([.. fields], start, raw.ToString());
        }
    }
}
