using System.Collections.Immutable;

namespace JunctionFit.Import;

/// <summary>
/// One measured current–voltage sweep in SI units, as read from a file. Immutable.
/// </summary>
public sealed record IvCurve
{
    /// <summary>Creates a curve; voltage and current must have the same length.</summary>
    public IvCurve(string sourcePath, ImmutableArray<double> voltageV, ImmutableArray<double> currentA)
    {
        ArgumentNullException.ThrowIfNull(sourcePath);
        if (voltageV.IsDefault || currentA.IsDefault) throw new ArgumentException("voltage and current must be given");
        if (voltageV.Length != currentA.Length) throw new ArgumentException("voltage and current must have the same length");
        SourcePath = sourcePath;
        VoltageV = voltageV;
        CurrentA = currentA;
    }

    /// <summary>The path as the user gave it.</summary>
    public string SourcePath { get; }

    /// <summary>Bias in volt, in measurement order.</summary>
    public ImmutableArray<double> VoltageV { get; }

    /// <summary>Current in ampere, in measurement order.</summary>
    public ImmutableArray<double> CurrentA { get; }

    /// <summary>1-based line in the source file of each point (empty when not known).</summary>
    public ImmutableArray<int> SourceLines { get; init; } = [];

    /// <summary>Monotonic segment number of each point, 0-based (empty: one segment).</summary>
    public ImmutableArray<int> Segments { get; init; } = [];

    /// <summary>Points the importer flagged as unusable (compliance etc.); empty: none.</summary>
    public ImmutableArray<bool> ImportMask { get; init; } = [];

    /// <summary>Effective area from the file's metadata, in m², if given.</summary>
    public double? AreaM2 { get; init; }

    /// <summary>Temperature from the file's metadata, in kelvin, if given.</summary>
    public double? TemperatureK { get; init; }

    /// <summary>Current compliance from the file's metadata, in ampere, if given.</summary>
    public double? ComplianceA { get; init; }

    /// <summary>Lot name, if known.</summary>
    public string? Lot { get; init; }

    /// <summary>Wafer name, if known.</summary>
    public string? Wafer { get; init; }

    /// <summary>Die column on the wafer grid, if known.</summary>
    public int? DieX { get; init; }

    /// <summary>Die row on the wafer grid, if known.</summary>
    public int? DieY { get; init; }

    /// <summary>Every metadata key and value as found (keys lower-case).</summary>
    public ImmutableDictionary<string, string> Metadata { get; init; } = ImmutableDictionary<string, string>.Empty;

    /// <summary>Things the importer noticed and the user should know (skipped lines etc.).</summary>
    public ImmutableArray<string> Warnings { get; init; } = [];

    /// <summary>Number of points.</summary>
    public int Count => VoltageV.Length;
}
