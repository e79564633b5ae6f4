using MathNet.Numerics.RootFinding;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// An independent statement of textbook MOS electrostatics, written in the real frame (no mirroring) for the tests to compare
/// with: the exact silicon charge of a uniformly doped substrate (Sze &amp; Ng, Physics of Semiconductor Devices, 3rd ed., ch. 4,
/// the F function, with p_p0 = N and n_p0 = n_i²/N), the depletion approximation in a poly gate (the same chapter applied to the
/// gate), V_g = V_fb + ψ_s + Q_g/C_ox + V_poly solved by MathNet.Numerics' Brent root finder. Constants typed in: CODATA 2018
/// (NIST SP 961), ε_Si = 11.7 ε₀ and ε_SiO₂ = 3.9 ε₀ (Sze &amp; Ng appendix), n_i(300 K) = 1.0×10¹⁰ cm⁻³ (from memory),
/// E_g(T) = 1.17 − 4.73×10⁻⁴ T²/(T + 636) eV (Varshni form with Sze &amp; Ng's silicon values).
/// </summary>
internal sealed class MosReference
{
    public const double Q = Codata2018.ElementaryChargeC;   // C, CODATA 2018 (exact)
    public const double K = Codata2018.BoltzmannJPerK;      // J/K, CODATA 2018 (exact)
    public const double Eps0 = Codata2018.VacuumPermittivityFPerM; // F/m, CODATA 2018
    public const double Ni300 = 1.0e16;        // m^-3, 1.0e10 cm^-3 at 300 K (from memory)
    public const double ChiEv = 4.05;          // electron affinity of Si, eV (Sze & Ng 3rd ed.)

    /// <summary>Gate electrode: 'm' metal, 'n' n⁺ poly, 'p' p⁺ poly.</summary>
    public MosReference(bool nSubstrate, char gate, double dopingM3, double temperatureK = 300, double gateDopingM3 = 2e26, double metalWorkFunctionEv = 4.6)
    {
        NSubstrate = nSubstrate;
        Gate = gate;
        N = dopingM3;
        T = temperatureK;
        Ng = gateDopingM3;
        MetalEv = metalWorkFunctionEv;
        EpsS = 11.7 * Eps0;
        EpsOx = 3.9 * Eps0;
        Vt = K * T / Q;
        Ni = IntrinsicDensity(T);
        R = Ni * Ni / (N * N);
        DebyeLength = Math.Sqrt(EpsS * K * T / (Q * Q * N));
    }

    public bool NSubstrate { get; }
    public char Gate { get; }
    public double N { get; }
    public double T { get; }
    public double Ng { get; }
    public double MetalEv { get; }
    public double EpsS { get; }
    public double EpsOx { get; }
    public double Vt { get; }
    public double Ni { get; }
    public double R { get; }
    public double DebyeLength { get; }

    /// <summary>√2 ε_s (kT/q)/L_D = √(2 ε_s kT N), the scale of Sze &amp; Ng's Q_s.</summary>
    public double Scale => Math.Sqrt(2) * EpsS * Vt / DebyeLength;

    public static double BandGapEv(double t) => 1.17 - 4.73e-4 * t * t / (t + 636.0);

    /// <summary>n_i ∝ T^{3/2} exp(−E_g/2kT) (Sze &amp; Ng ch. 1, effective densities of states ∝ T^{3/2}), pinned at 300 K.</summary>
    public static double IntrinsicDensity(double t)
        => Ni300 * Math.Pow(t / 300.0, 1.5) * Math.Exp(BandGapEv(300) * Q / (2 * K * 300) - BandGapEv(t) * Q / (2 * K * t));

    /// <summary>ψ_B = (kT/q) ln(N/n_i).</summary>
    public double BulkPotential => Vt * Math.Log(N / Ni);

    /// <summary>V_fb = φ_m − φ_s (Hu, Modern Semiconductor Devices, ch. 5; Sze &amp; Ng ch. 4), no oxide charge.</summary>
    public double IdealFlatBand
    {
        get
        {
            double eg = BandGapEv(T);
            double phiM = Gate switch { 'n' => ChiEv, 'p' => ChiEv + eg, _ => MetalEv };
            double phiS = ChiEv + eg / 2 + (NSubstrate ? -BulkPotential : BulkPotential);
            return phiM - phiS;
        }
    }

    /// <summary>e^x − 1 − x, by its Taylor series for small x (no cancellation).</summary>
    public static double ExpMinusOneMinusX(double x)
    {
        if (Math.Abs(x) >= 0.5) return Math.Exp(x) - 1 - x;
        double term = x, sum = 0;
        for (int k = 2; k < 40; k++) { term *= x / k; sum += term; }
        return sum;
    }

    /// <summary>e^x − 1, by its Taylor series for small x.</summary>
    public static double ExpMinusOne(double x) => ExpMinusOneMinusX(x) + x;

    /// <summary>Majority bracket in the carriers' own frame: (e^{−v} + v − 1) with v = qψ/kT for p, −qψ/kT for n.</summary>
    private double Frame(double psi) => NSubstrate ? -psi / Vt : psi / Vt;

    private double FSquared(double v) => ExpMinusOneMinusX(-v) + R * ExpMinusOneMinusX(v);

    /// <summary>Sze &amp; Ng's Q_s = −sgn(ψ_s) √(2ε_s kT N) F for p (and its mirror for n), real frame, C/m².</summary>
    public double SiliconCharge(double psi)
    {
        double v = Frame(psi);
        if (v == 0) return 0;
        double f = Math.Sqrt(FSquared(v));
        double qs = -Math.Sign(v) * Scale * f;
        return NSubstrate ? -qs : qs;
    }

    /// <summary>
    /// Sze &amp; Ng's C_D = (ε_s/(√2 L_D))·[1 − e^{−u} + (n_p0/p_p0)(e^{u} − 1)]/F (p; mirror for n), and ε_s/L_D·√(1 + n_p0/p_p0)
    /// at flat band (the limit of the same expression).
    /// </summary>
    public double SurfaceCapacitance(double psi)
    {
        double v = Frame(psi);
        if (v == 0) return EpsS / DebyeLength * Math.Sqrt(1 + R);
        double num = -ExpMinusOne(-v) + R * ExpMinusOne(v);
        return EpsS / (Math.Sqrt(2) * DebyeLength) * Math.Abs(num) / Math.Sqrt(FSquared(v));
    }

    /// <summary>
    /// Mobile charge |Q_c|: the part of |Q_s| the minority bracket adds, √(2ε_s kT N)(F − √M) (inversion side), or that the
    /// majority bracket adds beyond the minority one, √(2ε_s kT N)(F − √(r m)) (accumulation side); computed directly when
    /// <paramref name="direct"/>, else through the identity F − √a = b/(F + √a) with F² = a + b (no cancellation).
    /// </summary>
    public double CarrierCharge(double psi, bool direct)
    {
        double v = Frame(psi);
        if (v == 0) return 0;
        double major = ExpMinusOneMinusX(-v), minor = R * ExpMinusOneMinusX(v), f = Math.Sqrt(major + minor);
        if (v > 0) return Scale * (direct ? f - Math.Sqrt(major) : minor / (f + Math.Sqrt(major)));
        return Scale * (direct ? f - Math.Sqrt(minor) : major / (f + Math.Sqrt(minor)));
    }

    /// <summary>V_poly = sgn(Q_g) Q_g²/(2qε_s N_g) when Q_g depletes the gate (positive for n⁺, negative for p⁺), else 0.</summary>
    public double PolyVoltage(double qg) => Gate switch
    {
        'n' when qg > 0 => qg * qg / (2 * Q * EpsS * Ng),
        'p' when qg < 0 => -qg * qg / (2 * Q * EpsS * Ng),
        _ => 0.0,
    };

    /// <summary>The depleted-gate capacitance ε_s/W_poly with W_poly = |Q_g|/(q N_g), or +∞ when the gate does not deplete.</summary>
    public double PolyCapacitance(double qg) => PolyVoltage(qg) == 0 ? double.PositiveInfinity : EpsS * Q * Ng / Math.Abs(qg);

    public double Cox(double tox) => EpsOx / tox;

    /// <summary>V_g of surface potential ψ_s.</summary>
    public double GateBias(double psi, double vfb, double tox)
    {
        double qg = -SiliconCharge(psi);
        return vfb + psi + qg / Cox(tox) + PolyVoltage(qg);
    }

    /// <summary>ψ_s at gate bias V_g, by Brent's method (MathNet.Numerics) on the bias equation.</summary>
    public double SurfacePotential(double vg, double vfb, double tox)
        => Brent.FindRoot(p => GateBias(p, vfb, tox) - vg, -1.6, 1.6, 1e-14, 300);

    /// <summary>Low-frequency C = [1/C_ox + 1/C_s + 1/C_poly]⁻¹ (series capacitances, Sze &amp; Ng ch. 4).</summary>
    public double QuasiStaticCapacitance(double vg, double vfb, double tox)
    {
        double psi = SurfacePotential(vg, vfb, tox);
        double qg = -SiliconCharge(psi);
        return 1.0 / (1.0 / Cox(tox) + 1.0 / SurfaceCapacitance(psi) + 1.0 / PolyCapacitance(qg));
    }
}
