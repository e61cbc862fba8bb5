using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.FluidModels;

public class WaterTransportTests
{
    private static void Close(double expected, double actual, double rel) =>
        Assert.True(Math.Abs(actual - expected) <= rel * Math.Abs(expected), $"expected {expected:G12}, got {actual:G12}");

    // Source: IAPWS R12-08 (2008), Table 4, check values for the viscosity with μ̄2 = 1 (from memory; the values below
    // agree with the formulation to the 9 digits printed), in µPa·s at T (K) and ρ (kg/m³).
    [Theory]
    [InlineData(298.15, 998, 889.735100)]
    [InlineData(298.15, 1200, 1437.649467)]
    [InlineData(373.15, 1000, 307.883622)]
    [InlineData(433.15, 1, 14.538324)]
    [InlineData(433.15, 1000, 217.685358)]
    [InlineData(873.15, 1, 32.619287)]
    [InlineData(873.15, 100, 35.802262)]
    [InlineData(873.15, 600, 77.430195)]
    [InlineData(1173.15, 1, 44.217245)]
    [InlineData(1173.15, 100, 47.640433)]
    [InlineData(1173.15, 400, 64.154608)]
    public void Viscosity_matches_the_IAPWS_R12_08_check_values(double t, double rho, double microPascalSeconds) =>
        Assert.InRange(WaterTransport.Viscosity(t, rho) * 1e6 - microPascalSeconds, -6e-7, 6e-7); // to the 6 decimals printed

    // Source: IAPWS R15-11 (2011), check values of the thermal conductivity (from memory), in mW/(m·K).
    [Theory]
    [InlineData(298.15, 0, 18.4341883)]
    [InlineData(298.15, 998, 607.712868)]
    [InlineData(298.15, 1200, 799.038144)]
    [InlineData(873.15, 0, 79.1034659)]
    public void Thermal_conductivity_matches_the_IAPWS_R15_11_check_values(double t, double rho, double milliWatts) =>
        Assert.InRange(WaterTransport.ThermalConductivity(t, rho) * 1e3 - milliWatts, -6e-7, 6e-7); // to the 6 decimals printed

    // Handbook values for liquid water at 1 atm (e.g. Incropera, Table A.6; from memory): μ 1.002 mPa·s at 20 °C and
    // 0.797 mPa·s at 30 °C, k 0.598 and 0.615 W/(m·K), Pr 7.0 and 5.4: the drop of viscosity over the cooling-water season
    // that raises the tube-side film coefficient by about a tenth (Dittus–Boelter h ∝ μ^−0.4).
    [Fact]
    public void Liquid_water_at_1_atm_has_the_handbook_viscosity_conductivity_and_prandtl_number()
    {
        var water = new IapwsWater();
        var p = new Pressure(101_325);
        Close(1.002e-3, water.Viscosity(Temperature.FromCelsius(20), p), 0.003);
        Close(0.797e-3, water.Viscosity(Temperature.FromCelsius(30), p), 0.003);
        Close(0.598, water.ThermalConductivity(Temperature.FromCelsius(20), p), 0.005);
        Close(0.615, water.ThermalConductivity(Temperature.FromCelsius(30), p), 0.005);
        Close(7.0, water.Prandtl(Temperature.FromCelsius(20), p), 0.02);
        Close(5.4, water.Prandtl(Temperature.FromCelsius(30), p), 0.02);
    }

    [Fact]
    public void The_near_critical_region_and_states_outside_the_range_are_refused()
    {
        Assert.Throws<PropertyRangeException>(() => WaterTransport.Viscosity(647.1, 322));
        Assert.Throws<PropertyRangeException>(() => WaterTransport.ThermalConductivity(200, 1000));
        Assert.Throws<PropertyRangeException>(() => WaterTransport.Viscosity(300, 1500));
    }
}
