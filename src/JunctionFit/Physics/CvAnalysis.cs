using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>What a capacitance–voltage curve gives about a gate stack.</summary>
/// <param name="CapacitanceEquivalentThicknessNm">CET = ε_ox ε₀ A / C_max in nm.</param>
/// <param name="MaxCapacitanceF">C_max in farad.</param>
/// <param name="MaxCapacitanceBiasV">The bias of C_max in volt.</param>
/// <param name="AreaM2">The capacitor area used, in m².</param>
/// <param name="Saturated">True when C has levelled off at C_max (the last steps change C by less than 2 %); false when it still rises at the end of the sweep, so that CET is an upper bound.</param>
/// <param name="DopingM3">Doping from the 1/C² slope in depletion, m⁻³, where the curve allows; else null.</param>
/// <param name="FlatBandVoltageV">Flat-band voltage where the 1/C² line reaches the flat-band capacitance, in volt, where the curve allows; else null.</param>
/// <param name="LooksNType">True when the 1/C² slope says n-type (depletion at the negative side), false for p-type, null when unknown.</param>
/// <param name="Notes">What was assumed or could not be derived, in words.</param>
public sealed record CvSummary(double CapacitanceEquivalentThicknessNm, double MaxCapacitanceF, double MaxCapacitanceBiasV, double AreaM2,
    bool Saturated, double? DopingM3, double? FlatBandVoltageV, bool? LooksNType, IReadOnlyList<string> Notes);

/// <summary>
/// Capacitance-equivalent thickness and depletion analysis of a C–V curve.
/// <para>
/// CET = ε_ox ε₀ A / C_max with ε_ox = 3.9 (SiO₂): the oxide thickness that alone would give the largest measured capacitance. It
/// exceeds the physical thickness because the inversion (or accumulation) charge sits about 1 nm inside the silicon (quantum
/// confinement; ≈ 0.3–0.4 nm of oxide equivalent) and a poly gate depletes (≈ 0.1–0.3 nm for 10²⁰ cm⁻³), so CET − t_ox is usually
/// 0.3–0.7 nm near 1 V (common practice, no source; the size follows from ε_ox/ε_s × the charge centroid and the poly depletion width).
/// </para>
/// <para>
/// Depletion (Sze &amp; Ng 3rd ed., ch. 4, depletion approximation): 1/C² = 1/C_ox² + 2(V − V_fb)/(q ε_s N A²) for a p substrate
/// (the mirror for n), so N = 2/(q ε_s A² |d(1/C²)/dV|); the straight-line fit uses the points on the low-capacitance side with
/// C between 10 % above C_min and half of C_max, V_fb is where that line meets 1/C_FB², C_FB = [1/C_ox + L_D/ε_s]⁻¹ (flat-band
/// capacitance, L_D the Debye length), with C_ox taken as C_max. Both are approximate (C_max is not C_ox, the curve need not be
/// in depletion equilibrium) and reported as such.
/// </para>
/// Pure computation.
/// </summary>
public static class CvAnalysis
{
    /// <summary>Analyses a C–V curve.</summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="capacitanceF">Capacitance in farad.</param>
    /// <param name="areaM2">Capacitor area in m².</param>
    /// <param name="oxidePermittivity">Relative permittivity of the oxide (3.9 for SiO₂).</param>
    /// <param name="temperatureK">Temperature for the Debye length (300 K when unknown).</param>
    public static CvSummary Analyse(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> capacitanceF, double areaM2, double oxidePermittivity = 3.9, double temperatureK = 300)
    {
        if (voltageV.Length != capacitanceF.Length || voltageV.Length < 2) throw new ArgumentException("at least two points, one capacitance per bias");
        Guard.Positive(areaM2);
        var notes = new List<string>();
        int n = voltageV.Length;
        int[] order = new int[n];
        for (int i = 0; i < n; i++) order[i] = i;
        double[] vs = voltageV.ToArray();
        Array.Sort(vs, order);
        double[] cs = new double[n];
        for (int i = 0; i < n; i++) cs[i] = capacitanceF[order[i]];
        int iMax = 0, iMin = 0;
        for (int i = 1; i < n; i++) { if (cs[i] > cs[iMax]) iMax = i; if (cs[i] < cs[iMin]) iMin = i; }
        double cMax = cs[iMax], cMin = cs[iMin];
        if (!(cMax > 0)) throw new ArgumentException("the capacitance must be positive somewhere");
        double eox = oxidePermittivity * PhysicalConstants.VacuumPermittivityFPerM;
        double cet = eox * areaM2 / cMax * 1e9;
        bool atEnd = iMax == 0 || iMax == n - 1;
        int neighbour = iMax == 0 ? 1 : iMax == n - 1 ? n - 2 : iMax;
        bool saturated = !atEnd || Math.Abs(cs[neighbour] / cMax - 1) < 0.02;
        if (!saturated)
        {
            notes.Add($"C still rises at the end of the sweep (by {1 - cs[neighbour] / cMax:P1} over the last step): C_max is below the oxide capacitance and CET is an upper bound");
        }

        // Depletion side: the side of C_max opposite the maximum, points with 1.1·C_min < C < 0.5·C_max.
        bool maxAtHighBias = iMax > iMin;
        var xs = new List<double>();
        var ys = new List<double>();
        for (int i = 0; i < n; i++)
        {
            bool side = maxAtHighBias ? i < iMax : i > iMax;
            if (side && cs[i] > 1.1 * cMin && cs[i] < 0.5 * cMax) { xs.Add(vs[i]); ys.Add(1.0 / (cs[i] * cs[i])); }
        }
        double? doping = null, vfb = null;
        bool? nType = null;
        if (xs.Count >= 3)
        {
            double mx = xs.Average(), my = ys.Average(), sxx = 0, sxy = 0;
            for (int i = 0; i < xs.Count; i++) { sxx += (xs[i] - mx) * (xs[i] - mx); sxy += (xs[i] - mx) * (ys[i] - my); }
            double slope = sxy / sxx;
            if (slope != 0 && double.IsFinite(slope))
            {
                double es = 11.7 * PhysicalConstants.VacuumPermittivityFPerM;
                double nd = 2.0 / (PhysicalConstants.ElementaryChargeC * es * areaM2 * areaM2 * Math.Abs(slope));
                doping = nd;
                nType = slope < 0;
                double kt = PhysicalConstants.BoltzmannJPerK * temperatureK;
                double debye = Math.Sqrt(es * kt / (PhysicalConstants.ElementaryChargeC * PhysicalConstants.ElementaryChargeC * nd));
                double cfb = areaM2 / (areaM2 / cMax + debye / es);
                vfb = mx + (1.0 / (cfb * cfb) - my) / slope;
                notes.Add($"from the 1/C^2 slope of {xs.Count} depletion points: doping {nd / 1e6:0.##e+0} cm^-3, " +
                          $"{(slope < 0 ? "n-type (depletion at the negative side)" : "p-type (depletion at the positive side)")}, flat band near {vfb:0.##} V (depletion approximation)");
            }
        }
        else
        {
            notes.Add("too few points in depletion (C between 1.1 C_min and C_max/2) for the 1/C^2 slope: no doping or flat-band voltage from C-V");
        }
        return new CvSummary(cet, cMax, vs[iMax], areaM2, saturated, doping, vfb, nType, notes);
    }
}
