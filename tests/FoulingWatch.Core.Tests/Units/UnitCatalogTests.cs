using FoulingWatch.Core.Quantities;
using FoulingWatch.Core.Units;

namespace FoulingWatch.Core.Tests.Units;

public class UnitCatalogTests
{
    // Source: NIST Special Publication 811 (2008 ed.), Appendix B.8 "Factors for units listed alphabetically";
    // the factors there are given to 7 significant digits (exact ones in full), so the tolerance is 5e-7 relative.
    [Theory]
    [InlineData(Dimension.Power, "Btu/h", 2.930711E-01)]
    [InlineData(Dimension.Power, "MMBtu/h", 2.930711E+05)]
    [InlineData(Dimension.HeatTransferCoefficient, "Btu/(h ft2 °F)", 5.678263E+00)]
    [InlineData(Dimension.FoulingResistance, "h·ft²·°F/Btu", 1.761102E-01)]
    [InlineData(Dimension.Pressure, "psi", 6.894757E+03)]
    [InlineData(Dimension.Area, "ft2", 9.290304E-02)]
    [InlineData(Dimension.Energy, "Btu", 1.055056E+03)]
    [InlineData(Dimension.Energy, "kWh", 3.6E+06)]
    [InlineData(Dimension.Energy, "MMBtu", 1.055056E+09)]
    [InlineData(Dimension.MassFlow, "lb/h", 1.259979E-04)]
    [InlineData(Dimension.MassFlow, "klb/h", 1.259979E-01)]
    [InlineData(Dimension.VolumetricFlow, "US gpm", 6.309020E-05)]
    [InlineData(Dimension.VolumetricFlow, "bbl/d", 1.589873E-01 / 86400)]
    [InlineData(Dimension.SpecificHeat, "Btu/lb degF", 4.1868E+03)]
    [InlineData(Dimension.ThermalConductivity, "Btu/h ft degF", 1.730735E+00)]
    [InlineData(Dimension.Density, "lb/ft3", 1.601846E+01)]
    [InlineData(Dimension.Length, "in", 2.54E-02)]
    public void Factors_match_NIST_SP_811(Dimension dimension, string unit, double siPerUnit)
    {
        var resolved = UnitCatalog.Resolve(unit, dimension);
        Assert.Equal(siPerUnit, resolved.Scale, siPerUnit * 5e-7);
        Assert.Equal(0.0, resolved.Offset);
    }

    // Source: NIST SP 811, B.9 (temperature): T/K = (t/°F + 459.67)/1.8 and T/K = t/°C + 273.15; exact.
    [Theory]
    [InlineData("degF", 32.0, 273.15)]
    [InlineData("°F", 212.0, 373.15)]
    [InlineData("F", -40.0, 233.15)]
    [InlineData("degC", 25.0, 298.15)]
    [InlineData("°C", -273.15, 0.0)]
    [InlineData("K", 300.0, 300.0)]
    [InlineData("degR", 491.67, 273.15)]
    public void Temperature_levels_convert_with_their_offsets(string unit, double value, double kelvin)
        => Assert.Equal(kelvin, UnitCatalog.Resolve(unit, Dimension.Temperature).ToSi(value), 10);

    // Source: NIST SP 811, B.9: a temperature interval of 1 °F is 5/9 K with no offset.
    [Fact]
    public void A_fahrenheit_difference_converts_by_five_ninths_without_offset()
    {
        var u = UnitCatalog.Resolve("degF", Dimension.TemperatureDifference);
        Assert.Equal(5.0, u.ToSi(9.0), 12);
        Assert.Equal(5.0, TemperatureDifference.FromFahrenheitDegrees(9.0).Kelvin, 12);
    }

    [Theory]
    [InlineData("W/m2K")]
    [InlineData("W/(m²·K)")]
    [InlineData("w/m2k")]
    [InlineData("W/m2/K")]
    [InlineData("W/(m2 K)")]
    public void Spellings_of_one_unit_resolve_alike(string unit)
        => Assert.Equal(1.0, UnitCatalog.Resolve(unit, Dimension.HeatTransferCoefficient).Scale);

    [Fact]
    public void Mass_flow_trade_units_resolve()
    {
        Assert.Equal(1000.0 / 3600.0, UnitCatalog.Resolve("t/h", Dimension.MassFlow).Scale, 15);
        Assert.Equal(1.0 / 3600.0, UnitCatalog.Resolve("kg/h", Dimension.MassFlow).Scale, 15);
    }

    // Source: NIST SP 811, B.8: bar = 1e5 Pa; standard atmosphere = 101 325 Pa (exact).
    [Fact]
    public void Gauge_pressure_adds_the_stated_atmosphere()
    {
        var barg = UnitCatalog.ResolvePressure("barg", 101_325.0);
        Assert.Equal(601_325.0, barg.ToSi(5.0), 9);
        var psig = UnitCatalog.ResolvePressure("psi(g)", 101_325.0);
        Assert.Equal(101_325.0 + 6.894757E+03 * 10, psig.ToSi(10.0), 0.05);
        Assert.Equal(5e5, UnitCatalog.ResolvePressure("bar", 101_325.0).ToSi(5.0), 9);
    }

    [Fact]
    public void Numbers_with_units_parse_to_SI()
    {
        Assert.Equal(250.0 * 9.290304E-02, UnitCatalog.ParseToSi("250 ft2", Dimension.Area), 9);
        Assert.Equal(2.5e6, UnitCatalog.ParseToSi("2.5MW", Dimension.Power), 6);
        Assert.Equal(1.5e-4, UnitCatalog.ParseToSi("1.5e-4 m2K/W", Dimension.FoulingResistance), 15);
    }

    [Fact]
    public void An_unknown_unit_is_refused_with_the_accepted_list()
    {
        var ex = Assert.Throws<UnknownUnitException>(() => UnitCatalog.Resolve("kg/fortnight", Dimension.MassFlow));
        Assert.Equal("'kg/fortnight' is not a mass-flow unit; use kg/s, kg/min, kg/h, t/h, t/min, t/d, lb/h, klb/h, lb/s.", ex.Message);
    }

    // Definitions (SI: 1 min = 60 s): a flow per minute is 1/60 of the same per second; minutes spelled as people write them.
    [Fact]
    public void Flows_per_minute_and_durations_in_minutes_are_read()
    {
        Assert.Equal(1.0 / 60.0, UnitCatalog.Resolve("kg/min", Dimension.MassFlow).Scale, 15);
        Assert.Equal(1000.0 / 60.0, UnitCatalog.Resolve("t/min", Dimension.MassFlow).Scale, 15);
        foreach (var unit in new[] { "min", "mins", "minute", "minutes" })
            Assert.Equal(600.0, UnitCatalog.ParseToSi($"10 {unit}", Dimension.Duration), 12);
        Assert.Equal(30.0, UnitCatalog.ParseToSi("30 secs", Dimension.Duration), 12);
    }

    [Fact]
    public void A_number_without_a_unit_is_refused_with_an_example()
    {
        var ex = Assert.Throws<FormatException>(() => UnitCatalog.ParseToSi("250", Dimension.Area));
        Assert.StartsWith("'250' has no unit; write it like \"250 m2\"", ex.Message);
    }

    [Fact]
    public void A_unit_of_the_wrong_dimension_is_refused()
        => Assert.Throws<UnknownUnitException>(() => UnitCatalog.Resolve("kW", Dimension.MassFlow));

    [Fact]
    public void Negative_absolute_temperature_is_refused_naming_quantity_value_and_range()
    {
        var ex = Assert.Throws<QuantityOutOfRangeException>(() => Temperature.FromCelsius(-300));
        Assert.Equal("temperature = -26.85 K is out of range; valid: 0 K or above (absolute temperature).", ex.Message);
        Assert.IsAssignableFrom<ArgumentOutOfRangeException>(ex);
    }

    [Fact]
    public void Negative_mass_flow_is_refused()
    {
        var ex = Assert.Throws<QuantityOutOfRangeException>(() => MassFlow.FromKilogramsPerSecond(-1));
        Assert.Contains("mass flow = -1 kg/s", ex.Message);
    }

    // Source: the STYLE derivation, checked against NIST SP 811 B.8 (h·ft²·°F/Btu_IT = 1.761102E-01 m²·K/W).
    [Fact]
    public void Fouling_resistance_from_US_units_matches_NIST()
        => Assert.Equal(1.761102E-01, FoulingResistance.FromHourSquareFootFahrenheitPerBtu(1).SquareMetreKelvinPerWatt, 7);
}
