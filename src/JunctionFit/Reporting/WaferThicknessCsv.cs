using System.Text;
using JunctionFit.Common;
using JunctionFit.Lots;

namespace JunctionFit.Reporting;

/// <summary>
/// The per-wafer thickness table of <c>thickness … --cv</c>, <c>thickness-wafers.csv</c>: columns
/// <c>lot, wafer, dies, thickness_nm_median, thickness_nm_spread, ellipsometry_nm, cet_nm, cet_files, cet_upper_bound,
/// thickness_minus_ellipsometry_nm, cet_minus_thickness_nm, ellipsometry_flagged, cet_flagged, note</c>. Numbers invariant in
/// shortest round-trip form, empty when unknown; booleans <c>true</c>/<c>false</c>.
/// </summary>
public static class WaferThicknessCsv
{
    /// <summary>File name inside the output folder.</summary>
    public const string FileName = "thickness-wafers.csv";

    /// <summary>The table as text.</summary>
    /// <param name="result">The cross-check.</param>
    /// <param name="ellipsometryFlagged">Whether the ellipsometry consistency refit flagged a wafer (lot, wafer); null when not known.</param>
    /// <returns>CSV text ending with a line feed.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="result"/> is null.</exception>
    public static string Format(CetCrossCheckResult result, Func<string, string, bool?>? ellipsometryFlagged = null)
    {
        ArgumentNullException.ThrowIfNull(result);
        var sb = new StringBuilder();
        CsvFields.WriteRecord(sb,
        [
            "lot", "wafer", "dies", "thickness_nm_median", "thickness_nm_spread", "ellipsometry_nm", "cet_nm", "cet_files", "cet_upper_bound",
            "thickness_minus_ellipsometry_nm", "cet_minus_thickness_nm", "ellipsometry_flagged", "cet_flagged", "note",
        ]);
        foreach (var w in result.Wafers)
        {
            bool? ell = ellipsometryFlagged?.Invoke(w.Lot, w.Wafer);
            CsvFields.WriteRecord(sb,
            [
                w.Lot, w.Wafer, CsvFields.Integer(w.Dies), CsvFields.Number(w.ElectricalMedianNm), CsvFields.Number(w.ElectricalSpreadNm),
                CsvFields.Number(w.EllipsometricNm), CsvFields.Number(w.CetNm), CsvFields.Integer(w.CetFiles), w.CetIsUpperBound ? "true" : "false",
                CsvFields.Number(w.ElectricalMinusEllipsometryNm), CsvFields.Number(w.CetMinusElectricalNm),
                ell is bool b ? (b ? "true" : "false") : "", w.CetFlagged ? "true" : "false", w.Note,
            ]);
        }
        return sb.ToString();
    }

    /// <summary>Writes the table to <paramref name="path"/> atomically.</summary>
    /// <param name="path">Target file; its directory is created when missing.</param>
    /// <param name="result">The cross-check.</param>
    /// <param name="ellipsometryFlagged">See <see cref="Format"/>.</param>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void Write(string path, CetCrossCheckResult result, Func<string, string, bool?>? ellipsometryFlagged = null)
        => AtomicFile.WriteAllText(path, Format(result, ellipsometryFlagged));
}
