namespace JunctionFit.Physics;

/// <summary>
/// Which parasitic elements a <see cref="JunctionCurrentModel"/> carries as extra parameters. Immutable.
/// Circuit: the tunnel junction (A·J) and the leakage conductance G_leak in parallel, that pair in series with R_s,
/// and the instrument offsets outside: I_measured = I + I₀ with I = A·J(V_j) + G_leak·V_j, V_j = V − V₀ − I·R_s.
/// </summary>
public sealed record ParasiticOptions
{
    /// <summary>No parasitic elements (the behaviour of the one-argument constructor).</summary>
    public static ParasiticOptions None { get; } = new();

    /// <summary>Adds <c>series_resistance_ohm</c> (R_s; the current is then the root of an implicit equation).</summary>
    public bool SeriesResistance { get; init; }

    /// <summary>Adds <c>leakage_conductance_S</c> (G_leak, ohmic leakage in parallel with the barrier).</summary>
    public bool LeakageConductance { get; init; }

    /// <summary>Adds <c>voltage_offset_V</c> (V₀, subtracted from the applied bias).</summary>
    public bool VoltageOffset { get; init; }

    /// <summary>Adds <c>current_offset_A</c> (I₀, added to the measured current).</summary>
    public bool CurrentOffset { get; init; }

    /// <summary>True when any element is enabled.</summary>
    public bool Any => SeriesResistance || LeakageConductance || VoltageOffset || CurrentOffset;
}
