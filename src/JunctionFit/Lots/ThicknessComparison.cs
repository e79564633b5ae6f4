using System.Collections.Immutable;
using System.Globalization;
using MathNet.Numerics.Distributions;
using JunctionFit.Import;
using JunctionFit.Results;
using JunctionFit.Physics;
using JunctionFit.Common;

namespace JunctionFit.Lots;

/// <summary>Whether electrical and ellipsometric thicknesses are paired per wafer or per die site.</summary>
public enum ThicknessMatchLevel
{
    /// <summary>(lot, wafer): the median electrical thickness of the wafer's good dies against the wafer's value.</summary>
    Wafer,

    /// <summary>(lot, wafer, die_x, die_y): each good die against the value at its site.</summary>
    Site,
}

/// <summary>One matched pair.</summary>
/// <param name="Lot">Lot.</param>
/// <param name="Wafer">Wafer.</param>
/// <param name="DieX">Die column (site matching), else null.</param>
/// <param name="DieY">Die row (site matching), else null.</param>
/// <param name="ElectricalNm">Electrical thickness in nm (per wafer: median over its good dies).</param>
/// <param name="EllipsometricNm">Ellipsometric thickness in nm.</param>
/// <param name="DieCount">Good dies behind <see cref="ElectricalNm"/>.</param>
public sealed record ThicknessPair(string Lot, string Wafer, int? DieX, int? DieY, double ElectricalNm, double EllipsometricNm, int DieCount)
{
    /// <summary>Electrical − ellipsometric, nm.</summary>
    public double DifferenceNm => ElectricalNm - EllipsometricNm;

    /// <summary>Mean of the two, nm (the x axis of a Bland–Altman plot).</summary>
    public double MeanNm => 0.5 * (ElectricalNm + EllipsometricNm);
}

/// <summary>A result row that was not compared, and why.</summary>
/// <param name="File">The row's I–V file.</param>
/// <param name="Lot">Lot.</param>
/// <param name="Wafer">Wafer.</param>
/// <param name="DieX">Die column.</param>
/// <param name="DieY">Die row.</param>
/// <param name="Reason">Why, in words.</param>
public sealed record UnmatchedResult(string File, string? Lot, string? Wafer, int? DieX, int? DieY, string Reason);

/// <summary>An ellipsometry row that was not compared, and why.</summary>
/// <param name="Row">The row.</param>
/// <param name="Reason">Why, in words.</param>
public sealed record UnmatchedEllipsometry(EllipsometryRow Row, string Reason);

/// <summary>
/// Agreement of two methods from paired differences (Bland &amp; Altman, Lancet 327 (8476), 307–310, 1986):
/// bias d̄ with its 95 % t interval d̄ ± t_{0.975, n−1} s/√n, and the 95 % limits of agreement d̄ ± 1.96 s with
/// their approximate 95 % intervals, limit ± t_{0.975, n−1} √(3 s²/n) (the same paper's standard error of a limit).
/// </summary>
/// <param name="N">Pairs.</param>
/// <param name="BiasNm">Mean difference d̄, nm.</param>
/// <param name="BiasLower95Nm">Lower end of the bias interval.</param>
/// <param name="BiasUpper95Nm">Upper end of the bias interval.</param>
/// <param name="DifferenceSdNm">Sample SD of the differences s (n − 1), nm.</param>
/// <param name="LowerLimitNm">d̄ − 1.96 s.</param>
/// <param name="UpperLimitNm">d̄ + 1.96 s.</param>
/// <param name="LowerLimitLower95Nm">Lower end of the interval of the lower limit.</param>
/// <param name="LowerLimitUpper95Nm">Upper end of the interval of the lower limit.</param>
/// <param name="UpperLimitLower95Nm">Lower end of the interval of the upper limit.</param>
/// <param name="UpperLimitUpper95Nm">Upper end of the interval of the upper limit.</param>
public sealed record AgreementStatistics(
    int N, double BiasNm, double BiasLower95Nm, double BiasUpper95Nm, double DifferenceSdNm,
    double LowerLimitNm, double UpperLimitNm,
    double LowerLimitLower95Nm, double LowerLimitUpper95Nm, double UpperLimitLower95Nm, double UpperLimitUpper95Nm);

/// <summary>Outcome of <see cref="ThicknessComparison.Compare"/>.</summary>
/// <param name="Level">How rows were paired.</param>
/// <param name="Pairs">Matched pairs, in ellipsometry-file order.</param>
/// <param name="Agreement">Bias and limits of agreement; null with fewer than 2 pairs (see <see cref="Reason"/>).</param>
/// <param name="Reason">Why there are no statistics; null when there are.</param>
/// <param name="UnmatchedResults">Result rows not compared, with reasons (never dropped silently).</param>
/// <param name="UnmatchedEllipsometry">Ellipsometry rows not compared, with reasons.</param>
public sealed record ThicknessComparisonResult(
    ThicknessMatchLevel Level, ImmutableArray<ThicknessPair> Pairs, AgreementStatistics? Agreement, string? Reason,
    ImmutableArray<UnmatchedResult> UnmatchedResults, ImmutableArray<UnmatchedEllipsometry> UnmatchedEllipsometry);

/// <summary>Outcome of the per-wafer consistency F-test.</summary>
/// <param name="F">F statistic (0 when the fixed fit is not worse).</param>
/// <param name="NumeratorDf">q, the number of parameters fixed.</param>
/// <param name="DenominatorDf">Residual degrees of freedom of the free fit.</param>
/// <param name="PValue">P(F_{q, df} ≥ F).</param>
/// <param name="Consistent">True when p &gt; α: fixing the parameters does not make the fit significantly worse.</param>
/// <param name="Verdict">The result in words.</param>
public sealed record ConsistencyTest(double F, int NumeratorDf, int DenominatorDf, double PValue, bool Consistent, string Verdict);

/// <summary>
/// Cross-check of the electrical barrier thickness against ellipsometry. Pure computation.
/// <list type="bullet">
/// <item><see cref="Compare"/> pairs good result rows (status ok, finite <c>thickness_nm</c>) with ellipsometry rows
/// per wafer or per site and computes electrical − ellipsometric bias and Bland–Altman limits of agreement;
/// every row on either side that is not used is listed with a reason.</item>
/// <item><see cref="ConsistencyFTest"/> compares a refit with d fixed to the ellipsometric value against the free fit
/// (extra-sum-of-squares F-test for nested least-squares models).</item>
/// </list>
/// </summary>
public static class ThicknessComparison
{
    /// <summary>Key of the thickness in result rows.</summary>
    public static string ThicknessKey => ParameterKey.Thickness.Name;

    /// <summary>z for 95 % limits of agreement, as in Bland &amp; Altman (1986).</summary>
    public const double LimitsZ = 1.96;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// Pairs <paramref name="results"/> with <paramref name="ellipsometry"/>. The level follows the ellipsometry:
    /// per site when every row has die coordinates, per wafer when none has.
    /// </summary>
    /// <param name="results">Result rows.</param>
    /// <param name="ellipsometry">Ellipsometry rows, all per wafer or all per site.</param>
    /// <returns>Pairs, statistics and the unmatched rows of both sides.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentException">The ellipsometry rows mix per-wafer and per-site values.</exception>
    public static ThicknessComparisonResult Compare(IReadOnlyList<ResultRow> results, IReadOnlyList<EllipsometryRow> ellipsometry)
    {
        ArgumentNullException.ThrowIfNull(results);
        ArgumentNullException.ThrowIfNull(ellipsometry);
        int sites = ellipsometry.Count(e => e.IsSite);
        if (sites != 0 && sites != ellipsometry.Count)
        {
            throw new ArgumentException("the ellipsometry rows mix per-wafer and per-site values; use one layout per file", nameof(ellipsometry));
        }
        var level = sites > 0 ? ThicknessMatchLevel.Site : ThicknessMatchLevel.Wafer;

        var unmatchedResults = ImmutableArray.CreateBuilder<UnmatchedResult>();
        var unmatchedEllipsometry = ImmutableArray.CreateBuilder<UnmatchedEllipsometry>();

        // Ellipsometry by key; a repeated key is listed, and only its first row is used.
        var ellipsometryByKey = new Dictionary<string, EllipsometryRow>(StringComparer.Ordinal);
        var ellipsometryOrder = new List<(string Key, EllipsometryRow Row)>();
        foreach (var e in ellipsometry)
        {
            string key = KeyOf(e.Lot, e.Wafer, level == ThicknessMatchLevel.Site ? e.DieX : null, level == ThicknessMatchLevel.Site ? e.DieY : null);
            if (ellipsometryByKey.TryGetValue(key, out var first))
            {
                unmatchedEllipsometry.Add(new UnmatchedEllipsometry(e, string.Create(Inv, $"repeats {Describe(e)} of line {first.SourceLine}; only the first is used")));
                continue;
            }
            ellipsometryByKey[key] = e;
            ellipsometryOrder.Add((key, e));
        }

        // Good electrical thicknesses by the same key; everything else is listed.
        var electrical = new Dictionary<string, List<double>>(StringComparer.Ordinal);
        foreach (var r in results)
        {
            string? why = ExclusionReason(r, level);
            if (why is not null)
            {
                unmatchedResults.Add(new UnmatchedResult(r.File, r.Lot, r.Wafer, r.DieX, r.DieY, why));
                continue;
            }
            string key = KeyOf(r.Lot!, r.Wafer!, level == ThicknessMatchLevel.Site ? r.DieX : null, level == ThicknessMatchLevel.Site ? r.DieY : null);
            if (!ellipsometryByKey.ContainsKey(key))
            {
                string what = level == ThicknessMatchLevel.Site ? "this site" : "this wafer";
                unmatchedResults.Add(new UnmatchedResult(r.File, r.Lot, r.Wafer, r.DieX, r.DieY, $"no ellipsometry value for {what}"));
                continue;
            }
            if (!electrical.TryGetValue(key, out var list)) electrical[key] = list = [];
            if (level == ThicknessMatchLevel.Site && list.Count > 0)
            {
                unmatchedResults.Add(new UnmatchedResult(r.File, r.Lot, r.Wafer, r.DieX, r.DieY, "another good result for this site came first; only the first is used"));
                continue;
            }
            list.Add(r.ValueOf(ThicknessKey)!.Value);
        }

        var pairs = ImmutableArray.CreateBuilder<ThicknessPair>();
        foreach (var (key, e) in ellipsometryOrder)
        {
            if (!electrical.TryGetValue(key, out var values))
            {
                string what = level == ThicknessMatchLevel.Site ? "no good result at this site" : "no good result on this wafer";
                unmatchedEllipsometry.Add(new UnmatchedEllipsometry(e, what));
                continue;
            }
            pairs.Add(new ThicknessPair(e.Lot, e.Wafer, e.DieX, e.DieY, LotStatistics.Median(values), e.ThicknessNm, values.Count));
        }

        var differences = pairs.Select(p => p.DifferenceNm).ToList();
        AgreementStatistics? agreement = differences.Count >= 2 ? BlandAltman(differences) : null;
        string? reason = agreement is null
            ? string.Create(Inv, $"{differences.Count} matched pair{(differences.Count == 1 ? "" : "s")}; at least 2 are needed for a bias interval and limits of agreement")
            : null;
        return new ThicknessComparisonResult(level, pairs.ToImmutable(), agreement, reason, unmatchedResults.ToImmutable(), unmatchedEllipsometry.ToImmutable());
    }

    /// <summary>
    /// Bias and limits of agreement from paired differences (Bland &amp; Altman 1986); see <see cref="AgreementStatistics"/>.
    /// t quantiles from MathNet.Numerics' Student t distribution with n − 1 degrees of freedom.
    /// </summary>
    /// <param name="differencesNm">Differences (method A − method B), at least 2, finite.</param>
    /// <returns>The statistics.</returns>
    /// <exception cref="ArgumentException">Fewer than 2 differences, or a non-finite one.</exception>
    public static AgreementStatistics BlandAltman(IReadOnlyList<double> differencesNm)
    {
        ArgumentNullException.ThrowIfNull(differencesNm);
        if (differencesNm.Count < 2) throw new ArgumentException("needs at least 2 differences", nameof(differencesNm));
        var (mean, variance) = LotStatistics.MeanAndVariance(differencesNm);
        int n = differencesNm.Count;
        double sd = Math.Sqrt(variance);
        double t = StudentT.InvCDF(0, 1, n - 1, 0.975);
        double biasHalf = t * sd / Math.Sqrt(n);
        double lower = mean - LimitsZ * sd;
        double upper = mean + LimitsZ * sd;
        double limitHalf = t * Math.Sqrt(3 * variance / n);
        return new AgreementStatistics(
            n, mean, mean - biasHalf, mean + biasHalf, sd, lower, upper,
            lower - limitHalf, lower + limitHalf, upper - limitHalf, upper + limitHalf);
    }

    /// <summary>
    /// Extra-sum-of-squares F-test of a nested fit: the free fit has residual sum of squares RSS_free with df_free
    /// residual degrees of freedom; the refit with q parameters fixed (d at the ellipsometric value) has RSS_fixed.
    /// F = ((RSS_fixed − RSS_free)/q) / (RSS_free/df_free), p = 1 − F_{q, df_free}(F) (MathNet.Numerics
    /// FisherSnedecor). Consistent when p &gt; α. The RSS must be weighted the same way in both fits.
    /// </summary>
    /// <param name="rssFree">RSS of the free fit, &gt; 0.</param>
    /// <param name="dfFree">Residual degrees of freedom of the free fit, ≥ 1.</param>
    /// <param name="rssFixed">RSS of the fit with the parameters fixed, ≥ 0.</param>
    /// <param name="parametersFixed">q, ≥ 1 (1 for d alone).</param>
    /// <param name="alpha">Significance level, in (0, 1).</param>
    /// <returns>F, p and a verdict in words. When RSS_fixed &lt; RSS_free (the free fit missed its optimum) F is 0 and the verdict says so.</returns>
    /// <exception cref="ArgumentOutOfRangeException">An argument is outside its range.</exception>
    public static ConsistencyTest ConsistencyFTest(double rssFree, int dfFree, double rssFixed, int parametersFixed = 1, double alpha = 0.05)
    {
        Guard.Positive(rssFree);
        Guard.NonNegative(rssFixed);
        Guard.AtLeast(dfFree, 1);
        Guard.AtLeast(parametersFixed, 1);
        Guard.StrictlyBetween(alpha, 0.0, 1.0);

        double raw = (rssFixed - rssFree) / parametersFixed / (rssFree / dfFree);
        double f = Math.Max(raw, 0);
        double p = f == 0 ? 1.0 : Math.Clamp(1.0 - FisherSnedecor.CDF(parametersFixed, dfFree, f), 0, 1);
        bool consistent = p > alpha;
        string stats = string.Create(Inv, $"F({parametersFixed}, {dfFree}) = {f:0.###}, p = {FormatP(p)}");
        string verdict;
        if (raw < 0)
        {
            verdict = $"consistent: the fit with d fixed is not worse than the free fit ({stats}); the free fit seems to have missed its optimum";
        }
        else if (consistent)
        {
            verdict = $"consistent: fixing d at the ellipsometric value does not make the fit significantly worse ({stats})";
        }
        else
        {
            verdict = string.Create(Inv, $"inconsistent: fixing d at the ellipsometric value makes the fit significantly worse at the {alpha:0.###} level ({stats})");
        }
        return new ConsistencyTest(f, parametersFixed, dfFree, p, consistent, verdict);
    }

    private static string FormatP(double p) => p < 1e-4 ? p.ToString("0.#e+0", Inv) : p.ToString("0.####", Inv);

    private static string? ExclusionReason(ResultRow r, ThicknessMatchLevel level)
    {
        if (!r.IsGood) return $"fit status {Results.ResultSchema.StatusText(r.Status)}: only good fits are compared";
        if (r.ValueOf(ThicknessKey) is null) return "no electrical thickness in this row";
        if (string.IsNullOrWhiteSpace(r.Lot) || string.IsNullOrWhiteSpace(r.Wafer)) return "the row names no lot or no wafer";
        if (level == ThicknessMatchLevel.Site && (r.DieX is null || r.DieY is null)) return "the row has no die coordinates for site matching";
        return null;
    }

    private static string KeyOf(string lot, string wafer, int? x, int? y)
        => x is int dx && y is int dy ? string.Create(Inv, $"{lot}\u001f{wafer}\u001f{dx}\u001f{dy}") : $"{lot}\u001f{wafer}";

    private static string Describe(EllipsometryRow e)
        => e.IsSite ? string.Create(Inv, $"lot {e.Lot} wafer {e.Wafer} die ({e.DieX}, {e.DieY})") : $"lot {e.Lot} wafer {e.Wafer}";
}
