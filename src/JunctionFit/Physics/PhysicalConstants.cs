namespace JunctionFit.Physics;

/// <summary>
/// CODATA 2018 values (e, h and k are exact by the 2019 SI definition; mₑ and ε₀ are measured).
/// Source: CODATA 2018 recommended values, NIST SP 961 (2019).
/// </summary>
public static class PhysicalConstants
{
    /// <summary>Elementary charge e in coulomb (exact).</summary>
    public const double ElementaryChargeC = 1.602176634e-19;

    /// <summary>Planck constant h in joule second (exact).</summary>
    public const double PlanckJs = 6.62607015e-34;

    /// <summary>Reduced Planck constant ħ = h / 2π in joule second.</summary>
    public const double ReducedPlanckJs = PlanckJs / (2.0 * Math.PI);

    /// <summary>Electron rest mass mₑ in kilogram.</summary>
    public const double ElectronMassKg = 9.1093837015e-31;

    /// <summary>Boltzmann constant k in joule per kelvin (exact).</summary>
    public const double BoltzmannJPerK = 1.380649e-23;

    /// <summary>Vacuum permittivity ε₀ in farad per metre.</summary>
    public const double VacuumPermittivityFPerM = 8.8541878128e-12;

    /// <summary>One electronvolt in joule (numerically equal to e).</summary>
    public const double JoulePerElectronVolt = ElementaryChargeC;
}
