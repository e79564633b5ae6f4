using System.Globalization;
using System.Text;

namespace JunctionFit.Fitting;

/// <summary>
/// The canonical text of a set of fit options: every option that changes the outcome of a fit as sorted <c>name=value</c>
/// lines. The results database hashes it into a result's identity (JunctionFit.Storage.ResultIdentity) and keeps it beside
/// each row, readable.
/// </summary>
public static class FitOptionsText
{
    /// <summary>First line of the canonical options text; bump it when the meaning of a line changes.</summary>
    public const string Format = "junctionfit-fit-options/3";

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// The canonical text of <paramref name="options"/> and of any further settings that change a fit (model options,
    /// parasitics, import options; the caller names them): the line <see cref="Format"/>, then sorted
    /// <c>name=value</c> lines. Doubles are written in invariant shortest round-trip form, null as an empty value.
    /// </summary>
    /// <param name="options">The fit options.</param>
    /// <param name="extra">Further settings as name/value pairs (written as <c>extra.NAME=VALUE</c>); null for none.</param>
    /// <returns>The text, lines separated by <c>\n</c>.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="options"/> is null.</exception>
    /// <exception cref="ArgumentException">A name in <paramref name="extra"/> is empty, repeated, or holds '=' or a line break,
    /// or a value holds a line break.</exception>
    public static string Canonical(FitOptions options, IEnumerable<KeyValuePair<string, string>>? extra = null)
    {
        ArgumentNullException.ThrowIfNull(options);
        var lines = new SortedDictionary<string, string>(StringComparer.Ordinal);
        // Parameter values are written in the unit their key names (fixed.thickness_nm=1.6), converted from SI once here.
        foreach (var (key, value) in options.FixedValues) lines.Add("fixed." + key.Name, Number(key.ToDisplay(value)));
        foreach (var key in options.FreedKeys) lines.Add("freed." + key.Name, "true");
        foreach (var (key, value) in options.StartValues) lines.Add("start." + key.Name, Number(key.ToDisplay(value)));
        foreach (var (key, b) in options.Bounds)
        {
            lines.Add("bound." + key.Name, Number(key.ToDisplay(b.LowerSi)) + ":" + Number(key.ToDisplay(b.UpperSi)));
        }
        lines.Add("relative_noise", Number(options.RelativeNoise));
        lines.Add("noise_floor_A", Number(options.NoiseFloorA));
        lines.Add("compliance_A", Number(options.ComplianceA));
        lines.Add("fix_area_from_metadata", options.FixAreaFromMetadata ? "true" : "false");
        lines.Add("starts", options.Starts.ToString(Inv));
        lines.Add("bias_window_low_V", Number(options.BiasWindowLowV));
        lines.Add("bias_window_high_V", Number(options.BiasWindowHighV));
        lines.Add("sweep_direction", options.SweepDirection.ToString(Inv));
        lines.Add("misfit_tolerance", Number(options.MisfitTolerance));
        lines.Add("keep_settling", options.KeepSettling ? "true" : "false");
        lines.Add("direction_fits", options.DirectionFits ? "true" : "false");
        var s = options.Solver;
        lines.Add("solver.max_iterations", s.MaxIterations.ToString(Inv));
        lines.Add("solver.max_function_evaluations", s.MaxFunctionEvaluations is int m ? m.ToString(Inv) : "");
        lines.Add("solver.relative_reduction_tolerance", Number(s.RelativeReductionTolerance));
        lines.Add("solver.step_tolerance", Number(s.StepTolerance));
        lines.Add("solver.gradient_tolerance", Number(s.GradientTolerance));
        lines.Add("solver.initial_step_factor", Number(s.InitialStepFactor));
        if (extra is not null)
        {
            foreach (var (name, value) in extra)
            {
                ArgumentException.ThrowIfNullOrWhiteSpace(name, nameof(extra));
                ArgumentNullException.ThrowIfNull(value, nameof(extra));
                if (name.AsSpan().IndexOfAny("=\r\n") >= 0) throw new ArgumentException($"option name '{name}' holds '=' or a line break", nameof(extra));
                if (value.AsSpan().IndexOfAny("\r\n") >= 0) throw new ArgumentException($"option '{name}' has a line break in its value", nameof(extra));
                if (!lines.TryAdd("extra." + name, value)) throw new ArgumentException($"option '{name}' is given twice", nameof(extra));
            }
        }
        var sb = new StringBuilder(Format.Length + 40 * lines.Count).Append(Format);
        foreach (var (name, value) in lines) sb.Append('\n').Append(name).Append('=').Append(value);
        return sb.ToString();
    }

    private static string Number(double? x) => x is double v ? v.ToString("R", Inv) : "";
}
