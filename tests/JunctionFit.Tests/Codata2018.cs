namespace JunctionFit.Tests;

/// <summary>
/// CODATA 2018 recommended values of the fundamental constants (NIST SP 961, May 2019), typed in here for the tests
/// and never taken from <c>JunctionFit.Physics.PhysicalConstants</c>, so that a wrong digit in the library fails a test
/// instead of flowing into both sides of a comparison. e, h and k are exact by the 2019 SI definition; mₑ and ε₀ are
/// measured values printed to their published digits; ħ = h/2π is exact but infinitely long and printed to 10 digits.
/// </summary>
public static class Codata2018
{
    /// <summary>Elementary charge e, C (exact). Also 1 eV in J.</summary>
    public const double ElementaryChargeC = 1.602176634e-19;

    /// <summary>Planck constant h, J s (exact).</summary>
    public const double PlanckJs = 6.62607015e-34;

    /// <summary>Reduced Planck constant ħ, J s (exact, printed to 10 digits).</summary>
    public const double ReducedPlanckJs = 1.054571817e-34;

    /// <summary>Electron rest mass mₑ, kg (relative standard uncertainty 3.0e-10).</summary>
    public const double ElectronMassKg = 9.1093837015e-31;

    /// <summary>Boltzmann constant k, J/K (exact).</summary>
    public const double BoltzmannJPerK = 1.380649e-23;

    /// <summary>Vacuum electric permittivity ε₀, F/m (relative standard uncertainty 1.5e-10).</summary>
    public const double VacuumPermittivityFPerM = 8.8541878128e-12;
}
