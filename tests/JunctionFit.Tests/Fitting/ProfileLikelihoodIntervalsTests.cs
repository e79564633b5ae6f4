using System.Collections.Immutable;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using MathNet.Numerics.Distributions;
using Xunit;
using Xunit.Abstractions;
using static JunctionFit.Tests.Fitting.TruthPoint;

namespace JunctionFit.Tests.Fitting;

public class ProfileLikelihoodIntervalsTests(ITestOutputHelper output)
{
    public static TheoryData<bool> AreaKnown => new() { true, false };

    /// <summary>Refits with θₖ fixed at its end value and returns the weighted RSS of that refit.</summary>
    private static double RefitRss(IvCurve curve, FitOptions options, string key, double displayValue)
    {
        var def = Model.Parameters[Model.IndexOf(key)];
        var refit = JunctionFitter.Fit(curve, Model, options with { FixedValues = options.FixedValues.SetItem(def.Id, def.FromDisplay(displayValue)) });
        return refit.Quality!.ResidualSumOfSquares;
    }

    [Theory]
    [MemberData(nameof(AreaKnown))]
    public void Refit_ParameterFixedAtEstimate_ReproducesMinimumRss(bool areaKnown)
    {
        // The profile compares RSS values of different fits of one curve; that is valid only if the refits weigh the
        // points as the fit did (same mask, same noise estimate). Fixing a parameter at its estimate must give S_min back.
        var curve = Baseline.Simulate(41);
        var options = Baseline.Options(areaKnown);
        var fit = JunctionFitter.Fit(curve, Model, options);
        double sMin = fit.Quality!.ResidualSumOfSquares;
        foreach (var (key, _) in Baseline.FreeKeys(areaKnown))
        {
            double s = RefitRss(curve, options, key, fit.Find(key)!.Value);
            Assert.Equal(sMin, s, sMin * 1e-6);
        }
    }

    [Fact]
    public void Compute_AreaKnown_AgreesWithWaldWithinTenPercentOfWidth()
    {
        // With the area known the fit is well conditioned and nearly linear in (ln φ, ln d); the likelihood-ratio interval
        // with the F threshold and the Wald interval with the t quantile then coincide asymptotically (G. A. F. Seber and
        // C. J. Wild, Nonlinear Regression, Wiley 1989, on the equivalence of the two constructions; from memory).
        var options = Baseline.Options(areaKnown: true);
        for (int seed = 1; seed <= 10; seed++)
        {
            var curve = Baseline.Simulate(seed);
            var fit = JunctionFitter.Fit(curve, Model, options);
            var profile = ProfileLikelihoodIntervals.Compute(curve, Model, options, fit);
            Assert.Equal(ProfileLikelihoodIntervals.MethodScaled, profile.Quality!.IntervalMethod);
            foreach (var (key, _) in Baseline.FreeKeys(areaKnown: true))
            {
                var w = fit.Find(key)!;
                var p = profile.Find(key)!;
                double width = w.Upper95!.Value - w.Lower95!.Value;
                Assert.InRange(p.Lower95!.Value, w.Lower95.Value - 0.1 * width, w.Lower95.Value + 0.1 * width);
                Assert.InRange(p.Upper95!.Value, w.Upper95.Value - 0.1 * width, w.Upper95.Value + 0.1 * width);
            }
        }
    }

    [Theory]
    [MemberData(nameof(AreaKnown))]
    public void Compute_NoiseUnknown_EndsSitOnFThreshold(bool areaKnown)
    {
        // Threshold S_min·(1 + F₀.₉₅(1, ν)/ν) (D. M. Bates and D. G. Watts, Nonlinear Regression Analysis and Its
        // Applications, Wiley 1988; from memory). F quantile from MathNet (a general-purpose reference library).
        var curve = Baseline.Simulate(42);
        var options = Baseline.Options(areaKnown);
        var fit = JunctionFitter.Fit(curve, Model, options);
        var profile = ProfileLikelihoodIntervals.Compute(curve, Model, options, fit);
        double sMin = fit.Quality!.ResidualSumOfSquares;
        int nu = fit.Quality.PointsUsed - Baseline.FreeKeys(areaKnown).Length;
        double deltaS = sMin * FisherSnedecor.InvCDF(1, nu, 0.95) / nu;
        foreach (var (key, _) in Baseline.FreeKeys(areaKnown))
        {
            var p = profile.Find(key)!;
            foreach (double end in new[] { p.Lower95!.Value, p.Upper95!.Value })
            {
                double excess = RefitRss(curve, options, key, end) - sMin;
                output.WriteLine($"{key} end {end:g6}: ΔS = {excess:g6}, threshold {deltaS:g6}");
                Assert.Equal(deltaS, excess, 0.01 * deltaS);
            }
        }
    }

    [Fact]
    public void Compute_NoiseKnown_EndsSit3Point84AboveMinimum()
    {
        // Known noise: threshold S_min + χ²₀.₉₅(1) = S_min + 3.841 (the 95 % point of χ² with one degree of freedom,
        // standard statistical tables).
        var curve = Baseline.Simulate(43);
        var options = Baseline.Options(areaKnown: true) with { RelativeNoise = Baseline.RelativeNoise };
        var fit = JunctionFitter.Fit(curve, Model, options);
        var profile = ProfileLikelihoodIntervals.Compute(curve, Model, options, fit);
        Assert.Equal(ProfileLikelihoodIntervals.MethodKnownNoise, profile.Quality!.IntervalMethod);
        double sMin = fit.Quality!.ResidualSumOfSquares;
        foreach (var (key, _) in Baseline.FreeKeys(areaKnown: true))
        {
            var p = profile.Find(key)!;
            foreach (double end in new[] { p.Lower95!.Value, p.Upper95!.Value })
            {
                Assert.Equal(3.841, RefitRss(curve, options, key, end) - sMin, 0.02);
            }
        }
    }

    [Fact]
    public void Compute_OhmicSweep_ReportsBoundAndOpenEndedWarning()
    {
        // A ±50 mV sweep with 5 % noise is ohmic: only the zero-bias conductance is determined, so with the area free the
        // profile of the barrier height stays flat towards one bound at least.
        double[] truth = Baseline.TruthSi;
        var (v, i) = IvSimulator.Simulate(Model, truth, new SimulationSpec(-0.05, 0.05, 41) { RelativeNoise = 0.05, Seed = 5 });
        var curve = new IvCurve("ohmic.csv", v, i);
        var options = Baseline.Options(areaKnown: false);
        var fit = JunctionFitter.Fit(curve, Model, options);
        var profile = ProfileLikelihoodIntervals.Compute(curve, Model, options, fit);
        foreach (var w in profile.Warnings) output.WriteLine(w);
        foreach (var p in profile.Parameters) output.WriteLine($"{p.Key} {p.Value:g4} [{p.Lower95:g4}, {p.Upper95:g4}]");
        var phi = profile.Find("barrier_height_eV")!;
        var (lower, upper) = Bounds("barrier_height_eV");
        Assert.True(phi.Lower95 == lower || phi.Upper95 == upper, "an open end is reported as the bound");
        Assert.Contains(profile.Warnings, w => w.Contains("barrier height is open-ended", StringComparison.Ordinal));
    }

    [Fact]
    public void Compute_FailedFit_ReturnsFitWithWarning()
    {
        var curve = Baseline.Simulate(44);
        var failed = FitResult.Failed(curve.SourcePath, "simmons", "no usable points");
        var result = ProfileLikelihoodIntervals.Compute(curve, Model, FitOptions.Default, failed);
        Assert.Equal(FitStatus.Failed, result.Status);
        Assert.Contains(result.Warnings, w => w.StartsWith("profile-likelihood intervals not computed", StringComparison.Ordinal));
    }
}
