using System.Collections.Immutable;
using System.Text;
using JunctionFit.Fitting;
using JunctionFit.Storage;
using Xunit;
using JunctionFit.Physics;

namespace JunctionFit.Tests.Storage;

public sealed class DatabaseIdentityTests
{
    [Fact]
    public void FileSha256_KnownBytes_MatchesPublishedDigest()
    {
        // FIPS 180-2, appendix B.1: SHA-256("abc").
        using var folder = new TempFolder();
        string path = folder.File("abc.csv");
        File.WriteAllBytes(path, Encoding.ASCII.GetBytes("abc"));
        Assert.Equal("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", ResultIdentity.FileSha256(path));
    }

    [Fact]
    public void FileSha256_RenamedCopy_SameHash()
    {
        using var folder = new TempFolder();
        File.WriteAllText(folder.File("a.csv"), "Voltage (V),Current (A)\n0.1,1e-9\n");
        File.Copy(folder.File("a.csv"), folder.File("b.csv"));
        Assert.Equal(ResultIdentity.FileSha256(folder.File("a.csv")), ResultIdentity.FileSha256(folder.File("b.csv")));
    }

    [Fact]
    public void CanonicalOptions_SameOptionsInAnyOrder_SameText()
    {
        var a = FitOptions.Default with
        {
            FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, 1e-10).Add(ParameterKey.MassRatio, 0.4),
            StartValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Thickness, 1.5),
        };
        var b = FitOptions.Default with
        {
            FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.MassRatio, 0.4).Add(ParameterKey.Area, 1e-10),
            StartValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Thickness, 1.5),
        };
        Assert.Equal(FitOptionsText.Canonical(a), FitOptionsText.Canonical(b));
        Assert.StartsWith(FitOptionsText.Format + "\n", FitOptionsText.Canonical(a), StringComparison.Ordinal);
        Assert.Contains("\nfixed.area_m2=1E-10\n", FitOptionsText.Canonical(a), StringComparison.Ordinal);
    }

    [Fact]
    public void CanonicalOptions_AnyOptionChanged_DifferentHash()
    {
        string baseline = ResultIdentity.OptionsHash(FitOptionsText.Canonical(FitOptions.Default));
        FitOptions[] changed =
        [
            FitOptions.Default with { FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, 1e-10) },
            FitOptions.Default with { FreedKeys = [ParameterKey.MassRatio] },
            FitOptions.Default with { StartValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.BarrierHeight, 2.0) },
            FitOptions.Default with { RelativeNoise = 0.01 },
            FitOptions.Default with { NoiseFloorA = 1e-13 },
            FitOptions.Default with { ComplianceA = 1e-3 },
            FitOptions.Default with { FixAreaFromMetadata = true },
            FitOptions.Default with { Starts = 5 },
            FitOptions.Default with { BiasWindowLowV = 0.1 },
            FitOptions.Default with { BiasWindowHighV = 0.1 },
            FitOptions.Default with { SweepDirection = -1 },
            FitOptions.Default with { MisfitTolerance = 0.1 },
            FitOptions.Default with { KeepSettling = true },
            FitOptions.Default with { DirectionFits = false },
            FitOptions.Default with { Solver = FitOptions.DefaultSolver with { MaxIterations = 10 } },
            FitOptions.Default with { Solver = FitOptions.DefaultSolver with { MaxFunctionEvaluations = 100 } },
            FitOptions.Default with { Solver = FitOptions.DefaultSolver with { RelativeReductionTolerance = 1e-8 } },
            FitOptions.Default with { Solver = FitOptions.DefaultSolver with { StepTolerance = 1e-8 } },
            FitOptions.Default with { Solver = FitOptions.DefaultSolver with { GradientTolerance = 1e-8 } },
            FitOptions.Default with { Solver = FitOptions.DefaultSolver with { InitialStepFactor = 1.0 } },
        ];
        var hashes = changed.Select(o => ResultIdentity.OptionsHash(FitOptionsText.Canonical(o))).ToList();
        Assert.DoesNotContain(baseline, hashes);
        Assert.Equal(hashes.Count, hashes.Distinct().Count());
        Assert.NotEqual(baseline, ResultIdentity.OptionsHash(FitOptionsText.Canonical(FitOptions.Default, [new("temperature_K", "300")])));
    }

    [Fact]
    public void CanonicalOptions_OptionTypesGainAProperty_ThisTestNamesIt()
    {
        // When FitOptions or the solver options gain a property, decide whether it changes a fit's outcome; if it does,
        // write it in FitOptionsText.Canonical (stored results then count as stale), then list it here.
        string[] fit = ["BiasWindowHighV", "BiasWindowLowV", "Bounds", "ComplianceA", "DirectionFits", "FixAreaFromMetadata", "FixedValues", "FreedKeys",
            "KeepSettling", "MisfitTolerance", "NoiseFloorA", "RelativeNoise", "Solver", "StartValues", "Starts", "SweepDirection"];
        string[] solver = ["GradientTolerance", "InitialStepFactor", "MaxFunctionEvaluations", "MaxIterations", "RelativeReductionTolerance", "StepTolerance"];
        Assert.Equal(fit, InstanceProperties(typeof(FitOptions)));
        Assert.Equal(solver, InstanceProperties(typeof(LevenbergMarquardtOptions)));
    }

    [Fact]
    public void CanonicalOptions_ExtraNameWithEquals_Throws()
    {
        Assert.Throws<ArgumentException>(() => FitOptionsText.Canonical(FitOptions.Default, [new("a=b", "1")]));
        Assert.Throws<ArgumentException>(() => FitOptionsText.Canonical(FitOptions.Default, [new("a", "1\n2")]));
        Assert.Throws<ArgumentException>(() => FitOptionsText.Canonical(FitOptions.Default, [new("a", "1"), new("a", "2")]));
    }

    [Fact]
    public void ResultKey_MalformedHash_Throws()
    {
        string ok = new('a', 64);
        Assert.Throws<ArgumentException>(() => new ResultKey("ABC", "simmons", ok));
        Assert.Throws<ArgumentException>(() => new ResultKey(new string('A', 64), "simmons", ok));
        Assert.Throws<ArgumentException>(() => new ResultKey(ok, " ", ok));
        Assert.Equal(new ResultKey(ok, "simmons", ok), new ResultKey(ok, "simmons", ok));
    }

    [Fact]
    public void StoredResult_KeyModelDiffersFromResult_Throws()
    {
        var fit = JunctionFit.StoreCrashHelper.DemoResults.Fit(1);
        string options = JunctionFit.StoreCrashHelper.DemoResults.Options;
        var key = ResultIdentity.Key(new string('0', 64), "bdr", options);
        Assert.Throws<ArgumentException>(() => new StoredResult(key, options, RunInfo.StartNew("1"), fit));
        var right = ResultIdentity.Key(new string('0', 64), "simmons", options);
        Assert.Throws<ArgumentException>(() => new StoredResult(right, options + "\nx=1", RunInfo.StartNew("1"), fit));
    }

    [Fact]
    public void RunInfo_StartNew_IdHasTimeAndRandomPart()
    {
        var a = RunInfo.StartNew("1.2.3");
        var b = RunInfo.StartNew("1.2.3");
        Assert.Matches("^[0-9]{8}T[0-9]{6}Z-[0-9a-f]{8}$", a.RunId);
        Assert.NotEqual(a.RunId, b.RunId);
        Assert.Equal("1.2.3", a.ToolVersion);
        Assert.False(string.IsNullOrEmpty(RunInfo.StartNew().ToolVersion));
    }

    private static string[] InstanceProperties(Type t)
        => [.. t.GetProperties(System.Reflection.BindingFlags.Public | System.Reflection.BindingFlags.Instance)
            .Where(p => p.Name != "EqualityContract").Select(p => p.Name).Order(StringComparer.Ordinal)];
}
