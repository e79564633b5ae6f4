using JunctionFit.Batch;
using JunctionFit.Cli.Support;
using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Cli.Commands;

/// <summary>
/// The command-line side of the lot analyses (JunctionFit.Batch.LotAnalyses): their bad input worded as usage errors naming
/// the option, and the C–V files of <c>thickness --cv</c> read with messages naming the options.
/// </summary>
internal static class LotAnalysisRun
{
    /// <summary><see cref="LotAnalyses.Drift"/>, with a reference lot that is not in the rows as a usage error naming <c>--reference</c>
    /// (the only <see cref="ArgumentException"/> the analysis throws, <see cref="DriftAnalysis.Compute"/>).</summary>
    public static (DriftResult Result, HtmlReportSection Section, List<string> Charts) Drift(IReadOnlyList<ResultRow> rows, DriftOptions options, string outDir)
    {
        try
        {
            return LotAnalyses.Drift(rows, options, outDir);
        }
        catch (ArgumentException e)
        {
            throw new UsageException($"--reference: {UsageException.WithoutParameterName(e.Message)}");
        }
    }

    /// <summary><see cref="LotAnalyses.CetCheck"/>, with a bad expected range as a usage error naming <c>--cet-range</c>.</summary>
    public static (CetCrossCheckResult Result, HtmlReportSection Section) CetCheck(IReadOnlyList<ResultRow> rows, IReadOnlyList<EllipsometryRow> ellipsometry,
        IReadOnlyList<CetMeasurement> cet, IReadOnlyList<LotAnalyses.WaferConsistency> wafers, double lowerNm, double upperNm, double oxidePermittivity)
    {
        try
        {
            return LotAnalyses.CetCheck(rows, ellipsometry, cet, wafers, lowerNm, upperNm, oxidePermittivity);
        }
        catch (ArgumentOutOfRangeException e)
        {
            throw new UsageException($"--cet-range: {UsageException.WithoutParameterName(e.Message)}");
        }
    }

    /// <summary>
    /// Reads the C–V files of <c>thickness --cv</c> (files or folders), places each on a wafer by its <c># lot:</c> / <c># wafer:</c>
    /// lines or <paramref name="pathPattern"/>, and computes CET = ε_ox ε₀ A / C_max. Prints <c>path:line: reason</c> and returns null
    /// when a file cannot be read or states no area.
    /// </summary>
    public static List<CetMeasurement>? ReadCet(CliContext context, IReadOnlyList<string> paths, string? pathPattern, double? areaM2, double oxidePermittivity)
    {
        var (files, missing) = InputFiles.Expand(paths);
        foreach (string m in missing) context.Error.WriteLine($"{m}:0: --cv: no such file or folder");
        if (missing.Count > 0) return null;
        if (files.Count == 0)
        {
            context.Error.WriteLine($"{paths[0]}:0: --cv: no C-V files in this folder (looked for {string.Join(", ", InputFiles.Extensions)})");
            return null;
        }
        var list = new List<CetMeasurement>(files.Count);
        bool ok = true;
        foreach (string file in files)
        {
            try
            {
                var curve = CvFileReader.Read(file, pathPattern);
                double area = areaM2 ?? curve.AreaM2
                    ?? throw new IvFormatException(file, 0, "the C-V file states no area ('# area: 10000 um2'); give --cv-area");
                var cv = Physics.CvAnalysis.Analyse(curve.VoltageV.AsSpan(), curve.CapacitanceF.AsSpan(), area, oxidePermittivity, curve.TemperatureK ?? 300.0);
                foreach (string note in curve.Notes) context.Error.WriteLine($"{file}:0: {note}");
                list.Add(new CetMeasurement(file, curve.Lot, curve.Wafer, cv.CapacitanceEquivalentThicknessNm, cv.Saturated));
            }
            catch (IvFormatException e)
            {
                context.Error.WriteLine(e.Message);
                ok = false;
            }
            catch (ArgumentException e)
            {
                context.Error.WriteLine($"{file}:0: {UsageException.WithoutParameterName(e.Message)}");
                ok = false;
            }
        }
        return ok ? list : null;
    }
}
