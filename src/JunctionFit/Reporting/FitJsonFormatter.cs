using System.Buffers;
using System.Text;
using System.Text.Json;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Reporting;

/// <summary>
/// The one-line JSON form of a <see cref="FitResult"/> that scripts rely on (keys fixed by docs/cli.md):
/// <c>file, model, status, error, warnings, parameters{key: {value, stderr, ci95, fixed}}, fit{...}</c>,
/// followed by extension keys (<c>correlation</c>, <c>transition_voltage_V</c>, <c>lot</c>, <c>wafer</c>, <c>die_x</c>, <c>die_y</c>).
/// </summary>
public static class FitJsonFormatter
{
    private static readonly JsonWriterOptions WriterOptions = new() { Indented = false, SkipValidation = false };

    /// <summary>Formats a result as a single JSON line (no trailing newline).</summary>
    public static string Format(FitResult result)
    {
        var buffer = new ArrayBufferWriter<byte>(1024);
        Write(result, buffer);
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>Writes a result as JSON (one line, no newline) into <paramref name="output"/>.</summary>
    public static void Write(FitResult result, IBufferWriter<byte> output)
    {
        ArgumentNullException.ThrowIfNull(result);
        using var w = new Utf8JsonWriter(output, WriterOptions);
        w.WriteStartObject();
        w.WriteString("file", result.SourcePath);
        w.WriteString("model", result.Model);
        w.WriteString("status", ResultSchema.StatusText(result.Status));
        if (result.Error is null) w.WriteNull("error"); else w.WriteString("error", result.Error);
        w.WriteStringOrNull("status_reason", result.StatusReason);
        w.WriteStartArray("warnings");
        foreach (var warning in result.Warnings) w.WriteStringValue(warning);
        w.WriteEndArray();

        w.WriteStartObject("parameters");
        // Table order of the schema: the standard keys first, the others in model order (a stable sort).
        foreach (var p in result.Parameters.OrderBy(p => ResultSchema.KeyRank(p.Key))) WriteParameter(w, p);
        w.WriteEndObject();

        w.WriteStartObject("fit");
        if (result.Quality is { } q)
        {
            w.WriteNumber("points_used", q.PointsUsed);
            w.WriteNumber("points_masked", q.PointsMasked);
            w.WriteNumber("iterations", q.Iterations);
            w.WriteNumberOrNull("rss", q.ResidualSumOfSquares);
            w.WriteNumberOrNull("reduced_chi2", q.ReducedChiSquare);
            w.WriteBoolean("converged", q.Converged);
            w.WriteString("stop_reason", q.StopReason);
            w.WriteString("covariance_scaling", q.CovarianceScaling);
            w.WriteString("interval_method", q.IntervalMethod);
            w.WriteNumber("noise_floor_A", q.NoiseFloorA);
            w.WriteStringOrNull("noise_floor", q.NoiseFloorDescription);
            w.WriteNumber("points_down_weighted", q.PointsDownWeighted);
            w.WriteNumberOrNull("relative_noise", q.RelativeNoise);
            w.WriteNumberOrNull("log_residual_rms", q.LogResidualRms);
            w.WriteNumberOrNull("systematic_misfit", q.SystematicMisfit);
            w.WriteNumberOrNull("misfit_tolerance", q.MisfitTolerance);
        }
        else
        {
            w.WriteNull("points_used");
            w.WriteNull("points_masked");
            w.WriteNull("iterations");
            w.WriteNull("rss");
            w.WriteNull("reduced_chi2");
            w.WriteBoolean("converged", false);
        }
        w.WriteEndObject();

        w.WriteCorrelation(result.CorrelationKeys, result.CorrelationKeys.Length, result.CorrelationRowMajor.AsSpan());

        w.WriteStartArray("diagnoses");
        foreach (string d in result.Diagnoses) w.WriteStringValue(d);
        w.WriteEndArray();
        if (result.Hysteresis is { } h)
        {
            w.WriteStartObject("hysteresis");
            w.WriteNumber("rising_points", h.RisingPoints);
            w.WriteNumber("falling_points", h.FallingPoints);
            w.WriteNumberOrNull("log_current_rms", h.LogCurrentRms);
            w.WriteBoolean("significant", h.Significant);
            w.WriteStartObject("rising_minus_falling");
            foreach (var d in h.Differences)
            {
                w.WriteStartObject(d.Key);
                w.WriteNumberOrNull("rising", d.Rising);
                w.WriteNumberOrNull("falling", d.Falling);
                w.WriteNumberOrNull("difference", d.Difference);
                w.WriteNumberOrNull("stderr", d.StandardError);
                if (d.Interval95 is (double lo, double hi))
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
                w.WriteEndObject();
            }
            w.WriteEndObject();
            w.WriteEndObject();
        }
        else
        {
            w.WriteNull("hysteresis");
        }
        w.WriteStringOrNull("model_validity", result.ModelValidity);
        w.WriteNumberOrNull("transition_voltage_V", result.TransitionVoltageV);
        w.WriteNumberOrNull("transition_voltage_negative_V", result.TransitionVoltageNegativeV);
        if (result.ModelComparison.Length > 0)
        {
            w.WriteStartArray("model_selection");
            foreach (var row in result.ModelComparison)
            {
                w.WriteStartObject();
                w.WriteString("model", row.Model);
                w.WriteString("status", ResultSchema.StatusText(row.Status));
                w.WriteNumber("free_parameters", row.FreeParameters);
                w.WriteNumber("points_used", row.PointsUsed);
                w.WriteNumberOrNull("rss", row.ResidualSumOfSquares);
                w.WriteNumberOrNull("aicc", row.Aicc);
                w.WriteBoolean("chosen", row.Chosen);
                w.WriteEndObject();
            }
            w.WriteEndArray();
        }
        if (result.CapacitanceVoltage is { } cv)
        {
            // "cet_nm": {"value": CET} with what it was computed from, and t_ox − CET when a thickness was fitted.
            w.WriteStartObject("cet_nm");
            w.WriteNumber("value", cv.CapacitanceEquivalentThicknessNm);
            w.WriteNumber("c_max_F", cv.MaxCapacitanceF);
            w.WriteNumber("c_max_bias_V", cv.MaxCapacitanceBiasV);
            w.WriteNumber(ParameterKey.Area.Name, cv.AreaM2);
            w.WriteBoolean("saturated", cv.Saturated);
            if (result.Find(ParameterKey.Thickness.Name) is { } tox) w.WriteNumber("cet_minus_thickness_nm", cv.CapacitanceEquivalentThicknessNm - tox.Value);
            w.WriteNumberOrNull("doping_cm3", cv.DopingM3 / 1e6);
            w.WriteNumberOrNull(ParameterKey.FlatBandVoltage.Name, cv.FlatBandVoltageV);
            w.WriteEndObject();
        }
        ResultTableWriter.WriteJsonFields(w, ResultSchema.PlacementColumns, ResultSchema.Placement(result));
        w.WriteEndObject();
        w.Flush();
    }

    private static void WriteParameter(Utf8JsonWriter w, ParameterEstimate p)
    {
        w.WriteStartObject(p.Key);
        w.WriteNumberOrNull("value", p.Value);
        w.WriteNumberOrNull("stderr", p.StandardError);
        if (p.Bound is { } bound)
        {
            // One-sided: [limit, null] for "at least", [null, limit] for "at most".
            w.WriteStartArray("ci95");
            if (bound.IsLower) { w.WriteNumberValue(bound.Value); w.WriteNullValue(); }
            else { w.WriteNullValue(); w.WriteNumberValue(bound.Value); }
            w.WriteEndArray();
        }
        else if (p.Lower95 is double lo && p.Upper95 is double hi && double.IsFinite(lo) && double.IsFinite(hi))
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
        w.WriteBoolean("fixed", p.IsFixed);
        if (p.IsUndetermined)
        {
            w.WriteBoolean("undetermined", true);
            if (p.Bound is { } b)
            {
                w.WriteString("bound", b.IsLower ? "lower" : "upper");
                w.WriteString("bound_method", b.Method);
            }
        }
        w.WriteEndObject();
    }



}
