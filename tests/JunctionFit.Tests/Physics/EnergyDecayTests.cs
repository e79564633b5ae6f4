using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// The energy decay constant c of each analytic model, D(E_F − ε) ≈ D(E_F) e^{−cε}, against a central difference in ε of the
/// WKB exponent written out here from the published barrier shape, and the thermal factor πckT / sin(πckT) it sets
/// (J. G. Simmons, J. Appl. Phys. 35, 2655, 1964; R. Stratton, J. Phys. Chem. Solids 23, 1177, 1962).
/// </summary>
public class EnergyDecayTests
{
    // CODATA 2018 (NIST SP 961): e, h and k exact, mₑ measured; typed in here, independent of PhysicalConstants.
    private const double Q = Codata2018.ElementaryChargeC, H = Codata2018.PlanckJs, Me = Codata2018.ElectronMassKg, Kb = Codata2018.BoltzmannJPerK;
    private const double Hbar = H / (2 * Math.PI);

    /// <summary>Rectangular barrier of width Δs and mean height φ̄ below the Fermi level by ε: exponent 2Δs√(2m*(φ̄ + ε))/ħ (WKB).</summary>
    private static double RectangularExponent(double epsJ, double widthM, double meanBarrierJ, double r)
        => 2 * widthM * Math.Sqrt(2 * r * Me * (meanBarrierJ + epsJ)) / Hbar;

    /// <summary>Simmons 1963 rectangular barrier, β = 1: Δs = d, φ̄ = φ − e|V|/2 for e|V| &lt; φ; Δs = dφ/(e|V|), φ̄ = φ/2 above.</summary>
    private static double SimmonsExponent(double epsJ, double v, double phiJ, double dM, double r)
    {
        double u = Q * Math.Abs(v);
        return u < phiJ
            ? RectangularExponent(epsJ, dM, phiJ - u / 2, r)
            : RectangularExponent(epsJ, dM * phiJ / u, phiJ / 2, r);
    }

    /// <summary>Fowler–Nordheim exponent 8π√(2m*)(φ + ε)^{3/2} / (3heF), F = |V|/d (M. Lenzlinger, E. H. Snow, J. Appl. Phys. 40, 278, 1969).</summary>
    private static double FowlerNordheimExponent(double epsJ, double v, double phiJ, double dM, double r)
    {
        double f = Math.Abs(v) / dM;
        double top = phiJ + epsJ;
        return 8 * Math.PI * Math.Sqrt(2 * r * Me) * top * Math.Sqrt(top) / (3 * H * Q * f);
    }

    /// <summary>Central difference of an exponent X(ε) at ε = 0 (common practice, no source).</summary>
    private static double DerivativeAtZero(Func<double, double> exponent, double scaleJ)
    {
        double h = 1e-4 * scaleJ;
        return (exponent(h) - exponent(-h)) / (2 * h);
    }

    private static double Decay(IBarrierModel model, double v, double[] p, double[]? gradient = null)
        => ((IThermalDecay)model).EnergyDecay(v, p, gradient ?? new double[p.Length]);

    /// <summary>∂c/∂θₖ against central differences of c itself (common practice, no source).</summary>
    private static void AssertDecayGradient(IBarrierModel model, double v, double[] p)
    {
        var grad = new double[p.Length];
        double c = Decay(model, v, p, grad);
        for (int k = 0; k < p.Length; k++)
        {
            double h = p[k] != 0 ? 1e-6 * Math.Abs(p[k]) : 1e-6 * p[0];
            var plus = (double[])p.Clone();
            var minus = (double[])p.Clone();
            plus[k] += h;
            minus[k] -= h;
            double fd = (Decay(model, v, plus) - Decay(model, v, minus)) / (2 * h);
            double scale = Math.Max(Math.Abs(grad[k]), Math.Abs(c / (p[k] != 0 ? p[k] : p[0])));
            Assert.True(Math.Abs(grad[k] - fd) <= 1e-6 * scale, $"{model.Name} dc/dθ[{k}] at V = {v}: analytic {grad[k]:R}, central difference {fd:R}");
        }
    }

    [Theory]
    [InlineData(2.0, 1.5, 1.0, 0.3)]
    [InlineData(2.0, 1.5, 1.0, -1.2)]
    [InlineData(1.0, 2.5, 0.4, 0.05)]
    [InlineData(1.0, 2.5, 0.4, 1.6)]
    [InlineData(3.2, 4.0, 0.42, -5.0)]
    public void EnergyDecay_Simmons_MatchesEnergyDerivativeOfExponent(double phiEv, double dNm, double r, double v)
    {
        // c = ∂/∂ε [2Δs√(2m*(φ̄+ε))/ħ] at ε = 0 with Simmons's Δs and φ̄ of the bias range (Simmons 1963, 1964).
        double[] p = [phiEv * Q, dNm * 1e-9, r];
        double expected = DerivativeAtZero(e => SimmonsExponent(e, v, p[0], p[1], r), p[0]);
        double c = Decay(SimmonsRectangularModel.Instance, v, p);
        Assert.True(GradientAssert.Relative(expected, c) < 1e-6, $"{c} vs {expected}");
        AssertDecayGradient(SimmonsRectangularModel.Instance, v, p);
    }

    [Fact]
    public void RectangularDecay_MatchesEnergyDerivativeOfExponent()
    {
        // ThermalFactor.RectangularDecay is the same c for a rectangular barrier of mean height φ̄ (Simmons 1964).
        double expected = DerivativeAtZero(e => RectangularExponent(e, 1.8e-9, 1.7 * Q, 0.6), 1.7 * Q);
        Assert.True(GradientAssert.Relative(expected, ThermalFactor.RectangularDecay(1.7 * Q, 1.8e-9, 0.6)) < 1e-6);
    }

    [Theory]
    [InlineData(3.2, 6.0, 0.42, 4.5)]
    [InlineData(3.2, 6.0, 0.42, -7.0)]
    [InlineData(1.0, 2.0, 1.0, 1.5)]
    public void EnergyDecay_FowlerNordheim_MatchesEnergyDerivativeOfExponent(double phiEv, double dNm, double r, double v)
    {
        // c = ∂/∂ε of the Fowler–Nordheim exponent B(φ+ε)/F (Lenzlinger & Snow 1969; E. L. Murphy, R. H. Good, Phys. Rev. 102, 1464, 1956).
        double[] p = [phiEv * Q, dNm * 1e-9, r];
        double expected = DerivativeAtZero(e => FowlerNordheimExponent(e, v, p[0], p[1], r), p[0]);
        double c = Decay(FowlerNordheimModel.Instance, v, p);
        Assert.True(GradientAssert.Relative(expected, c) < 1e-6, $"{c} vs {expected}");
        AssertDecayGradient(FowlerNordheimModel.Instance, v, p);
    }

    [Theory]
    [InlineData(2.0, 1.5, 0.5, 1.0, 0.3)]
    [InlineData(1.0, 2.0, -0.3, 0.4, -0.6)]
    public void EnergyDecay_Bdr_MatchesEnergyDerivativeOfMeanBarrierExponent(double phiEv, double dNm, double dphiEv, double r, double v)
    {
        // The trapezoid's mean height at bias V is φ̄ − e|V|/2 (Brinkman, Dynes & Rowell, J. Appl. Phys. 41, 1915, 1970);
        // c is the energy derivative of the WKB exponent of a rectangular barrier of that height (Simmons 1964).
        double[] p = [phiEv * Q, dNm * 1e-9, dphiEv * Q, r];
        double mean = p[0] - 0.5 * Q * Math.Abs(v);
        double expected = DerivativeAtZero(e => RectangularExponent(e, p[1], mean, r), mean);
        double c = Decay(BrinkmanDynesRowellModel.Instance, v, p);
        Assert.True(GradientAssert.Relative(expected, c) < 1e-6, $"{c} vs {expected}");
        AssertDecayGradient(BrinkmanDynesRowellModel.Instance, v, p);
    }

    [Theory]
    [InlineData(2.0, 2.0, 1.0, 4.0, 0.5)]
    [InlineData(1.5, 3.0, 0.5, 2.5, -0.8)]
    public void EnergyDecay_ImageForce_MatchesEnergyDerivativeOfMeanBarrierExponent(double phiEv, double dNm, double r, double eps, double v)
    {
        // Simmons 1963 image-force barrier: width Δs = s₂ − s₁ and mean height φ̄ (checked against an independent
        // implementation in SimmonsImageForceModelTests); c = ∂/∂ε [2Δs√(2m*(φ̄+ε))/ħ] (Simmons 1964).
        var model = new SimmonsImageForceModel();
        double[] p = [phiEv * Q, dNm * 1e-9, r, eps];
        var g = model.Geometry(v, p);
        Assert.True(g.Valid);
        double expected = DerivativeAtZero(e => RectangularExponent(e, g.WidthM, g.MeanBarrierJ, r), g.MeanBarrierJ);
        double c = Decay(model, v, p);
        Assert.True(GradientAssert.Relative(expected, c) < 1e-6, $"{c} vs {expected}");
        AssertDecayGradient(model, v, p);
    }

    public static TheoryData<string, double> ThermalCases()
    {
        var data = new TheoryData<string, double>();
        foreach (var (name, v) in new[] { ("simmons", 0.2), ("simmons", -0.7), ("simmons", 2.4), ("bdr", 0.3), ("fowler-nordheim", 8.0), ("simmons-image", 0.4) })
        {
            data.Add(name, v);
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(ThermalCases))]
    public void ThermallyCorrected_At300K_RatioIsPiCkTOverSinPiCkT(string name, double v)
    {
        // J(T)/J(0) = πckT / sin(πckT) (Stratton 1962; Simmons 1964), with c from the exponents above and k typed in.
        var cold = BarrierModelCatalog.Create(name);
        var warm = BarrierModelCatalog.Create(name, new BarrierModelOptions { TemperatureK = 300 });
        double[] p = name switch
        {
            "bdr" => [1.5 * Q, 1.6e-9, 0.3 * Q, 0.9],
            "fowler-nordheim" => [3.2 * Q, 6e-9, 0.42],
            "simmons-image" => [2.0 * Q, 2.0e-9, 1.0, 3.9],
            _ => [1.5 * Q, 1.6e-9, 0.9],
        };
        double c = name switch
        {
            "bdr" => DerivativeAtZero(e => RectangularExponent(e, p[1], p[0] - 0.5 * Q * Math.Abs(v), p[3]), p[0]),
            "fowler-nordheim" => DerivativeAtZero(e => FowlerNordheimExponent(e, v, p[0], p[1], p[2]), p[0]),
            "simmons-image" => ImageDecay(v, p),
            _ => DerivativeAtZero(e => SimmonsExponent(e, v, p[0], p[1], p[2]), p[0]),
        };
        double x = Math.PI * c * Kb * 300;
        Assert.InRange(x, 0.05, 1.0);
        double ratio = warm.CurrentDensity(v, p) / cold.CurrentDensity(v, p);
        Assert.True(GradientAssert.Relative(x / Math.Sin(x), ratio) < 1e-6, $"{ratio} vs {x / Math.Sin(x)}");
        Assert.True(GradientAssert.Relative(x, ((ThermallyCorrectedModel)warm).ThermalArgument(v, p)) < 1e-6);
    }

    private static double ImageDecay(double v, double[] p)
    {
        var g = new SimmonsImageForceModel(p[3]).Geometry(v, p);
        return DerivativeAtZero(e => RectangularExponent(e, g.WidthM, g.MeanBarrierJ, p[2]), g.MeanBarrierJ);
    }

    [Theory]
    [InlineData(1e-5)]
    [InlineData(5e-5)]
    [InlineData(5e-4)]
    [InlineData(0.4)]
    [InlineData(-0.9)]
    [InlineData(2.5)]
    public void ThermalFactor_BelowMaximum_IsXOverSinXWithItsDerivative(double x)
    {
        // x / sin x and d/dx (x / sin x) = (sin x − x cos x) / sin² x, evaluated with System.Math (reference library);
        // below 1e-3 the derivative from the series x csc x = 1 + x²/6 + 7x⁴/360 + … (Abramowitz & Stegun 4.3.68; from memory),
        // where the closed form loses digits. The factor is even in x (Stratton 1962).
        double ax = Math.Abs(x);
        double value = ThermalFactor.Evaluate(x, out double derivative);
        Assert.True(GradientAssert.Relative(ax / Math.Sin(ax), value) < 1e-12, $"{value}");
        double expected = ax < 1e-3
            ? ax / 3 + 7 * ax * ax * ax / 90
            : (Math.Sin(ax) - ax * Math.Cos(ax)) / (Math.Sin(ax) * Math.Sin(ax));
        Assert.True(GradientAssert.Relative(expected, derivative) < 1e-8, $"{derivative} vs {expected}");
    }

    [Fact]
    public void ThermalFactor_AboveMaximum_HeldContinuously()
    {
        // Past its range the factor is held, not left to run into the pole of x / sin x at π: it must join the
        // formula continuously at the clamp (common practice, no source).
        double x = ThermalFactor.MaxArgument;
        Assert.True(GradientAssert.Relative(ThermalFactor.Evaluate(x * (1 - 1e-12)), ThermalFactor.Evaluate(x * (1 + 1e-12))) < 1e-9);
        Assert.Equal(ThermalFactor.Evaluate(x + 0.1), ThermalFactor.Evaluate(x + 0.2));
    }

    [Fact]
    public void CheckValidity_ArgumentBelowOneAtZeroBiasAboveOneAtLargestBias_Warns()
    {
        // πckT must stay below 1 over the whole sweep (Simmons 1964). For φ = 1 eV, d = 2.2 nm, mₑ at 300 K the argument from
        // the exponent above is below 1 at 0 V and above 1 at 0.9 V (φ̄ = φ − eV/2 falls): the warning must come from the largest.
        double[] p = [1.0 * Q, 2.2e-9, 1.0];
        double x0 = Math.PI * Kb * 300 * DerivativeAtZero(e => SimmonsExponent(e, 0.0, p[0], p[1], 1.0), p[0]);
        double x1 = Math.PI * Kb * 300 * DerivativeAtZero(e => SimmonsExponent(e, 0.9, p[0], p[1], 1.0), p[0]);
        Assert.True(x0 < 1 && x1 > 1, $"{x0} {x1}");
        var warm = BarrierModelCatalog.Create("simmons", new BarrierModelOptions { TemperatureK = 300 });
        Assert.Contains(warm.CheckValidity(0.9, p), w => w.Contains("pi*c*kT", StringComparison.Ordinal));
        Assert.DoesNotContain(warm.CheckValidity(0.1, p), w => w.Contains("pi*c*kT", StringComparison.Ordinal));
    }

    [Fact]
    public void ThermalArgument_IsPiCkT()
    {
        // x = π c k T (Simmons 1964), k typed in above.
        Assert.True(GradientAssert.Relative(Math.PI * 2.0e19 * Kb * 250, ThermalFactor.Argument(2.0e19, 250)) < 1e-15);
    }
}
