using JunctionFit.Common;
namespace JunctionFit.Planning;

/// <summary>The words every plan carries about electrical stress, in the text and the JSON output.</summary>
public static class PlanSafety
{
    /// <summary>The safety notes, one sentence each.</summary>
    public static IReadOnlyList<string> Notes { get; } =
    [
        $"A recommended sweep never exceeds the stated {new Remedy(RemedyKind.MaxBias)} or {new Remedy(RemedyKind.MaxField)} limit; without a stated limit no sweep is recommended.",
        "The field at which an oxide breaks down or degrades depends on the oxide, its thickness and its quality (deposition, defects, " +
        "interfaces, temperature, stress time); the limits used here are the ones you stated, not a property of the device.",
        "Your lab's own stress rules and the instrument maker's limits (voltage, current, compliance settings) govern; check the sweep against them before measuring.",
        "junctionfit never drives an instrument: this is a prediction to plan a measurement, not a control program.",
    ];
}
