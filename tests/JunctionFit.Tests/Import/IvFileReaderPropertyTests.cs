using System.Globalization;
using System.Text;
using CsCheck;
using JunctionFit.Import;
using Xunit;

namespace JunctionFit.Tests.Import;

/// <summary>
/// Property-based tests (CsCheck): generated files in every layout round-trip to the same numbers,
/// and arbitrary or damaged input never throws anything but <see cref="IvFormatException"/>.
/// </summary>
public class IvFileReaderPropertyTests
{
    private const long Iterations = 10_000;
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static readonly string[] VoltageNames = ["Voltage", "V", "Bias", "Vbias", "U", "Vd", "Vforce", "voltage_1_1", "voltage_1_2_11", "V_2", "Vg"];
    private static readonly string[] CurrentNames = ["Current", "I", "Id", "Imeas", "Idrain", "current_1_1", "current_1_2_11", "I_2", "Ig"];
    private static readonly string[] VoltageUnits = ["V", "mV", "uV", "µV", "kV"];
    private static readonly string[] CurrentUnits = ["A", "mA", "uA", "µA", "nA", "pA", "A/cm2", "mA/cm²", "A/m^2"];
    private static readonly char[] Delimiters = [',', ';', '\t', ' ', '|'];
    private static readonly string[] LineEnds = ["\n", "\r\n", "\r"];
    private static readonly string[] Encodings = ["utf8", "utf8bom", "utf16le-bom", "utf16be-bom", "utf16le"];

    private static readonly Gen<(double V, double I)> GenPoint =
        Gen.Select(Gen.Double[-5, 5], Gen.Double[1, 10], Gen.Int[-15, -1], Gen.Bool,
            (v, m, e, neg) => (v, (neg ? -m : m) * Math.Pow(10, e)));

    private static readonly Gen<(int Seed, (double V, double I)[] Points)> GenFile =
        Gen.Select(Gen.Int, GenPoint.Array[2, 30]);

    /// <summary>A file layout chosen from a seed, and the text it produces.</summary>
    internal sealed record GeneratedFile(byte[] Bytes, string Description, double[] V, double[] I, double RelTol)
    {
        /// <summary>The file also holds |J| and J columns in A/cm² for an area of <see cref="ColumnAreaCm2"/>.</summary>
        public bool DensityColumns { get; init; }

        /// <summary>The text before encoding.</summary>
        public string Text { get; init; } = "";

        /// <summary>The encoding of <see cref="Bytes"/>, one of <see cref="Encodings"/>.</summary>
        public string EncodingName { get; init; } = "utf8";
    }

    /// <summary>The bytes of <paramref name="text"/> in one of <see cref="Encodings"/> (with its byte-order mark where named).</summary>
    private static byte[] Encode(string text, string encoding) => encoding switch
    {
        "utf8" => new UTF8Encoding(false).GetBytes(text),
        "utf8bom" => [.. Encoding.UTF8.GetPreamble(), .. Encoding.UTF8.GetBytes(text)],
        "utf16le-bom" => [.. Encoding.Unicode.GetPreamble(), .. Encoding.Unicode.GetBytes(text)],
        "utf16be-bom" => [.. Encoding.BigEndianUnicode.GetPreamble(), .. Encoding.BigEndianUnicode.GetBytes(text)],
        "utf16le" => Encoding.Unicode.GetBytes(text),
        _ => throw new ArgumentOutOfRangeException(nameof(encoding), encoding, "not a generated encoding"),
    };

    /// <summary>Area behind the generated |J| and J columns, in cm².</summary>
    private const double ColumnAreaCm2 = 1.257e-5;

    internal static GeneratedFile Write(int seed, (double V, double I)[] points)
    {
        var rng = new Random(seed);
        char delim = Delimiters[rng.Next(Delimiters.Length)];
        bool decimalComma = delim != ',' ? rng.Next(3) == 0 : rng.Next(6) == 0; // comma files need quotes for it
        bool quoteNumbers = (delim == ',' && decimalComma) || rng.Next(6) == 0;
        bool quoteHeader = rng.Next(5) == 0;
        bool header = rng.Next(12) != 0;
        int notation = header ? rng.Next(8) : 0; // 0 none, 1 (), 2 [], 3 /, 4 _, 5 units row, 6 space, 7 bracketed units row
        if (delim == ' ' && notation == 6)
        {
            notation = 7;
        }
        bool trailingHeaderDelimiter = header && delim != ' ' && rng.Next(4) == 0;
        string vUnitText = notation == 0 ? "V" : VoltageUnits[rng.Next(VoltageUnits.Length)];
        string iUnitText = notation == 0 ? "A" : CurrentUnits[rng.Next(CurrentUnits.Length)];
        _ = UnitParser.TryParse(vUnitText, out UnitScale vUnit);
        _ = UnitParser.TryParse(iUnitText, out UnitScale iUnit);
        bool density = iUnit.Kind == QuantityKind.CurrentDensity;
        const double areaM2 = 1e-10;
        int extras = header ? rng.Next(4) : rng.Next(2);
        // With a header, sometimes |J| and J columns beside the current (as in molecular-junction files):
        // the current is still read, and I/J gives the area.
        bool densityColumns = header && !density && rng.Next(4) == 0;
        string nl = LineEnds[rng.Next(LineEnds.Length)];
        string encoding = Encodings[rng.Next(Encodings.Length)];

        // Columns: 0 voltage, 1 current, 2 index, 3 time, 4 status.
        var cols = new List<int> { 0, 1 };
        for (int k = 0; k < extras; k++)
        {
            cols.Add(2 + k);
        }
        if (densityColumns)
        {
            cols.Add(5);
            cols.Add(6);
        }
        if (header)
        {
            for (int k = cols.Count - 1; k > 0; k--)
            {
                int j = rng.Next(k + 1);
                (cols[k], cols[j]) = (cols[j], cols[k]);
            }
        }

        string vName = VoltageNames[rng.Next(VoltageNames.Length)];
        string iName = density ? "J" : CurrentNames[rng.Next(CurrentNames.Length)];
        string Sep() => delim == ' ' ? new string(' ', 1 + rng.Next(3)) : delim.ToString();
        string Q(string s, bool q) => q ? $"\"{s}\"" : s;
        string Num(double x)
        {
            string s = x.ToString("R", Inv);
            if (decimalComma)
            {
                s = s.Replace('.', ',');
            }
            return Q(s, quoteNumbers);
        }

        var sb = new StringBuilder();
        int preamble = rng.Next(6);
        string[] pre =
        [
            "# lot: KM-A0" + rng.Next(10), "wafer = W" + rng.Next(25), "Die: " + rng.Next(20) + "," + rng.Next(20),
            "temperature: 300 K", "# Kestrel Microsystems sweep export", "", "Operator notes follow",
            "# site: north", "Sweep 1 of 2",
        ];
        for (int k = 0; k < preamble; k++)
        {
            sb.Append(pre[rng.Next(pre.Length)]).Append(nl);
        }
        if (density)
        {
            sb.Append("# area: 100 um2").Append(nl);
        }
        if (preamble > 0 && rng.Next(2) == 0)
        {
            sb.Append(nl);
        }

        if (header)
        {
            var cells = new List<string>();
            foreach (int c in cols)
            {
                string name = c switch { 0 => vName, 1 => iName, 2 => "Index", 3 => "Time", 4 => "Status", 5 => "absJ_1_1", _ => "J_1_1" };
                string unit = c switch { 0 => vUnitText, 1 => iUnitText, 2 => "#", 3 => "s", 4 => "-", _ => "A/cm2" };
                string cell = notation switch
                {
                    1 => $"{name} ({unit})",
                    2 => $"{name} [{unit}]",
                    3 => $"{name}/{unit}",
                    4 => $"{name}_{unit}",
                    6 => $"{name} {unit}",
                    _ => name,
                };
                if (notation is 3 or 4 or 6 or 7 && c >= 2)
                {
                    cell = name;
                }
                cells.Add(Q(cell, quoteHeader));
            }
            sb.AppendJoin(Sep(), cells).Append(trailingHeaderDelimiter ? Sep() : string.Empty).Append(nl);
            if (notation is 5 or 7)
            {
                var units = new List<string>();
                foreach (int c in cols)
                {
                    string u = c switch { 0 => vUnitText, 1 => iUnitText, 2 => "#", 3 => "s", 4 => "-", _ => "A/cm2" };
                    units.Add(notation == 7 ? $"[{u}]" : u);
                }
                sb.AppendJoin(Sep(), units).Append(trailingHeaderDelimiter ? Sep() : string.Empty).Append(nl);
            }
        }

        var vs = new double[points.Length];
        var cs = new double[points.Length];
        for (int r = 0; r < points.Length; r++)
        {
            (double v, double i) = points[r];
            vs[r] = v;
            cs[r] = i;
            var cells = new List<string>();
            foreach (int c in cols)
            {
                cells.Add(c switch
                {
                    0 => Num(vUnit.FromSi(v)),
                    1 => Num(iUnit.FromSi(density ? i / areaM2 : i)),
                    2 => r.ToString(Inv),
                    3 => Num(0.25 * r),
                    4 => Q("OK", quoteNumbers),
                    5 => Num(Math.Abs(i) / ColumnAreaCm2),
                    _ => Num(i / ColumnAreaCm2),
                });
            }
            if (delim == ' ' && rng.Next(4) == 0)
            {
                sb.Append("  ");
            }
            sb.AppendJoin(Sep(), cells).Append(nl);
        }

        string text = sb.ToString();
        byte[] bytes = Encode(text, encoding);
        string description = $"delim={IvTableParser.DelimiterName(delim)} comma={decimalComma} quote={quoteNumbers}/{quoteHeader} header={header} trailing={trailingHeaderDelimiter} densities={densityColumns} notation={notation} units={vUnitText},{iUnitText} extras={extras} order={string.Join("", cols)} nl={nl.Replace("\r", "CR").Replace("\n", "LF")} enc={encoding}\n{text}";
        bool si = vUnit.PowerOfTen == 0 && iUnit.PowerOfTen == 0 && !density;
        return new GeneratedFile(bytes, description, vs, cs, si ? 0 : density ? 1e-14 : 1e-15) { DensityColumns = densityColumns, Text = text, EncodingName = encoding };
    }

    [Fact]
    public void ReadFile_GeneratedLayouts_RoundTripSameNumbers()
    {
        GenFile.Sample((seed, points) =>
        {
            GeneratedFile f = Write(seed, points);
            IvCurve c;
            try
            {
                c = IvFileReader.ParseBytes(f.Bytes, "gen.csv", "gen.csv", IvReadOptions.Default).Curve;
            }
            catch (IvFormatException e)
            {
                throw new InvalidOperationException($"refused: {e.Message}\n{f.Description}", e);
            }
            if (c.Count != f.V.Length)
            {
                throw new InvalidOperationException($"read {c.Count} of {f.V.Length} points\n{f.Description}");
            }
            // I/J of the generated columns is the area (exact up to the "R" round-trip of the printed numbers).
            if (f.DensityColumns && HasThreeWellAboveZero(f.I) && !(c.AreaM2 is double a && Close(a, ColumnAreaCm2 * 1e-4, 1e-9)))
            {
                throw new InvalidOperationException($"area from I/J is {c.AreaM2:R}, not {ColumnAreaCm2 * 1e-4:R}\n{f.Description}");
            }
            for (int k = 0; k < c.Count; k++)
            {
                if (!Close(c.VoltageV[k], f.V[k], f.RelTol) || !Close(c.CurrentA[k], f.I[k], f.RelTol))
                {
                    throw new InvalidOperationException(
                        $"point {k}: read ({c.VoltageV[k]:R}, {c.CurrentA[k]:R}) wrote ({f.V[k]:R}, {f.I[k]:R})\n{f.Description}");
                }
            }
        }, iter: Iterations);
    }

    private static bool HasThreeWellAboveZero(double[] current)
    {
        double max = current.Max(Math.Abs);
        // Clearly above the importer's 1e-3 × max cut (a point exactly at the cut may fall either side after unit conversion).
        return current.Count(x => Math.Abs(x) >= 2e-3 * max) >= 3;
    }

    private static bool Close(double a, double b, double rel)
        => rel == 0 ? a.Equals(b) || (a == 0 && b == 0) : Math.Abs(a - b) <= rel * Math.Max(Math.Abs(a), Math.Abs(b));

    private static readonly Gen<string> GenNoise =
        Gen.Char["0123456789012345.,,;;\t\t   --+eE\"#:=()[]/_VvIiAamunpkµ\r\n\n\nNaNinf\u0000\u001F\uFEFF\u00E9xyz"].Array[0, 300]
            .Select(cs => new string(cs));

    [Fact]
    public void Parse_ArbitraryText_NeverThrowsAnotherType()
    {
        GenNoise.Sample(text =>
        {
            try
            {
                _ = IvFileReader.Parse(text, "noise.csv");
            }
            catch (IvFormatException e)
            {
                Assert.StartsWith("noise.csv:", e.Message);
            }
        }, iter: Iterations);
    }

    [Fact]
    public void ParseBytes_ArbitraryBytes_NeverThrowsAnotherType()
    {
        Gen.Byte.Array[0, 400].Sample(bytes =>
        {
            try
            {
                _ = IvFileReader.ParseBytes(bytes, "bytes.bin", "bytes.bin", IvReadOptions.Default);
            }
            catch (IvFormatException e)
            {
                Assert.StartsWith("bytes.bin:", e.Message);
            }
        }, iter: Iterations);
    }

    [Fact]
    public void Write_EveryEncoding_DecodesBackToItsText()
    {
        // The generator's bytes are what they claim to be: each encoding decodes (with the BCL decoders) to the text.
        foreach (string name in Encodings)
        {
            const string text = "Voltage (V),Current (µA)\n0.1,2.5\n0.2,5.5\n0.3,9.0\n";
            byte[] bytes = Encode(text, name);
            string decoded = name switch
            {
                "utf8" or "utf8bom" => new UTF8Encoding(false).GetString(bytes).TrimStart('\uFEFF'),
                "utf16be-bom" => Encoding.BigEndianUnicode.GetString(bytes).TrimStart('\uFEFF'),
                _ => Encoding.Unicode.GetString(bytes).TrimStart('\uFEFF'),
            };
            Assert.Equal(text, decoded);
            Assert.Equal(3, IvFileReader.ParseBytes(bytes, "enc.csv", "enc.csv", IvReadOptions.Default).Curve.Count);
        }
    }

    [Fact]
    public void Parse_DamagedValidFiles_NeverThrowsAnotherType()
    {
        Gen.Select(GenFile, Gen.Int[0, int.MaxValue], Gen.Int[1, 8]).Sample((file, where, edits) =>
        {
            // Each file is damaged as text and written back in its own encoding, so the reader's decoding is exercised too
            // (before, every file was decoded as UTF-16LE, which turned three of the five encodings into junk before damage).
            GeneratedFile f = Write(file.Seed, file.Points);
            var rng = new Random(where);
            var sb = new StringBuilder(f.Text);
            const string junk = "0.,;\t \"#:=\r\nNaNµ(V)";
            for (int k = 0; k < edits && sb.Length > 0; k++)
            {
                int at = rng.Next(sb.Length);
                switch (rng.Next(3))
                {
                    case 0:
                        sb.Remove(at, Math.Min(1 + rng.Next(10), sb.Length - at));
                        break;
                    case 1:
                        sb.Insert(at, junk[rng.Next(junk.Length)]);
                        break;
                    default:
                        sb[at] = junk[rng.Next(junk.Length)];
                        break;
                }
            }
            try
            {
                _ = IvFileReader.ParseBytes(Encode(sb.ToString(), f.EncodingName), "damaged.csv", "damaged.csv", IvReadOptions.Default);
            }
            catch (IvFormatException e)
            {
                Assert.StartsWith("damaged.csv:", e.Message);
            }
        }, iter: Iterations);
    }
}
