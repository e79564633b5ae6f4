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

    /// <summary>
    /// Writes the object <c>"correlation": {"parameters": [keys], "matrix": [[…], …]}</c>; the matrix rows are rounded to 6
    /// digits, non-finite entries are null, and the matrix is empty when <paramref name="rowMajor"/> is not keys × keys.
    /// </summary>
    public static void WriteCorrelation(this Utf8JsonWriter w, IEnumerable<string> keys, int keyCount, ReadOnlySpan<double> rowMajor)
    {
        w.WriteStartObject("correlation");
        w.WriteStartArray("parameters");
        foreach (string k in keys) w.WriteStringValue(k);
        w.WriteEndArray();
        w.WriteStartArray("matrix");
        if (rowMajor.Length == keyCount * keyCount)
        {
            for (int a = 0; a < keyCount; a++)
            {
                w.WriteStartArray();
                for (int b = 0; b < keyCount; b++) w.WriteNumberValueOrNull(Math.Round(rowMajor[a * keyCount + b], 6));
                w.WriteEndArray();
            }
        }
        w.WriteEndArray();
        w.WriteEndObject();
    }
}
