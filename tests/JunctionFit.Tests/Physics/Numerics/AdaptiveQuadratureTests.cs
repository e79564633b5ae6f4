using JunctionFit.Physics.Numerics;
using Xunit;

namespace JunctionFit.Tests.Physics.Numerics;

/// <summary>
/// The Gauss–Kronrod integrator's error estimate and its stopping rules, against closed forms: the error of the 7-point
/// Gauss–Legendre rule on x¹⁴ is (n!)⁴ f⁽²ⁿ⁾ / ((2n + 1) ((2n)!)³) exactly (Abramowitz &amp; Stegun 25.4.30), which with the
/// exact ∫|f − mean| gives the QUADPACK estimate err = I_abs·min(1, (200 |K15 − G7| / I_abs)^{3/2}) (Piessens et al.,
/// QUADPACK, Springer 1983); the bisection must stop at machine resolution and at the interval budget.
/// </summary>
public class AdaptiveQuadratureTests
{
    private struct Power14 : IIntegrand
    {
        public readonly double Evaluate(double x) => Math.Pow(x, 14);
    }

    private struct Power14PlusOne : IIntegrand
    {
        public readonly double Evaluate(double x) => 1.0 + Math.Pow(x, 14);
    }

    private struct Cubic : IIntegrand
    {
        public readonly double Evaluate(double x) => 1.0 + x * (2.0 + x * (-3.0 + 4.0 * x));
    }

    /// <summary>A unit step at 1/3 that counts its evaluations (passed by reference, so the count is seen).</summary>
    private struct CountedStep : IIntegrand
    {
        public int Evaluations;

        public double Evaluate(double x)
        {
            Evaluations++;
            return x < 1.0 / 3.0 ? 0.0 : 1.0;
        }
    }

    /// <summary>f(x) = x, counting its evaluations.</summary>
    private struct CountedLinear : IIntegrand
    {
        public int Evaluations;

        public double Evaluate(double x)
        {
            Evaluations++;
            return x;
        }
    }

    private static double Factorial(int n) => n <= 1 ? 1.0 : n * Factorial(n - 1);

    [Fact]
    public void OneInterval_ErrorEstimate_IsQuadpackFormulaWithExactGaussError()
    {
        var f = new Power14();
        double value = AdaptiveQuadrature.Integrate(ref f, 0.0, 1.0, 0.0, 0.0, out double estimate, maxIntervals: 1);
        // K15 integrates polynomials up to degree 22 exactly: ∫₀¹ x¹⁴ = 1/15.
        Assert.Equal(1.0 / 15.0, value, 15);
        // G7 error on [0, 1]: (7!)⁴ · 14! / (15 · (14!)³), since f⁽¹⁴⁾ = 14! (A&S 25.4.30).
        double gaussError = Math.Pow(Factorial(7), 4) / (15.0 * Factorial(14) * Factorial(14));
        // I_abs = ∫₀¹ |x¹⁴ − 1/15| dx = (2 x₀ / 15)(14 / 15) with x₀ = 15^(−1/14), the crossing point.
        double x0 = Math.Pow(15.0, -1.0 / 14.0);
        double absIntegral = 2.0 * x0 / 15.0 * (14.0 / 15.0);
        double expected = absIntegral * Math.Min(1.0, Math.Pow(200.0 * gaussError / absIntegral, 1.5));
        // K15 sees the kink of |f − mean| at x₀, so its I_abs is good to about a per cent; the estimate scales as I_abs^(−1/2).
        Assert.InRange(estimate / expected, 0.98, 1.02);
        // Adding a constant changes neither the Gauss error nor ∫|f − mean|, so neither the estimate.
        var g = new Power14PlusOne();
        double shifted = AdaptiveQuadrature.Integrate(ref g, 0.0, 1.0, 0.0, 0.0, out double shiftedEstimate, maxIntervals: 1);
        Assert.Equal(16.0 / 15.0, shifted, 14);
        Assert.InRange(shiftedEstimate / estimate, 1 - 1e-6, 1 + 1e-6);
    }

    [Fact]
    public void OneInterval_Scaled_ErrorEstimateScalesWithTheInterval()
    {
        // On [0, 2] the Gauss error grows by 2^(2n+1) = 2¹⁵ and I_abs by 2¹⁵ too (x¹⁴ has the same shape): the estimate is
        // 2¹⁵ times the one on [0, 1], the value 2¹⁵ / 15.
        var f = new Power14();
        AdaptiveQuadrature.Integrate(ref f, 0.0, 1.0, 0.0, 0.0, out double unit, maxIntervals: 1);
        double value = AdaptiveQuadrature.Integrate(ref f, 0.0, 2.0, 0.0, 0.0, out double doubled, maxIntervals: 1);
        Assert.Equal(32768.0 / 15.0, value, 9);
        Assert.InRange(doubled / (32768.0 * unit), 1 - 1e-9, 1 + 1e-9);
        // Reversed limits: the negative integral, the same estimate.
        double reversed = AdaptiveQuadrature.Integrate(ref f, 2.0, 0.0, 0.0, 0.0, out double reversedEstimate, maxIntervals: 1);
        Assert.Equal(-32768.0 / 15.0, reversed, 9);
        Assert.InRange(reversedEstimate / doubled, 1 - 1e-12, 1 + 1e-12);
    }

    [Fact]
    public void Polynomial_BothRulesExact_EstimateAtRoundingLevel()
    {
        // A cubic is integrated exactly by both rules (G7 to degree 13): ∫₀¹ 1 + 2x − 3x² + 4x³ = 1 + 1 − 1 + 1 = 2.
        var f = new Cubic();
        double value = AdaptiveQuadrature.Integrate(ref f, 0.0, 1.0, 1e-14, 0.0, out double estimate);
        Assert.Equal(2.0, value, 14);
        Assert.InRange(estimate, 0.0, 1e-14);
    }

    [Fact]
    public void Step_ToleranceZero_SpendsTheWholeBudgetAndKeepsTheValue()
    {
        // Tolerance zero can never be met on a step: all 256 intervals are used (one rule, then 255 halvings of 2 rules).
        var f = new CountedStep();
        double value = AdaptiveQuadrature.Integrate(ref f, 0.0, 1.0, 0.0, 0.0, out _, maxIntervals: AdaptiveQuadrature.MaxIntervals);
        Assert.Equal(2.0 / 3.0, value, 12);
        Assert.Equal(15 * (1 + 2 * 255), f.Evaluations);
    }

    [Fact]
    public void IntervalAtMachineResolution_StopsTheHalving()
    {
        // [1, 1 + 4 ulp] can be halved only twice before a midpoint equals an end (IEEE 754 doubles): the integrator must
        // then stop, not spend its budget, even though tolerance zero is never met.
        var f = new CountedLinear();
        double b = 1.0 + 4.0 * Math.Pow(2.0, -52);
        double value = AdaptiveQuadrature.Integrate(ref f, 1.0, b, 0.0, 0.0, out _, maxIntervals: AdaptiveQuadrature.MaxIntervals);
        Assert.InRange(f.Evaluations, 15, 15 * (1 + 2 * 4));
        Assert.Equal(4.0 * Math.Pow(2.0, -52), value, 15);
    }

    [Fact]
    public void IntervalBudget_StopsTheBisection()
    {
        var f = new CountedStep();
        AdaptiveQuadrature.Integrate(ref f, 0.0, 1.0, 0.0, 0.0, out double estimate, maxIntervals: 8);
        Assert.Equal(15 * (1 + 2 * 7), f.Evaluations); // one rule on the whole interval, then seven halvings
        Assert.True(estimate > 0);
    }

    [Fact]
    public void AbsoluteTolerance_MetByTheFirstRule_NoHalving()
    {
        var f = new CountedStep();
        AdaptiveQuadrature.Integrate(ref f, 0.0, 1.0, 0.0, 1.0, out double estimate);
        Assert.Equal(15, f.Evaluations);
        Assert.True(estimate <= 1.0);
        var g = new CountedStep();
        AdaptiveQuadrature.Integrate(ref g, 0.0, 1.0, 10.0, 0.0, out _); // relative tolerance 10 × |I|: also met at once
        Assert.Equal(15, g.Evaluations);
    }

    [Fact]
    public void EmptyInterval_IsZeroWithZeroError()
    {
        var f = new CountedStep();
        Assert.Equal(0.0, AdaptiveQuadrature.Integrate(ref f, 0.5, 0.5, 1e-10, 0.0, out double estimate));
        Assert.Equal(0.0, estimate);
        Assert.Equal(0, f.Evaluations);
    }
}
