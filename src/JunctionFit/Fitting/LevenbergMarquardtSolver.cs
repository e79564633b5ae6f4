namespace JunctionFit.Fitting;

/// <summary>Levenberg–Marquardt with scaled trust-region steps (Moré 1978). Placeholder until the engine lands.</summary>
public static class LevenbergMarquardtSolver
{
    /// <summary>Minimises Σ r(x)² from <paramref name="start"/>.</summary>
    public static LeastSquaresSolution Minimize(ILeastSquaresProblem problem, ReadOnlySpan<double> start, LevenbergMarquardtOptions? options = null)
        => throw new NotImplementedException();
}
