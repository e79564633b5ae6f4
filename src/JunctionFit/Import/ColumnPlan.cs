using System.Collections.Immutable;

namespace JunctionFit.Import;

/// <summary>
/// Which columns of a table are read and how: the bias and current columns (0-based) with their units, whether the current
/// is a density (turned into current with <see cref="AreaM2"/>), the columns reported, and an optional current/density pair
/// from which the area is derived.
/// </summary>
    internal sealed record ColumnPlan(
        int VoltageIndex,
        int CurrentIndex,
        UnitScale VoltageUnit,
        UnitScale CurrentUnit,
        bool Density,
        double AreaM2,
        ImmutableArray<ImportColumn> Columns)
    {
        /// <summary>The current column holds |I| or |J|: the sign is taken from the bias.</summary>
        public bool Absolute { get; init; }

        /// <summary>A current and a density column for the area from I/J (-1: none).</summary>
        public int PairCurrentIndex { get; init; } = -1;

        public int PairDensityIndex { get; init; } = -1;

        public UnitScale PairCurrentUnit { get; init; } = UnitScale.Ampere;

        public UnitScale PairDensityUnit { get; init; } = UnitScale.AmperePerSquareCentimetre;

        public string PairText { get; init; } = string.Empty;
    }
