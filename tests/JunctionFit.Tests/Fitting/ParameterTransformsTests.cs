using JunctionFit.Fitting;
using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The bound transforms against their closed forms: θ = lo + eˣ (log) and θ = lo + (hi − lo)/(1 + e⁻ˣ) (logistic, the
/// standard logistic function), their inverses, and their derivatives against central finite differences; the Wald
/// interval as x̂ ± t·se mapped back, with the delta-method standard error |dθ/dx|·se_x (common practice, no source beyond
/// the first-order Taylor expansion).
/// </summary>
public sealed class ParameterTransformsTests
{
    private const double Ev = Codata2018.ElementaryChargeC;

    // Log transform, 0 < φ ≤ 20 eV (a finite upper end the transform does not enforce).
    private static readonly ParameterDefinition Phi = StandardParameters.BarrierHeight;

    // Logistic transform, −10 eV < Δφ < 10 eV.
    private static readonly ParameterDefinition Asym = StandardParameters.Asymmetry;

    // Identity, unbounded.
    private static readonly ParameterDefinition Offset = StandardParameters.VoltageOffset;

    // Log transform with a non-zero lower end: A > 1 µm², from a narrowing (the upper end stays +∞).
    private static readonly ParameterDefinition AreaAbove1Um2 = StandardParameters.Area.WithBounds(new ParameterBounds(1e-12, double.PositiveInfinity));

    public static TheoryData<string, double> Points => new()
    {
        { "phi", 0.3 * Ev }, { "phi", 2.0 * Ev }, { "phi", 19.0 * Ev },
        { "asym", -9.5 * Ev }, { "asym", 0.0 }, { "asym", 0.4 * Ev }, { "asym", 7.0 * Ev },
        { "offset", -0.3 }, { "offset", 0.0 }, { "offset", 2.5 },
        { "area", 1.2e-12 }, { "area", 4e-12 },
    };

    private static ParameterDefinition Def(string name) => name switch
    {
        "phi" => Phi,
        "asym" => Asym,
        "offset" => Offset,
        _ => AreaAbove1Um2,
    };

    [Fact]
    public void TheDefinitionsUnderTestUseTheIntendedTransforms()
    {
        Assert.Equal(ParameterTransform.Log, Phi.Transform);
        Assert.Equal(ParameterTransform.Logistic, Asym.Transform);
        Assert.Equal(ParameterTransform.Identity, Offset.Transform);
        Assert.Equal(ParameterTransform.Log, AreaAbove1Um2.Transform);
        Assert.Equal(1e-12, AreaAbove1Um2.LowerSi);
    }

    [Theory]
    [MemberData(nameof(Points))]
    public void ToSolver_IsTheClosedFormInverse_AndFromSolverTakesItBack(string name, double theta)
    {
        ParameterDefinition def = Def(name);
        double x = ParameterTransforms.ToSolver(def, theta);
        double expected = def.Transform switch
        {
            ParameterTransform.Log => Math.Log(theta - def.LowerSi),
            ParameterTransform.Logistic => Math.Log((theta - def.LowerSi) / (def.UpperSi - theta)),   // logit of the fraction
            _ => theta,
        };

        Assert.Equal(expected, x, 1e-12);
        double back = ParameterTransforms.FromSolver(def, x);
        Assert.True(Math.Abs(back - theta) <= 1e-12 * Math.Max(Math.Abs(theta), def.Transform == ParameterTransform.Logistic ? def.UpperSi : 1e-300),
            $"{name}: θ {theta:R} → x {x:R} → {back:R}");
    }

    [Fact]
    public void Logistic_HasItsTextbookValues()
    {
        // θ(0) is the midpoint; θ(±ln 3) puts θ at 1/4 and 3/4 of the range (1/(1 + 3) and 1/(1 + 1/3)).
        Assert.Equal(0.0, ParameterTransforms.FromSolver(Asym, 0.0), 1e-30);
        Assert.Equal(-5.0 * Ev, ParameterTransforms.FromSolver(Asym, -Math.Log(3)), 1e-30);
        Assert.Equal(5.0 * Ev, ParameterTransforms.FromSolver(Asym, Math.Log(3)), 1e-30);
        Assert.Equal(Math.Log(3), ParameterTransforms.ToSolver(Asym, 5.0 * Ev), 1e-14);
        // Far out it stays inside the bounds.
        Assert.InRange(ParameterTransforms.FromSolver(Asym, 50), -10 * Ev, 10 * Ev);
        Assert.InRange(ParameterTransforms.FromSolver(Asym, -50), -10 * Ev, 10 * Ev);
    }

    [Theory]
    [MemberData(nameof(Points))]
    public void Derivative_MatchesCentralDifferencesOfFromSolver(string name, double theta)
    {
        ParameterDefinition def = Def(name);
        double x = ParameterTransforms.ToSolver(def, theta);
        const double h = 1e-5;
        double fd = (ParameterTransforms.FromSolver(def, x + h) - ParameterTransforms.FromSolver(def, x - h)) / (2 * h);
        double analytic = ParameterTransforms.Derivative(def, theta);

        // Central differences carry an O(h²) error: relative 1e-9 here.
        double scale = Math.Max(Math.Abs(fd), 1e-300);
        Assert.True(Math.Abs(analytic - fd) <= 1e-8 * scale, $"{name} at {theta:R}: analytic {analytic:R}, central difference {fd:R}");
    }

    [Fact]
    public void WaldInterval_IsTheSolverIntervalMappedBack_WithTheDeltaMethodError()
    {
        // Log: θ = 2 eV, se_x = 0.05, t = 2: [2·e^−0.1, 2·e^0.1] eV, se = 2·0.05 = 0.1 eV.
        (double se, double lo, double hi) = ParameterTransforms.WaldInterval(Phi, 2.0 * Ev, 0.05, 2.0);
        Assert.Equal(0.1, se, 1e-12);
        Assert.Equal(2.0 * Math.Exp(-0.1), lo, 1e-12);
        Assert.Equal(2.0 * Math.Exp(0.1), hi, 1e-12);

        // Logistic: θ = 0 (x = 0), se_x = ln 3 / 2, t = 2 → x ∈ [−ln 3, ln 3] → [−5, 5] eV; dθ/dx at the midpoint is
        // (hi − lo)/4 = 5 eV, so se = 5 eV·ln 3/2.
        (se, lo, hi) = ParameterTransforms.WaldInterval(Asym, 0.0, Math.Log(3) / 2, 2.0);
        Assert.Equal(5.0 * Math.Log(3) / 2, se, 1e-12);
        Assert.Equal(-5.0, lo, 1e-12);
        Assert.Equal(5.0, hi, 1e-12);

        // Identity: θ ± t·se.
        (se, lo, hi) = ParameterTransforms.WaldInterval(Offset, 0.01, 0.002, 1.96);
        Assert.Equal(0.002, se, 1e-15);
        Assert.Equal(0.01 - (1.96 * 0.002), lo, 1e-15);
        Assert.Equal(0.01 + (1.96 * 0.002), hi, 1e-15);

        // Shifted log (A > 1 µm², display unit m²): A = 3 µm², x = ln(2 µm²), se_x = 0.5, t = 1 → 1 + 2·e^∓0.5 µm²,
        // se = 2·0.5 = 1 µm².
        (se, lo, hi) = ParameterTransforms.WaldInterval(AreaAbove1Um2, 3e-12, 0.5, 1.0);
        Assert.Equal(1e-12, se, 1e-24);
        Assert.Equal(1e-12 * (1.0 + (2.0 * Math.Exp(-0.5))), lo, 1e-24);
        Assert.Equal(1e-12 * (1.0 + (2.0 * Math.Exp(0.5))), hi, 1e-24);
    }

    [Fact]
    public void WaldInterval_ClipsAnEndBeyondTheUnenforcedUpperBound()
    {
        // φ = 18 eV with se_x = 0.1, t = 2: the upper end 18·e^0.2 = 22 eV lies beyond 20 eV and is clipped to it.
        (_, double lo, double hi) = ParameterTransforms.WaldInterval(Phi, 18.0 * Ev, 0.1, 2.0);
        Assert.Equal(18.0 * Math.Exp(-0.2), lo, 1e-12);
        Assert.Equal(20.0, hi, 1e-12);
    }

    [Fact]
    public void Inside_MovesAStartOffTheBoundsSoItsTransformIsFinite()
    {
        // Log: a start at or below the lower end moves to lo + |default − lo|; one inside stays.
        Assert.Equal(2.0 * Ev, ParameterTransforms.Inside(Phi, 0.0));
        Assert.Equal(2.0 * Ev, ParameterTransforms.Inside(Phi, -1.0 * Ev));
        Assert.Equal(1.3 * Ev, ParameterTransforms.Inside(Phi, 1.3 * Ev));
        double d = ParameterTransforms.Inside(AreaAbove1Um2, 0.5e-12);
        Assert.Equal(1e-12 + Math.Abs(AreaAbove1Um2.DefaultSi - 1e-12), d, 1e-27);
        Assert.True(d > 1e-12);
        Assert.True(double.IsFinite(ParameterTransforms.ToSolver(AreaAbove1Um2, d)));

        // Logistic: clamped 1e-9 of the span inside each end.
        double span = 20.0 * Ev;
        Assert.Equal(10.0 * Ev - (1e-9 * span), ParameterTransforms.Inside(Asym, 10.0 * Ev), 1e-36);
        Assert.Equal(-10.0 * Ev + (1e-9 * span), ParameterTransforms.Inside(Asym, -30.0 * Ev), 1e-36);
        Assert.Equal(3.0 * Ev, ParameterTransforms.Inside(Asym, 3.0 * Ev));
        Assert.True(double.IsFinite(ParameterTransforms.ToSolver(Asym, ParameterTransforms.Inside(Asym, 10.0 * Ev))));

        // Identity: untouched.
        Assert.Equal(-7.0, ParameterTransforms.Inside(Offset, -7.0));
    }

    [Fact]
    public void TryToSolver_MapsTheChosenParameters_AndReportsANonFiniteOne()
    {
        ParameterDefinition[] defs = [Phi, Asym, Offset];
        double[] theta = [2.0 * Ev, 5.0 * Ev, 0.25];

        Assert.True(ParameterTransforms.TryToSolver(defs, [0, 2], theta, out double[] x));
        Assert.Equal([Math.Log(2.0 * Ev), 0.25], x);

        Assert.True(ParameterTransforms.TryToSolver(defs, [1], theta, out x));
        Assert.Equal(Math.Log(3), x[0], 1e-14);

        // Δφ at its upper end: logit(1) = +∞.
        theta[1] = 10.0 * Ev;
        Assert.False(ParameterTransforms.TryToSolver(defs, [0, 1, 2], theta, out x));
        Assert.Equal(3, x.Length);
    }
}
