using System.Collections.Immutable;
using JunctionFit.Common;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Fitting;

/// <summary>
/// Hysteresis between sweep directions: when a curve holds both a rising-bias and a falling-bias sweep, each direction is
/// fitted on its own (same model and options, same noise floor) and the differences of the barrier parameters are
/// reported with the standard error √(SE₁² + SE₂²) of two independent estimates; beside it, a model-free figure: the RMS of
/// ln(I_rising/I_falling) at the biases measured in both directions. Pure computation.
/// </summary>
internal static class DirectionFits
{
    /// <summary>ln-current RMS between directions above which hysteresis is reported, beside 3× the noise (2 %; common practice, no source).</summary>
    public const double LogCurrentThreshold = 0.02;

    public static FitResult Attach(IvCurve curve, JunctionCurrentModel model, FitOptions options, PreparedCurve data, FitResult full)
    {
        var v = curve.VoltageV.AsSpan();
        var c = curve.CurrentA.AsSpan();
        var dirs = CurveDiagnostics.Directions(v);
        int rising = 0, falling = 0;
        for (int i = 0; i < dirs.Length; i++)
        {
            if (!data.Used[i]) continue;
            if (dirs[i] > 0) rising++; else if (dirs[i] < 0) falling++;
        }
        int nFree = full.CorrelationKeys.Length;
        int need = Math.Max(8, nFree + 4);
        if (rising < need || falling < need) return full;

        var sub = options with
        {
            DirectionFits = false,
            KeepSettling = true,
            NoiseFloorA = data.Floor.Source == NoiseFloorSource.None ? options.NoiseFloorA : data.Floor.FloorA,
        };
        var up = JunctionFitter.Fit(Subset(curve, dirs, data, +1), model, sub);
        var down = JunctionFitter.Fit(Subset(curve, dirs, data, -1), model, sub);

        double? logRms = SharedBiasRms(v, c, dirs, data);
        var diffs = ImmutableArray.CreateBuilder<DirectionDifference>();
        bool significant = logRms is double lr && lr > Math.Max(LogCurrentThreshold, 3.0 * data.RelativeNoiseUsed);
        if (up.Status != FitStatus.Failed && down.Status != FitStatus.Failed)
        {
            foreach (var p in full.Parameters)
            {
                if (p.IsFixed || p.Key == StandardParameters.Area.Key) continue;
                var a = up.Find(p.Key);
                var b = down.Find(p.Key);
                if (a is null || b is null || !double.IsFinite(a.Value) || !double.IsFinite(b.Value)) continue;
                double? se = a.StandardError is double sa && b.StandardError is double sb ? Math.Sqrt(sa * sa + sb * sb) : null;
                var d = new DirectionDifference(p.Key, a.Value, b.Value, se);
                if (se is double s && Math.Abs(d.Difference) > 1.96 * s && (p.Key == StandardParameters.BarrierHeight.Key || p.Key == StandardParameters.Thickness.Key))
                {
                    significant = true;
                }
                diffs.Add(d);
            }
        }
        var report = new HysteresisReport(up.Quality?.PointsUsed ?? 0, down.Quality?.PointsUsed ?? 0, logRms, diffs.ToImmutable(), significant);
        if (!significant) return full with { Hysteresis = report };

        var parts = new List<string>();
        foreach (var d in report.Differences)
        {
            var p = full.Find(d.Key)!;
            string unit = p.Unit.Length > 0 ? " " + p.Unit : "";
            parts.Add(d.Interval95 is (double lo, double hi)
                ? $"{p.Symbol} {d.Difference:+0.###;-0.###} [{lo:+0.###;-0.###}, {hi:+0.###;-0.###}]{unit}"
                : $"{p.Symbol} {d.Difference:+0.###;-0.###}{unit}");
        }
        string text = $"hysteresis: the rising and falling sweeps differ" +
                      (logRms is double r ? $" by {r * 100:0.#} % RMS in current at the biases measured both ways" : "") +
                      (parts.Count > 0 ? $"; fitted separately, rising minus falling: {string.Join(", ", parts)} (95 %)" : "") +
                      $"; charging, trapping or drift during the sweep. Fit one direction with {new Remedy(RemedyKind.SweepDirection, "rising|falling")}";
        return full with
        {
            Hysteresis = report,
            Warnings = full.Warnings.Add(text),
            Diagnoses = full.Diagnoses.Add("hysteresis"),
        };
    }

    private static IvCurve Subset(IvCurve curve, sbyte[] dirs, PreparedCurve data, int direction)
    {
        var v = ImmutableArray.CreateBuilder<double>();
        var c = ImmutableArray.CreateBuilder<double>();
        var lines = ImmutableArray.CreateBuilder<int>();
        bool hasLines = curve.SourceLines.Length == curve.Count;
        bool hasMask = curve.ImportMask.Length == curve.Count;
        var mask = ImmutableArray.CreateBuilder<bool>();
        for (int i = 0; i < curve.Count; i++)
        {
            if (dirs[i] != direction || Array.IndexOf(data.SettlingIndices, i) >= 0) continue;
            v.Add(curve.VoltageV[i]);
            c.Add(curve.CurrentA[i]);
            if (hasLines) lines.Add(curve.SourceLines[i]);
            if (hasMask) mask.Add(curve.ImportMask[i]);
        }
        return new IvCurve(curve.SourcePath, v.ToImmutable(), c.ToImmutable())
        {
            SourceLines = hasLines ? lines.ToImmutable() : [],
            ImportMask = hasMask ? mask.ToImmutable() : [],
            AreaM2 = curve.AreaM2,
            TemperatureK = curve.TemperatureK,
            ComplianceA = curve.ComplianceA,
            Lot = curve.Lot,
            Wafer = curve.Wafer,
            DieX = curve.DieX,
            DieY = curve.DieY,
            Metadata = curve.Metadata,
        };
    }

    /// <summary>RMS of ln(I_rising/I_falling) over used falling points that have a used rising point at the same bias.</summary>
    private static double? SharedBiasRms(ReadOnlySpan<double> v, ReadOnlySpan<double> c, sbyte[] dirs, PreparedCurve data)
    {
        double step = NoiseFloorEstimator.TypicalStepV(v);
        if (!(step > 0)) return null;
        double tol = 1e-3 * step;
        var risingByBias = new Dictionary<long, double>();
        for (int i = 0; i < v.Length; i++)
        {
            if (!data.Used[i] || dirs[i] <= 0) continue;
            risingByBias.TryAdd((long)Math.Round(v[i] / tol), Math.Log(Math.Abs(c[i])));
        }
        double ss = 0;
        int count = 0;
        for (int i = 0; i < v.Length; i++)
        {
            if (!data.Used[i] || dirs[i] >= 0) continue;
            if (risingByBias.TryGetValue((long)Math.Round(v[i] / tol), out double yUp))
            {
                double d = yUp - Math.Log(Math.Abs(c[i]));
                ss += d * d;
                count++;
            }
        }
        return count >= 3 ? Math.Sqrt(ss / count) : null;
    }
}
