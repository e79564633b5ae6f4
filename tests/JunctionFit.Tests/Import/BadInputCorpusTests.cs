using System.Text;
using System.Text.RegularExpressions;
using JunctionFit.Import;
using Xunit;

namespace JunctionFit.Tests.Import;

/// <summary>
/// Bad and odd input: every case is either read as docs/file-formats.md says or refused with an
/// <see cref="IvFormatException"/> reading <c>path:line: reason</c> — never another exception type.
/// The files are made here; the two large ones are generated at run time into a temp folder.
/// </summary>
public partial class BadInputCorpusTests
{
    /// <summary>What a case must do: be refused (at a given line, if known), be read (with a point count, if known), or either.</summary>
    public sealed record Outcome(bool? Refused, int? Line = null, int? Points = null, string? ReasonContains = null)
    {
        public static Outcome Refuse(int? line = null, string? reason = null) => new(true, line, null, reason);

        public static Outcome Read(int? points = null) => new(false, null, points);
    }

    private sealed record Case(Func<byte[]> Bytes, Outcome Expect, IvReadOptions? Options = null);

    private static byte[] T(string s) => new UTF8Encoding(false).GetBytes(s);

    private static readonly Dictionary<string, Case> Cases = new()
    {
        ["empty"] = new(() => [], Outcome.Refuse(0, "empty")),
        ["blank lines only"] = new(() => T("\n\n  \r\n\t\n"), Outcome.Refuse(0, "blank")),
        ["bom only"] = new(() => [0xEF, 0xBB, 0xBF], Outcome.Refuse(0, "empty")),
        ["utf16 bom only"] = new(() => [0xFF, 0xFE], Outcome.Refuse(0, "empty")),
        ["binary with nul"] = new(() => Random(1, 4096, allowNul: true), Outcome.Refuse(reason: "binary")),
        ["binary without nul"] = new(() => Random(2, 4096, allowNul: false), Outcome.Refuse(reason: "binary")),
        ["png signature"] = new(() => [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 0x0D, 0x49, 0x48, 0x44, 0x52], Outcome.Refuse(reason: "binary")),
        ["one column"] = new(() => T("Voltage (V)\n0.1\n0.2\n0.3\n"), Outcome.Refuse(2, "one column")),
        ["single number"] = new(() => T("42"), Outcome.Refuse(1, "one column")),
        ["one row"] = new(() => T("V,I\n0.1,1e-9\n"), Outcome.Refuse(2, "only one")),
        ["one row no header"] = new(() => T("0.1\t1e-9"), Outcome.Refuse(1, "only one")),
        ["all nan"] = new(() => T("V,I\nNaN,NaN\n0.1,NaN\nnan,1e-9\n"), Outcome.Refuse(2, "no usable")),
        ["all infinite"] = new(() => T("V,I\n1e400,1\n2,-1e999\n3,Infinity\n"), Outcome.Refuse(2, "no usable")),
        ["text only"] = new(() => T("This folder holds the Kestrel Microsystems sweep notes.\nNothing to see.\n"), Outcome.Refuse(0, "no table")),
        ["headers only"] = new(() => T("Voltage (V),Current (A)\n"), Outcome.Refuse(0, "no table")),
        ["header and units row only"] = new(() => T("Voltage,Current\nV,A\n"), Outcome.Refuse(0, "no table")),
        ["comments only"] = new(() => T("# lot: KM-A01\n# wafer: W01\n# 0.1, 1e-9\n"), Outcome.Refuse(0, "no table")),
        ["non-numeric voltage everywhere"] = new(() => T("V,I\nlow,1e-9\nmid,2e-9\nhigh,3e-9\n"), Outcome.Refuse(0, "no table")),
        ["non-numeric voltage in one row"] = new(() => T("V,I\n0,0\n0.1,1e-9\nabc,2e-9\n0.3,3e-9\n"), Outcome.Read(3)),
        ["units inside cells"] = new(() => T("V,I\n0.1 V,1e-9 A\n0.2 V,2e-9 A\n0.3 V,3e-9 A\n"), Outcome.Refuse(0, "no table")),
        ["hex numbers"] = new(() => T("V,I\n0x10,0x20\n0x11,0x21\n"), Outcome.Refuse(0, "no table")),
        ["html page"] = new(() => T("<!DOCTYPE html>\n<html><body><p>Kestrel</p></body></html>\n"), Outcome.Refuse(0)),
        ["json document"] = new(() => T("{\"voltage\": [0.1, 0.2], \"current\": [1e-9, 2e-9]}\n"), Outcome.Refuse()),
        ["mixed delimiters header vs data"] = new(() => T("Voltage (V),Current (A)\n0.1;1e-9\n0.2;2e-9\n0.3;3e-9\n"), Outcome.Read(3)),
        ["mixed delimiters between rows"] = new(() => T("V,I\n0.1,1e-9\n0.2;2e-9\n0.3,3e-9\n0.4,4e-9\n"), Outcome.Read(3)),
        ["unknown voltage unit"] = new(() => T("Voltage (furlong),Current (A)\n0.1,1e-9\n0.2,2e-9\n"), Outcome.Refuse(1, "unknown unit")),
        ["unknown current unit"] = new(() => T("V (V),I [Zz]\n0.1,1e-9\n0.2,2e-9\n"), Outcome.Refuse(1, "unknown unit")),
        ["unit of the wrong kind"] = new(() => T("Voltage (A),Current (A)\n0.1,1e-9\n0.2,2e-9\n"), Outcome.Refuse(1, "not a voltage unit")),
        ["mega prefix not accepted"] = new(() => T("V (MV),I (A)\n0.1,1e-9\n0.2,2e-9\n"), Outcome.Refuse(1, "unknown unit")),
        ["duplicate current headers"] = new(() => T("V,Current (A),Current (A)\n0.1,1e-9,1e-9\n0.2,2e-9,2e-9\n"), Outcome.Refuse(1, "could both be")),
        ["duplicate voltage headers"] = new(() => T("V,V,I\n0.1,0.1,1e-9\n0.2,0.2,2e-9\n"), Outcome.Refuse(1, "could both be")),
        ["two current columns by unit only"] = new(() => T("V,Ch1 (A),Ch2 (A)\n0.1,1e-9,1e-9\n0.2,2e-9,2e-9\n"), Outcome.Refuse(1, "could both be")),
        ["unknown names two columns"] = new(() => T("foo,bar\n0.1,1e-9\n0.2,2e-9\n"), Outcome.Read(2)),
        ["unknown names three columns"] = new(() => T("x,y,z\n0.1,1e-9,5\n0.2,2e-9,6\n"), Outcome.Read(2)),
        ["voltage name only three columns"] = new(() => T("Voltage,b,c\n0.1,1e-9,5\n0.2,2e-9,6\n"), Outcome.Refuse(1, "no current column")),
        ["current density without area"] = new(() => T("V,J (A/cm2)\n0.1,1\n0.2,2\n"), Outcome.Refuse(1, "area")),
        ["bad area value"] = new(() => T("# area: big\nV,J (A/cm2)\n0.1,1\n0.2,2\n"), Outcome.Refuse(2, "area")),
        ["unterminated quote"] = new(() => T("V,I\n\"0.1,1e-9\n0.2,2e-9\n0.3,3e-9\n"), Outcome.Read(2)),
        ["trailing delimiters"] = new(() => T("V,I,\n0.1,1e-9,\n0.2,2e-9,\n"), Outcome.Read(2)),
        ["repeated header mid-file"] = new(() => T("V,I\n0,0\n0.1,1e-9\nV,I\n0.2,2e-9\n0.1,1e-9\n"), Outcome.Read(4)),
        ["comment lines inside data"] = new(() => T("V,I\n0,0\n# paused\n0.1,1e-9\n0.2,2e-9\n"), Outcome.Read(3)),
        ["excel sep line"] = new(() => T("sep=;\nV;I\n0,1;1e-9\n0,2;2e-9\n"), Outcome.Read(2)),
        ["plus signs and capital exponents"] = new(() => T("V,I\n+1.0E-01,+1.0E-09\n+2.0E-01,+2.0E-09\n"), Outcome.Read(2)),
        ["negative zero and subnormals"] = new(() => T("V,I\n-0,-0\n0.1,4.9e-324\n0.2,1e-310\n"), Outcome.Read(3)),
        ["thousands separators"] = new(() => T("V;I\n1.234,5;2,0\n0,1;1,0\n0,2;2,0\n"), Outcome.Refuse(2, "no usable")),
        ["column named by a unit letter"] = new(() => T("a,b,c\n0.1,1e-9,5\n0.2,2e-9,6\n"), Outcome.Refuse(1, "no voltage column")),
        ["a few control characters"] = new(() => T("V,I\n0,0\n0.1,1e-9\n0.2,2e-9\n\u001A"), Outcome.Read(3)),
        ["latin1 micro sign"] = new(() => Encoding.Latin1.GetBytes("V (V);I (\u00B5A)\n0,1;2,5\n0,2;5,0\n"), Outcome.Read(2)),
        ["cr only one row"] = new(() => T("V,I\r0.1,1e-9\r"), Outcome.Refuse(2, "only one")),
        ["tabs only"] = new(() => T("\t\t\t\n\t"), Outcome.Refuse(0, "blank")),
        ["empty cells between"] = new(() => T("V\t\tI\n0.1\t\t1e-9\n0.2\t\t2e-9\n"), Outcome.Read(2)),
        ["many columns"] = new(() => T(ManyColumns()), Outcome.Read(3)),
        ["long preamble"] = new(() => T(string.Concat(Enumerable.Repeat("# note: Kestrel free text line\n", 10_000)) + "V,I\n0,0\n0.1,1e-9\n"), Outcome.Read(2)),
        ["negative temperature"] = new(() => T("# temperature: -300 °C\nV,I\n0,0\n0.1,1e-9\n"), Outcome.Read(2)),
        ["bad die"] = new(() => T("# die: centre\nV,I\n0,0\n0.1,1e-9\n"), Outcome.Read(2)),
        ["over-long preamble line"] = new(() => T("# " + new string('x', 2_000_000) + "\nV,I\n0,0\n0.1,1e-9\n"), Outcome.Refuse(1, "characters long")),
        ["column option out of range"] = new(() => T("V,I\n0,0\n0.1,1e-9\n"), Outcome.Refuse(1, "column 5"), new IvReadOptions { CurrentColumn = "5" }),
        ["column option by unknown name"] = new(() => T("V,I\n0,0\n0.1,1e-9\n"), Outcome.Refuse(1, "no column named"), new IvReadOptions { VoltageColumn = "Vgate" }),
        ["column option by name without header"] = new(() => T("0,0\n0.1,1e-9\n"), Outcome.Refuse(0, "no header"), new IvReadOptions { VoltageColumn = "V" }),
        ["forced wrong delimiter"] = new(() => T("V,I\n0,0\n0.1,1e-9\n"), Outcome.Refuse(), new IvReadOptions { Delimiter = ';' }),
        ["capacitance-voltage file"] = new(() => T("vg,cox\n-1,1e-9\n0,2e-9\n1,3e-9\n"), Outcome.Refuse(1, "capacitance–voltage")),
        ["time and voltage only"] = new(() => T("Time (s),Voltage (V)\n0,0.1\n1,0.2\n"), Outcome.Refuse(1, "no current column")),
        ["|J| only without area"] = new(() => T("V,|J|\n0.1,1\n0.2,2\n"), Outcome.Refuse(1, "area")),
        ["suffixed header with trailing tab"] = new(() => T("voltage_1_1\tcurrent_1_1\t\n0\t0\n0.1\t1e-9\n"), Outcome.Read(2)),
        ["names and bracketed units row"] = new(() => T("Time Voltage Current\n[s] [V] [uA]\n0 0.1 1\n1 0.2 2\n"), Outcome.Read(2)),
        ["current and density not proportional"] = new(() => T("V,I (A),J (A/cm2)\n0.1,1e-9,1\n0.2,2e-9,5\n0.3,3e-9,1\n"), Outcome.Read(3)),
        ["constant voltage"] = new(() => T("V,I\n0.5,1e-9\n0.5,1.1e-9\n0.5,0.9e-9\n"), Outcome.Read(3)),
        ["all current identical (clipped)"] = new(() => T("V,I\n0.1,1e-3\n0.2,1e-3\n0.3,1e-3\n"), Outcome.Read(3)),
    };

    public static TheoryData<string> CaseNames
    {
        get
        {
            var data = new TheoryData<string>();
            foreach (string name in Cases.Keys)
            {
                data.Add(name);
            }
            return data;
        }
    }

    [Fact]
    public void Corpus_Size_IsAtLeastForty() => Assert.True(Cases.Count >= 40, $"corpus has {Cases.Count} cases");

    [Theory]
    [MemberData(nameof(CaseNames))]
    public void ReadFile_CorpusCase_ReadOrRefusedAsDocumented(string name)
    {
        Case c = Cases[name];
        using var dir = new TempFolder();
        string path = dir.WriteBytes("case.csv", c.Bytes());
        Check(path, () => IvFileReader.ReadFile(path, c.Options), c.Expect);
    }

    [Theory]
    [MemberData(nameof(CaseNames))]
    public void Parse_CorpusCaseAsText_NeverThrowsAnotherType(string name)
    {
        Case c = Cases[name];
        string text = Encoding.UTF8.GetString(c.Bytes());
        try
        {
            _ = IvFileReader.Parse(text, "mem.csv", c.Options);
        }
        catch (IvFormatException e)
        {
            Assert.Matches(LocationPrefix(), e.Message);
        }
    }

    [Fact]
    public void ReadFile_Folder_IsRefused()
    {
        using var dir = new TempFolder();
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.ReadFile(dir.Path));
        Assert.Equal(0, e.Line);
    }

    [Fact]
    public void ReadFile_HundredMegabyteSingleLine_IsRefusedAtLineOne()
    {
        using var dir = new TempFolder();
        string path = Path.Combine(dir.Path, "long.csv");
        using (var fs = new FileStream(path, FileMode.Create, FileAccess.Write))
        {
            byte[] chunk = T(string.Concat(Enumerable.Repeat("0.125,1.5e-9,", 1 << 12)));
            long target = 100L * 1024 * 1024;
            for (long written = 0; written < target; written += chunk.Length)
            {
                fs.Write(chunk);
            }
        }
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.ReadFile(path));
        Assert.StartsWith($"{path}:1: line is", e.Message);
    }

    [Fact]
    public void ReadFile_MillionRows_ReadsEveryPoint()
    {
        using var dir = new TempFolder();
        string path = Path.Combine(dir.Path, "million.csv");
        WriteMillionRows(path);
        IvCurve c = IvFileReader.ReadFile(path);
        Assert.Equal(1_000_000, c.Count);
        Assert.Equal(-1.0, c.VoltageV[0]);
        Assert.Equal(1_000_002, c.SourceLines[^1]);
        // Speed is measured by ImportBenchmarks, never asserted here.
    }

    internal static void WriteMillionRows(string path)
    {
        using var w = new StreamWriter(path, false, new UTF8Encoding(false), 1 << 16);
        w.Write("# lot: KM-A01\nVoltage (V),Current (A)\n");
        for (int k = 0; k < 1_000_000; k++)
        {
            double v = -1.0 + (2.0 * k / 999_999);
            double i = 1e-9 * Math.Sinh(3 * v);
            w.Write(v.ToString("R", System.Globalization.CultureInfo.InvariantCulture));
            w.Write(',');
            w.Write(i.ToString("R", System.Globalization.CultureInfo.InvariantCulture));
            w.Write('\n');
        }
    }

    private static void Check(string path, Func<IvCurve> read, Outcome expect)
    {
        IvCurve? curve = null;
        IvFormatException? error = null;
        try
        {
            curve = read();
        }
        catch (IvFormatException e)
        {
            error = e;
        }

        if (error is not null)
        {
            Assert.True(expect.Refused != false, $"expected the file to be read, but: {error.Message}");
            Assert.StartsWith(path + ":", error.Message);
            Assert.Matches(LocationPrefix(), error.Message[path.Length..].Insert(0, "p"));
            if (expect.Line is int line)
            {
                Assert.Equal(line, error.Line);
            }
            if (expect.ReasonContains is string r)
            {
                Assert.Contains(r, error.Reason, StringComparison.OrdinalIgnoreCase);
            }
        }
        else
        {
            Assert.True(expect.Refused != true, $"expected a refusal, but {curve!.Count} points were read");
            Assert.True(curve!.Count >= 2);
            if (expect.Points is int n)
            {
                Assert.Equal(n, curve.Count);
            }
        }
    }

    [GeneratedRegex(@"^[^\n]*:\d+(:\d+)?: \S")]
    private static partial Regex LocationPrefix();

    private static byte[] Random(int seed, int length, bool allowNul)
    {
        var rng = new Random(seed);
        var b = new byte[length];
        rng.NextBytes(b);
        if (!allowNul)
        {
            for (int k = 0; k < b.Length; k++)
            {
                if (b[k] == 0)
                {
                    b[k] = 1;
                }
            }
        }
        else
        {
            b[10] = 0;
        }
        return b;
    }

    private static string ManyColumns()
    {
        var sb = new StringBuilder();
        for (int k = 0; k < 1000; k++)
        {
            sb.Append(k == 500 ? "Voltage (V)" : k == 700 ? "Current (A)" : $"aux{k}").Append(k < 999 ? "," : "\n");
        }
        for (int r = 0; r < 3; r++)
        {
            for (int k = 0; k < 1000; k++)
            {
                sb.Append(k == 500 ? (0.1 * r).ToString(System.Globalization.CultureInfo.InvariantCulture) : k == 700 ? $"{r}e-9" : "7").Append(k < 999 ? "," : "\n");
            }
        }
        return sb.ToString();
    }
}
