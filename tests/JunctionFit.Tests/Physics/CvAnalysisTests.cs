using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// <see cref="CvAnalysis"/> on high-frequency C–V curves built here from the depletion approximation (Sze &amp; Ng, Physics of
/// Semiconductor Devices, 3rd ed., ch. 4): accumulation at C_ox, 1/C² = 1/C_ox² + 2|V − V₀|/(q ε_s N A²) in depletion, and the
/// inversion floor at the maximum depletion width W_max = √(4 ε_s ψ_B/(q N)). Checks the doping, the type, the flat-band voltage
/// where the line meets 1/C_FB² (C_FB = [1/C_ox + L_D/ε_s]⁻¹), CET, the 2 % saturation rule, the depletion window and the guards.
/// Constants typed in: CODATA 2018 (NIST SP 961), ε_Si = 11.7 ε₀, ε_SiO₂ = 3.9 ε₀ (Sze &amp; Ng appendix), n_i = 1e10 cm⁻³
/// (from memory).
/// </summary>
public class CvAnalysisTests
{
    private const double Q = Codata2018.ElementaryChargeC, K = Codata2018.BoltzmannJPerK, Eps0 = Codata2018.VacuumPermittivityFPerM;
    private const double EpsS = 11.7 * Eps0, EpsOx = 3.9 * Eps0;
    private const double Area = 1e-8, Tox = 3e-9, Doping = 3e23;
    private static readonly double Cox = EpsOx / Tox * Area;

    /// <summary>A high-frequency curve: V₀ is where the depletion line starts; n-type mirrors it (accumulation at V &gt; V₀).</summary>
    private static (double[] V, double[] C) Curve(bool nType, double v0, double from = -2.0, double to = 2.0, double step = 0.05)
    {
        double psiB = K * 300 / Q * Math.Log(Doping / 1e16);
        double wMax = Math.Sqrt(4 * EpsS * psiB / (Q * Doping));
        double cMin = Area / (Tox / EpsOx + wMax / EpsS);
        var v = new List<double>();
        var c = new List<double>();
        for (double x = from; x <= to + 1e-9; x += step)
        {
            double depth = nType ? v0 - x : x - v0;
            double value = depth <= 0 ? Cox : 1.0 / Math.Sqrt(1.0 / (Cox * Cox) + 2 * depth / (Q * EpsS * Doping * Area * Area));
            v.Add(x);
            c.Add(Math.Max(value, cMin));
        }
        return (v.ToArray(), c.ToArray());
    }

    /// <summary>Where the depletion line 1/C² = 1/C_ox² + (2/(qε_sNA²))|V − V₀| meets 1/C_FB², C_FB = A/(t_ox/ε_ox + L_D/ε_s).</summary>
    private static double ExpectedFlatBand(bool nType, double v0)
    {
        double debye = Math.Sqrt(EpsS * K * 300 / (Q * Q * Doping));
        double cfb = Area / (Tox / EpsOx + debye / EpsS);
        double shift = (1.0 / (cfb * cfb) - 1.0 / (Cox * Cox)) * Q * EpsS * Doping * Area * Area / 2;
        return nType ? v0 - shift : v0 + shift;
    }

    [Theory]
    [InlineData(false, -0.8)]
    [InlineData(true, 0.5)]
    public void Analyse_HighFrequencyCurve_GivesDopingTypeFlatBandAndCet(bool nType, double v0)
    {
        // The points in depletion lie exactly on the line, so N comes back to rounding (1e-9 relative) and V_fb to 1e-9 V;
        // the inversion floor (C = C_min) must stay out of the fit. CET = ε_ox A/C_max = t_ox here (1e-9 relative).
        var (v, c) = Curve(nType, v0);
        var s = CvAnalysis.Analyse(v, c, Area);
        Assert.NotNull(s.DopingM3);
        Assert.Equal(Doping, s.DopingM3!.Value, Doping * 1e-9);
        Assert.Equal(nType, s.LooksNType);
        Assert.Equal(ExpectedFlatBand(nType, v0), s.FlatBandVoltageV!.Value, 1e-9);
        Assert.Equal(Tox * 1e9, s.CapacitanceEquivalentThicknessNm, 1e-9 * Tox * 1e9);
        Assert.True(s.Saturated);
        // Worked number: L_D = √(ε_s kT/(q²N)) = 7.5 nm at 3e17 cm⁻³, so V_fb sits about 44 mV into depletion from V₀
        // (hand calculation: (1/C_FB² − 1/C_ox²)·qε_sN/2 per area = (158.9² − 86.9²)·4.979e-6/2 ≈ 0.044 V).
        Assert.Equal(0.044, Math.Abs(s.FlatBandVoltageV.Value - v0), 2e-3);
    }

    [Fact]
    public void Analyse_ReversedPointOrder_GivesTheSameResult()
    {
        // The analysis sorts by bias: a sweep recorded from +2 V down to −2 V is the same curve.
        var (v, c) = Curve(false, -0.8);
        var s = CvAnalysis.Analyse(v.Reverse().ToArray(), c.Reverse().ToArray(), Area);
        Assert.Equal(Doping, s.DopingM3!.Value, Doping * 1e-9);
        Assert.Equal(ExpectedFlatBand(false, -0.8), s.FlatBandVoltageV!.Value, 1e-9);
    }

    [Fact]
    public void Analyse_StrayLowPointBeyondAccumulationMaximum_StaysOutOfDepletionFit()
    {
        // Only the depletion side of C_max (away from accumulation) carries the Sze & Ng 1/C² line; a low point recorded beyond
        // the accumulation plateau (a contact glitch, say) must not enter it. N back to 1e-9 relative.
        var (v, c) = Curve(false, -0.8);
        var s = CvAnalysis.Analyse([-2.05, .. v], [0.3 * Cox, .. c], Area);
        Assert.Equal(Doping, s.DopingM3!.Value, Doping * 1e-9);
        Assert.True(s.Saturated);
    }

    [Theory]
    [InlineData(false, 0.97, false)]
    [InlineData(false, 0.99, true)]
    [InlineData(true, 0.97, false)]
    [InlineData(true, 0.99, true)]
    public void Analyse_MaximumAtSweepEnd_IsSaturatedOnlyWhenLastStepBelowTwoPercent(bool nType, double lastStepRatio, bool saturated)
    {
        // The documented rule (CvSummary.Saturated): C_max at the end of the sweep counts as levelled off when the neighbouring
        // point is within 2 % of it (common practice, no source). The accumulation end is at −2 V for p, +2 V for n. The points
        // are handed over shuffled (the rule is about bias order, not file order).
        double r = lastStepRatio, sign = nType ? -1 : 1;
        double[] v = [-2.0, -1.9, -1.8, -1.0, -0.5, 0.0, 0.5, 1.0];
        double[] c = [Cox, r * Cox, r * r * Cox, 0.6 * Cox, 0.4 * Cox, 0.25 * Cox, 0.2 * Cox, 0.2 * Cox];
        v = v.Select(x => sign * x).ToArray();
        int[] perm = [3, 0, 6, 1, 7, 4, 2, 5];
        var s = CvAnalysis.Analyse(perm.Select(i => v[i]).ToArray(), perm.Select(i => c[i]).ToArray(), Area);
        double end = sign * -2.0;
        Assert.Equal(saturated, s.Saturated);
        Assert.Equal(end, s.MaxCapacitanceBiasV);
        Assert.Equal(!saturated, s.Notes.Any(n => n.Contains("C still rises", StringComparison.Ordinal)));
    }

    [Fact]
    public void Analyse_MaximumInsideSweep_IsSaturated()
    {
        // A maximum with points on both sides has levelled off whatever the neighbours (CvSummary.Saturated).
        var s = CvAnalysis.Analyse([-2.0, -1.5, -1.0, 0.0, 1.0], [0.9e-10, 1e-10, 0.5e-10, 0.2e-10, 0.2e-10], Area);
        Assert.True(s.Saturated);
        Assert.Equal(-1.5, s.MaxCapacitanceBiasV);
    }

    [Theory]
    [InlineData(3, true)]
    [InlineData(2, false)]
    public void Analyse_DepletionWindow_NeedsThreePoints(int points, bool derived)
    {
        // At least three points with 1.1 C_min < C < C_max/2 give the 1/C² line (documented rule; common practice, no source).
        // Depletion points at V₀ + 0.2, 0.4 (and 0.6) V on the Sze & Ng line; three points return N to rounding.
        double v0 = -0.8;
        var v = new List<double> { -1.2, -1.0 };
        var c = new List<double> { Cox, Cox };
        for (int k = 1; k <= points; k++)
        {
            v.Add(v0 + 0.2 * k);
            c.Add(1.0 / Math.Sqrt(1.0 / (Cox * Cox) + 2 * 0.2 * k / (Q * EpsS * Doping * Area * Area)));
        }
        v.AddRange([0.5, 1.0]);
        c.AddRange([0.1 * Cox, 0.1 * Cox]);
        var s = CvAnalysis.Analyse(v.ToArray(), c.ToArray(), Area);
        Assert.Equal(derived, s.DopingM3.HasValue);
        Assert.Equal(derived, s.FlatBandVoltageV.HasValue);
        if (derived) Assert.Equal(Doping, s.DopingM3!.Value, Doping * 1e-9);
        else Assert.Null(s.LooksNType);
    }

    [Fact]
    public void Analyse_FlatDepletionPoints_GiveNoDoping()
    {
        // A zero 1/C² slope would mean infinite doping (N = 2/(qε_sA²|slope|), Sze & Ng ch. 4): no doping is reported.
        var s = CvAnalysis.Analyse([-1.0, -0.8, -0.6, -0.4, -0.2, 0.5, 1.0], [Cox, Cox, 0.3 * Cox, 0.3 * Cox, 0.3 * Cox, 0.1 * Cox, 0.1 * Cox], Area);
        Assert.Null(s.DopingM3);
        Assert.Null(s.FlatBandVoltageV);
    }

    [Fact]
    public void Analyse_BadInput_Throws()
    {
        // Two points are the documented minimum; lengths must match; the area and some capacitance must be positive.
        var two = CvAnalysis.Analyse([0.0, 1.0], [1e-10, 1e-10], Area);
        Assert.Equal(EpsOx * Area / 1e-10 * 1e9, two.CapacitanceEquivalentThicknessNm, 1e-9);
        Assert.Throws<ArgumentException>(() => CvAnalysis.Analyse([0.0], [1e-10], Area));
        Assert.Throws<ArgumentException>(() => CvAnalysis.Analyse([0.0, 1.0, 2.0], [1e-10, 1e-10], Area));
        Assert.Throws<ArgumentOutOfRangeException>(() => CvAnalysis.Analyse([0.0, 1.0], [1e-10, 1e-10], 0.0));
        Assert.Throws<ArgumentException>(() => CvAnalysis.Analyse([0.0, 1.0], [0.0, 0.0], Area));
    }
}
