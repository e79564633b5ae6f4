using System.Globalization;
using System.Runtime.CompilerServices;

namespace JunctionFit.Common;

/// <summary>
/// The one place for argument preconditions. One rule for numbers: every check on a <see cref="double"/> rejects NaN and
/// both infinities before it looks at the range, and every refusal is an <see cref="ArgumentOutOfRangeException"/> that
/// names the argument and carries the value.
/// <para>
/// The argument is named by the expression passed; inside a property's <c>init</c> accessor (where that expression is
/// <c>value</c>) it is named by the property.
/// </para>
/// </summary>
internal static class Guard
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Throws unless <paramref name="value"/> is a finite number.</summary>
    public static double Finite(double value, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => double.IsFinite(value) ? value : throw Refuse(value, "must be a finite number", name, member);

    /// <summary>Throws unless <paramref name="value"/> is finite and strictly positive.</summary>
    public static double Positive(double value, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => double.IsFinite(value) && value > 0 ? value : throw Refuse(value, "must be a finite number greater than zero", name, member);

    /// <summary>Throws unless <paramref name="value"/> is finite and not negative.</summary>
    public static double NonNegative(double value, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => double.IsFinite(value) && value >= 0 ? value : throw Refuse(value, "must be a finite number not below zero", name, member);

    /// <summary>Throws unless <paramref name="value"/> is finite and at least <paramref name="minimum"/>.</summary>
    public static double AtLeast(double value, double minimum, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => double.IsFinite(value) && value >= minimum ? value
            : throw Refuse(value, string.Create(Inv, $"must be a finite number of at least {minimum}"), name, member);

    /// <summary>Throws unless <paramref name="value"/> is finite and above <paramref name="limit"/>.</summary>
    public static double Above(double value, double limit, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => double.IsFinite(value) && value > limit ? value
            : throw Refuse(value, string.Create(Inv, $"must be a finite number above {limit}"), name, member);

    /// <summary>Throws unless <paramref name="value"/> is finite and within [<paramref name="minimum"/>, <paramref name="maximum"/>].</summary>
    /// <param name="value">The argument.</param>
    /// <param name="minimum">Smallest value accepted.</param>
    /// <param name="maximum">Largest value accepted.</param>
    /// <param name="range">The range in the caller's words (for example "1e12 and 1e20 cm^-3" for a value held in m⁻³); default the two ends.</param>
    /// <param name="name">The argument's name.</param>
    /// <param name="member">The calling member (names the argument inside an <c>init</c> accessor).</param>
    public static double InRange(double value, double minimum, double maximum, string? range = null,
        [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => double.IsFinite(value) && value >= minimum && value <= maximum ? value
            : throw Refuse(value, "must lie between " + (range ?? string.Create(Inv, $"{minimum} and {maximum}")), name, member);

    /// <summary>Throws unless <paramref name="value"/> is finite and strictly between <paramref name="low"/> and <paramref name="high"/>.</summary>
    public static double StrictlyBetween(double value, double low, double high, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => double.IsFinite(value) && value > low && value < high ? value
            : throw Refuse(value, string.Create(Inv, $"must lie strictly between {low} and {high}"), name, member);

    /// <summary>Throws unless <paramref name="value"/> is at least <paramref name="minimum"/>.</summary>
    public static int AtLeast(int value, int minimum, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => value >= minimum ? value : throw Refuse(value, string.Create(Inv, $"must be at least {minimum}"), name, member);

    /// <summary>Throws unless <paramref name="value"/> lies in [<paramref name="minimum"/>, <paramref name="maximum"/>].</summary>
    public static int InRange(int value, int minimum, int maximum, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => value >= minimum && value <= maximum ? value : throw Refuse(value, string.Create(Inv, $"must be {minimum} to {maximum}"), name, member);

    /// <summary>Throws unless <paramref name="value"/> lies in [<paramref name="minimum"/>, <paramref name="maximum"/>].</summary>
    public static long InRange(long value, long minimum, long maximum, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => value >= minimum && value <= maximum ? value : throw Refuse(value, string.Create(Inv, $"must be {minimum} to {maximum}"), name, member);

    /// <summary>Throws unless <paramref name="value"/> is more than zero and at most <paramref name="maximum"/>.</summary>
    public static TimeSpan Duration(TimeSpan value, TimeSpan maximum, [CallerArgumentExpression(nameof(value))] string? name = null, [CallerMemberName] string member = "")
        => value > TimeSpan.Zero && value <= maximum ? value
            : throw Refuse(value, string.Create(Inv, $"must be more than zero and at most {maximum}"), name, member);

    private static ArgumentOutOfRangeException Refuse(object value, string rule, string? name, string member)
        => new(name == "value" && member.Length > 0 ? member : name, value, rule);
}
