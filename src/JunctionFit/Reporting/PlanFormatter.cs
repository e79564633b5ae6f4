using System.Buffers;
using System.Globalization;
using System.Text;
using System.Text.Json;
using JunctionFit.Common;
using JunctionFit.Planning;

namespace JunctionFit.Reporting;

/// <summary>How the proposed sweep was given, for the output.</summary>
/// <param name="FromV">First bias in volt.</param>
/// <param name="ToV">Last bias in volt.</param>
/// <param name="Points">Number of points.</param>
/// <param name="Shape">linear, positive, loop or list.</param>
public sealed record ProposedSweepInfo(double FromV, double ToV, int Points, string Shape);

/// <summary>
/// The output of <c>plan</c>: one JSON object (keys in docs/cli.md: <c>predicted</c>, <c>recommended_sweep</c>, …) or a
/// table for people. Both carry the safety notes of <see cref="PlanSafety"/>.
/// </summary>
public static class PlanFormatter
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    private const double VoltPerMeterPerMvPerCm = 1e8;

    /// <summary>The plan as one JSON object on one line (no trailing newline).</summary>
    /// <param name="plan">The plan.</param>
    /// <param name="request">The request it answers.</param>
    /// <param name="proposed">How the proposed sweep was given; null without one.</param>
    public static string Json(MeasurementPlan plan, PlanRequest request, ProposedSweepInfo? proposed)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(request);
        var buffer = new ArrayBufferWriter<byte>(4096);
        using (var w = new Utf8JsonWriter(buffer))
        {
            var setup = request.Setup;
            var defs = setup.Model.Parameters;
            w.WriteStartObject();
            w.WriteString("model", setup.Model.Barrier.Name);
            w.WriteStartObject("nominal");
            for (int k = 0; k < defs.Count; k++) w.WriteNumber(defs[k].Key, Tidy(defs[k].ToDisplay(setup.NominalSi[k])));
            w.WriteEndObject();
            w.WriteStartArray("free");
            foreach (var def in defs) if (setup.FreeKeys.Contains(def.Key)) w.WriteStringValue(def.Key);
            w.WriteEndArray();
            w.WriteStartObject("noise");
            w.WriteNumber("relative", setup.RelativeNoise);
            w.WriteNumber("floor_A", setup.NoiseFloorA);
            w.WriteEndObject();

            if (plan.Proposed is { } p && proposed is not null)
            {
                w.WriteStartObject("proposed_sweep");
                w.WriteNumber("from", proposed.FromV);
                w.WriteNumber("to", proposed.ToV);
                w.WriteNumber("points", proposed.Points);
                w.WriteString("shape", proposed.Shape);
                w.WriteNumber("points_used", p.PointsUsed);
                WriteField(w, "max_field_MV_per_cm", p.MaxAbsVoltageV, plan.FieldThicknessNm);
                w.WriteNumber("max_current_A", p.MaxAbsCurrentA);
                w.WriteEndObject();
                w.WriteStartObject("predicted");
                foreach (var q in p.Parameters) WritePrediction(w, q, q.RelativeHalfWidth95, null);
                w.WriteEndObject();
                w.WriteCorrelation(p.Parameters.Select(q => q.Key), p.Parameters.Length, p.Correlation.AsSpan());
                WriteIdentifiability(w, p.IsIdentifiable, p.Reasons);
                w.WriteNumber("condition_number", double.IsFinite(p.ConditionNumber) ? p.ConditionNumber : -1);
            }
            else
            {
                w.WriteNull("proposed_sweep");
                w.WriteNull("predicted");
                w.WriteNull("correlation");
                w.WriteNull("identifiable");
            }

            if (plan.ProposedWorstCase is { } wc) WriteWorst(w, "worst_case", wc, request);
            else w.WriteNull("worst_case");

            if (plan.Recommendation is { } rec)
            {
                w.WriteStartObject("recommended_sweep");
                w.WriteNumber("from", rec.FromV);
                w.WriteNumber("to", rec.ToV);
                w.WriteNumber("points", rec.Points);
                w.WriteString("shape", ShapeName(rec.Family));
                w.WriteNumber("max_bias_V", rec.MaxBiasV);
                WriteField(w, "max_field_MV_per_cm", rec.MaxBiasV, plan.FieldThicknessNm);
                w.WriteNumber("max_current_A", rec.Prediction.MaxAbsCurrentA);
                w.WriteBoolean("meets_targets", rec.MeetsTargets);
                w.WriteBoolean("identifiable", rec.Prediction.IsIdentifiable);
                w.WriteStartObject("predicted");
                foreach (var q in rec.Prediction.Parameters) WritePrediction(w, q, rec.Prediction.RelativeHalfWidth(q.Key), request.Ranges.IsEmpty ? null : rec.Prediction.WorstAt[q.Key]);
                w.WriteEndObject();
                w.WriteStartArray("validity_warnings");
                foreach (string v in rec.ValidityWarnings) w.WriteStringValue(v);
                w.WriteEndArray();
                w.WriteEndObject();
            }
            else
            {
                w.WriteNull("recommended_sweep");
            }

            w.WriteStartObject("limits");
            w.WriteNumberOrNull("max_bias_V", request.MaxBiasV);
            w.WriteNumberOrNull("max_field_MV_per_cm", request.MaxFieldVPerM / VoltPerMeterPerMvPerCm);
            w.WriteNumberOrNull("field_thickness_nm", plan.FieldThicknessNm is double ftn ? Tidy(ftn) : null);
            w.WriteNumberOrNull("bias_limit_V", plan.BiasLimitV);
            w.WriteNumberOrNull("compliance_A", setup.ComplianceA);
            w.WriteNumberOrNull("compliance_reached_at_V", plan.ComplianceBiasV);
            w.WriteNumber("max_points", request.MaxPoints);
            w.WriteEndObject();
            w.WriteStartArray("targets");
            foreach (var t in request.Targets)
            {
                w.WriteStartObject();
                w.WriteString("parameter", t.Key);
                w.WriteNumber(t.IsRelative ? "relative_halfwidth" : "ci95_halfwidth", t.Value);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartArray("focus");
            foreach (string k in plan.FocusKeys) w.WriteStringValue(k);
            w.WriteEndArray();
            w.WriteStartArray("warnings");
            foreach (string s in plan.Warnings) w.WriteStringValue(s);
            w.WriteEndArray();
            w.WriteStartArray("safety");
            foreach (string s in PlanSafety.Notes) w.WriteStringValue(s);
            w.WriteEndArray();
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>The plan as a table for people.</summary>
    /// <param name="plan">The plan.</param>
    /// <param name="request">The request it answers.</param>
    /// <param name="proposed">How the proposed sweep was given; null without one.</param>
    public static string Text(MeasurementPlan plan, PlanRequest request, ProposedSweepInfo? proposed)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(request);
        var setup = request.Setup;
        var defs = setup.Model.Parameters;
        var sb = new StringBuilder();
        var nominal = new List<string>();
        for (int k = 0; k < defs.Count; k++)
        {
            string value = defs[k].Key == "area_m2" ? $"{F(setup.NominalSi[k] * 1e12)} µm²" : $"{F(defs[k].ToDisplay(setup.NominalSi[k]))} {defs[k].DisplayUnit}".TrimEnd();
            string range = request.Ranges.TryGetValue(defs[k].Key, out var r) ? $" (range {F(defs[k].ToDisplay(r.LowSi))}…{F(defs[k].ToDisplay(r.HighSi))})" : "";
            nominal.Add($"{defs[k].Symbol} = {value}{range}{(setup.FreeKeys.Contains(defs[k].Key) ? "" : " fixed")}");
        }
        sb.Append(Inv, $"Plan for model {setup.Model.Barrier.Name}: {string.Join(", ", nominal)}\n");
        sb.Append(Inv, $"Noise model: {F(setup.RelativeNoise * 100)} % of |I|, floor {F(setup.NoiseFloorA)} A{(setup.ComplianceA is double c ? $", compliance {F(c)} A" : "")}\n");
        if (plan.Proposed is { } p && proposed is not null)
        {
            string field = plan.FieldThicknessNm is double d ? $", largest field {F(p.MaxAbsVoltageV / d * 10)} MV/cm" : "";
            sb.Append(Inv, $"\nProposed sweep {F(proposed.FromV)} … {F(proposed.ToV)} V, {proposed.Points} points ({proposed.Shape}; {p.PointsUsed} used){field}, largest current {F(p.MaxAbsCurrentA)} A\n");
            Table(sb, p.Parameters, q => q.RelativeHalfWidth95);
            if (p.Correlation.Length == p.Parameters.Length * p.Parameters.Length)
            {
                var pairs = new List<string>();
                int n = p.Parameters.Length;
                for (int a = 0; a < n; a++)
                for (int b = a + 1; b < n; b++)
                    pairs.Add($"{p.Parameters[a].Symbol}/{p.Parameters[b].Symbol} {p.Correlation[a * n + b].ToString("0.0000", Inv)}");
                if (pairs.Count > 0) sb.Append(Inv, $"  correlation: {string.Join(", ", pairs)}\n");
            }
            sb.Append(p.IsIdentifiable ? "  identifiable: yes\n" : $"  NOT IDENTIFIABLE: {string.Join("; ", p.Reasons)}\n");
        }
        if (plan.ProposedWorstCase is { } wc)
        {
            sb.Append(Inv, $"\nWorst case of the proposed sweep over {wc.GridPoints} nominal points:\n");
            Table(sb, wc.Parameters, q => wc.RelativeHalfWidth(q.Key));
            if (!wc.IsIdentifiable) sb.Append(Inv, $"  NOT IDENTIFIABLE somewhere in the range: {string.Join("; ", wc.Reasons)}\n");
        }
        if (plan.Recommendation is { } rec)
        {
            string field = rec.MaxFieldVPerM is double fv ? $", largest field {F(fv / VoltPerMeterPerMvPerCm)} MV/cm" : "";
            string goal = request.Targets.IsDefaultOrEmpty
                ? $"best precision for {request.MaxPoints} points"
                : rec.MeetsTargets ? "fewest points that meet every target" : "targets NOT met within the limits and the point budget; best candidate";
            sb.Append(Inv, $"\nRecommended sweep ({goal}): {F(rec.FromV)} … {F(rec.ToV)} V, {rec.Points} points ({ShapeName(rec.Family)}){field}, largest current {F(rec.Prediction.MaxAbsCurrentA)} A\n");
            Table(sb, rec.Prediction.Parameters, q => rec.Prediction.RelativeHalfWidth(q.Key));
            if (!rec.Prediction.IsIdentifiable) sb.Append(Inv, $"  NOT IDENTIFIABLE: {string.Join("; ", rec.Prediction.Reasons)}\n");
            foreach (string v in rec.ValidityWarnings) sb.Append(Inv, $"  model validity: {v}\n");
        }
        if (plan.BiasLimitV is double limit)
        {
            string from = request.MaxFieldVPerM is double mf && plan.FieldThicknessNm is double td
                ? $" ({new Remedy(RemedyKind.MaxField)} {F(mf / VoltPerMeterPerMvPerCm)} MV/cm × d = {F(td)} nm = {F(mf * td * 1e-9)} V{(request.MaxBiasV is double mb ? $"; {new Remedy(RemedyKind.MaxBias)} {F(mb)} V" : "")})"
                : "";
            sb.Append(Inv, $"Bias limit of the search: {F(limit)} V{from}");
            if (plan.ComplianceBiasV is double cb) sb.Append(Inv, $"; the compliance is reached from {F(cb)} V");
            sb.Append('\n');
        }
        else
        {
            sb.Append($"\nNo sweep recommended: give {new Remedy(RemedyKind.MaxBias)} or {new Remedy(RemedyKind.MaxField)} (or both).\n");
        }
        foreach (string w in plan.Warnings) sb.Append(Inv, $"warning: {w}\n");
        sb.Append("\nSafety:\n");
        foreach (string s in PlanSafety.Notes) sb.Append(Inv, $"  - {s}\n");
        return sb.ToString();
    }

    private static void Table(StringBuilder sb, IEnumerable<ParameterPrediction> parameters, Func<ParameterPrediction, double?> relative)
    {
        sb.Append(Inv, $"  {"parameter",-14} {"value",10} {"stderr",11} {"95% half-width",15} {"relative",9}\n");
        foreach (var q in parameters)
        {
            string name = q.Unit.Length > 0 ? $"{q.Symbol} ({q.Unit})" : q.Symbol;
            string rel = relative(q) is double r ? (100 * r).ToString("0.###", Inv) + " %" : "-";
            sb.Append(Inv, $"  {name,-14} {F(q.Value),10} {(q.StandardError is double se ? F(se) : "undetermined"),11} {(q.HalfWidth95 is double h ? F(h) : "-"),15} {rel,9}\n");
        }
    }

    private static void WritePrediction(Utf8JsonWriter w, ParameterPrediction q, double? relative, IReadOnlyDictionary<string, double>? at)
    {
        w.WriteStartObject(q.Key);
        w.WriteNumber("value", Tidy(q.Value));
        w.WriteNumberOrNull("stderr", q.StandardError);
        w.WriteNumberOrNull("ci95_halfwidth", q.HalfWidth95);
        if (q.Lower95 is double lo && q.Upper95 is double hi)
        {
            w.WriteStartArray("ci95");
            w.WriteNumberValue(lo);
            w.WriteNumberValue(hi);
            w.WriteEndArray();
        }
        else
        {
            w.WriteNull("ci95");
        }
        w.WriteNumberOrNull("relative_halfwidth", relative);
        if (at is not null)
        {
            w.WriteStartObject("at");
            foreach (var (key, value) in at.Where(kv => kv.Key is "barrier_height_eV" or "thickness_nm" or "asymmetry_eV"))
            {
                w.WriteNumber(key, Tidy(value));
            }
            w.WriteEndObject();
        }
        w.WriteEndObject();
    }

    private static void WriteWorst(Utf8JsonWriter w, string name, WorstCasePrediction wc, PlanRequest request)
    {
        var defs = request.Setup.Model.Parameters;
        w.WriteStartObject(name);
        w.WriteNumber("grid_points", wc.GridPoints);
        w.WriteStartObject("ranges");
        foreach (var (key, (lo, hi)) in request.Ranges.OrderBy(kv => kv.Key, StringComparer.Ordinal))
        {
            var def = defs[request.Setup.Model.IndexOf(key)];
            w.WriteStartArray(key);
            w.WriteNumberValue(Tidy(def.ToDisplay(lo)));
            w.WriteNumberValue(Tidy(def.ToDisplay(hi)));
            w.WriteEndArray();
        }
        w.WriteEndObject();
        WriteIdentifiability(w, wc.IsIdentifiable, wc.Reasons);
        w.WriteNumber("max_current_A", wc.MaxAbsCurrentA);
        w.WriteStartObject("predicted");
        foreach (var q in wc.Parameters) WritePrediction(w, q, wc.RelativeHalfWidth(q.Key), wc.WorstAt[q.Key]);
        w.WriteEndObject();
        w.WriteEndObject();
    }

    private static void WriteIdentifiability(Utf8JsonWriter w, bool identifiable, IEnumerable<string> reasons)
    {
        w.WriteBoolean("identifiable", identifiable);
        w.WriteStartArray("not_identifiable_reasons");
        foreach (string r in reasons) w.WriteStringValue(r);
        w.WriteEndArray();
    }

    private static void WriteField(Utf8JsonWriter w, string name, double maxBiasV, double? thicknessNm)
    {
        if (thicknessNm is double d && d > 0) w.WriteNumber(name, maxBiasV / d * 10); // V/nm → MV/cm: 1 V/nm = 10 MV/cm
        else w.WriteNull(name);
    }


    /// <summary>Name of a sweep family as the <c>--sweep</c> option spells it.</summary>
    public static string ShapeName(SweepFamily family) => family switch
    {
        SweepFamily.PositiveOnly => "positive",
        SweepFamily.NegativeOnly => "negative",
        SweepFamily.Loop => "loop",
        _ => "linear",
    };

    /// <summary>A display value at 12 significant digits: unit conversions leave 1.5000000000000002 for 1.5.</summary>
    private static double Tidy(double x) => double.Parse(x.ToString("G12", Inv), Inv);

    private static string F(double x) => x.ToString("G4", Inv).Replace("E", "e", StringComparison.Ordinal);
}
