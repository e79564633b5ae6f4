using System.Collections.Immutable;
using CsCheck;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using Xunit;
using Xunit.Abstractions;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The noise floor σ_floor of σ_I² = (r·I)² + σ_floor²: its estimate from zero-bias readings and quantisation, and fits of
/// sweeps that carry a floor-level point near 0 V (a bias stepped in floating point reads back as 1e-16 V while the
/// instrument reads its floor, 1e-14 … 1e-12 A, with the sign of the bias).
/// </summary>
public class NoiseFloorTests(ITestOutputHelper output)
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly JunctionCurrentModel Model = new(SimmonsRectangularModel.Instance);

    private static FitOptions AreaFixed(double areaUm2) =>
        FitOptions.Default with { FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, areaUm2 * 1e-12) };

    /// <summary>A sweep stepped in floating point (x += step), as a script or an instrument firmware produces it.</summary>
    internal static IvCurve FloatSteppedSweep(double phiEv, double dNm, double areaUm2, double vMax, int points, double relNoise,
        double floorCurrentA, int seed)
    {
        double step = 2 * vMax / (points - 1);
        var v = new double[points];
        double x = -vMax;
        for (int k = 0; k < points; k++) { v[k] = x; x += step; }
        double[] theta = [phiEv * Ev, dNm * 1e-9, 1.0, areaUm2 * 1e-12];
        var rng = new Random(seed);
        var i = new double[points];
        int nearest = 0;
        for (int k = 0; k < points; k++)
        {
            double gauss = Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
            i[k] = Model.Current(v[k], theta) * (1 + relNoise * gauss);
            if (Math.Abs(v[k]) < Math.Abs(v[nearest])) nearest = k;
        }
        // The reading nearest zero bias is the instrument floor, with the sign of its (tiny) bias.
        i[nearest] = (v[nearest] >= 0 ? 1 : -1) * floorCurrentA;
        return new IvCurve($"float-{seed}.csv", [.. v], [.. i]);
    }

    [Fact]
    public void IsZeroBias_FloatSteppedZero_IsZeroBias()
    {
        double x = -1.0;
        for (int k = 0; k < 100; k++) x += 0.01;
        Assert.NotEqual(0.0, x); // the classic floating-point residue (about 1e-16)
        Assert.True(NoiseFloorEstimator.IsZeroBias(x, 0.01));
        Assert.False(NoiseFloorEstimator.IsZeroBias(0.01, 0.01));
        Assert.False(NoiseFloorEstimator.IsZeroBias(2e-5, 0.01));
    }

    [Fact]
    public void Estimate_ZeroBiasReadings_GivesTheirRms()
    {
        double[] v = [-0.1, 0, 0.1, 0.2, 0, 0.1, 0];
        double[] i = [-1e-9, 3e-13, 1e-9, 2e-9, -4e-13, 1e-9, 0];
        var e = NoiseFloorEstimator.Estimate(v, i, []);
        Assert.Equal(NoiseFloorSource.ZeroBias, e.Source);
        Assert.Equal(3, e.ZeroBiasSamples);
        Assert.Equal(Math.Sqrt((9e-26 + 16e-26) / 3), e.FloorA, 1e-20);
    }

    [Fact]
    public void Quantum_GateCurrentOfTheIhpNmos_IsTwoTimesTenToTheMinus14()
    {
        // Gate current ig of IHP Open PDK SG13G2 nMOS W = L = 10 µm, 300 K (shared/real-data/gate-oxide-nmos/
        // nmos_gate_W10_L10_300K.csv, Apache-2.0); its README: "quantised at about 2e-14 A".
        double[] ig =
        [
            -4.986e-11, -1.09e-11, -4.2e-12, -2.4e-12, -1.74e-12, -1.14e-12, -8.4e-13, -6.6e-13, -3.2e-13, -2.2e-13, 1e-13, 6.8e-13,
            3.26e-12, 1.04e-11, 2.6e-11, 5.538e-11, 1.0488e-10, 1.8612e-10, 3.1228e-10, 5.0254e-10, 7.7964e-10, 1.1716e-09, 1.713e-09,
            2.4454e-09, 3.415e-09, 4.6824e-09, 6.3094e-09, 8.3752e-09, 1.09568e-08, 1.4156e-08, 1.8072e-08, 2.2822e-08, 2.8524e-08,
            3.5328e-08, 4.339e-08, 5.2866e-08, 6.3952e-08, 7.6886e-08,
        ];
        double? q = NoiseFloorEstimator.Quantum(ig);
        Assert.NotNull(q);
        Assert.Equal(2e-14, q!.Value, 1e-18);
    }

    [Fact]
    public void Quantum_SixSignificantDigits_NoneFound()
    {
        // Simulated currents written with many digits have no quantisation step.
        var rng = new Random(3);
        var i = Enumerable.Range(0, 200).Select(_ => Math.Exp(-20 + 6 * rng.NextDouble())).ToArray();
        Assert.Null(NoiseFloorEstimator.Quantum(i));
    }

    [Fact]
    public void Fit_FloorPointAtOneTenToTheMinus16Volt_AreaFixed_IsOkAndSaysWhichFloor()
    {
        // The case of the issue: φ 1.56 eV; a floor point at ~1e-16 V used to give φ = 0.46 eV with the area fixed.
        var curve = FloatSteppedSweep(1.56, 1.4, 100, 1.0, 201, 0.01, 3e-13, seed: 5);
        var result = JunctionFitter.Fit(curve, Model, AreaFixed(100));
        Assert.Equal(FitStatus.Ok, result.Status);
        var phi = result.Find("barrier_height_eV")!;
        Assert.InRange(1.56, phi.Lower95!.Value, phi.Upper95!.Value);
        Assert.Equal(NoiseFloorSource.ZeroBias.ToString(), result.Quality!.NoiseFloorDescription!.Contains("zero bias") ? "ZeroBias" : "?");
        Assert.Equal(3e-13, result.Quality.NoiseFloorA, 1e-20);
        Assert.Contains(result.Warnings, w => w.Contains("at zero bias", StringComparison.Ordinal));
    }

    [Fact]
    public void Fit_FloorPointAtOneTenToTheMinus16Volt_AreaFree_IsNotFailed()
    {
        // Area free, the same point used to drive φ to 1e15 eV and a failed fit.
        var curve = FloatSteppedSweep(1.56, 1.4, 100, 1.0, 201, 0.01, 1e-12, seed: 6);
        var result = JunctionFitter.Fit(curve, Model, FitOptions.Default);
        Assert.Equal(FitStatus.Ok, result.Status);
        Assert.InRange(result.Find("barrier_height_eV")!.Value, 1.0, 2.5);
    }

    [Fact]
    public void Fit_FortySweepsWithAFloorPoint_AtLeast39OkAndAtLeast35IntervalsCover()
    {
        // Held-out shape of the issue: 40 sweeps with a floor-level point near 0 V, area known; at least 39 ok and at
        // least 35 of the 95 % intervals cover the truth (binomial: 38 expected, P(≤ 34) ≈ 3 %). Fixed seeds.
        int ok = 0, phiCovered = 0, dCovered = 0;
        for (int s = 0; s < 40; s++)
        {
            var rng = new Random(900 + s);
            double phi = 1.0 + 1.5 * rng.NextDouble(), d = 1.0 + 1.0 * rng.NextDouble();
            double vMax = 0.4 * phi + 0.4 * rng.NextDouble();
            double floor = Math.Pow(10, -14 + 2 * rng.NextDouble());
            var curve = FloatSteppedSweep(phi, d, 100, vMax, 201, 0.01, floor, seed: 1900 + s);
            var r = JunctionFitter.Fit(curve, Model, AreaFixed(100));
            if (r.Status == FitStatus.Ok) ok++;
            var p = r.Find("barrier_height_eV");
            var t = r.Find("thickness_nm");
            if (p?.Lower95 <= phi && phi <= p?.Upper95) phiCovered++;
            if (t?.Lower95 <= d && d <= t?.Upper95) dCovered++;
        }
        output.WriteLine($"ok {ok}/40, φ covered {phiCovered}/40, d covered {dCovered}/40");
        Assert.True(ok >= 39, $"only {ok} of 40 ok");
        Assert.True(phiCovered >= 35, $"φ intervals cover the truth {phiCovered} of 40 times");
        Assert.True(dCovered >= 35, $"d intervals cover the truth {dCovered} of 40 times");
    }

    [Fact]
    public void Fit_RandomNearZeroFloorPoint_NeverMovesPhiByMoreThanItsStandardError()
    {
        // Property: a point near zero bias (from 1e-18 V to half a step) whose current is at the instrument floor
        // (1e-14 … 1e-12 A, sign of the bias), added to a sweep, moves φ by less than its standard error.
        var baseCurve = JunctionFitterTests.Simulate(1.8, 1.5, 100, 0.01, seed: 21, fromV: -0.9, toV: 0.9, points: 181);
        var reference = JunctionFitter.Fit(baseCurve, Model, AreaFixed(100));
        var phiRef = reference.Find("barrier_height_eV")!;
        double step = 0.01;
        Gen.Select(Gen.Double[-18, Math.Log10(0.49 * step)], Gen.Double[-14, -12], Gen.Bool, Gen.Int[0, 180]).Sample((logV, logI, negative, at) =>
        {
            double v = (negative ? -1 : 1) * Math.Pow(10, logV);
            double i = (negative ? -1 : 1) * Math.Pow(10, logI);
            var vs = baseCurve.VoltageV.Insert(at, v);
            var cs = baseCurve.CurrentA.Insert(at, i);
            var r = JunctionFitter.Fit(new IvCurve("prop.csv", vs, cs), Model, AreaFixed(100));
            var phi = r.Find("barrier_height_eV")!;
            return r.Status == FitStatus.Ok && Math.Abs(phi.Value - phiRef.Value) <= phiRef.StandardError!.Value;
        }, iter: 60);
    }

    /// <summary>A float-stepped sweep whose every reading also carries floor noise of σ_floor (Gaussian), the zero-bias one at σ_floor.</summary>
    private static IvCurve SweepWithFloorNoise(double phiEv, double dNm, double floorA, int seed)
    {
        var clean = FloatSteppedSweep(phiEv, dNm, 100, 1.2, 201, 0.01, floorA, seed);
        var rng = new Random(seed + 7);
        var i = clean.CurrentA.ToArray();
        for (int k = 0; k < i.Length; k++)
        {
            if (NoiseFloorEstimator.IsZeroBias(clean.VoltageV[k], 0.012)) continue;
            double gauss = Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
            i[k] += floorA * gauss;
        }
        return new IvCurve($"floor-noise-{seed}.csv", clean.VoltageV, [.. i]);
    }

    [Fact]
    public void Fit_OneFloorReadingButNoFloorNoise_FloorRevisedAndOptimumAsWithEqualWeights()
    {
        // The held-out shape of issue 13 (heldout_0180: φ 2.99 eV, d 1.96 nm, 100 µm², ±1.2 V, 201 points, 1 % noise, the
        // 0 V row read as 1e-16 V, 1e-13 A): the single reading suggested a floor that down-weighted ~150 points the data show
        // to be as clean as the rest, moving φ 2.6 SE from the equal-weight fit of the careful reference
        // (tests/JunctionFit.Benchmarks/reference/scipy_simmons_fit.py). The scatter test must reject that floor.
        for (int seed = 0; seed < 5; seed++)
        {
            var curve = FloatSteppedSweep(2.99, 1.96, 100, 1.2, 201, 0.01, 1e-13, seed: 180 + seed);
            var r = JunctionFitter.Fit(curve, Model, AreaFixed(100));
            var equal = JunctionFitter.Fit(curve, Model, AreaFixed(100) with { NoiseFloorA = 0.0 });
            Assert.Equal(FitStatus.Ok, r.Status);
            Assert.True(r.Quality!.NoiseFloorA < 1e-13 / 3, $"seed {seed}: floor {r.Quality.NoiseFloorA:e2} kept");
            Assert.Contains("does not support", r.Quality.NoiseFloorDescription, StringComparison.Ordinal);
            var phi = r.Find("barrier_height_eV")!;
            var phiEqual = equal.Find("barrier_height_eV")!;
            output.WriteLine($"seed {seed}: floor {r.Quality.NoiseFloorA:e2}, φ {phi.Value:F5} vs equal weights {phiEqual.Value:F5} ± {phiEqual.StandardError:F5}");
            Assert.True(Math.Abs(phi.Value - phiEqual.Value) <= phiEqual.StandardError, $"seed {seed}");
        }
    }

    [Fact]
    public void Fit_FloorNoiseReallyThere_ZeroBiasFloorKept()
    {
        // The same junction with real floor noise of 1e-13 A on every reading: the scatter of the low-current points supports
        // the floor, so the test (99.9 % level, and only a revision below a third) keeps it. 100 fixed seeds; at most two
        // false rejections (at the 99 % level without the one-third rule it rejected 13 of 200; with both, 0 of 200 were
        // measured).
        int kept = 0;
        for (int seed = 0; seed < 100; seed++)
        {
            var curve = SweepWithFloorNoise(2.99, 1.96, 1e-13, 300 + seed);
            var r = JunctionFitter.Fit(curve, Model, AreaFixed(100));
            if (r.Quality!.NoiseFloorA == 1e-13) kept++;
        }
        output.WriteLine($"floor kept in {kept} of 100");
        Assert.True(kept >= 98, $"floor kept in {kept} of 100");
    }

    [Fact]
    public void FloorFromScatter_TooFewFloorDominatedPoints_KeepsTheFloor()
    {
        // Fewer than MinimumFloorTriples triples cannot judge a floor.
        double[] v = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6];
        double[] y = [-30, -29, -28, -27, -26, -25];
        Assert.Null(NoiseFloorEstimator.FloorFromScatter(v, y, 0.01, 1e-12, out int triples));
        Assert.True(triples < NoiseFloorEstimator.MinimumFloorTriples);
    }
}
