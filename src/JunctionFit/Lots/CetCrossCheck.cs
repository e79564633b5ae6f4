using System.Collections.Immutable;
using System.Globalization;
using JunctionFit.Common;
using JunctionFit.Import;
using JunctionFit.Results;

namespace JunctionFit.Lots;

/// <summary>The capacitance-equivalent thickness of one C–V test capacitor, placed on a wafer.</summary>
/// <param name="Source">The C–V file, as given.</param>
/// <param name="Lot">Lot; null when the file names none.</param>
/// <param name="Wafer">Wafer; null when the file names none.</param>
/// <param name="CetNm">CET = ε_ox ε₀ A / C_max in nm.</param>
/// <param name="Saturated">False when C still rises at the end of the sweep, so that CET is an upper bound.</param>
public sealed record CetMeasurement(string Source, string? Lot, string? Wafer, double CetNm, bool Saturated);

/// <summary>A C–V measurement that was not placed on a wafer of the comparison, and why.</summary>
/// <param name="Measurement">The measurement.</param>
/// <param name="Reason">Why, in words.</param>
public sealed record UnmatchedCet(CetMeasurement Measurement, string Reason);

/// <summary>
/// One wafer of the three-way thickness cross-check: electrical t_ox (median of the good die fits, with its robust spread),
/// ellipsometry and CET, and their differences.
/// </summary>
/// <param name="Lot">Lot.</param>
/// <param name="Wafer">Wafer.</param>
/// <param name="Dies">Good dies with a thickness behind <see cref="ElectricalMedianNm"/>.</param>
/// <param name="ElectricalMedianNm">Median t_ox of the good dies, nm; null without good dies.</param>
/// <param name="ElectricalSpreadNm">Robust spread (1.4826 × MAD) of the good dies' t_ox, nm; null without good dies.</param>
/// <param name="EllipsometricNm">Ellipsometric thickness, nm (per-site values: their mean); null when the table has none for this wafer.</param>
/// <param name="CetNm">CET, nm (several C–V files: their median); null without a C–V file on this wafer.</param>
/// <param name="CetFiles">C–V files behind <see cref="CetNm"/>.</param>
/// <param name="CetIsUpperBound">True when a C–V file's capacitance still rises at the end of its sweep.</param>
/// <param name="CetFlagged">True when CET − t_ox lies outside the plausible range.</param>
/// <param name="Note">The result in words.</param>
public sealed record WaferThicknessCheck(
    string Lot, string Wafer, int Dies, double? ElectricalMedianNm, double? ElectricalSpreadNm, double? EllipsometricNm,
    double? CetNm, int CetFiles, bool CetIsUpperBound, bool CetFlagged, string Note)
{
    /// <summary>t_ox − ellipsometry, nm; null when either is missing.</summary>
    public double? ElectricalMinusEllipsometryNm => ElectricalMedianNm - EllipsometricNm;

    /// <summary>CET − t_ox, nm; null when either is missing.</summary>
    public double? CetMinusElectricalNm => CetNm - ElectricalMedianNm;
}

/// <summary>Outcome of <see cref="CetCrossCheck.Compare"/>.</summary>
/// <param name="Wafers">One entry per wafer with an ellipsometry value or a C–V file: ellipsometry-file order, then wafers with C–V only.</param>
/// <param name="UnmatchedCet">C–V files not placed on a wafer, with reasons (never dropped silently).</param>
/// <param name="LowerNm">Lower end of the plausible CET − t_ox range, nm.</param>
/// <param name="UpperNm">Upper end of the plausible CET − t_ox range, nm.</param>
public sealed record CetCrossCheckResult(ImmutableArray<WaferThicknessCheck> Wafers, ImmutableArray<UnmatchedCet> UnmatchedCet, double LowerNm, double UpperNm)
{
    /// <summary>Wafers whose CET − t_ox lies outside the plausible range.</summary>
    public IEnumerable<WaferThicknessCheck> Flagged => Wafers.Where(w => w.CetFlagged);
}

/// <summary>
/// Per wafer: the electrical (tunnelling) oxide thickness of the die fits beside the ellipsometric thickness and the
/// capacitance-equivalent thickness of the wafer's C–V capacitors. Pure computation.
/// <para>
/// CET exceeds the physical t_ox: the inversion or accumulation charge sits about 1 nm inside the silicon (quantum confinement,
/// about 0.3–0.4 nm of oxide equivalent) and a poly gate depletes (about 0.1–0.3 nm at 10²⁰ cm⁻³), so CET − t_ox is usually
/// 0.3–0.7 nm near 1 V (common practice, no source; the same words as the report lines of JunctionFit.Reporting.ThicknessBesideCet). A wafer
/// whose CET − t_ox lies outside [<see cref="DefaultLowerNm"/>, <see cref="DefaultUpperNm"/>] (settable) is flagged.
/// </para>
/// </summary>
public static class CetCrossCheck
{
    /// <summary>Default lower end of the plausible CET − t_ox, nm: CET below the physical thickness is not physical.</summary>
    public const double DefaultLowerNm = 0.0;

    /// <summary>Default upper end of the plausible CET − t_ox, nm (common practice, no source: about twice the usual 0.3–0.7 nm).</summary>
    public const double DefaultUpperNm = 1.2;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Builds the per-wafer table.</summary>
    /// <param name="results">Result rows (good rows with <c>thickness_nm</c>, a lot and a wafer count).</param>
    /// <param name="ellipsometry">Ellipsometry rows, per wafer or per site (may be empty).</param>
    /// <param name="cet">C–V measurements.</param>
    /// <param name="lowerNm">Lower end of the plausible CET − t_ox, nm.</param>
    /// <param name="upperNm">Upper end of the plausible CET − t_ox, nm; above <paramref name="lowerNm"/>.</param>
    /// <returns>The wafers and the C–V files that could not be placed.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException">The range is not finite or not increasing, or a CET is not a positive number.</exception>
    public static CetCrossCheckResult Compare(IReadOnlyList<ResultRow> results, IReadOnlyList<EllipsometryRow> ellipsometry, IReadOnlyList<CetMeasurement> cet,
        double lowerNm = DefaultLowerNm, double upperNm = DefaultUpperNm)
    {
        ArgumentNullException.ThrowIfNull(results);
        ArgumentNullException.ThrowIfNull(ellipsometry);
        ArgumentNullException.ThrowIfNull(cet);
        Guard.Finite(lowerNm);
        Guard.Above(upperNm, lowerNm);
        foreach (var m in cet)
        {
            if (!double.IsFinite(m.CetNm) || m.CetNm <= 0) throw new ArgumentOutOfRangeException(nameof(cet), m.CetNm, $"{m.Source}: CET must be a positive number");
        }

        var order = new List<(string Lot, string Wafer)>();
        var seen = new HashSet<(string, string)>();
        void Add(string lot, string wafer)
        {
            if (seen.Add((lot, wafer))) order.Add((lot, wafer));
        }
        foreach (var e in ellipsometry) Add(e.Lot, e.Wafer);

        var unmatched = ImmutableArray.CreateBuilder<UnmatchedCet>();
        var cetByWafer = new Dictionary<(string, string), List<CetMeasurement>>();
        foreach (var m in cet)
        {
            if (string.IsNullOrWhiteSpace(m.Lot) || string.IsNullOrWhiteSpace(m.Wafer))
            {
                unmatched.Add(new UnmatchedCet(m, $"the C-V file names no lot or no wafer: give '# lot:' and '# wafer:' lines or {new Remedy(RemedyKind.PathPattern)}"));
                continue;
            }
            var key = (m.Lot!, m.Wafer!);
            if (!cetByWafer.TryGetValue(key, out var list)) cetByWafer[key] = list = [];
            list.Add(m);
            Add(m.Lot!, m.Wafer!);
        }

        var wafers = ImmutableArray.CreateBuilder<WaferThicknessCheck>(order.Count);
        foreach (var (lot, wafer) in order)
        {
            var thicknesses = results
                .Where(r => r.IsGood && r.Lot == lot && r.Wafer == wafer)
                .Select(r => r.ValueOf(ThicknessComparison.ThicknessKey))
                .OfType<double>().Where(double.IsFinite).ToList();
            double? median = thicknesses.Count > 0 ? LotStatistics.Median(thicknesses) : null;
            double? spread = thicknesses.Count > 0 ? LotStatistics.ScaledMad(thicknesses) : null;
            var ell = ellipsometry.Where(e => e.Lot == lot && e.Wafer == wafer).ToList();
            var perWafer = ell.Where(e => !e.IsSite).ToList();
            double? ellipsometric = perWafer.Count > 0 ? perWafer[0].ThicknessNm : ell.Count > 0 ? ell.Average(e => e.ThicknessNm) : null;
            var files = cetByWafer.TryGetValue((lot, wafer), out var ms) ? ms : [];
            double? cetNm = files.Count > 0 ? LotStatistics.Median(files.Select(f => f.CetNm).ToList()) : null;
            bool upperBound = files.Any(f => !f.Saturated);

            bool flagged = false;
            string note;
            if (cetNm is null)
            {
                note = "no C-V file on this wafer";
            }
            else if (median is null)
            {
                note = results.Any(r => r.Lot == lot && r.Wafer == wafer) ? "no good die fit with a thickness on this wafer" : "this wafer is not in the results";
            }
            else
            {
                double d = cetNm.Value - median.Value;
                string bound = upperBound ? " (CET is an upper bound: C still rises at the end of a sweep)" : "";
                if (d < lowerNm)
                {
                    flagged = true;
                    note = string.Create(Inv, $"FLAGGED: CET - t_ox = {d:0.###} nm is below the plausible {lowerNm:0.###} to {upperNm:0.###} nm{bound}; ") +
                           "CET below the tunnelling thickness is not physical: check the capacitor area and its parasitic capacitance, and whether the die fits absorbed a leak or a series resistance into t_ox";
                }
                else if (d > upperNm)
                {
                    flagged = true;
                    note = string.Create(Inv, $"FLAGGED: CET - t_ox = {d:0.###} nm is above the plausible {lowerNm:0.###} to {upperNm:0.###} nm{bound}; ") +
                           "more than the inversion-layer centroid and poly depletion explain: check the gate doping (poly depletion), whether C had saturated, " +
                           "the series resistance and leakage of the C-V capacitor, and its area";
                }
                else
                {
                    note = string.Create(Inv, $"CET - t_ox = {d:0.###} nm, within the plausible {lowerNm:0.###} to {upperNm:0.###} nm{bound}");
                }
                if (files.Count > 1) note += string.Create(Inv, $"; CET is the median of {files.Count} C-V files");
            }
            wafers.Add(new WaferThicknessCheck(lot, wafer, thicknesses.Count, median, spread, ellipsometric, cetNm, files.Count, upperBound, flagged, note));
        }
        return new CetCrossCheckResult(wafers.ToImmutable(), unmatched.ToImmutable(), lowerNm, upperNm);
    }
}
