using System.Collections.Immutable;
using JunctionFit.Physics;
using JunctionFit.Common;

namespace JunctionFit.Lots;

/// <summary>
/// How large a lot-to-lot shift must be to matter in practice, whatever its p-value: either an absolute amount
/// in the parameter's own unit, or a fraction of the reference mean.
/// </summary>
public sealed record PracticalThreshold
{
    private PracticalThreshold(double amount, bool isRelative)
    {
        Amount = Guard.NonNegative(amount);
        IsRelative = isRelative;
    }

    /// <summary>The amount: in the key's unit when absolute, a fraction (0.1 = 10 %) when relative.</summary>
    public double Amount { get; }

    /// <summary>True when <see cref="Amount"/> is a fraction of |reference mean|.</summary>
    public bool IsRelative { get; }

    /// <summary>A threshold in the parameter's own unit (eV for <c>barrier_height_eV</c>, nm for <c>thickness_nm</c>).</summary>
    /// <param name="amount">Finite, not negative.</param>
    /// <returns>The threshold.</returns>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="amount"/> is negative or not finite.</exception>
    public static PracticalThreshold Absolute(double amount) => new(amount, false);

    /// <summary>A threshold as a fraction of |reference mean| (0.10 = 10 %).</summary>
    /// <param name="fraction">Finite, not negative.</param>
    /// <returns>The threshold.</returns>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="fraction"/> is negative or not finite.</exception>
    public static PracticalThreshold Relative(double fraction) => new(fraction, true);

    /// <summary>The threshold in the parameter's unit, given the reference mean.</summary>
    /// <param name="referenceMean">Mean of the reference lot(s).</param>
    /// <returns>The absolute threshold.</returns>
    public double Resolve(double referenceMean) => IsRelative ? Amount * Math.Abs(referenceMean) : Amount;

    /// <summary>"0.05" or "10 %" for messages.</summary>
    /// <returns>The threshold in words.</returns>
    public override string ToString() => IsRelative
        ? (Amount * 100).ToString("0.###", System.Globalization.CultureInfo.InvariantCulture) + " % of the reference mean"
        : Amount.ToString("0.#####", System.Globalization.CultureInfo.InvariantCulture);
}

/// <summary>
/// Settings of <see cref="DriftAnalysis"/>. Immutable and checked on construction.
/// <para>
/// Default practical thresholds — common practice for process monitoring of tunnel barriers, no published source:
/// 0.05 eV for <c>barrier_height_eV</c>, 0.05 nm for <c>thickness_nm</c>, 0.05 V for <c>flatband_voltage_V</c> (the mos
/// model; a relative threshold would follow the sign and size of V_fb), 10 % of the reference mean for
/// <c>area_m2</c>, <c>mass_ratio</c>, <c>transition_voltage_V</c> and any other key.
/// </para>
/// </summary>
public sealed record DriftOptions
{
    private readonly double _alpha = 0.05;
    private readonly int _minimumGoodDies = 3;
    private readonly ImmutableArray<string> _referenceLots;

    /// <summary>Creates options with one or more reference lots.</summary>
    /// <param name="referenceLots">Reference lot names (at least one, none empty).</param>
    /// <exception cref="ArgumentException">No lot, or an empty name.</exception>
    public DriftOptions(params string[] referenceLots) => ReferenceLots = [.. referenceLots];

    /// <summary>Default thresholds (see the type's remarks).</summary>
    public static ImmutableDictionary<string, PracticalThreshold> DefaultThresholds { get; } =
        ImmutableDictionary.CreateRange(StringComparer.Ordinal,
        [
            new KeyValuePair<string, PracticalThreshold>(ParameterKey.BarrierHeight.Name, PracticalThreshold.Absolute(0.05)),
            new KeyValuePair<string, PracticalThreshold>(ParameterKey.Thickness.Name, PracticalThreshold.Absolute(0.05)),
            new KeyValuePair<string, PracticalThreshold>(ParameterKey.Area.Name, PracticalThreshold.Relative(0.10)),
            new KeyValuePair<string, PracticalThreshold>(ParameterKey.FlatBandVoltage.Name, PracticalThreshold.Absolute(0.05)),
        ]);

    /// <summary>Reference lots: their good dies are pooled as the reference sample, and they set the control limits.</summary>
    /// <exception cref="ArgumentException">Empty, or a name is empty.</exception>
    public ImmutableArray<string> ReferenceLots
    {
        get => _referenceLots;
        init
        {
            if (value.IsDefaultOrEmpty) throw new ArgumentException("at least one reference lot is needed", nameof(ReferenceLots));
            foreach (string lot in value)
            {
                if (string.IsNullOrWhiteSpace(lot)) throw new ArgumentException("a reference lot name is empty", nameof(ReferenceLots));
            }
            _referenceLots = [.. value.Distinct(StringComparer.Ordinal)];
        }
    }

    /// <summary>Family-wise significance level for the Holm procedure, in (0, 1); default 0.05.</summary>
    /// <exception cref="ArgumentOutOfRangeException">Outside (0, 1).</exception>
    public double Alpha
    {
        get => _alpha;
        init => _alpha = Guard.StrictlyBetween(value, 0.0, 1.0);
    }

    /// <summary>Fewest good dies a lot (and the reference) needs for a comparison; at least 2, default 3.</summary>
    /// <exception cref="ArgumentOutOfRangeException">Below 2.</exception>
    public int MinimumGoodDies
    {
        get => _minimumGoodDies;
        init => _minimumGoodDies = Guard.AtLeast(value, 2);
    }

    /// <summary>
    /// Keys to analyse; null: every parameter that was free in at least one good fit (has a standard error),
    /// in table order, then the transition voltage when present.
    /// </summary>
    public ImmutableArray<string>? ParameterKeys { get; init; }

    /// <summary>Lot order for the control chart; null: ordinal order of the names (lots not listed follow in that order).</summary>
    public ImmutableArray<string>? LotOrder { get; init; }

    /// <summary>Practical thresholds by key; keys not listed use <see cref="DefaultThreshold"/>.</summary>
    public ImmutableDictionary<string, PracticalThreshold> Thresholds { get; init; } = DefaultThresholds;

    /// <summary>Threshold for keys not in <see cref="Thresholds"/>; default 10 % of the reference mean.</summary>
    public PracticalThreshold DefaultThreshold { get; init; } = PracticalThreshold.Relative(0.10);

    /// <summary>The threshold that applies to <paramref name="key"/>.</summary>
    /// <param name="key">Parameter key.</param>
    /// <returns>The threshold.</returns>
    public PracticalThreshold ThresholdFor(string key) => Thresholds.TryGetValue(key, out var t) ? t : DefaultThreshold;
}
