namespace JunctionFit.Import;

/// <summary>The importer's pipeline, part: where the table is: its delimiter, its first data row and its length.</summary>
internal static partial class IvTableParser
{
    private sealed partial class Context
    {
        // ---------------------------------------------------------------- table detection

        private (int Start, int Count) FindTable()
        {
            ReadOnlySpan<char> candidates = options.Delimiter is char d ? [d] : CandidateDelimiters;
            int firstOneColumn = -1;
            // Pass 0 wants more numbers than words in the first row ("Sweep 1 of 2" is not data);
            // pass 1 accepts as many words as numbers (rows with status and comment columns).
            for (int pass = 0; pass < 2; pass++)
            {
            for (int i = 0; i < lines.Count; i++)
            {
                ReadOnlySpan<char> line = _table.Line(i);
                if (line.IsWhiteSpace() || MetadataParser.IsComment(line))
                {
                    continue;
                }
                int bestScore = int.MinValue;
                char best = '\0';
                int bestCount = 0;
                foreach (char delim in candidates)
                {
                    _table.Classify(line, delim, out int count, out int numeric, out int textual, out int raw);
                    if (numeric < 2 || (pass == 0 && numeric <= textual))
                    {
                        if (numeric == 1 && count == 1 && firstOneColumn < 0)
                        {
                            firstOneColumn = i;
                        }
                        continue;
                    }
                    // The following rows must look like data too (same number of fields, numbers
                    // outnumber text); one of the next three may be a damaged row.
                    int score = numeric - textual;
                    int checkedRows = 0;
                    int bad = 0;
                    for (int j = i + 1; j < lines.Count && checkedRows < SampleRows; j++)
                    {
                        ReadOnlySpan<char> next = _table.Line(j);
                        if (next.IsWhiteSpace() || MetadataParser.IsComment(next))
                        {
                            continue;
                        }
                        _table.Classify(next, delim, out _, out int n2, out int t2, out int raw2);
                        bool valid = raw2 == raw && n2 >= 1 && n2 >= t2;
                        if (!valid)
                        {
                            // A row without digits right after the candidate (a header) means the
                            // candidate is preamble; a row with digits may be a damaged data row.
                            // So does a row of two or more words and no numbers (a header).
                            bool texty = !next.ContainsAnyInRange('0', '9') || (n2 == 0 && t2 >= 2);
                            if ((texty && checkedRows == 0) || ++bad > 1)
                            {
                                bad = int.MaxValue;
                                break;
                            }
                        }
                        score += n2 - t2;
                        checkedRows++;
                    }
                    if (bad <= 1 && score > bestScore)
                    {
                        bestScore = score;
                        best = delim;
                        bestCount = count;
                    }
                }
                if (best != '\0')
                {
                    _delimiter = best;
                    return (i, bestCount);
                }
            }
            }

            if (firstOneColumn >= 0)
            {
                throw new IvFormatException(path, firstOneColumn + 1,
                    "only one column of numbers: an I–V table needs a voltage and a current column" +
                    (options.Delimiter is char od ? $" (delimiter forced to {DelimiterName(od)})" : string.Empty));
            }
            throw new IvFormatException(path, 0,
                "no table of numbers found: expected rows of at least two numbers (voltage and current) separated by commas, tabs, semicolons or spaces");
        }
    }
}
