using System.Numerics;
using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>
/// Exact transmission and reflection of a plane wave through a piecewise-constant potential (one effective mass throughout).
/// <para>
/// In each region ψ = Aⱼ e^{ikⱼ(x − xⱼ)} + Bⱼ e^{−ikⱼ(x − xⱼ)}, kⱼ = √(2m(E − Uⱼ))/ħ (imaginary under the barrier), xⱼ the left edge
/// of region j. Continuity of ψ and ψ′ at each interface gives, from the right, P = Aⱼ₊₁ + Bⱼ₊₁, Q = (kⱼ₊₁/kⱼ)(Aⱼ₊₁ − Bⱼ₊₁),
/// Aⱼ = ½(P + Q) e^{−ikⱼwⱼ}, Bⱼ = ½(P − Q) e^{+ikⱼwⱼ}. Starting from A = 1, B = 0 in the right lead:
/// T = (k_R / k_L) / |A_L|², R = |B_L / A_L|², and T + R = 1 by flux conservation.
/// For one rectangular barrier of height U₀ and width L with E &lt; U₀ this reproduces T = [1 + U₀² sinh²(κL) / (4E(U₀ − E))]⁻¹
/// (textbook result, e.g. D. J. Griffiths, Introduction to Quantum Mechanics, problem on the rectangular barrier).
/// </para>
/// </summary>
public static class TransferMatrix
{
    /// <summary>Transmission probability through the layers between two leads.</summary>
    /// <param name="energyJ">Electron energy E in joule (same zero as the potentials).</param>
    /// <param name="layerPotentialsJ">Uⱼ of each layer in joule.</param>
    /// <param name="layerWidthsM">Width of each layer in metre.</param>
    /// <param name="leftPotentialJ">Potential of the left (incident) lead.</param>
    /// <param name="rightPotentialJ">Potential of the right lead.</param>
    /// <param name="massKg">Effective mass in kilogram.</param>
    /// <param name="reflection">Reflection probability R.</param>
    /// <returns>T; zero when either lead has no propagating state at E.</returns>
    /// <exception cref="ArgumentException">Spans of different lengths or a negative width.</exception>
    public static double Transmission(double energyJ, ReadOnlySpan<double> layerPotentialsJ, ReadOnlySpan<double> layerWidthsM,
                                      double leftPotentialJ, double rightPotentialJ, double massKg, out double reflection)
    {
        if (layerPotentialsJ.Length != layerWidthsM.Length) throw new ArgumentException("one width per layer potential", nameof(layerWidthsM));
        if (!(energyJ > leftPotentialJ) || !(energyJ > rightPotentialJ))
        {
            reflection = 1.0;
            return 0.0;
        }
        Complex kRight = WaveNumber(energyJ, rightPotentialJ, massKg);
        Complex a = Complex.One, b = Complex.Zero, kNext = kRight;
        for (int j = layerPotentialsJ.Length - 1; j >= -1; j--)
        {
            Complex k = j >= 0 ? WaveNumber(energyJ, layerPotentialsJ[j], massKg) : WaveNumber(energyJ, leftPotentialJ, massKg);
            double w = j >= 0 ? layerWidthsM[j] : 0.0;
            Guard.NonNegative(w, nameof(layerWidthsM));
            Complex p = a + b, q = kNext / k * (a - b);
            Complex phase = Complex.Exp(Complex.ImaginaryOne * k * w);
            a = 0.5 * (p + q) / phase;
            b = 0.5 * (p - q) * phase;
            kNext = k;
        }
        Complex kLeft = kNext;
        double absA2 = a.Real * a.Real + a.Imaginary * a.Imaginary;
        reflection = (b.Real * b.Real + b.Imaginary * b.Imaginary) / absA2;
        return kRight.Real / kLeft.Real / absA2;
    }

    private static Complex WaveNumber(double energyJ, double potentialJ, double massKg)
    {
        double k2 = 2.0 * massKg * (energyJ - potentialJ);
        if (k2 == 0) k2 = 1e-60; // avoid k = 0 exactly (zero-slope matching)
        return k2 > 0
            ? new Complex(Math.Sqrt(k2) / PhysicalConstants.ReducedPlanckJs, 0)
            : new Complex(0, Math.Sqrt(-k2) / PhysicalConstants.ReducedPlanckJs);
    }
}
