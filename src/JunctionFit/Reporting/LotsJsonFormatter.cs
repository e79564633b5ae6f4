using System.Buffers;
using System.Text;
using System.Text.Json;
using JunctionFit.Lots;
using JunctionFit.Physics;

namespace JunctionFit.Reporting;

/// <summary>
/// One-line JSON forms of the lot analyses, for <c>drift --json</c> and <c>thickness --json</c> (one object per line,
/// no trailing newline; numbers in the parameter key's unit; null where a number is unknown).
/// <list type="bullet">
/// <item>drift: <c>{"lot", "parameter", "shift", "ci95", "p_value", "flagged", "n"}</c>, where <c>p_value</c> is
/// Holm-corrected, followed by <c>p_value_uncorrected, n_reference, lot_mean, reference_mean, df, threshold, reason</c>;</item>
/// <item>thickness: <c>{"bias_nm", "ci95", "limits_of_agreement", "n"}</c>, followed by <c>level, sd_nm,
/// limits_of_agreement_ci95, reason, unmatched_results, unmatched_ellipsometry</c>.</item>
/// </list>
/// </summary>
public static class LotsJsonFormatter
{
    private static readonly JsonWriterOptions WriterOptions = new() { Indented = false };

    /// <summary>One drift row as a JSON line.</summary>
    /// <param name="row">The row.</param>
    /// <returns>JSON text, one line.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="row"/> is null.</exception>
    public static string FormatDrift(DriftRow row)
    {
        ArgumentNullException.ThrowIfNull(row);
        return Write(w =>
        {
            w.WriteString("lot", row.Lot);
            w.WriteString("parameter", row.Key);
            w.WriteNumberOrNull("shift", row.Shift);
            Pair(w, "ci95", row.Lower95, row.Upper95);
            w.WriteNumberOrNull("p_value", row.PValueHolm);
            w.WriteBoolean("flagged", row.Flagged);
            w.WriteNumber("n", row.N);
            w.WriteNumberOrNull("p_value_uncorrected", row.PValue);
            w.WriteNumber("n_reference", row.ReferenceN);
            w.WriteNumberOrNull("lot_mean", row.LotMean);
            w.WriteNumberOrNull("reference_mean", row.ReferenceMean);
            w.WriteNumberOrNull("df", row.DegreesOfFreedom);
            w.WriteNumberOrNull("threshold", row.Threshold);
            if (row.Reason is null) w.WriteNull("reason"); else w.WriteString("reason", row.Reason);
        });
    }

    /// <summary>A thickness comparison as a JSON line.</summary>
    /// <param name="comparison">The comparison.</param>
    /// <returns>JSON text, one line.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="comparison"/> is null.</exception>
    public static string FormatThickness(ThicknessComparisonResult comparison)
    {
        ArgumentNullException.ThrowIfNull(comparison);
        var a = comparison.Agreement;
        return Write(w =>
        {
            w.WriteNumberOrNull("bias_nm", a?.BiasNm);
            Pair(w, "ci95", a?.BiasLower95Nm, a?.BiasUpper95Nm);
            Pair(w, "limits_of_agreement", a?.LowerLimitNm, a?.UpperLimitNm);
            w.WriteNumber("n", comparison.Pairs.Length);
            w.WriteString("level", comparison.Level == ThicknessMatchLevel.Site ? "site" : "wafer");
            w.WriteNumberOrNull("sd_nm", a?.DifferenceSdNm);
            w.WriteStartObject("limits_of_agreement_ci95");
            Pair(w, "lower", a?.LowerLimitLower95Nm, a?.LowerLimitUpper95Nm);
            Pair(w, "upper", a?.UpperLimitLower95Nm, a?.UpperLimitUpper95Nm);
            w.WriteEndObject();
            if (comparison.Reason is null) w.WriteNull("reason"); else w.WriteString("reason", comparison.Reason);
            w.WriteStartArray("unmatched_results");
            foreach (var u in comparison.UnmatchedResults)
            {
                w.WriteStartObject();
                w.WriteString("file", u.File);
                w.WriteStringOrNull("lot", u.Lot);
                w.WriteStringOrNull("wafer", u.Wafer);
                w.WriteIntegerOrNull("die_x", u.DieX);
                w.WriteIntegerOrNull("die_y", u.DieY);
                w.WriteString("reason", u.Reason);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartArray("unmatched_ellipsometry");
            foreach (var u in comparison.UnmatchedEllipsometry)
            {
                w.WriteStartObject();
                w.WriteNumber("line", u.Row.SourceLine);
                w.WriteString("lot", u.Row.Lot);
                w.WriteString("wafer", u.Row.Wafer);
                w.WriteIntegerOrNull("die_x", u.Row.DieX);
                w.WriteIntegerOrNull("die_y", u.Row.DieY);
                w.WriteNumber(ParameterKey.Thickness.Name, u.Row.ThicknessNm);
                w.WriteString("reason", u.Reason);
                w.WriteEndObject();
            }
            w.WriteEndArray();
        });
    }

    private static string Write(Action<Utf8JsonWriter> body)
    {
        var buffer = new ArrayBufferWriter<byte>(512);
        using (var w = new Utf8JsonWriter(buffer, WriterOptions))
        {
            w.WriteStartObject();
            body(w);
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }




    private static void Pair(Utf8JsonWriter w, string name, double? lo, double? hi)
    {
        if (lo is double a && hi is double b && double.IsFinite(a) && double.IsFinite(b))
        {
            w.WriteStartArray(name);
            w.WriteNumberValue(a);
            w.WriteNumberValue(b);
            w.WriteEndArray();
        }
        else
        {
            w.WriteNull(name);
        }
    }
}
