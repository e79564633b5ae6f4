using System.Globalization;
using System.Text;
using JunctionFit.Common;
using JunctionFit.Lots;

namespace JunctionFit.Reporting;

/// <summary>
/// The per-lot summary table, <c>OUTDIR/lot-summary.csv</c>: columns <c>lot, dies, ok, poor_fit, failed, yield</c>
/// (yield = ok / dies, 0 … 1), then for each parameter key K <c>K_n, K_median, K_spread</c> where the spread is the
/// MAD × 1.4826 over the good dies. Numbers invariant, empty when unknown.
/// </summary>
public static class LotSummaryCsv
{
    /// <summary>File name inside the output folder.</summary>
    public const string FileName = "lot-summary.csv";

    /// <summary>The table as text.</summary>
    /// <param name="lots">Summaries from <see cref="LotSummary.Compute"/>.</param>
    /// <returns>CSV text ending with a line feed.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="lots"/> is null.</exception>
    public static string Format(IReadOnlyList<LotSummaryRow> lots)
    {
        ArgumentNullException.ThrowIfNull(lots);
        var keys = lots.Count == 0 ? [] : lots[0].Parameters.Select(p => p.Key).ToList();
        var sb = new StringBuilder();
        var header = new List<string> { "lot", "dies", "ok", "poor_fit", "failed", "yield" };
        foreach (string k in keys) header.AddRange([k + "_n", k + "_median", k + "_spread"]);
        CsvFields.WriteRecord(sb, header);
        foreach (var lot in lots)
        {
            var fields = new List<string>
            {
                lot.Lot, CsvFields.Integer(lot.Total), CsvFields.Integer(lot.Ok), CsvFields.Integer(lot.PoorFit), CsvFields.Integer(lot.Failed),
                lot.Yield.ToString("0.####", CultureInfo.InvariantCulture),
            };
            foreach (string k in keys)
            {
                var p = lot.Find(k);
                fields.Add(CsvFields.Integer(p?.GoodCount ?? 0));
                fields.Add(CsvFields.Number(p?.Median));
                fields.Add(CsvFields.Number(p?.RobustSpread));
            }
            CsvFields.WriteRecord(sb, fields);
        }
        return sb.ToString();
    }

    /// <summary>Writes the table to <paramref name="path"/> atomically.</summary>
    /// <param name="path">Target file; its directory is created when missing.</param>
    /// <param name="lots">Summaries.</param>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void Write(string path, IReadOnlyList<LotSummaryRow> lots) => AtomicFile.WriteAllText(path, Format(lots));
}
