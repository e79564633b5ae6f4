using System.Buffers;
using System.Collections.Immutable;
using System.Text;
using System.Text.Json;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>
/// How the values of a result that have no column type of their own are held in the database: NaN as NULL, the status as
/// its text, the warnings as a JSON array, the correlation matrix as <c>{"keys": [...], "matrix": [...]}</c>. Both engines
/// use the same codecs, so a result reads back the same from either.
/// </summary>
internal static class StoredColumnCodecs
{
    /// <summary>NaN becomes SQL NULL (databases do not all store NaN).</summary>
    internal static double? Finite(double? x) => x is double v && !double.IsNaN(v) ? v : null;

    /// <summary>The status column read back.</summary>
    /// <exception cref="ResultStoreException">Not ok, poor-fit or failed.</exception>
    internal static FitStatus ParseStatus(string text) => ResultSchema.TryParseStatus(text, out var status)
        ? status
        : throw new ResultStoreException($"status '{text}' in the database is not ok, poor-fit or failed");

    /// <summary>The warnings as a JSON array of strings.</summary>
    internal static string WarningsJson(ImmutableArray<string> warnings)
    {
        var buffer = new ArrayBufferWriter<byte>(64);
        using (var w = new Utf8JsonWriter(buffer))
        {
            w.WriteStartArray();
            foreach (string s in warnings) w.WriteStringValue(s);
            w.WriteEndArray();
        }
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>The warnings read back from their JSON array.</summary>
    internal static ImmutableArray<string> ParseWarnings(string json)
    {
        using var doc = JsonDocument.Parse(json);
        var b = ImmutableArray.CreateBuilder<string>(doc.RootElement.GetArrayLength());
        foreach (var e in doc.RootElement.EnumerateArray()) b.Add(e.GetString() ?? "");
        return b.MoveToImmutable();
    }

    /// <summary><c>{"keys": [...], "matrix": [row-major, null for NaN]}</c>.</summary>
    internal static string CorrelationJson(FitResult r)
    {
        var buffer = new ArrayBufferWriter<byte>(128);
        using (var w = new Utf8JsonWriter(buffer))
        {
            w.WriteStartObject();
            w.WriteStartArray("keys");
            foreach (string k in r.CorrelationKeys) w.WriteStringValue(k);
            w.WriteEndArray();
            w.WriteStartArray("matrix");
            foreach (double x in r.CorrelationRowMajor)
            {
                if (double.IsFinite(x)) w.WriteNumberValue(x); else w.WriteNullValue();
            }
            w.WriteEndArray();
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>Correlation keys and matrix read back (null entries become NaN).</summary>
    internal static (ImmutableArray<string>, ImmutableArray<double>) ParseCorrelation(string json)
    {
        using var doc = JsonDocument.Parse(json);
        var keys = doc.RootElement.GetProperty("keys").EnumerateArray().Select(e => e.GetString() ?? "").ToImmutableArray();
        var matrix = doc.RootElement.GetProperty("matrix").EnumerateArray()
            .Select(e => e.ValueKind == JsonValueKind.Number ? e.GetDouble() : double.NaN).ToImmutableArray();
        return (keys, matrix);
    }
}
