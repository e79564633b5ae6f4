using JunctionFit.Physics.Numerics;
using MathNet.Numerics;

namespace JunctionFit.Physics;

/// <summary>
/// Numerical reference model: the Tsu–Esaki current with Fermi supply functions and the WKB transmission through a trapezoidal
/// barrier, optionally rounded by the classical image potential.
/// <para>
/// J(V) = (4π m* e / h³) ∫ D(ε) N(ε) dε,  N(ε) = kT ln[(1 + e^{−ε/kT}) / (1 + e^{−(ε + eV)/kT})]  (T = 0: N = max(−ε, 0) − max(−ε − eV, 0)),
/// ε measured from the Fermi level of the bottom electrode, from the higher of the two band bottoms (−E_F, −E_F − eV) upwards.
/// D(ε) = exp(−2 ∫ κ dx) over the classically forbidden part of the barrier, κ = √(2m*(U(x) − ε))/ħ, D = 1 above the barrier.
/// Barrier: U(x) = φ_bottom + (φ_top − eV − φ_bottom) x/d + U_im(x), φ_bottom = φ̄ − Δφ/2, φ_top = φ̄ + Δφ/2 (Δφ as in bdr);
/// image potential of a charge between two metal plates, from the image series summed in closed form:
/// U_im(x) = e² / (16π ε_r ε₀ d) · [ψ(x/d) + ψ(1 − x/d) + 2γ] (ψ digamma, γ Euler's constant; −e²/(16πε_rε₀x) near a plate,
/// −e² ln2/(4πε_rε₀d) at mid-gap). For the plain trapezoid the WKB integral is closed-form,
/// ∫√(U − ε) dx = (2d/3)(b₊^{3/2} − a₊^{3/2})/(b − a) with a, b = U − ε at the two ends and ₊ the positive part.
/// Sources: R. Tsu, L. Esaki, Appl. Phys. Lett. 22, 562 (1973) (current); the WKB transmission (textbook); the image series
/// (classical electrostatics). The same effective mass m* = r·mₑ enters the prefactor and κ, as in Simmons's derivation.
/// </para>
/// <para>
/// Numerics: the energy integral is split at ε = 0 and ε = −eV and each piece integrated by adaptive Gauss–Kronrod (7/15) to the
/// relative tolerance of <see cref="BarrierModelOptions.QuadratureRelativeTolerance"/>; with the image force the barrier maximum is
/// found by golden-section search (U is concave), the turning points by bisection, and ∫κ dx by Gauss–Kronrod after the
/// substitution x = x₁ + (x₂ − x₁)(1 − cos θ)/2, which removes the square-root end points.
/// Derivatives are numerical (documented): central differences with steps 10⁻⁴·θₖ (10⁻⁴·φ̄ for Δφ), so a gradient costs
/// ten current evaluations. Expect milliseconds per point without and tens of milliseconds with the image force.
/// </para>
/// </summary>
public sealed class WkbModel : IBarrierModel
{
    /// <summary>Index of φ̄ in the parameter vector.</summary>
    public const int BarrierHeightIndex = 0;

    /// <summary>Index of d in the parameter vector.</summary>
    public const int ThicknessIndex = 1;

    /// <summary>Index of Δφ in the parameter vector.</summary>
    public const int AsymmetryIndex = 2;

    /// <summary>Index of m*/mₑ in the parameter vector.</summary>
    public const int MassRatioIndex = 3;

    /// <summary>Index of E_F in the parameter vector.</summary>
    public const int FermiEnergyIndex = 4;

    private const double E = PhysicalConstants.ElementaryChargeC;
    private const double Hbar = PhysicalConstants.ReducedPlanckJs;
    private const double RelativeStep = 1e-4;

    private readonly double _kT;
    private readonly double _tolerance;
    private readonly double _imageConstant; // e²/(16π ε_r ε₀) in J m, 0 without image force

    /// <summary>Creates the model with the temperature, Fermi energy, image force and tolerance of <paramref name="options"/>.</summary>
    /// <param name="options">Model options; null for the defaults.</param>
    public WkbModel(BarrierModelOptions? options = null)
    {
        options ??= BarrierModelOptions.Default;
        Options = options;
        _kT = PhysicalConstants.BoltzmannJPerK * (options.TemperatureK ?? 0.0);
        _tolerance = options.QuadratureRelativeTolerance;
        _imageConstant = options.IncludeImageForce
            ? E * E / (16.0 * Math.PI * options.RelativePermittivity * PhysicalConstants.VacuumPermittivityFPerM)
            : 0.0;
        Parameters = [StandardParameters.MeanBarrierHeight, StandardParameters.Thickness, StandardParameters.Asymmetry, StandardParameters.MassRatio,
                      StandardParameters.FermiEnergy with { DefaultSi = options.FermiEnergyEv * PhysicalConstants.JoulePerElectronVolt }];
    }

    /// <summary>The options the model was built with.</summary>
    public BarrierModelOptions Options { get; }

    /// <inheritdoc />
    public string Name => "wkb";

    /// <inheritdoc />
    public string Description => "Tsu-Esaki current with WKB transmission through a trapezoidal barrier" +
                                 (_imageConstant > 0 ? " with image force" : "") +
                                 $", T = {Options.TemperatureK ?? 0:0.#} K (numerical reference)";

    /// <inheritdoc />
    public string ValidityRange => "any bias (direct and Fowler-Nordheim tunnelling) for a barrier where WKB holds (kappa*d well above 1); " +
                                   "free-electron electrodes with the barrier's effective mass; no resonances (use the transfer matrix for those)";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters { get; }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
    {
        var barrier = new Barrier(parameters, voltageV, _imageConstant, _tolerance);
        double ev = E * voltageV;
        double ef = parameters[FermiEnergyIndex];
        double lower = Math.Max(-ef, -ef - ev);
        double low = Math.Min(0.0, -ev), high = Math.Max(0.0, -ev);
        double top = high + (_kT > 0 ? 40.0 * _kT : 0.0);
        var integrand = new Integrand(barrier, ev, _kT);
        double sum = 0;
        if (low > lower) sum += AdaptiveQuadrature.Integrate(ref integrand, lower, low, _tolerance, 0, out _);
        sum += AdaptiveQuadrature.Integrate(ref integrand, Math.Max(low, lower), high, _tolerance, 0, out _);
        if (top > high) sum += AdaptiveQuadrature.Integrate(ref integrand, high, top, _tolerance, 0, out _);
        double mass = parameters[MassRatioIndex] * PhysicalConstants.ElectronMassKg;
        double h = PhysicalConstants.PlanckJs;
        return 4.0 * Math.PI * mass * E / (h * h * h) * sum;
    }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        int n = parameters.Length;
        Span<double> work = stackalloc double[n];
        parameters.CopyTo(work);
        for (int k = 0; k < n; k++)
        {
            double step = k == AsymmetryIndex ? RelativeStep * parameters[BarrierHeightIndex] : RelativeStep * Math.Abs(parameters[k]);
            work[k] = parameters[k] + step;
            double plus = CurrentDensity(voltageV, work);
            work[k] = parameters[k] - step;
            double minus = CurrentDensity(voltageV, work);
            work[k] = parameters[k];
            gradient[k] = (plus - minus) / (2.0 * step);
        }
        return CurrentDensity(voltageV, parameters);
    }

    /// <summary>The WKB transmission D(ε) at energy <paramref name="energyJ"/> above the bottom electrode's Fermi level.</summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="energyJ">ε in joule.</param>
    /// <param name="parameters">SI parameters.</param>
    public double Transmission(double voltageV, double energyJ, ReadOnlySpan<double> parameters)
        => new Barrier(parameters, voltageV, _imageConstant, _tolerance).Transmission(energyJ);

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>();
        double phi = parameters[BarrierHeightIndex], d = parameters[ThicknessIndex], dphi = parameters[AsymmetryIndex];
        if (Math.Abs(dphi) >= 2.0 * phi)
        {
            warnings.Add("the fitted asymmetry makes one interface barrier negative: the trapezoid is not a barrier there");
        }
        double kappaD = d * Math.Sqrt(2.0 * parameters[MassRatioIndex] * PhysicalConstants.ElectronMassKg * Math.Max(phi - 0.5 * E * maxAbsVoltageV, 0.0)) / Hbar;
        if (kappaD < 3.0)
        {
            warnings.Add($"kappa*d = {kappaD:0.#} at the largest bias: the barrier is too thin or too low for the WKB approximation; compare with the transfer matrix");
        }
        return warnings;
    }

    /// <summary>The barrier profile at one bias and its WKB exponent.</summary>
    private readonly struct Barrier
    {
        private readonly double _left, _slope, _d, _twoRootTwoMOverHbar, _image, _tolerance;

        public Barrier(ReadOnlySpan<double> p, double voltageV, double imageConstant, double tolerance)
        {
            double phi = p[BarrierHeightIndex], dphi = p[AsymmetryIndex];
            _d = p[ThicknessIndex];
            _left = phi - 0.5 * dphi;
            double right = phi + 0.5 * dphi - E * voltageV;
            _slope = right - _left;
            _twoRootTwoMOverHbar = 2.0 * Math.Sqrt(2.0 * p[MassRatioIndex] * PhysicalConstants.ElectronMassKg) / Hbar;
            _image = imageConstant / _d;
            _tolerance = tolerance;
        }

        public double Potential(double x)
        {
            double t = x / _d;
            double u = _left + _slope * t;
            if (_image > 0) u += _image * (SpecialFunctions.DiGamma(t) + SpecialFunctions.DiGamma(1.0 - t) + 2.0 * Constants.EulerMascheroni);
            return u;
        }

        public double Transmission(double energyJ)
        {
            double integral = _image > 0 ? ImageIntegral(energyJ) : TrapezoidIntegral(energyJ);
            return Math.Exp(-_twoRootTwoMOverHbar * integral);
        }

        /// <summary>∫√(U − ε) dx for the linear profile, closed form.</summary>
        private double TrapezoidIntegral(double energyJ)
        {
            double a = _left - energyJ, b = _left + _slope - energyJ;
            if (a <= 0 && b <= 0) return 0.0;
            if (Math.Abs(b - a) <= 1e-9 * Math.Max(Math.Abs(a), Math.Abs(b))) return _d * Math.Sqrt(Math.Max(0.5 * (a + b), 0.0));
            double ap = Math.Max(a, 0.0), bp = Math.Max(b, 0.0);
            return 2.0 * _d / 3.0 * (bp * Math.Sqrt(bp) - ap * Math.Sqrt(ap)) / (b - a);
        }

        /// <summary>∫√(U − ε) dx between the turning points of the image-rounded profile.</summary>
        private double ImageIntegral(double energyJ)
        {
            // U is concave: golden-section search for its maximum.
            double lo = 1e-6 * _d, hi = _d - 1e-6 * _d;
            const double g = 0.6180339887498949;
            double a = lo, b = hi;
            double c = b - g * (b - a), dd = a + g * (b - a);
            double fc = Potential(c), fd = Potential(dd);
            for (int k = 0; k < 80 && b - a > 1e-12 * _d; k++)
            {
                if (fc > fd) { b = dd; dd = c; fd = fc; c = b - g * (b - a); fc = Potential(c); }
                else { a = c; c = dd; fc = fd; dd = a + g * (b - a); fd = Potential(dd); }
            }
            double xMax = 0.5 * (a + b);
            if (Potential(xMax) <= energyJ) return 0.0;
            double x1 = Root(energyJ, lo, xMax), x2 = Root(energyJ, hi, xMax);
            var kappa = new KappaIntegrand(this, energyJ, x1, x2);
            return AdaptiveQuadrature.Integrate(ref kappa, 0.0, Math.PI, 0.1 * _tolerance, 0, out _);
        }

        /// <summary>Bisection for U(x) = ε between a point below (<paramref name="outside"/>) and the maximum.</summary>
        private double Root(double energyJ, double outside, double inside)
        {
            if (Potential(outside) >= energyJ) return outside;
            for (int k = 0; k < 100 && Math.Abs(inside - outside) > 1e-15 * _d; k++)
            {
                double mid = 0.5 * (outside + inside);
                if (Potential(mid) > energyJ) inside = mid; else outside = mid;
            }
            return 0.5 * (outside + inside);
        }
    }

    private readonly struct KappaIntegrand(Barrier barrier, double energyJ, double x1, double x2) : IIntegrand
    {
        public double Evaluate(double theta)
        {
            double half = 0.5 * (x2 - x1);
            double x = x1 + half * (1.0 - Math.Cos(theta));
            return Math.Sqrt(Math.Max(barrier.Potential(x) - energyJ, 0.0)) * half * Math.Sin(theta);
        }
    }

    private readonly struct Integrand(Barrier barrier, double ev, double kT) : IIntegrand
    {
        public double Evaluate(double energyJ) => barrier.Transmission(energyJ) * Supply(energyJ);

        private double Supply(double e)
        {
            if (kT == 0) return Math.Max(-e, 0.0) - Math.Max(-e - ev, 0.0);
            return kT * (Softplus(-e / kT) - Softplus(-(e + ev) / kT));
        }

        private static double Softplus(double z) => Math.Max(z, 0.0) + Math.Log(1.0 + Math.Exp(-Math.Abs(z)));
    }
}
