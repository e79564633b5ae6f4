namespace JunctionFit.Import;

/// <summary>One ellipsometric thickness: for a whole wafer (no die coordinates) or for one site.</summary>
/// <param name="Lot">Lot.</param>
/// <param name="Wafer">Wafer.</param>
/// <param name="DieX">Die column of the site; null for a per-wafer value.</param>
/// <param name="DieY">Die row of the site; null for a per-wafer value.</param>
/// <param name="ThicknessNm">Film thickness in nm.</param>
/// <param name="SourceLine">1-based line in the ellipsometry file (0 when not from a file).</param>
public sealed record EllipsometryRow(string Lot, string Wafer, int? DieX, int? DieY, double ThicknessNm, int SourceLine = 0)
{
    /// <summary>True when the row is for one site (both die coordinates known).</summary>
    public bool IsSite => DieX is not null && DieY is not null;
}
