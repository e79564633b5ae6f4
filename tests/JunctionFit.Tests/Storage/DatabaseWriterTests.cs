using System.Text.Json;
using JunctionFit.Results;
using JunctionFit.Storage;
using JunctionFit.StoreCrashHelper;
using Xunit;

namespace JunctionFit.Tests.Storage;

public sealed class DatabaseWriterTests
{
    private static readonly RunInfo Run = new("20250314T101500Z-3f9c2a1b", new DateTimeOffset(2025, 3, 14, 10, 15, 0, TimeSpan.Zero), "1.0.0", "probe-7");

    [Fact]
    public void FormatCsv_Rows_HasResultsCsvColumnsInOrder()
    {
        var fittedAt = new DateTimeOffset(2025, 3, 14, 10, 16, 0, TimeSpan.Zero);
        var rows = new[] { DemoResults.Row(1, Run) with { FittedBy = "probe-7:4242", FittedAt = fittedAt }, DemoResults.Row(5, Run), DemoResults.Row(36, Run) };
        string csv = StoredResultsWriter.FormatCsv(rows);
        var lines = csv.Split('\n');
        Assert.Equal(
            "file,lot,wafer,die_x,die_y,model,status," +
            "barrier_height_eV,barrier_height_eV_stderr,barrier_height_eV_lo,barrier_height_eV_hi," +
            "thickness_nm,thickness_nm_stderr,thickness_nm_lo,thickness_nm_hi," +
            "area_m2,area_m2_stderr,area_m2_lo,area_m2_hi," +
            "mass_ratio,mass_ratio_stderr,mass_ratio_lo,mass_ratio_hi," +
            "series_resistance_ohm,series_resistance_ohm_stderr,series_resistance_ohm_lo,series_resistance_ohm_hi," +
            "reduced_chi2,transition_voltage_V,warnings,error," +
            "fitted_by,fitted_at," + // who fitted the result and when, after the core columns of results.csv
            "option_set", // the options that made it
            lines[0]);
        Assert.Equal(5, lines.Length); // header, three rows, and the empty text after the last line feed
        Assert.Equal("", lines[^1]);
        var p = rows[0].Result;
        string R(string key, Func<JunctionFit.Results.ParameterEstimate, double?> f) => f(p.Find(key)!)!.Value.ToString("R", System.Globalization.CultureInfo.InvariantCulture);
        string expected =
            $"KM-A01/W00/die_01_00.csv,KM-A01,W00,1,0,simmons,ok,{R("barrier_height_eV", e => e.Value)},0.004,{R("barrier_height_eV", e => e.Lower95)},"
            + $"{R("barrier_height_eV", e => e.Upper95)},{R("thickness_nm", e => e.Value)},0.002,{R("thickness_nm", e => e.Lower95)},{R("thickness_nm", e => e.Upper95)},"
            + "1E-10,,,,1,,,,,,,,1.03,0.801,,,probe-7:4242,2025-03-14T10:16:00.0000000+00:00,";
        Assert.StartsWith(expected, lines[1], StringComparison.Ordinal);
        // The option set: the canonical options text on one line (RFC 4180 quoted when it holds a comma).
        string cell = ResultSchema.OptionSetCell(rows[0].OptionsText)!;
        Assert.Equal(cell.Contains(',', StringComparison.Ordinal) ? $"\"{cell}\"" : cell, lines[1][expected.Length..]);
        Assert.Contains(",,,,,,no current above the noise floor; check the probe contact,,,", lines[3], StringComparison.Ordinal); // empty fitted_by, fitted_at, then the option set
        Assert.Contains(",failed,", lines[3], StringComparison.Ordinal);
    }

    [Fact]
    public void FormatCsv_WarningsAndCommas_QuotedAndJoined()
    {
        var fit = DemoResults.Fit(0) with { SourcePath = "KM-A01/W00/die \"a\",1.csv", Warnings = ["first, with comma", "second | piped", "third\nline"] };
        var row = StoredResult.Create(fit, DemoResults.FileSha256(0), DemoResults.Options, Run);
        var line = StoredResultsWriter.FormatCsv([row]).Split('\n')[1];
        Assert.StartsWith("\"KM-A01/W00/die \"\"a\"\",1.csv\",", line, StringComparison.Ordinal);
        Assert.Contains(",\"first, with comma | second / piped | third line\",", line, StringComparison.Ordinal);
    }

    [Fact]
    public void FormatCsv_NoRows_HeaderWithStandardKeys()
    {
        string csv = StoredResultsWriter.FormatCsv([]);
        Assert.StartsWith("file,lot,wafer,die_x,die_y,model,status,barrier_height_eV,", csv, StringComparison.Ordinal);
        Assert.EndsWith("mass_ratio_hi,reduced_chi2,transition_voltage_V,warnings,error,fitted_by,fitted_at,option_set\n", csv, StringComparison.Ordinal);
    }

    [Fact]
    public void WriteJsonLines_Rows_OneObjectPerLineWithCsvKeysThenStorageKeys()
    {
        var rows = new[] { DemoResults.Row(0, Run), DemoResults.Row(36, Run) };
        using var w = new StringWriter();
        StoredResultsWriter.WriteJsonLines(w, rows);
        var lines = w.ToString().Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(2, lines.Length);
        using var doc = JsonDocument.Parse(lines[0]);
        var names = doc.RootElement.EnumerateObject().Select(p => p.Name).ToList();
        var keys = StoredResultsWriter.ParameterKeys(rows);
        var schemaColumns = ResultSchema.Columns(keys, StoredResultsWriter.JsonGroups).Select(c => c.Name).ToList();
        Assert.Equal(schemaColumns, names.Take(schemaColumns.Count));
        Assert.Subset(schemaColumns.ToHashSet(), StoredResultsWriter.Columns(keys).ToHashSet()); // every CSV column is a JSON key
        Assert.Equal(["points_used", "points_masked"], schemaColumns.Where(n => n.StartsWith("points_", StringComparison.Ordinal)));
        Assert.Equal(["file_sha256", "options_hash", "run_id", "run_started_utc", "tool_version", "host", "stored_utc"], names.Skip(schemaColumns.Count));
        Assert.Equal(2.0, doc.RootElement.GetProperty("barrier_height_eV").GetDouble());
        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("area_m2_stderr").ValueKind);
        Assert.Equal(DemoResults.FileSha256(0), doc.RootElement.GetProperty("file_sha256").GetString());
        Assert.Equal("2025-03-14T10:15:00.0000000+00:00", doc.RootElement.GetProperty("run_started_utc").GetString());
        using var failed = JsonDocument.Parse(lines[1]);
        Assert.Equal("failed", failed.RootElement.GetProperty("status").GetString());
        Assert.Equal(JsonValueKind.Null, failed.RootElement.GetProperty("barrier_height_eV").ValueKind);
    }

    [Fact]
    public void ChunkedResultWriter_AddMoreThanChunk_StoresWholeChunksThenFlushes()
    {
        using var folder = new TempFolder();
        using var store = ResultStore.Open(folder.File("c.db"));
        var w = new ChunkedResultWriter(store, chunkSize: 10);
        for (int i = 0; i < 25; i++) w.Add(DemoResults.Row(i, Run));
        Assert.Equal(20, store.Count());
        Assert.Equal(5, w.Pending);
        w.Flush();
        Assert.Equal(25, store.Count());
        Assert.Equal(25, w.Written);
        Assert.Equal(0, w.Pending);
    }

    [Fact]
    public void StoredResult_FromFitWithCurve_DropsCurve()
    {
        var fit = DemoResults.Fit(2) with { Curve = new CurveSnapshot([0.1], [1e-9], [1e-9], [true], [0.0]) };
        var row = StoredResult.Create(fit, DemoResults.FileSha256(2), DemoResults.Options, Run);
        Assert.Null(row.Result.Curve);
    }
}
