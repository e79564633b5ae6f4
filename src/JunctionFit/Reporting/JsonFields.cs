using System.Text.Json;

namespace JunctionFit.Reporting;

/// <summary>The JSON writers' shared rule for missing values: a non-finite or absent number, or an absent text, is null.</summary>
internal static class JsonFields
{
    /// <summary>Writes <paramref name="name"/>: the number when it is finite, otherwise null.</summary>
    public static void WriteNumberOrNull(this Utf8JsonWriter w, string name, double? value)
    {
        if (value is double v && double.IsFinite(v)) w.WriteNumber(name, v);
        else w.WriteNull(name);
    }

    /// <summary>Writes an array element: the number when it is finite, otherwise null.</summary>
    public static void WriteNumberValueOrNull(this Utf8JsonWriter w, double value)
    {
        if (double.IsFinite(value)) w.WriteNumberValue(value);
        else w.WriteNullValue();
    }

    /// <summary>Writes <paramref name="name"/>: the integer, or null.</summary>
    public static void WriteIntegerOrNull(this Utf8JsonWriter w, string name, int? value)
    {
        if (value is int v) w.WriteNumber(name, v);
        else w.WriteNull(name);
    }

    /// <summary>Writes <paramref name="name"/>: the text, or null.</summary>
    public static void WriteStringOrNull(this Utf8JsonWriter w, string name, string? value)
    {
        if (value is null) w.WriteNull(name);
        else w.WriteString(name, value);
    }
}
