using System.Collections.Immutable;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using MathNet.Numerics.Distributions;

namespace JunctionFit.Fitting;

/// <summary>Outcome of a multi-temperature analysis of one device.</summary>
/// <param name="Joint">One fit of all curves together: barrier parameters shared, each curve with its own temperature.</param>
/// <param name="PerCurve">Each curve fitted alone, at its own temperature.</param>
/// <param name="Arrhenius">ln|I| against 1/T at <paramref name="ReferenceBiasV"/>, model-free; null with fewer than two temperatures.</param>
/// <param name="ReferenceBiasV">Positive bias at which the measured currents are compared.</param>
/// <param name="TemperaturesK">Temperature of each curve.</param>
public sealed record TemperatureSeriesResult(
    FitResult Joint, ImmutableArray<FitResult> PerCurve, ArrheniusResult? Arrhenius, double ReferenceBiasV, ImmutableArray<double> TemperaturesK);

/// <summary>
/// A temperature series of one device: curves measured at several temperatures, fitted jointly with shared barrier
/// parameters (φ, d, area, …) and each curve's own thermal factor πckT/sin(πckT) (Simmons 1964; Stratton 1962), plus the
/// model-free Arrhenius check of <see cref="ArrheniusAnalysis"/> at a common bias. A joint fit that describes every
/// curve, with a weak temperature dependence, supports direct tunnelling; a strong activated dependence does not.
/// Residuals of all curves are stacked; each curve keeps its own weights and masks. Pure computation.
/// </summary>
public static class JointTemperatureFit
{
    /// <summary>Fits a temperature series. Every curve must state its temperature (or the plan must fix one).</summary>
    /// <param name="curves">Curves of one device.</param>
    /// <param name="plan">Fit plan (its model is used for all curves, at each curve's temperature).</param>
    /// <exception cref="ArgumentException">No curves, a curve without temperature, or a plan with several models.</exception>
    public static TemperatureSeriesResult Fit(IReadOnlyList<IvCurve> curves, FitPlan plan)
    {
        ArgumentNullException.ThrowIfNull(curves);
        ArgumentNullException.ThrowIfNull(plan);
        if (curves.Count == 0) throw new ArgumentException("no curves", nameof(curves));
        if (plan.ModelNames.Count != 1) throw new ArgumentException("a temperature series is fitted with one model, not auto", nameof(plan));
        var temperatures = ImmutableArray.CreateBuilder<double>(curves.Count);
        foreach (var c in curves)
        {
            double? t = plan.ModelOptions.TemperatureK ?? c.TemperatureK;
            if (t is not double tk) throw new ArgumentException($"{c.SourcePath}: the file states no temperature; a temperature series needs one per curve", nameof(curves));
            temperatures.Add(tk);
        }
        var perCurve = curves.Select(plan.Fit).ToImmutableArray();
        var models = curves.Select(c => plan.ModelsFor(c)[0]).ToArray();
        var defs = models[0].Parameters;
        var options = plan.Options;

        // Free parameters and the start: the best single-curve fit.
        int startIndex = -1;
        for (int i = 0; i < perCurve.Length; i++)
        {
            if (perCurve[i].Status != FitStatus.Failed && (startIndex < 0 || perCurve[i].Quality!.ReducedChiSquare < perCurve[startIndex].Quality!.ReducedChiSquare)) startIndex = i;
        }
        string label = string.Join(" + ", curves.Select(c => c.SourcePath));
        if (startIndex < 0)
        {
            return new TemperatureSeriesResult(FitResult.Failed(label, models[0].Barrier.Name, "no curve of the series could be fitted on its own"),
                perCurve, Arrhenius(curves, temperatures.ToImmutable(), out double vr0), vr0, temperatures.ToImmutable());
        }
        var theta = new double[defs.Count];
        var free = new List<int>();
        for (int k = 0; k < defs.Count; k++)
        {
            var est = perCurve[startIndex].Find(defs[k].Key)!;
            theta[k] = ParameterTransforms.Inside(defs[k], defs[k].FromDisplay(est.Value));
            if (!est.IsFixed) free.Add(k);
        }
        int[] freeIndex = [.. free];
        var problems = new List<LogCurrentProblem>();
        var prepared = new List<PreparedCurve>();
        for (int i = 0; i < curves.Count; i++)
        {
            var data = PreparedCurve.From(curves[i], options);
            prepared.Add(data);
            problems.Add(new LogCurrentProblem(models[i], data.VoltageV, data.LogAbsCurrent, data.InverseSigma, freeIndex, theta));
        }
        var joint = new StackedProblem(problems);
        var x0 = freeIndex.Select(k => ParameterTransforms.ToSolver(defs[k], theta[k])).ToArray();
        var solution = LevenbergMarquardtSolver.Minimize(joint, x0, options.Solver);
        var cov = LinearizedCovariance.Compute(solution);
        int m = joint.ResidualCount, nFree = freeIndex.Length, dof = m - nFree;
        double t975 = dof > 0 ? StudentT.InvCDF(0, 1, dof, 0.975) : double.NaN;
        var estimates = ImmutableArray.CreateBuilder<ParameterEstimate>(defs.Count);
        var thetaHat = problems[0].ToTheta(solution.Parameters.AsSpan());
        bool noiseKnown = options.RelativeNoise is not null;
        for (int k = 0; k < defs.Count; k++)
        {
            var def = defs[k];
            int j = Array.IndexOf(freeIndex, k);
            double? se = null, lo = null, hi = null;
            if (j >= 0 && !cov.IsRankDeficient && dof > 0)
            {
                double varX = noiseKnown ? cov.UnscaledCovariance[j * nFree + j] : cov.ScaledCovariance[j * nFree + j];
                (se, lo, hi) = ParameterTransforms.WaldInterval(def, thetaHat[k], Math.Sqrt(varX), t975);
            }
            estimates.Add(new ParameterEstimate(def.Key, def.Symbol, def.DisplayUnit, def.ToDisplay(thetaHat[k]), se, lo, hi, j < 0));
        }
        double reduced = dof > 0 ? solution.ResidualSumOfSquares / dof : double.NaN;
        var warnings = ImmutableArray.CreateBuilder<string>();
        var status = solution.Converged ? FitStatus.Ok : FitStatus.Failed;
        // Each curve's share of the joint misfit, by the runs test on its own residuals.
        int offset = 0;
        for (int i = 0; i < curves.Count; i++)
        {
            int len = prepared[i].VoltageV.Length;
            var ordered = new double[len];
            var volts = (double[])prepared[i].VoltageV.Clone();
            for (int u = 0; u < len; u++) ordered[u] = solution.Residuals[offset + u];
            Array.Sort(volts, ordered);
            double z = JunctionFitter.RunsTestZ(ordered);
            if (z < JunctionFitter.RunsTestCriticalZ && status == FitStatus.Ok)
            {
                status = FitStatus.PoorFit;
                warnings.Add($"the shared barrier does not describe the curve at {temperatures[i]:0.#} K ({JunctionFitter.RunsText(z)}): the temperature dependence is not that of direct tunnelling with one barrier");
            }
            offset += len;
        }
        var arrhenius = Arrhenius(curves, temperatures.ToImmutable(), out double vRef);
        if (arrhenius is { IsDirectTunnelling: false } ar)
        {
            warnings.Add(ar.Message);
            if (status == FitStatus.Ok) status = FitStatus.PoorFit;
        }
        var corr = cov.Correlation;
        var result = new FitResult
        {
            SourcePath = label,
            Model = models[0].Barrier.Name,
            Status = status,
            Error = solution.Converged ? null : $"the joint fit did not converge ({solution.Reason})",
            Warnings = warnings.ToImmutable(),
            Parameters = estimates.MoveToImmutable(),
            Quality = new FitQuality(m, curves.Sum(c => c.Count) - m, solution.Iterations, solution.ResidualSumOfSquares, dof > 0 ? reduced : null,
                solution.Converged, solution.Reason,
                noiseKnown ? "unscaled: residuals weighted by the stated noise model" : "scaled by the reduced chi-square of the joint fit",
                "Wald, in transformed parameters, t quantile, mapped back"),
            CorrelationKeys = [.. freeIndex.Select(k => defs[k].Key)],
            CorrelationRowMajor = corr,
        };
        return new TemperatureSeriesResult(result, perCurve, arrhenius, vRef, temperatures.ToImmutable());
    }

    /// <summary>
    /// Model-free Arrhenius check: |I| of each curve at a common positive bias (half the smallest of the curves' largest
    /// positive bias; the measured point nearest to it), against 1/T.
    /// </summary>
    private static ArrheniusResult? Arrhenius(IReadOnlyList<IvCurve> curves, ImmutableArray<double> temperatures, out double referenceBiasV)
    {
        referenceBiasV = double.NaN;
        if (temperatures.Distinct().Count() < 2) return null;
        double vMax = double.PositiveInfinity;
        foreach (var c in curves)
        {
            double top = 0;
            foreach (double v in c.VoltageV) if (double.IsFinite(v)) top = Math.Max(top, v);
            vMax = Math.Min(vMax, top);
        }
        if (!(vMax > 0)) return null;
        referenceBiasV = 0.5 * vMax;
        var currents = new double[curves.Count];
        for (int i = 0; i < curves.Count; i++)
        {
            int best = -1;
            for (int k = 0; k < curves[i].Count; k++)
            {
                double v = curves[i].VoltageV[k], c = curves[i].CurrentA[k];
                if (!(v > 0) || !(c > 0)) continue;
                if (best < 0 || Math.Abs(v - referenceBiasV) < Math.Abs(curves[i].VoltageV[best] - referenceBiasV)) best = k;
            }
            if (best < 0) return null;
            currents[i] = curves[i].CurrentA[best];
        }
        return ArrheniusAnalysis.Analyze(temperatures.AsSpan(), currents);
    }

    /// <summary>Residuals of several problems with the same variables, stacked.</summary>
    private sealed class StackedProblem(List<LogCurrentProblem> parts) : ILeastSquaresProblem
    {
        public int ResidualCount { get; } = parts.Sum(p => p.ResidualCount);

        public int ParameterCount => parts[0].ParameterCount;

        public bool HasAnalyticJacobian => true;

        public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
        {
            int offset = 0;
            foreach (var p in parts)
            {
                p.Evaluate(x, residuals.Slice(offset, p.ResidualCount));
                offset += p.ResidualCount;
            }
        }

        public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian)
        {
            int offset = 0, n = ParameterCount;
            foreach (var p in parts)
            {
                p.Jacobian(x, jacobian.Slice(offset * n, p.ResidualCount * n));
                offset += p.ResidualCount;
            }
        }
    }
}
