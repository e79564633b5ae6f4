using JunctionFit.Import;
using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Import;

public class CvFileReaderTests
{
    [Fact]
    public void Read_RealCapacitorFile_GivesCetFromAreaAndMaxCapacitance()
    {
        // IHP Open PDK SG13G2 gate-oxide capacitor C–V (Apache-2.0; Reference/RealData/gate-oxide-nmos/SOURCE.md): 55 rows, area
        // 120000 µm² in the preamble, C_max = 1.35939122e-9 F at 1.35 V (read from the file). CET = 3.9 ε₀ A / C_max
        // = 3.9 × 8.8541878128e-12 × 1.2e-7 / 1.35939122e-9 = 3.0482 nm (hand calculation). Tolerance 1e-9 relative.
        string path = Path.Combine(AppContext.BaseDirectory, "Reference", "RealData", "gate-oxide-nmos", "nmos_gate_capacitor_cv_300K.csv");
        var cv = CvFileReader.Read(path);
        Assert.Equal(55, cv.VoltageV.Length);
        Assert.Equal(1.2e-7, cv.AreaM2!.Value, 1e-18);
        Assert.Equal(300, cv.TemperatureK);
        var s = CvAnalysis.Analyse(cv.VoltageV.AsSpan(), cv.CapacitanceF.AsSpan(), cv.AreaM2.Value);
        double expected = 3.9 * PhysicalConstants.VacuumPermittivityFPerM * 1.2e-7 / 1.35939122e-9 * 1e9;
        Assert.Equal(expected, s.CapacitanceEquivalentThicknessNm, expected * 1e-9);
        Assert.Equal(3.0482, s.CapacitanceEquivalentThicknessNm, 1e-3);
        Assert.False(s.Saturated); // C still rises at +1.35 V
        Assert.NotNull(s.DopingM3);
    }

    [Fact]
    public void Parse_PicofaradHeaderAndSyntheticDepletion_RecoversDoping()
    {
        // Invented p-substrate depletion curve from the depletion approximation (Sze & Ng 3rd ed., ch. 4):
        // 1/C² = 1/C_ox² + 2(V − V_fb)/(q ε_s N A²); the 1/C² slope must return N within 1e-6.
        double area = 1e-8, n = 3e23, cox = 3.9 * Codata2018.VacuumPermittivityFPerM / 3e-9 * area, es = 11.7 * Codata2018.VacuumPermittivityFPerM;
        var lines = new List<string> { "# area: 10000 um2", "V (V), C (pF)" };
        for (double v = -1.0; v <= 1.0001; v += 0.05)
        {
            double c = v <= -0.8 ? cox : 1.0 / Math.Sqrt(1.0 / (cox * cox) + 2 * (v + 0.8) / (Codata2018.ElementaryChargeC * es * n * area * area));
            lines.Add(FormattableString.Invariant($"{v:0.00}, {c * 1e12:R}"));
        }
        var cv = CvFileReader.Parse("synthetic.csv", lines);
        Assert.Equal(area, cv.AreaM2!.Value, 1e-20);
        var s = CvAnalysis.Analyse(cv.VoltageV.AsSpan(), cv.CapacitanceF.AsSpan(), area);
        Assert.Equal(n, s.DopingM3!.Value, n * 1e-6);
        Assert.False(s.LooksNType);
    }

    [Fact]
    public void Parse_BadValue_NamesLine()
    {
        var ex = Assert.Throws<IvFormatException>(() => CvFileReader.Parse("bad.csv", ["vg,cox", "0.1,1e-10", "0.2,abc"]));
        Assert.Equal(3, ex.Line);
        Assert.Contains("capacitance", ex.Message, StringComparison.Ordinal);
    }
}
