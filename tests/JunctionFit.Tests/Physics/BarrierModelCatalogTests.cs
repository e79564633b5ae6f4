using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class BarrierModelCatalogTests
{
    [Fact]
    public void Create_EveryName_ReturnsModelOfThatName()
    {
        foreach (string name in BarrierModelCatalog.Names)
        {
            var model = BarrierModelCatalog.Create(name, BarrierModelOptions.Default);
            Assert.Equal(name, model.Name);
            Assert.False(string.IsNullOrWhiteSpace(model.ValidityRange));
            Assert.Contains(model.Parameters, p => p.Key == "barrier_height_eV");
            Assert.Contains(model.Parameters, p => p.Key == "thickness_nm");
            Assert.Contains(model.Parameters, p => p.Key == "mass_ratio");
        }
    }

    [Fact]
    public void Create_UnknownName_ThrowsListingNames()
    {
        var ex = Assert.Throws<ArgumentException>(() => BarrierModelCatalog.Create("nope", BarrierModelOptions.Default));
        Assert.Contains("simmons", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Create_AnalyticModelWithTemperature_WrapsInThermalFactor()
    {
        var model = BarrierModelCatalog.Create("simmons", new BarrierModelOptions { TemperatureK = 300 });
        Assert.IsType<ThermallyCorrectedModel>(model);
        Assert.Equal("simmons", model.Name);
        Assert.IsType<SimmonsRectangularModel>(BarrierModelCatalog.Create("SIMMONS", new BarrierModelOptions { TemperatureK = 0 }));
    }

    [Fact]
    public void Options_InvalidValues_Throw()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new BarrierModelOptions { TemperatureK = -1 });
        Assert.Throws<ArgumentOutOfRangeException>(() => new BarrierModelOptions { RelativePermittivity = 0.5 });
        Assert.Throws<ArgumentOutOfRangeException>(() => new BarrierModelOptions { FermiEnergyEv = double.NaN });
    }
}
