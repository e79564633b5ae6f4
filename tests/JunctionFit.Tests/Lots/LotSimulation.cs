using System.Collections.Immutable;
using JunctionFit.Lots;
using JunctionFit.Results;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace JunctionFit.Tests.Lots;

/// <summary>
/// Per-die parameter values drawn from normal distributions with a seeded generator — invented data for lot
/// statistics tests (lab "Kestrel Microsystems"); no curves are fitted.
/// </summary>
internal static class LotSimulation
{
    public sealed record LotSpec(string Lot, double BarrierHeightEv = 2.0, double ThicknessNm = 1.5, double AreaM2 = 1e-10)
    {
        public int Wafers { get; init; } = 2;
        public int GridX { get; init; } = 6;
        public int GridY { get; init; } = 5;
        public double BarrierSdEv { get; init; } = 0.03;
        public double ThicknessSdNm { get; init; } = 0.02;
        public double AreaRelativeSd { get; init; } = 0.03;
        public int FailedDies { get; init; }
        public int PoorFitDies { get; init; }
    }

    public static List<ResultRow> Lot(LotSpec spec, int seed)
    {
        var rng = new MersenneTwister(seed);
        var rows = new List<ResultRow>();
        int index = 0;
        for (int w = 1; w <= spec.Wafers; w++)
        {
            for (int y = 0; y < spec.GridY; y++)
            {
                for (int x = 0; x < spec.GridX; x++)
                {
                    double phi = Normal.Sample(rng, spec.BarrierHeightEv, spec.BarrierSdEv);
                    double d = Normal.Sample(rng, spec.ThicknessNm, spec.ThicknessSdNm);
                    double area = spec.AreaM2 * (1 + Normal.Sample(rng, 0, spec.AreaRelativeSd));
                    double vt = Normal.Sample(rng, 0.75, 0.02);
                    var status = index < spec.FailedDies ? FitStatus.Failed
                        : index < spec.FailedDies + spec.PoorFitDies ? FitStatus.PoorFit
                        : FitStatus.Ok;
                    string wafer = $"W{w:00}";
                    rows.Add(new ResultRow
                    {
                        File = $"{spec.Lot}/{wafer}/die_{x:00}_{y:00}.csv",
                        Lot = spec.Lot,
                        Wafer = wafer,
                        DieX = x,
                        DieY = y,
                        Model = "simmons",
                        Status = status,
                        Parameters = status == FitStatus.Failed ? [] :
                        [
                            new RowParameter("barrier_height_eV", phi, 0.004, phi - 0.008, phi + 0.008),
                            new RowParameter("thickness_nm", d, 0.002, d - 0.004, d + 0.004),
                            new RowParameter("area_m2", area, 0.02 * area, 0.96 * area, 1.04 * area),
                            new RowParameter("mass_ratio", 1.0, null, null, null),
                        ],
                        ReducedChiSquare = status == FitStatus.Failed ? null : status == FitStatus.PoorFit ? 14.2 : 1.02,
                        TransitionVoltageV = status == FitStatus.Failed ? null : vt,
                        Warnings = status == FitStatus.PoorFit ? ["residuals show a systematic trend"] : [],
                        Error = status == FitStatus.Failed ? "every point is below the noise floor; check the probe contact" : null,
                    });
                    index++;
                }
            }
        }
        return rows;
    }

    /// <summary>KM-A01 (reference), KM-A02 with a planted +0.15 eV barrier shift, KM-A03 like the reference.</summary>
    public static List<ResultRow> ThreeLotsWithPlantedShift(int seed = 20240611)
    {
        var rows = new List<ResultRow>();
        rows.AddRange(Lot(new LotSpec("KM-A01") { FailedDies = 2, PoorFitDies = 1 }, seed));
        rows.AddRange(Lot(new LotSpec("KM-A02", BarrierHeightEv: 2.15) { FailedDies = 1 }, seed + 1));
        rows.AddRange(Lot(new LotSpec("KM-A03") { PoorFitDies = 2 }, seed + 2));
        return rows;
    }

    public static ResultRow Row(string lot, FitStatus status, double? phi, string wafer = "W01", int? x = null, int? y = null, double? thicknessNm = null) => new()
    {
        File = $"{lot}/{wafer}/die_{x}_{y}.csv",
        Lot = lot,
        Wafer = wafer,
        DieX = x,
        DieY = y,
        Model = "simmons",
        Status = status,
        Parameters = ImmutableArray.CreateRange(new[]
        {
            phi is double p ? new RowParameter("barrier_height_eV", p, 0.01, p - 0.02, p + 0.02) : null,
            thicknessNm is double d ? new RowParameter("thickness_nm", d, 0.01, d - 0.02, d + 0.02) : null,
        }.OfType<RowParameter>()),
    };
}
