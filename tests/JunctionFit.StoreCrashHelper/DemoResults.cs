using System.Collections.Immutable;
using System.Globalization;
using System.Text;
using JunctionFit.Fitting;
using JunctionFit.Results;
using JunctionFit.Storage;

namespace JunctionFit.StoreCrashHelper;

/// <summary>Invented results for an invented lot (Kestrel Microsystems, lot KM-A01): result i is a die of wafer W(i/400).</summary>
public static class DemoResults
{
    /// <summary>The canonical options all demo results are fitted under.</summary>
    public static string Options { get; } = FitOptionsText.Canonical(FitOptions.Default);

    /// <summary>The file hash of die <paramref name="i"/> (the hash of an invented file content).</summary>
    public static string FileSha256(int i) => ResultIdentity.Sha256(Encoding.UTF8.GetBytes(string.Create(CultureInfo.InvariantCulture, $"KM-A01 die {i}")));

    /// <summary>The key of die <paramref name="i"/>.</summary>
    public static ResultKey Key(int i) => ResultIdentity.Key(FileSha256(i), "simmons", Options);

    /// <summary>The fit of die <paramref name="i"/>; <paramref name="variant"/> shifts the values (a "refit").</summary>
    public static FitResult Fit(int i, int variant = 0)
    {
        var inv = CultureInfo.InvariantCulture;
        double phi = 2.0 + 0.001 * (i % 97) + 0.1 * variant;
        double d = 1.5 + 0.0005 * (i % 89);
        bool failed = i % 37 == 36;
        var parameters = failed
            ? ImmutableArray<ParameterEstimate>.Empty
            : [
                new ParameterEstimate("barrier_height_eV", "φ", "eV", phi, 0.004, phi - 0.008, phi + 0.008, false),
                new ParameterEstimate("thickness_nm", "d", "nm", d, 0.002, d - 0.004, d + 0.004, false),
                new ParameterEstimate("area_m2", "A", "m²", 1e-10, null, null, null, true),
                new ParameterEstimate("mass_ratio", "m*/mₑ", "", 1.0, null, null, null, true),
                .. i % 5 == 0 ? [new ParameterEstimate("series_resistance_ohm", "Rs", "Ω", 12.5 + i, 0.5, 11.5 + i, 13.5 + i, false)] : ImmutableArray<ParameterEstimate>.Empty,
            ];
        return new FitResult
        {
            SourcePath = string.Create(inv, $"KM-A01/W{i / 400:00}/die_{i % 20:00}_{i / 20 % 20:00}.csv"),
            Model = "simmons",
            Status = failed ? FitStatus.Failed : i % 11 == 0 ? FitStatus.PoorFit : FitStatus.Ok,
            Error = failed ? "no current above the noise floor; check the probe contact" : null,
            StatusReason = failed ? "no current above the noise floor; check the probe contact" : i % 11 == 0 ? "reduced chi-square 4.2 above the tolerance" : null,
            ModelValidity = failed ? null : "intermediate bias: |V| below φ/e",
            Diagnoses = i % 11 == 0 ? ["the misfit grows with |V|: a series resistance?", "fit a window of the bias"] : [],
            Warnings = i % 11 == 0 ? ["reduced chi-square 4.2: the model does not describe the data", "3 points masked | compliance"] : [],
            Parameters = parameters,
            Quality = failed ? null : new FitQuality(190, 11, 9 + i % 7, 0.0123 + i * 1e-6, 1.03, true, "relative reduction", "scaled by reduced chi-square", "Wald (log scale)"),
            CorrelationKeys = failed ? [] : ["barrier_height_eV", "thickness_nm"],
            CorrelationRowMajor = failed ? [] : [1.0, -0.93, -0.93, 1.0],
            TransitionVoltageV = failed ? null : 0.8 + 0.001 * (i % 13),
            Lot = "KM-A01",
            Wafer = string.Create(inv, $"W{i / 400:00}"),
            DieX = i % 20,
            DieY = i / 20 % 20,
        };
    }

    /// <summary>The stored row of die <paramref name="i"/> in <paramref name="run"/>.</summary>
    public static StoredResult Row(int i, RunInfo run, int variant = 0) => StoredResult.Create(Fit(i, variant), FileSha256(i), Options, run);
}
