using JunctionFit.Physics;
using MathNet.Numerics.RootFinding;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// Checks the parasitic elements of <see cref="JunctionCurrentModel"/> (series resistance R_s, leakage G, offsets V₀ and I₀) on a
/// test barrier with J = a·V + b·V³, for which the junction current follows from circuit theory: with b = 0 the barrier is a
/// conductance A·a in parallel with G and in series with R_s (Ohm's and Kirchhoff's laws, textbook), so
/// I = (V − V₀)·G_t / (1 + G_t·R_s) + I₀ with G_t = A·a + G; with b ≠ 0 the implicit equation is solved by MathNet's Brent root
/// finder as the reference. Also the warning for a dominant R_s, <see cref="JunctionCurrentModel.WithBounds"/> and the index look-ups.
/// </summary>
public class JunctionParasiticsTests
{
    private static readonly ParasiticOptions All = new() { SeriesResistance = true, LeakageConductance = true, VoltageOffset = true, CurrentOffset = true };
    private static readonly ParasiticOptions NoSeries = new() { LeakageConductance = true, VoltageOffset = true, CurrentOffset = true };

    /// <summary>J = a·V + b·V³ (A m⁻²), parameters [a, b]; no analytic ∂J/∂V, so the junction model's central difference is used.</summary>
    private sealed class PolynomialBarrier : IBarrierModel
    {
        public static readonly PolynomialBarrier Instance = new();

        public string Name => "polynomial-test";

        public string Description => "J = a V + b V^3 (test barrier)";

        public IReadOnlyList<ParameterDefinition> Parameters { get; } =
        [
            new(new ParameterKey("poly_a", "A/m2/V", "A/m2/V", 1.0, 0.0, double.PositiveInfinity), "a", "linear coefficient", 1.0, ParameterTransform.Log, false),
            new(new ParameterKey("poly_b", "A/m2/V3", "A/m2/V3", 1.0, 0.0, double.PositiveInfinity), "b", "cubic coefficient", 1.0, ParameterTransform.Log, false),
        ];

        public string ValidityRange => "any bias";

        public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
            => parameters[0] * voltageV + parameters[1] * voltageV * voltageV * voltageV;

        public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
        {
            gradient[0] = voltageV;
            gradient[1] = voltageV * voltageV * voltageV;
            return CurrentDensity(voltageV, parameters);
        }

        public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters) => [];
    }

    private static JunctionCurrentModel Model(ParasiticOptions options) => new(PolynomialBarrier.Instance, options);

    /// <summary>Ohmic barrier: I = (V − V₀)·G_t/(1 + G_t·R_s) + I₀, G_t = A·a + G (series/parallel resistors, textbook).</summary>
    private static double CircuitCurrent(double a, double area, double rs, double g, double v, double v0, double i0)
    {
        double gt = area * a + g;
        return (v - v0) * gt / (1.0 + gt * rs) + i0;
    }

    [Theory]
    // a (A m⁻² V⁻¹), area (m²), R_s (Ω), G (S), V, V₀, I₀ (A)
    [InlineData(1e7, 1e-10, 1000.0, 6.2e-4, 0.8, 0.01, 1e-9)]    // A·a·R_s = 1, G·R_s = 0.62: a Newton slope with −G converges slowly
    [InlineData(1e10, 1e-10, 1e-3, 0.0, 1.0, 0.0, 0.0)]          // R_s·G_t = 1e-3: a Newton slope divided by R_s converges slowly
    [InlineData(1e-3, 1e-10, 1e9, 0.0, 0.5, 0.0, 0.0)]           // A/a·R_s = 100 ≫ A·a·R_s = 1e-4: a slope A/J′ converges slowly
    [InlineData(2e6, 1e-9, 250.0, 1e-5, -1.3, 0.02, -3e-10)]     // negative bias
    [InlineData(5e5, 1e-8, 1e6, 1e-6, 2.0, -0.05, 0.0)]          // resistor-limited: G_t·R_s = 6
    public void Current_OhmicBarrierWithSeriesResistance_MatchesCircuitFormula(double a, double area, double rs, double g, double v, double v0, double i0)
    {
        var model = Model(All);
        double[] p = [a, 0.0, area, rs, g, v0, i0];
        double expected = CircuitCurrent(a, area, rs, g, v, v0, i0);
        double i = model.Current(v, p);
        Assert.True(GradientAssert.Relative(expected, i) < 1e-12, $"{i:R} vs circuit formula {expected:R}");
        var grad = new double[p.Length];
        Assert.True(GradientAssert.Relative(expected, model.Current(v, p, grad)) < 1e-12);
    }

    [Theory]
    [InlineData(0.9, 300.0)]
    [InlineData(-0.4, 5e4)]
    [InlineData(2.5, 20.0)]
    public void Current_CubicBarrierWithSeriesResistance_MatchesBrentRoot(double v, double rs)
    {
        // Reference: the root of I − A·J(V_j) − G·V_j = 0, V_j = V − V₀ − I·R_s, by MathNet's Brent method on [0, (V − V₀)/R_s].
        double a = 1e6, b = 4e6, area = 1e-9, g = 3e-6, v0 = 0.01;
        var model = Model(new ParasiticOptions { SeriesResistance = true, LeakageConductance = true, VoltageOffset = true });
        double[] p = [a, b, area, rs, g, v0];
        double vv = v - v0;
        double H(double i)
        {
            double vj = vv - i * rs;
            return i - area * (a * vj + b * vj * vj * vj) - g * vj;
        }
        double scale = Math.Abs(vv / rs);
        double reference = Brent.FindRoot(H, Math.Min(0, vv / rs), Math.Max(0, vv / rs), 1e-15 * scale, 200);
        double current = model.Current(v, p);
        Assert.True(GradientAssert.Relative(reference, current) < 1e-12, $"{current:R} vs Brent {reference:R}");
    }

    [Theory]
    [InlineData(0.7)]
    [InlineData(-1.1)]
    public void CurrentGradient_OhmicBarrierWithAllParasitics_MatchesCircuitDerivatives(double v)
    {
        // Derivatives of I = u·G_t/(1 + G_t·R_s) + I₀, u = V − V₀, G_t = A·a + G, worked by hand:
        // ∂I/∂a = A·u/D², ∂I/∂b = A·V_j³/D at b = 0, ∂I/∂A = a·u/D², ∂I/∂R_s = −u·G_t²/D², ∂I/∂G = u/D², ∂I/∂V₀ = −G_t/D, ∂I/∂I₀ = 1, D = 1 + G_t·R_s.
        double a = 3e6, area = 2e-10, rs = 800.0, g = 4e-4, v0 = 0.03, i0 = 2e-9;
        var model = Model(All);
        double[] p = [a, 0.0, area, rs, g, v0, i0];
        var grad = new double[p.Length];
        double i = model.Current(v, p, grad);
        double u = v - v0, gt = area * a + g, d = 1 + gt * rs;
        Assert.True(GradientAssert.Relative(CircuitCurrent(a, area, rs, g, v, v0, i0), i) < 1e-12);
        Assert.True(GradientAssert.Relative(area * u / (d * d), grad[0]) < 1e-9, $"dI/da {grad[0]:R}");
        double vj = u / d; // junction bias V_j = u − I·R_s = u/D
        Assert.True(GradientAssert.Relative(area * vj * vj * vj / d, grad[1]) < 1e-9, $"dI/db {grad[1]:R}"); // ∂I/∂b = A·V_j³/D
        Assert.True(GradientAssert.Relative(a * u / (d * d), grad[2]) < 1e-9, $"dI/dA {grad[2]:R}");
        Assert.True(GradientAssert.Relative(-u * gt * gt / (d * d), grad[3]) < 1e-9, $"dI/dRs {grad[3]:R}");
        Assert.True(GradientAssert.Relative(u / (d * d), grad[4]) < 1e-9, $"dI/dG {grad[4]:R}");
        Assert.True(GradientAssert.Relative(-gt / d, grad[5]) < 1e-9, $"dI/dV0 {grad[5]:R}");
        Assert.Equal(1.0, grad[6]);
    }

    [Theory]
    [InlineData(0.002)]
    [InlineData(-0.03)]
    [InlineData(0.6)]
    public void Current_LeakAndOffsetsWithoutSeriesResistance_AddToBarrierCurrent(double v)
    {
        // Without R_s: I = A·J(u) + G·u + I₀ with u = V − V₀ (Kirchhoff's current law); ∂I/∂V₀ = −(A·J′(u) + G),
        // J′ = a + 3b·u² written out here; ∂I/∂G = u, ∂I/∂A = J(u), ∂I/∂I₀ = 1.
        double a = 1e6, b = 1e10, area = 1e-10, g = 1e-5, v0 = 0.001, i0 = 5e-12;
        var model = Model(NoSeries);
        Assert.Null(model.SeriesResistanceIndex);
        double[] p = [a, b, area, g, v0, i0];
        double u = v - v0;
        double j = a * u + b * u * u * u;
        double expected = area * j + g * u + i0;
        Assert.True(GradientAssert.Relative(expected, model.Current(v, p)) < 1e-13, $"{model.Current(v, p):R} vs {expected:R}");
        var grad = new double[p.Length];
        Assert.True(GradientAssert.Relative(expected, model.Current(v, p, grad)) < 1e-13);
        Assert.True(GradientAssert.Relative(area * u, grad[0]) < 1e-13);
        Assert.True(GradientAssert.Relative(j, grad[2]) < 1e-13);
        Assert.True(GradientAssert.Relative(u, grad[3]) < 1e-13);
        Assert.True(GradientAssert.Relative(-(area * (a + 3 * b * u * u) + g), grad[4]) < 1e-7, $"dI/dV0 {grad[4]:R}");
        Assert.Equal(1.0, grad[5]);
    }

    [Fact]
    public void Current_ZeroJunctionBiasWithSeriesResistance_IsCurrentOffsetWithFiniteSlope()
    {
        // V = V₀ leaves no bias on the junction: I = I₀ exactly (the circuit formula with u = 0); ∂I/∂V₀ = −G_t/(1 + G_t·R_s)
        // with G_t = A·J′(0) + G = A·a + G, also at G = 0.
        double a = 2e6, b = 1e8, area = 1e-10, rs = 1e3, v0 = 0.02, i0 = 7e-11;
        var model = Model(All);
        foreach (double g in new[] { 0.0, 1e-4 })
        {
            double[] p = [a, b, area, rs, g, v0, i0];
            Assert.Equal(i0, model.Current(v0, p));
            var grad = new double[p.Length];
            Assert.Equal(i0, model.Current(v0, p, grad));
            double gt = area * a + g;
            Assert.True(GradientAssert.Relative(-gt / (1 + gt * rs), grad[5]) < 1e-9, $"dI/dV0 {grad[5]:R}");
        }
    }

    [Theory]
    [InlineData(2.0, 0.25, true)]
    [InlineData(2.0, 0.15, false)]
    [InlineData(0.5, 0.15, false)]
    [InlineData(0.5, 0.3, true)]
    public void CheckValidity_SeriesResistanceShare_WarnsAboveTwentyPercent(double vMax, double share, bool warns)
    {
        // Voltage divider (textbook): R_s takes the share G_t·R_s/(1 + G_t·R_s) of the bias; warned above 20 % (the project's
        // documented threshold, common practice, no source). G_t·R_s = share/(1 − share).
        double a = 1e6, area = 1e-10, gt = area * a;
        double rs = share / (1 - share) / gt;
        var model = Model(new ParasiticOptions { SeriesResistance = true });
        var warnings = model.CheckValidity(vMax, [a, 0.0, area, rs]);
        Assert.Equal(warns, warnings.Any(w => w.Contains("series resistance", StringComparison.Ordinal)));
        Assert.Equal(warns ? 1 : 0, warnings.Count);
    }

    [Fact]
    public void IndexOf_UnknownKey_IsMinusOne()
    {
        var model = Model(All);
        Assert.Equal(-1, model.IndexOf("no_such_parameter"));
        Assert.Equal(-1, model.IndexOf(ParameterKey.BarrierHeight));
        Assert.Equal(3, model.IndexOf(ParameterKey.SeriesResistance));
        Assert.Equal(5, model.VoltageOffsetIndex);
        Assert.Equal(6, model.CurrentOffsetIndex);
        Assert.Null(Model(new ParasiticOptions { SeriesResistance = true }).VoltageOffsetIndex);
        Assert.Null(Model(new ParasiticOptions { SeriesResistance = true }).CurrentOffsetIndex);
    }

    [Fact]
    public void Constructor_NullArguments_Throw()
    {
        Assert.Throws<ArgumentNullException>(() => new JunctionCurrentModel(null!, ParasiticOptions.None));
        Assert.Throws<ArgumentNullException>(() => new JunctionCurrentModel(PolynomialBarrier.Instance, null!));
        Assert.Throws<ArgumentNullException>(() => Model(All).WithBounds(null!));
        Assert.Throws<ArgumentNullException>(() => Model(All).IndexOf((ParameterKey)null!));
    }

    [Fact]
    public void WithBounds_NarrowsOnlyTheNamedParameterAndKeepsTheCurrent()
    {
        var model = Model(All);
        var bounded = model.WithBounds(new Dictionary<ParameterKey, ParameterBounds>
        {
            [ParameterKey.SeriesResistance] = new(10.0, 1e4),
            [ParameterKey.BarrierHeight] = new(0.1, 1.0), // not a parameter of this model: ignored
        });
        Assert.NotSame(model, bounded);
        Assert.Equal(10.0, bounded.Parameters[3].LowerSi);
        Assert.Equal(1e4, bounded.Parameters[3].UpperSi);
        for (int k = 0; k < model.Parameters.Count; k++)
        {
            if (k != 3) Assert.Equal(model.Parameters[k], bounded.Parameters[k]);
        }
        Assert.Equal(model.SeriesResistanceIndex, bounded.SeriesResistanceIndex);
        Assert.Equal(model.CurrentOffsetIndex, bounded.CurrentOffsetIndex);
        double[] p = [1e7, 0.0, 1e-10, 1000.0, 6e-4, 0.01, 1e-9];
        Assert.Equal(CircuitCurrent(1e7, 1e-10, 1000.0, 6e-4, 0.8, 0.01, 1e-9), bounded.Current(0.8, p), 1e-12 * 1e-3);
        Assert.Equal(model.Current(0.8, p), bounded.Current(0.8, p));
    }

    [Fact]
    public void WithBounds_NothingNarrowed_ReturnsTheSameModel()
    {
        var model = Model(All);
        Assert.Same(model, model.WithBounds(new Dictionary<ParameterKey, ParameterBounds>()));
        Assert.Same(model, model.WithBounds(new Dictionary<ParameterKey, ParameterBounds> { [ParameterKey.BarrierHeight] = new(0.1, 1.0) }));
        // R_s's physical range (0, ∞) again: the definition does not change.
        Assert.Same(model, model.WithBounds(new Dictionary<ParameterKey, ParameterBounds> { [ParameterKey.SeriesResistance] = new(0.0, double.PositiveInfinity) }));
    }
}
