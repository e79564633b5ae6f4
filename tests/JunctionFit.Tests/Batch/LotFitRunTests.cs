using System.Globalization;
using System.Text;
using JunctionFit.Batch;
using JunctionFit.Common;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using JunctionFit.Storage;
using JunctionFit.Tests.Storage;
using Xunit;

namespace JunctionFit.Tests.Batch;

/// <summary>
/// The lot fit as a library call (what <c>junctionfit batch</c> runs before its report): rows in input order, a bad file
/// reported and the others fitted, results.csv renamed into place, and remedies left as placeholders unless the caller
/// gives their words. The curves are simulated (invented data, for coverage of the orchestration, not of the physics).
/// </summary>
public class LotFitRunTests
{
    private static readonly FitPlan Plan = new(["simmons"], BarrierModelOptions.Default, ParasiticOptions.None, FitOptions.Default);

    /// <summary>Two simulated Simmons dies and, between them, a file with a header and no data rows.</summary>
    private static List<string> MakeFiles(TempFolder dir)
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        var files = new List<string>();
        for (int k = 0; k < 2; k++)
        {
            double[] theta = [(1.9 + 0.02 * k) * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, 100e-12];
            var (v, i) = IvSimulator.Simulate(model, theta, new SimulationSpec(-0.8, 0.8, 61) { RelativeNoise = 0.01, Seed = 7 + k });
            var sb = new StringBuilder($"# lot: L1\n# wafer: W01\n# die: {k},0\nVoltage (V),Current (A)\n");
            for (int p = 0; p < v.Length; p++) sb.Append(CultureInfo.InvariantCulture, $"{v[p]:R},{i[p]:R}\n");
            string path = dir.File($"die_{k}.csv");
            File.WriteAllText(path, sb.ToString());
            files.Add(path);
            if (k == 0)
            {
                string empty = dir.File("empty.csv");
                File.WriteAllText(empty, "Voltage (V),Current (A)\n");
                files.Add(empty);
            }
        }
        return files;
    }

    private static IEnumerable<string> Texts(FitResult r) =>
        new[] { r.Error, r.StatusReason, r.ModelValidity }.OfType<string>().Concat(r.Warnings).Concat(r.Diagnoses);

    [Fact]
    public void Run_BadFileBetweenGoodOnes_RowsInInputOrderAndOnlyTheBadOneFails()
    {
        using var dir = new TempFolder();
        var files = MakeFiles(dir);
        var messages = new StringWriter();
        var progress = new List<int>();
        var outcome = LotFitRun.Run(new LotFitRequest(files, dir.File("out"), IvReadOptions.Default, Plan, 2) { Plots = false },
            null, null, messages, (done, total) => { Assert.Equal(3, total); progress.Add(done); });
        Assert.Equal(files, outcome.Rows.Select(r => r.File));
        Assert.Equal([1, 2, 3], progress);
        Assert.Equal(1, outcome.Unreadable);
        Assert.Equal(FitStatus.Failed, outcome.Results[1].Status);
        Assert.NotEqual(FitStatus.Failed, outcome.Results[0].Status);
        Assert.NotEqual(FitStatus.Failed, outcome.Results[2].Status);
        Assert.Contains(files[1] + ":", messages.ToString(), StringComparison.Ordinal); // path:line: reason
        Assert.True(File.Exists(outcome.ResultsPath));
        Assert.False(File.Exists(outcome.ResultsPath + ".partial"));
        Assert.Equal(4, File.ReadAllLines(outcome.ResultsPath).Length); // header + 3 rows
        Assert.All(outcome.PlotByIndex, Assert.Null);
    }

    [Fact]
    public void Run_WordsGiven_NoPlaceholderLeftInResultsOrStore_WithoutWords_PlaceholdersKept()
    {
        // A Simmons fit with the area free names a remedy (give the area) in its texts; the library keeps it as a
        // placeholder and the caller's words replace every one before anything is written or stored.
        using var dir = new TempFolder();
        var files = MakeFiles(dir);
        var raw = LotFitRun.Run(new LotFitRequest(files, dir.File("raw"), IvReadOptions.Default, Plan, 1) { Plots = false }, null, null, TextWriter.Null);
        Assert.Contains(raw.Results.SelectMany(Texts), t => t.Contains("{{remedy:", StringComparison.Ordinal));

        string db = dir.File("lot.db");
        using (var store = ResultStore.Open(db))
        {
            var worded = LotFitRun.Run(new LotFitRequest(files, dir.File("worded"), IvReadOptions.Default, Plan, 1) { Plots = false, Words = r => $"<{r.Kind}>" },
                store, () => ResultStore.Open(db), TextWriter.Null);
            var texts = worded.Results.SelectMany(Texts).ToList();
            Assert.DoesNotContain(texts, t => t.Contains("{{remedy:", StringComparison.Ordinal));
            Assert.Contains(texts, t => t.Contains('<' + nameof(RemedyKind.GiveArea) + '>', StringComparison.Ordinal));
            Assert.DoesNotContain("{{remedy:", File.ReadAllText(worded.ResultsPath), StringComparison.Ordinal);
            Assert.Equal(3, store.Count()); // the unreadable file is stored too, as failed, under its content hash

            // A second run finds all three stored; its note names the refit remedy, worded by whoever prints it.
            var again = new StringWriter();
            var second = LotFitRun.Run(new LotFitRequest(files, dir.File("again"), IvReadOptions.Default, Plan, 1) { Plots = false },
                store, () => ResultStore.Open(db), again);
            Assert.Contains("3 of 3 files are already stored", again.ToString(), StringComparison.Ordinal);
            Assert.Contains(new Remedy(RemedyKind.Refit).ToString(), again.ToString(), StringComparison.Ordinal);
            // Taken from the database, each result says what the fit said (status reason, validity, diagnoses kept since schema 4).
            Assert.Equal(worded.Results.Select(r => (r.Status, r.Error, r.StatusReason, r.ModelValidity)),
                second.Results.Select(r => (r.Status, r.Error, r.StatusReason, r.ModelValidity)));
            Assert.Equal(worded.Results.SelectMany(r => r.Diagnoses), second.Results.SelectMany(r => r.Diagnoses));
            Assert.Equal(worded.Results.SelectMany(r => r.Warnings), second.Results.SelectMany(r => r.Warnings));
        }
    }
}
