using System.Globalization;
using System.Text;
using CsvHelper;
using JunctionFit.Reporting;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Reporting;

public class SummaryTableWriterTests
{
    private static List<FitResult> Results() =>
    [
        ReportingFixtures.OkResult(),
        ReportingFixtures.PoorResult() with { SourcePath = "KM-A01/W07/die,\"quoted\"\nname.csv" },
        ReportingFixtures.FailedResult(),
    ];

    private static readonly string[] ExpectedHeader =
    [
        "file", "lot", "wafer", "die_x", "die_y", "model", "status",
        "barrier_height_eV", "barrier_height_eV_stderr", "barrier_height_eV_lo", "barrier_height_eV_hi", "barrier_height_eV_fixed",
        "thickness_nm", "thickness_nm_stderr", "thickness_nm_lo", "thickness_nm_hi", "thickness_nm_fixed",
        // The key order of every result table (ResultSchema): the standard keys φ, d, area, m*/mₑ first.
        "area_m2", "area_m2_stderr", "area_m2_lo", "area_m2_hi", "area_m2_fixed",
        "mass_ratio", "mass_ratio_stderr", "mass_ratio_lo", "mass_ratio_hi", "mass_ratio_fixed",
        "reduced_chi2", "points_used", "points_masked", "transition_voltage_V", "warnings", "error",
    ];

    [Fact]
    public void ToCsv_ThreeResults_RoundTripsThroughCsvHelper()
    {
        var results = Results();
        string csv = SummaryTableWriter.ToCsv(results);
        using var reader = CsvReader.Create(Encoding.UTF8.GetBytes(csv));
        Assert.Equal(ExpectedHeader, reader.Headers.ToArray());
        var rows = new List<string[]>();
        while (reader.Read()) rows.Add(reader.Current.ToArray());
        Assert.Equal(3, rows.Count);

        string Field(int row, string name) => rows[row][Array.IndexOf(ExpectedHeader, name)];
        Assert.Equal("KM-A01/W07/die_03_05.csv", Field(0, "file"));
        Assert.Equal("KM-A01/W07/die,\"quoted\" name.csv", Field(1, "file")); // a line break in a cell becomes a space
        Assert.Equal("ok", Field(0, "status"));
        Assert.Equal("poor-fit", Field(1, "status"));
        Assert.Equal("failed", Field(2, "status"));
        Assert.Equal(2.0041, double.Parse(Field(0, "barrier_height_eV"), CultureInfo.InvariantCulture));
        Assert.Equal(1.01e-10, double.Parse(Field(0, "area_m2"), CultureInfo.InvariantCulture));
        Assert.Equal(0.975e-10, double.Parse(Field(0, "area_m2_lo"), CultureInfo.InvariantCulture));
        Assert.Equal("true", Field(0, "mass_ratio_fixed"));
        Assert.Equal("", Field(0, "mass_ratio_stderr"));
        Assert.Equal("false", Field(0, "thickness_nm_fixed"));
        Assert.Equal("3", Field(0, "die_x"));
        Assert.Equal("1.03", Field(0, "reduced_chi2"));
        Assert.Equal("0.781", Field(0, "transition_voltage_V"));
        Assert.Equal(string.Join(" | ", ReportingFixtures.PoorResult().Warnings), Field(1, "warnings"));
        Assert.Equal("", Field(2, "barrier_height_eV"));
        Assert.Equal("", Field(2, "reduced_chi2"));
        Assert.StartsWith("every point is below", Field(2, "error"), StringComparison.Ordinal);
    }

    [Fact]
    public void ToCsv_FieldWithQuoteAndComma_IsQuotedPerRfc4180()
    {
        string csv = SummaryTableWriter.ToCsv(Results());
        // RFC 4180 quoting of the comma and the doubled quote; the line break inside the name becomes a space (one record, one line).
        Assert.Contains("\"KM-A01/W07/die,\"\"quoted\"\" name.csv\"", csv, StringComparison.Ordinal);
        Assert.StartsWith("file,lot,wafer,die_x,die_y,model,status,", csv, StringComparison.Ordinal);
        Assert.Contains("\r\n", csv, StringComparison.Ordinal);
    }

    [Fact]
    public void ToCsv_UnderAnotherCurrentCulture_UsesInvariantNumbers()
    {
        var saved = CultureInfo.CurrentCulture;
        try
        {
            CultureInfo.CurrentCulture = CultureInfo.InvariantCulture.Clone() is CultureInfo c
                ? WithCommaDecimal(c)
                : saved;
            string csv = SummaryTableWriter.ToCsv([ReportingFixtures.OkResult()]);
            Assert.Contains(",2.0041,", csv, StringComparison.Ordinal);
        }
        finally
        {
            CultureInfo.CurrentCulture = saved;
        }

        static CultureInfo WithCommaDecimal(CultureInfo c)
        {
            c.NumberFormat.NumberDecimalSeparator = ",";
            return c;
        }
    }

    [Fact]
    public void WriteCsv_Path_WritesUtf8WithoutBom()
    {
        string dir = Path.Combine(Path.GetTempPath(), "jf-csv-" + Guid.NewGuid().ToString("N"));
        try
        {
            string path = Path.Combine(dir, "nested", "summary.csv");
            SummaryTableWriter.WriteCsv(path, Results());
            byte[] bytes = File.ReadAllBytes(path);
            Assert.Equal((byte)'f', bytes[0]);
            Assert.Equal(SummaryTableWriter.ToCsv(Results()), Encoding.UTF8.GetString(bytes));
            Assert.Single(Directory.GetFiles(Path.Combine(dir, "nested")));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void FormatConsoleTable_ThreeResults_AlignsColumns()
    {
        string table = SummaryTableWriter.FormatConsoleTable(Results());
        string[] lines = table.TrimEnd('\n').Split('\n');
        Assert.Equal(5, lines.Length);
        Assert.StartsWith("file", lines[0], StringComparison.Ordinal);
        Assert.Matches("^-+  -+", lines[1]);
        int statusColumn = lines[0].IndexOf("status", StringComparison.Ordinal);
        Assert.Equal("ok", lines[2].Substring(statusColumn, 2));
        Assert.Equal("failed", lines[4].Substring(statusColumn, 6));
        Assert.Contains("2.0041 [1.9957, 2.0126]", lines[2], StringComparison.Ordinal);
        Assert.Contains("every point is below the noise floor", lines[4], StringComparison.Ordinal);
        foreach (string line in lines) Assert.DoesNotContain('\n', line);
    }

    [Fact]
    public void FormatConsoleTable_FreeExtraParameters_GetTheirOwnColumns()
    {
        // Invented values (ReportingFixtures): bdr-like Δφ and a free series resistance beside the three headline columns.
        var extra = ReportingFixtures.OkResult() with
        {
            Parameters =
            [
                .. ReportingFixtures.OkResult().Parameters,
                new ParameterEstimate("asymmetry_eV", "Δφ", "eV", 0.12, 0.01, 0.10, 0.14, false),
                new ParameterEstimate("series_resistance_ohm", "R_s", "Ω", 35.0, 2.0, 31.0, 39.0, false),
                new ParameterEstimate("voltage_offset_V", "V₀", "V", 0.0, null, null, null, true),
            ],
        };
        string[] lines = SummaryTableWriter.FormatConsoleTable([ReportingFixtures.OkResult(), extra]).Split('\n');
        Assert.Contains("asymmetry (eV)", lines[0], StringComparison.Ordinal);
        Assert.Contains("series_resistance (ohm)", lines[0], StringComparison.Ordinal);
        Assert.DoesNotContain("voltage_offset", lines[0], StringComparison.Ordinal); // fixed everywhere: an input, not a result
        Assert.True(lines[0].IndexOf("area (um2)", StringComparison.Ordinal) < lines[0].IndexOf("asymmetry", StringComparison.Ordinal));
        Assert.Contains("0.120 [0.100, 0.140]", lines[3], StringComparison.Ordinal); // two significant figures of the half-width
        Assert.Contains("35.0 [31.0, 39.0]", lines[3], StringComparison.Ordinal);
        Assert.DoesNotContain("[0.100", lines[2], StringComparison.Ordinal); // the plain row has no Δφ
    }

    [Fact]
    public void FormatConsoleTable_Empty_SaysSo()
    {
        Assert.Equal("(no results)\n", SummaryTableWriter.FormatConsoleTable([]));
    }
}
