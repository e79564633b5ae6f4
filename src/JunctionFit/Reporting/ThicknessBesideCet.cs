using System.Globalization;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Reporting;

/// <summary>
/// The report lines that put the tunnelling (physical) oxide thickness beside the capacitance-equivalent thickness of a C–V file,
/// with their difference and what explains it.
/// </summary>
public static class ThicknessBesideCet
{
    /// <summary>Text explaining CET − t_ox (common practice, no source; see docs/models.md).</summary>
    public const string Explanation =
        "CET exceeds the physical thickness because the inversion or accumulation charge sits about 1 nm inside the silicon " +
        "(quantum confinement: about 0.3-0.4 nm of oxide equivalent, eps_ox/eps_Si x the charge centroid) and a poly gate depletes " +
        "(about 0.1-0.3 nm at 1e20 cm^-3); together CET - t_ox is usually 0.3-0.7 nm near 1 V (common practice, no source)";

    /// <summary>Lines for a console or text report.</summary>
    /// <param name="results">Fit results (those with <c>thickness_nm</c> are listed).</param>
    /// <param name="cv">The C–V summary.</param>
    public static IReadOnlyList<string> Lines(IEnumerable<FitResult> results, CvSummary cv)
    {
        ArgumentNullException.ThrowIfNull(results);
        ArgumentNullException.ThrowIfNull(cv);
        var c = CultureInfo.InvariantCulture;
        var lines = new List<string>
        {
            string.Create(c, $"C-V: CET = {cv.CapacitanceEquivalentThicknessNm:0.###} nm (eps_ox*A/C_max, C_max = {cv.MaxCapacitanceF:G4} F at {cv.MaxCapacitanceBiasV:0.###} V, area {cv.AreaM2 * 1e12:G6} um2)"),
        };
        foreach (string note in cv.Notes) lines.Add("  " + note);
        foreach (var r in results)
        {
            if (r.Find(ParameterKey.Thickness.Name) is not { } t || r.Status == FitStatus.Failed) continue;
            double diff = cv.CapacitanceEquivalentThicknessNm - t.Value;
            lines.Add(string.Create(c, $"{r.SourcePath}: t_ox (tunnelling) {t.Value:0.###} nm | CET (C-V) {cv.CapacitanceEquivalentThicknessNm:0.###} nm | CET - t_ox = {diff:0.###} nm"));
        }
        lines.Add(Explanation + ".");
        return lines;
    }
}
