using System.Runtime.CompilerServices;

namespace JunctionFit.Common;

/// <summary>One place for argument preconditions: rejects NaN, infinities and out-of-range values, naming the argument.</summary>
internal static class Guard
{
    /// <summary>Throws unless <paramref name="value"/> is a finite number.</summary>
    public static double Finite(double value, [CallerArgumentExpression(nameof(value))] string? name = null)
    {
        if (!double.IsFinite(value))
        {
            throw new ArgumentOutOfRangeException(name, value, "must be a finite number");
        }
        return value;
    }

    /// <summary>Throws unless <paramref name="value"/> is finite and strictly positive.</summary>
    public static double Positive(double value, [CallerArgumentExpression(nameof(value))] string? name = null)
    {
        if (!double.IsFinite(value) || value <= 0)
        {
            throw new ArgumentOutOfRangeException(name, value, "must be a finite number greater than zero");
        }
        return value;
    }

    /// <summary>Throws unless <paramref name="value"/> is finite and not negative.</summary>
    public static double NonNegative(double value, [CallerArgumentExpression(nameof(value))] string? name = null)
    {
        if (!double.IsFinite(value) || value < 0)
        {
            throw new ArgumentOutOfRangeException(name, value, "must be a finite number not below zero");
        }
        return value;
    }

    /// <summary>Throws unless <paramref name="value"/> is at least <paramref name="minimum"/>.</summary>
    public static int AtLeast(int value, int minimum, [CallerArgumentExpression(nameof(value))] string? name = null)
    {
        if (value < minimum)
        {
            throw new ArgumentOutOfRangeException(name, value, $"must be at least {minimum}");
        }
        return value;
    }
}
