using System.Collections.Immutable;
using JunctionFit.Common;
using JunctionFit.Import;
using JunctionFit.Physics.Numerics;
using JunctionFit.Physics;
using JunctionFit.Results;
using MathNet.Numerics.Distributions;

namespace JunctionFit.Fitting;

/// <summary>
/// Fits a junction model to one measured curve on ln|I| residuals and returns an immutable <see cref="FitResult"/>.
/// <para>
/// Steps: (1) mask unusable points (zero bias, zero or wrong-sign current, at or below 3·σ_floor, at compliance,
/// flagged by the importer); (2) a data-driven start: a log-spaced grid over φ and d with the area profiled out in
/// closed form (in ln|I| the area is an additive constant, so its best value for given φ, d is the weighted mean of
/// ln|I| − ln|J|); (3) Levenberg–Marquardt from the best few grid points in log-transformed variables;
/// (4) the covariance from JᵀJ at the optimum and Wald 95 % intervals in the log space mapped back, so that every
/// interval stays positive; (5) quality checks (runs test on the residual signs, reduced χ² when the noise is known),
/// validity and identifiability warnings.
/// </para>
/// Pure computation; thread-safe (the only shared state is a cache of Student-t quantiles, each written once with its one value).
/// </summary>
public static class JunctionFitter
{
    /// <summary>|ρ| above which two parameters are reported as not separable (common practice, no source).</summary>
    public const double CorrelationWarningThreshold = 0.99;

    /// <summary>Condition number of the column-scaled Jacobian above which the fit is reported as near-singular.</summary>
    public const double ConditionWarningThreshold = 1e8;

    /// <summary>Runs-test z below which the residual signs show systematic misfit (one-sided p ≈ 0.0005).</summary>
    public const double RunsTestCriticalZ = -3.29;

    /// <summary>
    /// Reduced χ² against the data-estimated noise above which a warning says that the model misses structure
    /// (common practice, no source: the estimate itself scatters by about ±20 % for 200 points).
    /// </summary>
    public const double EstimatedNoiseChiSquareWarning = 2.0;

    /// <summary>RMS of ln|I| residuals below which a fit is exact to rounding and the misfit tests are skipped.</summary>
    public const double ExactFitLogResidual = 1e-9;

    /// <summary>Relative standard error above which a strongly correlated parameter is reported as not identifiable.</summary>
    public const double IdentifiabilityRelativeError = 0.02;

    /// <summary>Fits <paramref name="model"/> to <paramref name="curve"/>.</summary>
    /// <param name="curve">The measured curve (SI).</param>
    /// <param name="model">The junction model.</param>
    /// <param name="options">Fit options.</param>
    /// <returns>The result; failures are a status on the result, never an exception.</returns>
    public static FitResult Fit(IvCurve curve, JunctionCurrentModel model, FitOptions options)
    {
        ArgumentNullException.ThrowIfNull(curve);
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        model = model.WithBounds(options.Bounds);
        var defs = model.Parameters;
        int p = defs.Count;
        string modelName = model.Barrier.Name;

        // ---- parameters: fixed / free, template values -------------------------------------------------
        var theta = new double[p];
        var isFree = new bool[p];
        for (int k = 0; k < p; k++)
        {
            var def = defs[k];
            if (options.FixedValues.TryGetValue(def.Id, out double fixedValue)
                || (k == model.AreaIndex && options.FixAreaFromMetadata && curve.AreaM2 is double stated && (fixedValue = stated) > 0))
            {
                theta[k] = fixedValue;
                isFree[k] = false;
            }
            else
            {
                isFree[k] = !def.FixedByDefault || options.FreedKeys.Contains(def.Id);
                theta[k] = options.StartValues.TryGetValue(def.Id, out double s) ? s
                    : k == model.AreaIndex && curve.AreaM2 is double a ? a
                    : def.DefaultSi;
            }
        }
        int nFree = 0;
        for (int k = 0; k < p; k++) if (isFree[k]) nFree++;
        var freeIndex = new int[nFree];
        for (int k = 0, j = 0; k < p; k++) if (isFree[k]) freeIndex[j++] = k;

        // ---- masks and weights --------------------------------------------------------------------------
        var data = PreparedCurve.From(curve, options);
        int n = curve.Count, usedCount = data.VoltageV.Length, masked = n - usedCount;
        bool[] used = data.Used;
        double[] vUsed = data.VoltageV, yUsed = data.LogAbsCurrent, invSigma = data.InverseSigma;
        double maxAbsV = data.MaxAbsVoltageV;
        var (rawMaxV, rawMaxI) = CurveDiagnostics.Extremes(curve.VoltageV.AsSpan(), curve.CurrentA.AsSpan());
        if (usedCount < nFree + 2 && data.WrongSign >= 0.9 * n && n >= nFree + 2)
        {
            return Failed(curve, modelName, "swapped",
                $"the current has the opposite sign to the bias at {data.WrongSign} of {n} points: the terminals look swapped " +
                "(or the current column has the other sign convention); fix the connection or negate the current");
        }
        bool floorOnly = usedCount < Math.Max(nFree + 2, 0.2 * data.InWindow) && data.BelowFloor + data.WrongSign >= 0.8 * data.InWindow;
        bool randomSign = data.WrongSign >= 0.25 * data.InWindow && data.WrongSignHighBias >= 3 && data.WrongSign < 0.9 * data.InWindow;
        if (data.InWindow >= 4 && (floorOnly || randomSign))
        {
            string floorText = data.Floor.FloorA > 0 ? $" against a noise floor of {data.Floor.Describe()}" : "";
            return Failed(curve, modelName, "open",
                $"open circuit: the current stays at the instrument floor at every bias (largest |I| {rawMaxI:0.0#e+0} A{floorText}, " +
                $"{data.WrongSign} of {data.InWindow} readings with the wrong sign): no contact, a broken die or the wrong channel; " +
                $"check the probe contact and the current column ({new Remedy(RemedyKind.CurrentColumn)})");
        }
        if (usedCount < nFree + 2)
        {
            return Failed(curve, modelName, "too-few-points",
                $"only {usedCount} of {n} points are usable (non-zero bias with current of the same sign, above the noise floor, " +
                $"below compliance, inside the bias window); at least {nFree + 2} are needed for {nFree} free parameters" +
                (data.MaskNotes.Count > 0 ? $" (left out: {string.Join("; ", data.MaskNotes)})" : ""));
        }

        // ---- data-driven start and multi-start LM -------------------------------------------------------
        ParasiticStarts(model, theta, isFree, options, vUsed, yUsed);
        for (int k = 0; k < p; k++) theta[k] = ParameterTransforms.Inside(defs[k], theta[k]);
        bool profileArea = isFree[model.AreaIndex] && !model.Parasitics.Any;
        int[] iterIndex = profileArea ? Array.FindAll(freeIndex, k => k != model.AreaIndex) : freeIndex;
        var problem = new LogCurrentProblem(model, vUsed, yUsed, invSigma, iterIndex, theta, profileArea);
        var starts = GridStarts(model, theta, isFree, vUsed, yUsed, invSigma, options.Starts);
        // Start values given for free barrier parameters (FitOptions.StartValues) are tried first, before the grid's.
        bool startGiven = false;
        for (int k = 0; k < p; k++) startGiven |= isFree[k] && k != model.AreaIndex && options.StartValues.ContainsKey(defs[k].Id);
        if (startGiven) starts.Insert(0, (double[])theta.Clone());
        bool noiseWeighted = options.RelativeNoise is not null || data.EstimatedRelativeNoise is not null;
        LeastSquaresSolution? best = null;
        int iterations = 0;
        foreach (var start in starts)
        {
            if (!ParameterTransforms.TryToSolver(defs, iterIndex, start, out var x0)) continue;
            var solution = LevenbergMarquardtSolver.Minimize(problem, x0, options.Solver);
            iterations += solution.Iterations;
            if (!double.IsFinite(solution.ResidualSumOfSquares)) continue;
            if (best is null || solution.ResidualSumOfSquares < best.ResidualSumOfSquares) best = solution;
            // A converged start that already fits at the noise level (RSS/dof within 3 standard deviations of a χ²/dof for a
            // correct model, 1 + 3√(2/dof)) leaves nothing for the other starts to find: they are skipped.
            int dofStart = usedCount - iterIndex.Length;
            if (noiseWeighted && dofStart > 10 && best.Converged && iterIndex.Length <= 2
                && best.ResidualSumOfSquares / dofStart <= 1.0 + 3.0 * Math.Sqrt(2.0 / dofStart))
            {
                break;
            }
        }
        if (best is null)
        {
            return Failed(curve, modelName, "not-evaluable",
                $"the model could not be evaluated at any start value (non-finite currents); check the bias range and units ({new Remedy(RemedyKind.VoltageUnit)}, {new Remedy(RemedyKind.CurrentUnit)})");
        }
        var fullProblem = problem;
        if (profileArea)
        {
            // Polish in all free parameters from the profiled optimum: converges at once and gives the full Jacobian
            // (area included) for the covariance.
            var thetaBest = problem.ToTheta(best.Parameters.AsSpan());
            if (!Array.TrueForAll(thetaBest, double.IsFinite) || !(thetaBest[model.AreaIndex] > 0))
            {
                return Failed(curve, modelName, "no-area",
                    $"the {modelName} model cannot describe this curve at any effective area (the best area is not a finite positive number); " +
                    $"check that the model suits the bias range ({Remedy.BiasWindow}), or fix the area ({Remedy.GiveArea})");
            }
            fullProblem = new LogCurrentProblem(model, vUsed, yUsed, invSigma, freeIndex, thetaBest);
            var x0 = new double[freeIndex.Length];
            for (int j = 0; j < freeIndex.Length; j++) x0[j] = ParameterTransforms.ToSolver(defs[freeIndex[j]], thetaBest[freeIndex[j]]);
            var polished = LevenbergMarquardtSolver.Minimize(fullProblem, x0, options.Solver);
            iterations += polished.Iterations;
            bool profiledConverged = best.Converged;
            best = polished.ResidualSumOfSquares <= best.ResidualSumOfSquares * (1 + 1e-9) || !double.IsFinite(best.ResidualSumOfSquares)
                ? polished
                : polished with { Termination = best.Termination, Reason = best.Reason };
            if (!profiledConverged && best.Converged && polished.Iterations > 1)
            {
                best = polished;
            }
        }
        best = best with { Iterations = iterations };

        var result = BuildResult(curve, model, options, best, fullProblem, freeIndex, used, usedCount, masked, maxAbsV, data, rawMaxV, rawMaxI);
        if (result.Diagnoses.Contains("undetermined") && isFree[model.AreaIndex] && curve.AreaM2 is double statedArea && statedArea > 0)
        {
            // With the area free these data do not determine the barrier; the file states an area, so the fit falls back to it
            // (as --area-from-file would) and says so, rather than giving no value.
            var fallback = Fit(curve, model, options with { FixedValues = options.FixedValues.SetItem(model.Parameters[model.AreaIndex].Id, statedArea) });
            if (fallback.Status != FitStatus.Failed && !fallback.Diagnoses.Contains("undetermined"))
            {
                string bounds = string.Join(", ", result.Parameters.Where(q => q.IsUndetermined && q.Bound is not null)
                    .Select(q => $"{q.Symbol} {(q.Bound!.IsLower ? "≥" : "≤")} {q.Bound.Value:G3} {q.Unit}".TrimEnd()));
                return fallback with
                {
                    Warnings = fallback.Warnings.Insert(0,
                        $"area fixed at the file's stated area of {statedArea * 1e12:G4} µm²: with the area free these data do not determine the barrier " +
                        $"({(bounds.Length > 0 ? bounds : "it ran to the edge of the physical range")}); the stated area may be the nominal contact area, larger than " +
                        $"the effective one — give {Remedy.GiveArea} for another value"),
                    Diagnoses = fallback.Diagnoses.Add("area-from-file"),
                };
            }
        }
        if (options.DirectionFits && result.Status != FitStatus.Failed)
        {
            result = DirectionFits.Attach(curve, model, options, data, result);
        }
        return result;
    }

    private static FitResult Failed(IvCurve curve, string modelName, string diagnosis, string error) =>
        FitResult.Failed(curve.SourcePath, modelName, error) with
        {
            Diagnoses = [diagnosis], Lot = curve.Lot, Wafer = curve.Wafer, DieX = curve.DieX, DieY = curve.DieY,
        };

    private static FitResult BuildResult(IvCurve curve, JunctionCurrentModel model, FitOptions options, LeastSquaresSolution best,
        LogCurrentProblem problem, int[] freeIndex, bool[] used, int usedCount, int masked, double maxAbsV, PreparedCurve noise,
        double rawMaxV, double rawMaxI)
    {
        var defs = model.Parameters;
        int p = defs.Count, nFree = freeIndex.Length, m = usedCount;
        int dof = m - nFree;
        double rss = best.ResidualSumOfSquares;
        bool noiseKnown = options.RelativeNoise is not null;
        double? reducedChi2 = dof > 0 ? rss / dof : null;
        string scaling = noiseKnown
            ? "unscaled: residuals weighted by the stated noise model"
            : noise.EstimatedRelativeNoise is double est
                ? $"scaled by the reduced chi-square; weights from the point-to-point relative noise {est:0.###e+0} estimated from the data"
                : "scaled by the reduced chi-square (residual variance estimated from the fit)";
        const string intervalMethod = "Wald, in log parameters, t quantile, mapped back (stays inside the physical bounds)";
        var warnings = ImmutableArray.CreateBuilder<string>();
        warnings.AddRange(curve.Warnings);

        double[] thetaHat = problem.ToTheta(best.Parameters.AsSpan());

        // Covariance of the solver variables x from the column-scaled Jacobian (LinearizedCovariance: (JᵀJ)⁻¹ from a
        // pivoted QR and the SVD of R), scaled by the residual variance unless the noise is stated.
        LinearizedCovarianceResult? cov = null;
        if (nFree > 0 && dof > 0 && DenseKernels.AllFinite(best.JacobianRowMajor.AsSpan()))
        {
            cov = LinearizedCovariance.Compute(best);
        }
        bool covOk = cov is { IsRankDeficient: false };
        double condition = cov?.ConditionNumber ?? 1.0;
        var covFlat = cov is null ? [] : noiseKnown ? cov.UnscaledCovariance : cov.ScaledCovariance;
        double CovX(int a, int b) => covFlat[a * nFree + b];

        double tQuantile = dof > 0 ? StudentT975(dof) : double.NaN;
        var estimates = ImmutableArray.CreateBuilder<ParameterEstimate>(p);
        for (int k = 0; k < p; k++)
        {
            var def = defs[k];
            int j = Array.IndexOf(freeIndex, k);
            double value = thetaHat[k];
            double? se = null, lo = null, hi = null;
            if (j >= 0 && covOk && CovX(j, j) >= 0 && double.IsFinite(CovX(j, j)))
            {
                (se, lo, hi) = ParameterTransforms.WaldInterval(def, value, Math.Sqrt(CovX(j, j)), tQuantile);
            }
            estimates.Add(new ParameterEstimate(def.Key, def.Symbol, def.DisplayUnit, def.ToDisplay(value), se, lo, hi, j < 0));
        }

        // Correlation and identifiability.
        var corr = ImmutableArray.CreateBuilder<double>(nFree * nFree);
        var keys = ImmutableArray.CreateBuilder<string>(nFree);
        for (int a = 0; a < nFree; a++) keys.Add(defs[freeIndex[a]].Key);
        if (covOk)
        {
            for (int a = 0; a < nFree; a++)
            for (int b = 0; b < nFree; b++)
                corr.Add(CovX(a, b) / Math.Sqrt(CovX(a, a) * CovX(b, b)));
            var pairs = new List<string>();
            var involved = new SortedSet<int>();
            for (int a = 0; a < nFree; a++)
            for (int b = a + 1; b < nFree; b++)
            {
                double rho = corr[a * nFree + b];
                if (Math.Abs(rho) > CorrelationWarningThreshold
                    && Math.Max(Math.Sqrt(CovX(a, a)), Math.Sqrt(CovX(b, b))) > IdentifiabilityRelativeError)
                {
                    pairs.Add($"{defs[freeIndex[a]].Description} / {defs[freeIndex[b]].Description} {rho:0.0000}");
                    involved.Add(freeIndex[a]);
                    involved.Add(freeIndex[b]);
                }
            }
            if (pairs.Count > 0)
            {
                bool areaInvolved = involved.Contains(model.AreaIndex);
                string remedy = areaInvolved
                    ? $"fix the area from the lithography ({Remedy.GiveArea} or {Remedy.AreaFromFile}), or widen the bias range so that the curvature of I(V) pins the barrier"
                    : RemedyText(defs[involved.Min].Key, defs[involved.Max].Key);
                warnings.Add($"not identifiable: these data cannot separate {string.Join(", ", involved.Select(k => defs[k].Description))} " +
                             $"(correlation {string.Join("; ", pairs)}); their intervals are wide. Remedy: {remedy}");
            }
            if (condition > ConditionWarningThreshold)
            {
                warnings.Add((
                    $"the scaled Jacobian is near-singular (condition number {condition:0.#e+0}); some parameter combinations are not determined. " +
                    $"Remedy: fix the area from the lithography ({Remedy.GiveArea}), widen the bias range, or keep the mass ratio fixed"));
            }
        }
        else if (nFree > 0)
        {
            warnings.Add("the parameter covariance could not be computed (singular Jacobian or no degrees of freedom); no intervals are given. " +
                         $"Remedy: fix the area ({Remedy.GiveArea}) or widen the bias range");
        }

        // Curve snapshot and residual diagnostics.
        int n = curve.Count;
        var modelCurrent = new double[n];
        var logResidual = new double[n];
        for (int i = 0; i < n; i++)
        {
            modelCurrent[i] = model.Current(curve.VoltageV[i], thetaHat);
            double c = curve.CurrentA[i];
            logResidual[i] = c != 0 && modelCurrent[i] != 0 && Math.Sign(c) == Math.Sign(modelCurrent[i])
                ? Math.Log(Math.Abs(c)) - Math.Log(Math.Abs(modelCurrent[i]))
                : double.NaN;
        }
        var status = FitStatus.Ok;
        string? error = null;
        string? reason = null;
        var diagnoses = new List<string>();
        void Poor(string why)
        {
            if (status == FitStatus.Ok) status = FitStatus.PoorFit;
            reason ??= why;
        }

        // Misfit in practical terms: the weighted RMS of the ln|I| residuals, normalised to the relative noise, and the part
        // of it beyond the point-to-point noise.
        bool noiseEstimated = noiseKnown || noise.EstimatedRelativeNoise is not null;
        double relNoise = noise.RelativeNoiseUsed;
        double? logRms = dof > 0 ? relNoise * Math.Sqrt(rss / dof) : null;
        double? systematic = logRms is double lr
            ? noiseEstimated ? relNoise * Math.Sqrt(Math.Max(0.0, rss / dof - 1.0)) : lr
            : null;

        // Parameters that ran to the edge of their physical range: not determined by these data.
        var undetermined = new List<int>();
        for (int k = 0; k < p; k++)
        {
            if (Array.IndexOf(freeIndex, k) < 0) continue;
            var (lo, hi) = UndeterminedParameters.PlausibleRange(defs[k]);
            if (!(thetaHat[k] >= lo && thetaHat[k] <= hi)) undetermined.Add(k);
        }

        // Straight line: a resistor, a short, or a barrier swept only in its linear region.
        var (conductance, ohmicRms) = CurveDiagnostics.StraightLine(noise.VoltageV, noise.LogAbsCurrent, noise.InverseSigma);
        bool ohmic = double.IsFinite(ohmicRms) && usedCount >= 6
            && ohmicRms <= Math.Max(CurveDiagnostics.OhmicLogTolerance, 1.5 * (noiseEstimated ? relNoise : 0.0));
        string OhmicText()
        {
            double r = 1.0 / conductance;
            double? area = curve.AreaM2 ?? (Array.IndexOf(freeIndex, model.AreaIndex) < 0 ? thetaHat[model.AreaIndex] : null);
            string ra = area is double aM2 ? $", R·A = {r * aM2 * 1e12:G3} Ω·µm²" : "";
            return $"R = {FormatOhm(r)}{ra}; I/V is constant within {ohmicRms * 100:0.#} % over ±{maxAbsV:G3} V";
        }
        if (ohmic && 1.0 / conductance < CurveDiagnostics.ShortResistanceOhm)
        {
            diagnoses.Add("shorted");
            status = FitStatus.Failed;
            error = $"shorted: the curve is a straight line through zero ({OhmicText()}): a short through the barrier or between the probes, " +
                    "not tunnelling; exclude the die (or check the probe placement)";
            reason = error;
        }

        if (status != FitStatus.Failed && !best.Converged)
        {
            status = FitStatus.Failed;
            error = $"the solver did not converge ({best.Reason}); fix the area ({Remedy.GiveArea} or {Remedy.AreaFromFile}), narrow the bias window " +
                    $"({Remedy.BiasWindow}), or hold a parameter fixed ({Remedy.Fix("thickness=NM")})";
            reason = error;
        }
        else if (status != FitStatus.Failed && !covOk && nFree > 0 && undetermined.Count == 0)
        {
            status = FitStatus.Failed;
            var vanished = new List<string>();
            foreach (int k in freeIndex)
            {
                if (k != model.AreaIndex && defs[k].Transform == ParameterTransform.Log && !(thetaHat[k] > 1e-300)) vanished.Add(defs[k].Description);
            }
            error = vanished.Count > 0
                ? $"the {string.Join(" and ", vanished)} went to zero: these data show no sign of it; fit without it"
                : "these data do not determine the free parameters together (singular Jacobian: the curve has fewer independent features than " +
                  "free parameters); " + (isFreeArea(model, freeIndex)
                      ? $"fix the area from the lithography ({Remedy.GiveArea} or {Remedy.AreaFromFile}) or widen the bias range"
                      : $"widen the bias range or fix another parameter ({Remedy.Fix()})");
            reason = error;
        }
        if (status != FitStatus.Failed)
        {
            foreach (string u in CurveDiagnostics.UnitWarnings(rawMaxV, rawMaxI))
            {
                if (!diagnoses.Contains("units")) diagnoses.Add("units");
                warnings.Add(u);
                Poor(u);
            }
            if (undetermined.Count > 0)
            {
                diagnoses.Add("undetermined");
                double scale = noiseKnown ? 1.0 : rss / Math.Max(dof, 1);
                var bounds = new List<string>();
                foreach (int k in undetermined)
                {
                    var bound = UndeterminedParameters.OneSidedBound(model, noise, options, thetaHat, freeIndex, k, rss, scale);
                    var def = defs[k];
                    estimates[k] = estimates[k] with { Value = double.NaN, StandardError = null, Lower95 = bound?.IsLower == true ? bound.Value : null,
                        Upper95 = bound?.IsLower == false ? bound.Value : null, Bound = bound };
                    bounds.Add(bound is null
                        ? $"{def.Description} (ran to {def.ToDisplay(thetaHat[k]):G3} {def.DisplayUnit}, no bound found)".Replace(" )", ")")
                        : $"{def.Symbol} {(bound.IsLower ? "≥" : "≤")} {bound.Value:G3} {def.DisplayUnit}".TrimEnd());
                }
                // The other free parameters are conditional on an edge value: no honest interval for them either.
                for (int k = 0; k < p; k++)
                {
                    if (Array.IndexOf(freeIndex, k) >= 0 && !undetermined.Contains(k))
                    {
                        estimates[k] = estimates[k] with { StandardError = null, Lower95 = null, Upper95 = null };
                    }
                }
                string why = $"not determined by these data: {string.Join(", ", bounds)} (one-sided 95 % profile bounds; the fit ran to the edge " +
                             "of the physical range, so no value is given and the other parameters have no interval)";
                if (ohmic)
                {
                    diagnoses.Add("ohmic");
                    string ohmicWhy = $"ohmic: the curve is a straight line ({OhmicText()}) — a resistor, a leak path or a barrier swept only in its " +
                                      "linear region; tunnelling parameters need the curvature of I(V): widen the bias range, or, if a leak " +
                                      $"adds to a tunnel current, fit with {Remedy.Free("leakage-conductance")}";
                    warnings.Add(ohmicWhy);
                    Poor(ohmicWhy);
                }
                var phiDef = defs.FirstOrDefault(d => d.Key == StandardParameters.BarrierHeight.Key);
                if (phiDef is not null && undetermined.Contains(model.IndexOf(phiDef.Key)) && thetaHat[model.IndexOf(phiDef.Key)] > phiDef.UpperSi
                    && !ohmic && !diagnoses.Contains("units") && Array.IndexOf(freeIndex, model.AreaIndex) < 0)
                {
                    warnings.Add("the barrier height ran above any insulator's (largest band gaps are about 9 eV): if the current column is not in " +
                                 $"ampere (nA, µA, mA) give {new Remedy(RemedyKind.CurrentUnit)}, and check the area ({Remedy.GiveArea}) and the voltage unit ({new Remedy(RemedyKind.VoltageUnit)})");
                }
                Poor(why);
                warnings.Add(why);
            }
            else if (ohmic)
            {
                diagnoses.Add("ohmic");
                warnings.Add($"linear: the curve is nearly a straight line ({OhmicText()}); the barrier is pinned only by a small curvature");
            }
            if (systematic is double sys && sys > options.MisfitTolerance)
            {
                string misfitText = ($"misfit: the model misses the curve by {sys * 100:0.#} % RMS in current beyond the point-to-point noise " +
                     $"({relNoise * 100:0.##} %), more than the tolerance of {options.MisfitTolerance * 100:0.#} % ({new Remedy(RemedyKind.MisfitTolerance)}); " +
                     $"another conduction mechanism, a leak or series resistance ({Remedy.Free("leakage-conductance")}, {Remedy.Free("series-resistance")}), " +
                     $"or only one branch follows the model ({Remedy.BiasWindow}, {new Remedy(RemedyKind.Polarity)})");
                warnings.Add(misfitText);
                Poor(misfitText);
            }
            else if (systematic is double small && small > 0 && noiseEstimated)
            {
                // Small but systematic: a note, not a poor fit (common practice, no source).
                double exactRms = logRms ?? 0;
                bool exact = exactRms < ExactFitLogResidual;
                double z = exact ? 0.0 : RunsTestZ(curve.VoltageV.AsSpan(), best.Residuals.AsSpan(), used);
                if (z < RunsTestCriticalZ)
                {
                    warnings.Add($"small systematic misfit: {small * 100:0.#} % RMS beyond the noise, within the tolerance of " +
                                 $"{options.MisfitTolerance * 100:0.#} %; the residual signs form fewer runs than noise would ({RunsText(z)})");
                }
            }
            if (noiseKnown && dof > 0)
            {
                double limit = ChiSquared.InvCDF(dof, 0.999) / dof;
                if (reducedChi2 > limit)
                {
                    warnings.Add((
                        $"reduced chi-square {reducedChi2:0.###} exceeds {limit:0.###}, the 99.9 % limit for the stated noise ({new Remedy(RemedyKind.Noise)}): the residuals " +
                        "are larger than that noise"));
                }
            }
            TradeOffWarning(model, freeIndex, thetaHat, corr, undetermined, warnings, diagnoses);
        }
        if (status == FitStatus.Failed)
        {
            // A failed fit has no estimate: its free parameters carry no value (never an edge value such as 1e4 eV).
            for (int k = 0; k < p; k++)
            {
                if (Array.IndexOf(freeIndex, k) >= 0) estimates[k] = estimates[k] with { Value = double.NaN, StandardError = null, Lower95 = null, Upper95 = null };
            }
        }
        if (noise.MaskNotes.Count > 0)
        {
            warnings.Add($"{masked} of {n} points were left out: {string.Join("; ", noise.MaskNotes)}");
        }
        if (noise.SettlingIndices.Length > 0) diagnoses.Add("settling");
        if (noise.Floor.FloorA > 0 && (noise.DownWeighted > 0 || noise.BelowFloor > 0))
        {
            warnings.Add($"noise floor {noise.Floor.Describe()}: {noise.DownWeighted} point(s) down-weighted, {noise.BelowFloor} at or below 3x the floor left out");
        }
        foreach (var w in model.CheckValidity(maxAbsV, thetaHat)) warnings.Add(w);
        int areaK = model.AreaIndex;
        if (Array.IndexOf(freeIndex, areaK) < 0 && curve.AreaM2 is double statedArea && statedArea > 0
            && Math.Abs(thetaHat[areaK] / statedArea - 1) > 0.05)
        {
            warnings.Add($"the area is fixed at {thetaHat[areaK] * 1e12:G4} µm², but the file states {statedArea * 1e12:G4} µm²; " +
                         $"check the die (use {Remedy.AreaFromFile} to take each file's own area)");
        }
        if (Array.IndexOf(freeIndex, areaK) >= 0 && curve.AreaM2 is double stated && stated > 0)
        {
            double ratio = thetaHat[areaK] / stated;
            if (ratio > 10 || ratio < 0.1)
            {
                warnings.Add($"the fitted effective area is {ratio:0.###e+0} times the file's stated area of {stated * 1e12:G4} µm²; " +
                             $"with the area free the barrier parameters are poorly pinned — fix the area at the stated value with {Remedy.AreaFromFile}");
            }
        }
        // The transition voltage is a barrier property of a two-terminal tunnel junction; on a MOS gate current the minimum of
        // ln(I/V²) against 1/V follows the surface potential, not the barrier, so it is not reported there.
        var transition = model.Barrier.Name == BarrierModelCatalog.Mos
            ? new TransitionVoltages(null, null)
            : TransitionVoltage.Compute(curve.VoltageV.AsSpan(), curve.CurrentA.AsSpan());

        return new FitResult
        {
            SourcePath = curve.SourcePath,
            Model = model.Barrier.Name,
            Status = status,
            Error = error,
            Warnings = warnings.ToImmutable(),
            Parameters = estimates.MoveToImmutable(),
            StatusReason = status == FitStatus.Ok ? null : reason ?? error,
            Diagnoses = [.. diagnoses],
            Quality = new FitQuality(usedCount, masked, best.Iterations, rss, reducedChi2, best.Converged, best.Reason, scaling, intervalMethod)
            {
                NoiseFloorA = noise.Floor.FloorA,
                NoiseFloorDescription = noise.Floor.Describe(),
                PointsDownWeighted = noise.DownWeighted,
                RelativeNoise = noiseEstimated ? relNoise : null,
                LogResidualRms = logRms,
                SystematicMisfit = systematic,
                MisfitTolerance = options.MisfitTolerance,
            },
            CorrelationKeys = keys.MoveToImmutable(),
            CorrelationRowMajor = corr.ToImmutable(),
            Curve = new CurveSnapshot(curve.VoltageV, curve.CurrentA, ImmutableArray.Create(modelCurrent),
                ImmutableArray.Create(used), ImmutableArray.Create(logResidual)),
            ModelValidity = model.Barrier.ValidityRange,
            TransitionVoltageV = transition.PositiveV,
            TransitionVoltageNegativeV = transition.NegativeV,
            Lot = curve.Lot,
            Wafer = curve.Wafer,
            DieX = curve.DieX,
            DieY = curve.DieY,
        };
    }

    // The 97.5 % Student-t quantile per degrees of freedom, computed once (a root search in MathNet): the same value each time.
    private static readonly double[] StudentT975Cache = CreateNaNs(4096);

    private static double[] CreateNaNs(int n)
    {
        var a = new double[n];
        Array.Fill(a, double.NaN);
        return a;
    }

    internal static double StudentT975(int dof)
    {
        if (dof >= StudentT975Cache.Length) return StudentT.InvCDF(0.0, 1.0, dof, 0.975);
        double q = Volatile.Read(ref StudentT975Cache[dof]);
        if (double.IsNaN(q))
        {
            q = StudentT.InvCDF(0.0, 1.0, dof, 0.975);
            Volatile.Write(ref StudentT975Cache[dof], q);
        }
        return q;
    }

    private static bool isFreeArea(JunctionCurrentModel model, int[] freeIndex) => Array.IndexOf(freeIndex, model.AreaIndex) >= 0;

    private static string FormatOhm(double r) => r >= 1e6 ? $"{r / 1e6:G3} MΩ" : r >= 1e3 ? $"{r / 1e3:G3} kΩ" : $"{r:G3} Ω";

    /// <summary>
    /// With the mass ratio free, m*, φ and d trade off: in the direct-tunnelling exponent they enter as d·√(m*·φ), and only the
    /// weak curvature of I(V) separates them. Says so, by name, when they are strongly correlated or one ran to an edge.
    /// </summary>
    private static void TradeOffWarning(JunctionCurrentModel model, int[] freeIndex, double[] thetaHat, ImmutableArray<double>.Builder corr,
        List<int> undetermined, ImmutableArray<string>.Builder warnings, List<string> diagnoses)
    {
        int mass = model.IndexOf(StandardParameters.MassRatio.Key);
        if (mass < 0 || Array.IndexOf(freeIndex, mass) < 0) return;
        int nFree = freeIndex.Length;
        double strongest = 0;
        int jm = Array.IndexOf(freeIndex, mass);
        if (corr.Count == nFree * nFree)
        {
            for (int b = 0; b < nFree; b++) if (b != jm && freeIndex[b] != model.AreaIndex) strongest = Math.Max(strongest, Math.Abs(corr[jm * nFree + b]));
        }
        if (undetermined.Count == 0 && strongest <= CorrelationWarningThreshold) return;
        diagnoses.Add("trade-off");
        warnings.Add("trade-off: the effective mass ratio, barrier height and thickness enter the tunnelling exponent together as d·√(m*·φ); " +
                     $"with all three free these data cannot separate them (largest correlation with m* {strongest:0.000}" +
                     (undetermined.Count > 0 ? ", and the fit ran to the edge of the physical range" : "") +
                     $"). Keep the mass ratio fixed (leave out {Remedy.Free("mass-ratio")}; set {new Remedy(RemedyKind.MassRatio)} from the literature for this barrier) or fix " +
                     $"the thickness from ellipsometry ({Remedy.Fix("thickness=NM")})");
        _ = thetaHat;
    }

    /// <summary>
    /// Data-driven starts for free parasitic elements without a given start: a parallel leak at 10 % of the smallest
    /// |I/V| of the curve (the low-bias conductance it would have to explain), a series resistance at 2 % of |V/I| at the
    /// largest bias (a few per cent of the bias dropped across it). Offsets start at zero.
    /// </summary>
    private static void ParasiticStarts(JunctionCurrentModel model, double[] theta, bool[] isFree, FitOptions options, double[] v, double[] y)
    {
        if (v.Length == 0) return;
        double minConductance = double.PositiveInfinity, topResistance = 0, topV = 0;
        for (int i = 0; i < v.Length; i++)
        {
            double g = Math.Exp(y[i]) / Math.Abs(v[i]);
            minConductance = Math.Min(minConductance, g);
            if (Math.Abs(v[i]) > topV) { topV = Math.Abs(v[i]); topResistance = 1.0 / g; }
        }
        if (model.LeakageConductanceIndex is int leak && isFree[leak] && !options.StartValues.ContainsKey(model.Parameters[leak].Id))
        {
            theta[leak] = 0.1 * minConductance;
        }
        if (model.SeriesResistanceIndex is int rs && isFree[rs] && !options.StartValues.ContainsKey(model.Parameters[rs].Id))
        {
            theta[rs] = 0.02 * topResistance;
        }
    }

    /// <summary>
    /// What to change when parameters <paramref name="keyA"/> and <paramref name="keyB"/> cannot be told apart, in words with
    /// the structured remedies as placeholders (<see cref="Common.Remedy"/>): the caller words them with its own option names.
    /// </summary>
    internal static string RemedyText(string keyA, string keyB)
    {
        if (keyA == "area_m2" || keyB == "area_m2")
        {
            return $"fix the area from the lithography ({Remedy.GiveArea}), or widen the bias range so that the curvature of I(V) pins the barrier";
        }
        if (keyA == "mass_ratio" || keyB == "mass_ratio")
        {
            return "keep the mass ratio fixed (the default) at a value from the literature for this oxide";
        }
        return "widen the bias range, or fix one of them from an independent measurement (ellipsometry thickness)";
    }

    /// <summary>The runs test in words: its z value, or, when z is infinite, what that means.</summary>
    internal static string RunsText(double z) =>
        double.IsFinite(z) ? $"runs test z = {z:0.0}" : "the residuals have one sign throughout (a single run)";

    /// <summary>
    /// Wald–Wolfowitz runs test on the signs of the residuals ordered by voltage:
    /// z = (R − E[R]) / √Var[R], E[R] = 2n₊n₋/n + 1, Var[R] = 2n₊n₋(2n₊n₋ − n) / (n²(n − 1)).
    /// Source: A. Wald and J. Wolfowitz, Ann. Math. Stat. 11, 147 (1940).
    /// </summary>
    internal static double RunsTestZ(ReadOnlySpan<double> allVoltageV, ReadOnlySpan<double> residuals, bool[] used)
    {
        var order = new double[residuals.Length];
        var res = residuals.ToArray();
        for (int i = 0, u = 0; i < used.Length; i++) if (used[i]) order[u++] = allVoltageV[i];
        SortKernels.SortWithItems(order, res);
        return RunsTestZ(res);
    }

    /// <summary>Runs-test z of a sequence of residuals in the given order (zeros are skipped).</summary>
    internal static double RunsTestZ(ReadOnlySpan<double> orderedResiduals)
    {
        int nPos = 0, nNeg = 0, runs = 0, last = 0;
        foreach (double r in orderedResiduals)
        {
            int s = Math.Sign(r);
            if (s == 0) continue;
            if (s > 0) nPos++; else nNeg++;
            if (s != last) runs++;
            last = s;
        }
        double nTot = nPos + nNeg;
        if (nPos == 0 || nNeg == 0) return nTot > 10 ? double.NegativeInfinity : 0.0;
        double e = 2.0 * nPos * nNeg / nTot + 1.0;
        double var = 2.0 * nPos * nNeg * (2.0 * nPos * nNeg - nTot) / (nTot * nTot * (nTot - 1.0));
        return var > 0 ? (runs - e) / Math.Sqrt(var) : 0.0;
    }

    /// <summary>
    /// Log-spaced grid over φ ∈ [0.2, 6] eV and d ∈ [0.3, 8] nm (only the free ones), evaluated on at most
    /// <see cref="GridPoints"/> points spread evenly over the curve, with the area profiled out in closed form when it is
    /// free. Returns the best <paramref name="count"/> grid points that are not grid neighbours of a better one.
    /// <para>
    /// With the area fixed and one or two starts wanted, a cell is abandoned as soon as its partial cost (a sum of
    /// non-negative terms, so never more than its full cost) exceeds what is needed for it to be picked: with one start,
    /// the cost of a finished cell; with two, the larger cost of two finished cells at least three cells apart (no cell
    /// neighbours both, so two picks come before any cell costlier than both). The finished cells' costs are the same sums
    /// in the same order as <see cref="GridStartsExhaustive"/>, so the picks are the same; should two candidate costs tie
    /// exactly, the abandoned cells are finished and the exhaustive ranking decides.
    /// </para>
    /// </summary>
    internal static List<double[]> GridStarts(JunctionCurrentModel model, double[] template, bool[] isFree,
        double[] vAll, double[] yAll, double[] invSigmaAll, int count)
    {
        var grid = new StartGrid(model, template, isFree, vAll, yAll, invSigmaAll);
        if (grid.AreaFree || count > 2 || grid.Cells < 2) return grid.Exhaustive(count);

        int cells = grid.Cells;
        var costs = new double[cells];
        var done = new bool[cells];
        var finished = new int[cells];
        int finishedCount = 0;
        double threshold = double.PositiveInfinity;
        bool anyAbandoned = false;

        void Finish(int cell, double cost)
        {
            costs[cell] = cost;
            done[cell] = true;
            if (count == 1)
            {
                threshold = Math.Min(threshold, cost);
            }
            else if (cost < threshold)
            {
                int row = grid.Row(cell), column = grid.Column(cell);
                for (int k = 0; k < finishedCount; k++)
                {
                    int other = finished[k];
                    if (Math.Abs(grid.Row(other) - row) >= 3 || Math.Abs(grid.Column(other) - column) >= 3)
                    {
                        threshold = Math.Min(threshold, Math.Max(cost, costs[other]));
                    }
                }
            }
            finished[finishedCount++] = cell;
        }

        // Seeds first (cells 1, 4, 7 along each free axis: pairwise three apart), so that the threshold is low early.
        for (int cell = 0; cell < cells; cell++)
        {
            if (grid.IsSeed(cell)) Finish(cell, grid.Cost(cell, double.PositiveInfinity));
        }
        for (int cell = 0; cell < cells; cell++)
        {
            if (done[cell]) continue;
            double cost = grid.Cost(cell, threshold);
            if (double.IsNaN(cost))
            {
                anyAbandoned = true;
                continue;
            }
            Finish(cell, cost);
        }
        if (!anyAbandoned) return grid.Pick(costs, count);

        // The finished cells in ascending cost (insertion sort: a few dozen), then the greedy pick of the exhaustive ranking.
        var sorted = finished.AsSpan(0, finishedCount).ToArray();
        for (int i = 1; i < sorted.Length; i++)
        {
            int x = sorted[i];
            int j = i - 1;
            while (j >= 0 && costs[sorted[j]] > costs[x])
            {
                sorted[j + 1] = sorted[j];
                j--;
            }
            sorted[j + 1] = x;
        }
        var chosen = new List<int>(count);
        int last = -1;
        for (int i = 0; i < sorted.Length && chosen.Count < count; i++)
        {
            if (!grid.NeighboursAny(sorted[i], chosen))
            {
                chosen.Add(sorted[i]);
                last = i;
            }
        }
        bool unique = chosen.Count == count && double.IsFinite(costs[sorted[last]]);
        for (int i = 0; unique && i <= last && i + 1 < sorted.Length; i++)
        {
            unique = costs[sorted[i]] != costs[sorted[i + 1]];
        }
        if (!unique)
        {
            for (int cell = 0; cell < cells; cell++)
            {
                if (!done[cell]) costs[cell] = grid.Cost(cell, double.PositiveInfinity);
            }
            return grid.Pick(costs, count);
        }
        return grid.Starts(chosen);
    }

    /// <summary>The start grid of <see cref="GridStarts"/>, every cell evaluated on every grid point (the reference ranking).</summary>
    internal static List<double[]> GridStartsExhaustive(JunctionCurrentModel model, double[] template, bool[] isFree,
        double[] vAll, double[] yAll, double[] invSigmaAll, int count)
        => new StartGrid(model, template, isFree, vAll, yAll, invSigmaAll).Exhaustive(count);

    /// <summary>The cells, points and costs of the start grid.</summary>
    private sealed class StartGrid
    {
        private readonly JunctionCurrentModel _model;
        private readonly double[] _template;
        private readonly double[] _theta;
        private readonly double[] _v, _y, _w;
        private readonly double[] _r;
        private readonly double[] _logAreas;
        private readonly int[] _rows, _columns;
        private readonly int _phiIndex, _dIndex, _areaIndex, _nPhi, _nD, _m;
        private readonly bool _phiFree, _dFree;
        private readonly double _sw, _fixedLogArea;

        public StartGrid(JunctionCurrentModel model, double[] template, bool[] isFree, double[] vAll, double[] yAll, double[] invSigmaAll)
        {
            _model = model;
            _template = template;
            _phiIndex = model.IndexOf(StandardParameters.BarrierHeight.Key);
            _dIndex = model.IndexOf(StandardParameters.Thickness.Key);
            _areaIndex = model.AreaIndex;
            _phiFree = _phiIndex >= 0 && isFree[_phiIndex];
            _dFree = _dIndex >= 0 && isFree[_dIndex];
            AreaFree = isFree[_areaIndex];
            _nPhi = _phiFree ? GridSize : 1;
            _nD = _dFree ? GridSize : 1;
            _m = Math.Min(GridPoints, vAll.Length);
            _v = new double[_m];
            _y = new double[_m];
            _w = new double[_m];
            _r = new double[_m];
            for (int i = 0; i < _m; i++)
            {
                int src = (int)((long)i * (vAll.Length - 1) / Math.Max(_m - 1, 1));
                _v[i] = vAll[src];
                _y[i] = yAll[src];
                _w[i] = invSigmaAll[src] * invSigmaAll[src];
            }
            for (int i = 0; i < _m; i++) _sw += _w[i];
            _logAreas = new double[_nPhi * _nD];
            _rows = new int[_nPhi * _nD];
            _columns = new int[_nPhi * _nD];
            for (int cell = 0; cell < _rows.Length; cell++)
            {
                _rows[cell] = cell / _nD;
                _columns[cell] = cell % _nD;
            }
            _theta = (double[])template.Clone();
            _fixedLogArea = Math.Log(template[_areaIndex]);
            if (AreaFree) _theta[_areaIndex] = 1.0;
        }

        public bool AreaFree { get; }

        /// <summary>Grid φ: the standard grid, or spread over the fit bounds when <see cref="FitOptions.Bounds"/> narrow them.</summary>
        private double Phi(int a) => Spread(_model.Parameters[_phiIndex], GridPhi(0), GridPhi(GridSize - 1), a) ?? GridPhi(a);

        /// <summary>Grid d: the standard grid, or spread over the fit bounds.</summary>
        private double Thickness(int b) => Spread(_model.Parameters[_dIndex], GridThickness(0), GridThickness(GridSize - 1), b) ?? GridThickness(b);

        /// <summary>
        /// Null when the fit bounds hold the whole standard grid [<paramref name="gridLow"/>, <paramref name="gridHigh"/>];
        /// otherwise cell <paramref name="index"/> of a log-spaced grid over the part of it inside the bounds (or over the
        /// bounds themselves when they miss it), at cell centres so that no start sits on a bound.
        /// </summary>
        private static double? Spread(ParameterDefinition def, double gridLow, double gridHigh, int index)
        {
            if (def.LowerSi < gridLow && def.UpperSi > gridHigh) return null;
            double lo = Math.Max(gridLow, def.LowerSi), hi = Math.Min(gridHigh, def.UpperSi);
            if (!(lo < hi))
            {
                lo = def.LowerSi;
                hi = double.IsFinite(def.UpperSi) ? def.UpperSi : 10.0 * def.LowerSi;
                if (!(lo > 0)) lo = 0.01 * hi;
            }
            double t = (index + 0.5) / GridSize;
            return Math.Exp(Math.Log(lo) + (Math.Log(hi) - Math.Log(lo)) * t);
        }

        public int Cells => _nPhi * _nD;

        /// <summary>The φ index of a cell.</summary>
        public int Row(int cell) => _rows[cell];

        /// <summary>The d index of a cell.</summary>
        public int Column(int cell) => _columns[cell];

        public bool IsSeed(int cell)
            => (!_phiFree || cell / _nD % 3 == 1) && (!_dFree || cell % _nD % 3 == 1);

        public bool NeighboursAny(int cell, List<int> chosen)
        {
            foreach (int c in chosen)
            {
                if (Math.Abs(c / _nD - cell / _nD) <= 1 && Math.Abs(c % _nD - cell % _nD) <= 1) return true;
            }
            return false;
        }

        /// <summary>
        /// The cost of a cell (+∞ when not finite), or NaN once a partial sum exceeds <paramref name="abandonAbove"/> (area
        /// fixed only; +∞ never abandons).
        /// </summary>
        public double Cost(int cell, double abandonAbove)
        {
            if (_phiFree) _theta[_phiIndex] = Phi(cell / _nD);
            if (_dFree) _theta[_dIndex] = Thickness(cell % _nD);
            int m = _m;
            double[] v = _v, y = _y, w = _w, r = _r;
            if (!AreaFree)
            {
                // c = 0: the same terms w·(r − 0)·(r − 0) summed in the same order as below.
                double partial = 0;
                for (int i = 0; i < m; i++)
                {
                    double ri = y[i] - LogCurrentProblem.LogModel(_model.Current(v[i], _theta), v[i]);
                    partial += w[i] * (ri - 0.0) * (ri - 0.0);
                    if (partial > abandonAbove) return double.NaN;
                }
                _logAreas[cell] = _fixedLogArea;
                return double.IsFinite(partial) ? partial : double.PositiveInfinity;
            }
            double swr = 0;
            for (int i = 0; i < m; i++)
            {
                r[i] = y[i] - LogCurrentProblem.LogModel(_model.Current(v[i], _theta), v[i]);
                swr += w[i] * r[i];
            }
            double c = swr / _sw;
            double cost = 0;
            for (int i = 0; i < m; i++) cost += w[i] * (r[i] - c) * (r[i] - c);
            _logAreas[cell] = c;
            return double.IsFinite(cost) ? cost : double.PositiveInfinity;
        }

        public List<double[]> Exhaustive(int count)
        {
            var costs = new double[Cells];
            for (int cell = 0; cell < costs.Length; cell++) costs[cell] = Cost(cell, double.PositiveInfinity);
            return Pick(costs, count);
        }

        /// <summary>The best <paramref name="count"/> cells that are not neighbours of a better one, from every cell's cost.</summary>
        public List<double[]> Pick(double[] costs, int count)
        {
            var order = new int[costs.Length];
            for (int k = 0; k < order.Length; k++) order[k] = k;
            Array.Sort((double[])costs.Clone(), order);
            var chosen = new List<int>();
            foreach (int cell in order)
            {
                if (chosen.Count >= count) break;
                if (!NeighboursAny(cell, chosen)) chosen.Add(cell);
            }
            return Starts(chosen);
        }

        public List<double[]> Starts(List<int> chosen)
        {
            var starts = new List<double[]>(chosen.Count);
            foreach (int cell in chosen)
            {
                var start = (double[])_template.Clone();
                if (_phiFree) start[_phiIndex] = Phi(cell / _nD);
                if (_dFree) start[_dIndex] = Thickness(cell % _nD);
                if (AreaFree) start[_areaIndex] = Math.Exp(_logAreas[cell]);
                starts.Add(start);
            }
            return starts;
        }
    }

    /// <summary>Grid cells per free barrier parameter.</summary>
    private const int GridSize = 9;

    /// <summary>Points of the curve used to rank grid cells.</summary>
    private const int GridPoints = 32;

    private static double GridPhi(int a) => PhysicalConstants.JoulePerElectronVolt * 0.2 * Math.Pow(30.0, a / (GridSize - 1.0));

    private static double GridThickness(int b) => 0.3e-9 * Math.Pow(8.0 / 0.3, b / (GridSize - 1.0));
}
