using System.Collections.Immutable;
using JunctionFit.Physics;
using JunctionFit.Planning;
using Xunit;
using Xunit.Abstractions;

namespace JunctionFit.Tests.Planning;

/// <summary>The recommendation of <see cref="MeasurementPlanner"/>: limits, point budget, targets, compliance and the worst case.</summary>
public class MeasurementPlannerTests(ITestOutputHelper output)
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly JunctionCurrentModel Model = new(SimmonsRectangularModel.Instance);
    private static readonly double[] Truth = [2.0 * Ev, 1.5e-9, 1.0, 100e-12];

    private static PlanningSetup Setup() => new(Model, Truth, ["barrier_height_eV", "thickness_nm"], 0.01);

    private static ImmutableArray<double> Sweep(double vmax, int points) => [.. IvSimulator.SweepVoltages(new SimulationSpec(-vmax, vmax, points))];

    [Fact]
    public void Plan_MaxField5MvPerCmAt1p5Nm_RecommendationStaysAtOrBelow0p75V()
    {
        // Issue 16: 5 MV/cm × 1.5 nm = 5·10⁸ V/m × 1.5·10⁻⁹ m = 0.75 V.
        var plan = MeasurementPlanner.Plan(new PlanRequest(Setup()) { ProposedVoltagesV = Sweep(0.8, 201), MaxFieldVPerM = 5e8, MaxBiasV = 2.0 });
        Assert.NotNull(plan.Recommendation);
        var rec = plan.Recommendation!;
        output.WriteLine($"recommended {rec.FromV} … {rec.ToV} V, {rec.Points} points; bias limit {plan.BiasLimitV} V");
        Assert.True(rec.ToV <= 0.75 && rec.FromV >= -0.75, $"{rec.FromV} … {rec.ToV}");
        Assert.True(rec.MaxFieldVPerM <= 5e8 * (1 + 1e-12));
        Assert.All(plan.Scan, s => Assert.True(s.MaxBiasV <= 0.75));
        Assert.Contains(plan.Warnings, w => w.Contains("beyond the bias limit", StringComparison.Ordinal));
    }

    [Theory]
    [InlineData(0.3)]
    [InlineData(0.4567)]
    [InlineData(0.777)]
    [InlineData(1.3)]
    public void Plan_AnyBiasLimit_NoCandidateExceedsIt(double maxBias)
    {
        var plan = MeasurementPlanner.Plan(new PlanRequest(Setup()) { MaxBiasV = maxBias, MaxPoints = 101, BiasSteps = 10 });
        Assert.NotEmpty(plan.Scan);
        Assert.All(plan.Scan, s => Assert.True(s.MaxBiasV <= maxBias));
        Assert.All(plan.Scan, s => Assert.True(MeasurementPlanner.CandidateVoltages(SweepFamily.BothPolarities, s.MaxBiasV, 11).Max() <= maxBias));
        Assert.True(plan.Recommendation is null || Math.Abs(plan.Recommendation.ToV) <= maxBias);
    }

    [Fact]
    public void Plan_PointBudgetWithoutTargets_UsesTheBudgetAndTheBestPrecisionWithinTolerance()
    {
        var plan = MeasurementPlanner.Plan(new PlanRequest(Setup()) { MaxBiasV = 1.0, MaxPoints = 151, BiasSteps = 20 });
        var rec = plan.Recommendation!;
        Assert.Equal(151, rec.Points);
        double best = plan.Scan.Min(s => s.Score);
        Assert.True(rec.Score <= best * (1 + MeasurementPlanner.BestScoreTolerance));
        // The lowest such bias: every lower candidate is worse by more than the tolerance.
        Assert.All(plan.Scan.Where(s => s.MaxBiasV < rec.MaxBiasV), s => Assert.True(s.Score > best * (1 + MeasurementPlanner.BestScoreTolerance)));
    }

    [Fact]
    public void Plan_RelativeTarget_FewestPointsThatMeetIt()
    {
        var request = new PlanRequest(Setup())
        {
            MaxBiasV = 0.6,
            MaxPoints = 2001,
            BiasSteps = 12,
            Targets = [new PrecisionTarget("barrier_height_eV", 0.005, IsRelative: true)],
        };
        var plan = MeasurementPlanner.Plan(request);
        var rec = plan.Recommendation!;
        Assert.True(rec.MeetsTargets);
        double rel = rec.Prediction.RelativeHalfWidth("barrier_height_eV")!.Value;
        output.WriteLine($"recommended {rec.FromV} … {rec.ToV} V, {rec.Points} points, φ half-width {rel:P3}");
        Assert.True(rel <= 0.005);
        // Near-minimal: 10 % fewer points at the same bias miss the target (half-widths scale as 1/√N, so by about 5 %).
        var fewer = FisherPredictor.Predict(Setup(), MeasurementPlanner.CandidateVoltages(SweepFamily.BothPolarities, rec.MaxBiasV, (int)(0.9 * rec.Points)));
        Assert.True(fewer.Find("barrier_height_eV")!.RelativeHalfWidth95 > 0.005);
    }

    [Fact]
    public void Plan_UnreachableTarget_SaysSoAndGivesTheBestCandidate()
    {
        var request = new PlanRequest(Setup())
        {
            MaxBiasV = 0.5,
            MaxPoints = 51,
            BiasSteps = 8,
            Targets = [new PrecisionTarget("barrier_height_eV", 1e-5, IsRelative: true)],
        };
        var plan = MeasurementPlanner.Plan(request);
        Assert.NotNull(plan.Recommendation);
        Assert.False(plan.Recommendation!.MeetsTargets);
        Assert.Contains(plan.Warnings, w => w.Contains("reaches every target", StringComparison.Ordinal));
    }

    [Fact]
    public void Plan_Compliance_RecommendationStaysBelowIt()
    {
        double compliance = Math.Abs(Model.Current(0.55, Truth));
        var setup = Setup() with { ComplianceA = compliance };
        var plan = MeasurementPlanner.Plan(new PlanRequest(setup) { MaxBiasV = 1.0, MaxPoints = 101, BiasSteps = 20 });
        var rec = plan.Recommendation!;
        output.WriteLine($"compliance {compliance:G3} A reached from {plan.ComplianceBiasV} V; recommended to {rec.MaxBiasV} V");
        Assert.True(rec.Prediction.MaxAbsCurrentA < 0.999 * compliance);
        Assert.True(rec.MaxBiasV < 0.55);
        Assert.InRange(plan.ComplianceBiasV!.Value, 0.55, 0.6);
    }

    [Fact]
    public void WorstCase_OverRanges_IsTheLargestHalfWidthOfTheGrid()
    {
        var request = new PlanRequest(Setup())
        {
            Ranges = ImmutableDictionary<string, (double, double)>.Empty
                .Add("barrier_height_eV", (1.8 * Ev, 2.2 * Ev))
                .Add("thickness_nm", (1.4e-9, 1.6e-9)),
            ProposedVoltagesV = Sweep(0.8, 101),
        };
        var grid = MeasurementPlanner.Grid(request);
        Assert.Equal(9, grid.Count); // centre + 8 other points of the 3 × 3 grid
        var plan = MeasurementPlanner.Plan(request);
        var worst = plan.ProposedWorstCase!;
        foreach (var g in grid)
        {
            var p = FisherPredictor.Predict(g, request.ProposedVoltagesV!.Value.AsSpan());
            foreach (var q in p.Parameters) Assert.True(worst.Find(q.Key)!.HalfWidth95 >= q.HalfWidth95);
        }
        // The grid's edges are worse than its centre for φ (at a higher φ the same sweep shows less curvature).
        Assert.True(worst.Find("barrier_height_eV")!.HalfWidth95 > plan.Proposed!.Find("barrier_height_eV")!.HalfWidth95);
    }
}
