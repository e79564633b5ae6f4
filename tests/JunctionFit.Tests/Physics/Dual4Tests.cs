using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// The forward-mode dual numbers behind the mos model's derivatives: each operation's partials against central finite
/// differences of the same function in plain doubles (step 1e-6 relative), the guarded ends (√ at 0, the floor of
/// <c>AtLeast</c>), and the model catalogue's name handling.
/// </summary>
public class Dual4Tests
{
    private static double Central(Func<double, double> f, double x)
    {
        double h = 1e-6 * Math.Max(1.0, Math.Abs(x));
        return (f(x + h) - f(x - h)) / (2 * h);
    }

    [Theory]
    [InlineData(0.7)]
    [InlineData(2.5)]
    public void Operations_PartialsMatchFiniteDifferences(double x)
    {
        // g(x, y) = √(x·y) / (x − y/3) + e^(x/y) − ln(x + y), differentiated in x (index 0) and y (index 1).
        double y = 1.3;
        static double G(double a, double b) => Math.Sqrt(a * b) / (a - b / 3) + Math.Exp(a / b) - Math.Log(a + b);
        var dx = Dual4.Variable(x, 0);
        var dy = Dual4.Variable(y, 1);
        var g = Dual4.Sqrt(dx * dy) / (dx - dy / 3.0) + Dual4.Exp(dx / dy) - Dual4.Log(dx + dy);
        Assert.Equal(G(x, y), g.V, 12);
        Assert.Equal(Central(a => G(a, y), x), g.Partial(0), 6);
        Assert.Equal(Central(b => G(x, b), y), g.Partial(1), 6);
        Assert.Equal(0.0, g.Partial(2));
        Assert.Equal(0.0, g.Partial(3));
        var negated = -g;
        Assert.Equal(-g.Partial(0), negated.Partial(0));
        Assert.Throws<ArgumentOutOfRangeException>(() => g.Partial(4));
    }

    [Fact]
    public void Sqrt_AtZero_HasZeroDerivativeNotInfinity()
    {
        var root = Dual4.Sqrt(Dual4.Variable(0.0, 2));
        Assert.Equal(0.0, root.V);
        Assert.Equal(0.0, root.Partial(2));
        var inside = Dual4.Sqrt(Dual4.Variable(4.0, 2));
        Assert.Equal(0.25, inside.Partial(2)); // d√x/dx = 1 / (2√x) at x = 4
    }

    [Fact]
    public void AtLeast_BelowTheFloor_IsTheFloorWithNoDerivative()
    {
        var below = Dual4.AtLeast(Dual4.Variable(0.5, 3), 1.0);
        Assert.Equal(1.0, below.V);
        Assert.Equal(0.0, below.Partial(3));
        var above = Dual4.AtLeast(Dual4.Variable(1.5, 3), 1.0);
        Assert.Equal(1.5, above.V);
        Assert.Equal(1.0, above.Partial(3));
    }

    [Fact]
    public void Catalog_Names_CaseAndSpaceInsensitive_UnknownNamesListed()
    {
        Assert.Same(SimmonsRectangularModel.Instance, BarrierModelCatalog.Create("  SIMMONS "));
        Assert.Throws<ArgumentNullException>(() => BarrierModelCatalog.Create(null!));
        var error = Assert.Throws<ArgumentException>(() => BarrierModelCatalog.Create("trapezoid"));
        Assert.Contains("trapezoid", error.Message, StringComparison.Ordinal);
        Assert.All(BarrierModelCatalog.Names, name => Assert.Contains(name, error.Message, StringComparison.Ordinal));
    }
}
