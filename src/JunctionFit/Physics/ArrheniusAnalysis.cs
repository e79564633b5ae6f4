using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>What the temperature dependence of a junction's current says about the conduction mechanism.</summary>
public enum TemperatureDependence
{
    /// <summary>Weak increase with temperature: consistent with direct tunnelling (thermal factor πckT/sin πckT).</summary>
    WeakDirectTunnelling,

    /// <summary>Strong Arrhenius increase: thermally activated conduction, not direct tunnelling.</summary>
    ThermallyActivated,

    /// <summary>The current falls as the temperature rises: metallic conduction (pinholes, shorts), not direct tunnelling.</summary>
    Metallic,
}

/// <summary>The result of <see cref="ArrheniusAnalysis.Analyze"/>.</summary>
/// <param name="ActivationEnergyEv">E_a from ln|I| = a − E_a/(kT), least squares in 1/T, in eV (negative when I falls with T).</param>
/// <param name="RSquared">Coefficient of determination of the Arrhenius line.</param>
/// <param name="CurrentRatio">|I| at the highest temperature over |I| at the lowest.</param>
/// <param name="Verdict">The classification.</param>
/// <param name="IsDirectTunnelling">True only for <see cref="TemperatureDependence.WeakDirectTunnelling"/>.</param>
/// <param name="Message">The verdict in words, for a report.</param>
public sealed record ArrheniusResult(
    double ActivationEnergyEv,
    double RSquared,
    double CurrentRatio,
    TemperatureDependence Verdict,
    bool IsDirectTunnelling,
    string Message);

/// <summary>
/// Arrhenius check of a multi-temperature data set of one device at one bias: ln|I| against 1/T.
/// Direct tunnelling depends only weakly on temperature: the thermal factor πckT/sin(πckT) (Stratton 1962; Simmons 1964)
/// gives apparent activation energies of a few meV for practical barriers. A strong activated dependence points to hopping,
/// Poole–Frenkel or Schottky emission; a current that falls with rising temperature points to metallic pinholes
/// (the temperature criterion of J. J. Åkerman and co-workers for tunnel barriers, 2001). Pure computation.
/// </summary>
public static class ArrheniusAnalysis
{
    /// <summary>Default threshold of the activation energy above which the dependence counts as activated, in eV.</summary>
    public const double DefaultActivationThresholdEv = 0.05;

    /// <summary>Relative fall of the current between the lowest and highest temperature that counts as metallic.</summary>
    public const double MetallicRelativeFall = 0.02;

    /// <summary>Classifies the temperature dependence of <paramref name="currentA"/>.</summary>
    /// <param name="temperatureK">Temperatures in kelvin (at least two distinct, all positive).</param>
    /// <param name="currentA">Currents (or fitted current densities) at the same bias, all of one sign and non-zero.</param>
    /// <param name="activationThresholdEv">E_a above which the dependence is called activated; default 0.05 eV.</param>
    /// <returns>The activation energy, fit quality and verdict in words.</returns>
    /// <exception cref="ArgumentException">Lengths differ, fewer than two distinct temperatures, or a current is zero, of mixed sign or not finite.</exception>
    public static ArrheniusResult Analyze(ReadOnlySpan<double> temperatureK, ReadOnlySpan<double> currentA, double activationThresholdEv = DefaultActivationThresholdEv)
    {
        if (temperatureK.Length != currentA.Length) throw new ArgumentException("temperatures and currents must have the same length", nameof(currentA));
        if (temperatureK.Length < 2) throw new ArgumentException("at least two temperatures are needed", nameof(temperatureK));
        Common.Guard.Positive(activationThresholdEv);
        double sign = Math.Sign(currentA[0]);
        int n = temperatureK.Length;
        double sx = 0, sy = 0;
        int iMin = 0, iMax = 0;
        for (int k = 0; k < n; k++)
        {
            Guard.Positive(temperatureK[k], nameof(temperatureK));
            if (!double.IsFinite(currentA[k]) || currentA[k] == 0 || Math.Sign(currentA[k]) != sign) throw new ArgumentException("the currents must be finite, non-zero and of one sign", nameof(currentA));
            sx += 1.0 / (PhysicalConstants.BoltzmannJPerK * temperatureK[k] / PhysicalConstants.JoulePerElectronVolt);
            sy += Math.Log(Math.Abs(currentA[k]));
            if (temperatureK[k] < temperatureK[iMin]) iMin = k;
            if (temperatureK[k] > temperatureK[iMax]) iMax = k;
        }
        if (temperatureK[iMin] == temperatureK[iMax]) throw new ArgumentException("at least two distinct temperatures are needed", nameof(temperatureK));
        double mx = sx / n, my = sy / n, sxx = 0, sxy = 0, syy = 0;
        for (int k = 0; k < n; k++)
        {
            double dx = PhysicalConstants.JoulePerElectronVolt / (PhysicalConstants.BoltzmannJPerK * temperatureK[k]) - mx;
            double dy = Math.Log(Math.Abs(currentA[k])) - my;
            sxx += dx * dx; sxy += dx * dy; syy += dy * dy;
        }
        double slope = sxy / sxx;               // d ln|I| / d(1/kT), in eV
        double ea = -slope;
        double r2 = syy == 0 ? 1.0 : sxy * sxy / (sxx * syy);
        double ratio = Math.Abs(currentA[iMax] / currentA[iMin]);
        string range = $"{temperatureK[iMin]:0.#}-{temperatureK[iMax]:0.#} K";
        if (ea > activationThresholdEv)
        {
            return new ArrheniusResult(ea, r2, ratio, TemperatureDependence.ThermallyActivated, false,
                $"not direct tunneling: the current is thermally activated with E_a = {ea:0.###} eV over {range} (x{ratio:0.##}); " +
                "this points to hopping, Poole-Frenkel or Schottky emission, and the tunnelling parameters of this device are not meaningful");
        }
        if (ratio < 1.0 - MetallicRelativeFall)
        {
            return new ArrheniusResult(ea, r2, ratio, TemperatureDependence.Metallic, false,
                $"not direct tunneling: the current falls by {1 - ratio:P0} as the temperature rises over {range}, like a metal; " +
                "this points to pinholes or a short through the barrier");
        }
        return new ArrheniusResult(ea, r2, ratio, TemperatureDependence.WeakDirectTunnelling, true,
            $"weak temperature dependence over {range} (x{ratio:0.###}, apparent E_a = {ea * 1000:0.#} meV), as expected for direct tunnelling");
    }
}
