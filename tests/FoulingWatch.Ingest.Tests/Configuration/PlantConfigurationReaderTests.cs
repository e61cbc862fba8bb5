using FoulingWatch.Core.Exchangers;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Ingest.Tests.Configuration;

public class PlantConfigurationReaderTests
{
    private static ConfigurationException Fails(string exchangers, string source = "{ \"files\": [\"*.csv\"] }")
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig(source, exchangers);
        return Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath));
    }

    [Fact]
    public void A_valid_configuration_reads_into_SI()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }");
        var config = PlantConfigurationReader.Load(plant.ConfigPath);
        var x = Assert.Single(config.Exchangers);
        Assert.Equal("E-101", x.Id);
        Assert.Equal(250.0, x.Area);
        Assert.IsType<OneShellPassEvenTubePasses>(x.Arrangement);
        Assert.Equal(1000.0 / 3600.0, x.Hot.Flow.Unit.Scale, 12);
        Assert.Equal(120_000.0 / 3600.0, x.Hot.DesignFlow!.Value, 9);
        Assert.Equal(ExchangerSide.Tube, x.Cold.Side);
        var clean = Assert.IsType<DatasheetCleanReference>(x.Clean);
        Assert.Equal(450.0, clean.CleanU);
        Assert.Equal(0.8, clean.TubeExponent);
        Assert.Equal(0.6, clean.ShellExponent);
        Assert.Equal(TimeSpan.FromMinutes(10), config.Data.Interval);
        Assert.Single(config.Data.Sources[0].Files);
    }

    [Fact]
    public void A_mass_flow_in_an_unknown_unit_names_the_key_and_the_accepted_units()
    {
        var ex = Fails(TestPlant.Interchanger(flowUnit: "kg/fortnight"));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].hot.flow.unit", e.Path);
        Assert.Equal("'kg/fortnight' is not a mass-flow unit; use kg/s, kg/min, kg/h, t/h, t/min, t/d, lb/h, klb/h, lb/s, m3/s (with density), m3/h (with density), m3/d (with density), L/s (with density), L/min (with density), US gpm (with density), bbl/d (with density).", e.Message);
        Assert.StartsWith("plant.json: exchangers[0].hot.flow.unit: 'kg/fortnight' is not a mass-flow unit", ex.Message);
    }

    [Fact]
    public void An_unknown_key_is_an_error_with_a_suggestion()
    {
        var ex = Fails(TestPlant.Interchanger(extra: ", \"limts\": { \"foulingResistance\": \"0.0008 m2K/W\" }"));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].limts", e.Path);
        Assert.Equal("is not a known key here; did you mean 'limits'?", e.Message);
    }

    [Fact]
    public void A_number_without_its_unit_is_refused()
    {
        var ex = Fails(TestPlant.Interchanger().Replace("\"250 m2\"", "250"));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].area", e.Path);
        Assert.Equal("250 has no unit; every number carries its unit, e.g. \"250 m2\".", e.Message);
    }

    // Property scaling needs the fluid's viscosity and conductivity: asked of a constant-cp side, it is refused with the key.
    [Fact]
    public void A_bulk_temperature_for_a_fluid_without_transport_properties_is_refused()
    {
        var ex = Fails(TestPlant.Interchanger().Replace("\"u\": \"450 W/m2K\"", "\"u\": \"450 W/m2K\", \"tubeBulkTemperature\": \"120 degC\""));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].clean.tubeBulkTemperature", e.Path);
        Assert.StartsWith("scales the film with the fluid's viscosity and conductivity, which constant cp", e.Message);
        Assert.Contains("does not have: use the \"water\" model, give a petroleum liquid its viscosity at two temperatures", e.Message);
    }

    // Film coefficients from the datasheet set the tube share: 1/U = 1/h_o + R_w + (D_o/D_i)/h_i (series resistances
    // referred to the outside area, analytic). U 600, h_shell 1500, inside h_tube 1200 with D_o/D_i = 1.2:
    // 1/1500 + 1.2/1200 = 1/600 exactly, so the tube share is (1.2/1200)/(1/600) = 0.6.
    [Fact]
    public void Datasheet_film_coefficients_set_the_tube_share_and_must_add_up_to_the_clean_U()
    {
        var films = "\"u\": \"600 W/m2K\", \"hTube\": \"1200 W/m2K\", \"hShell\": \"1500 W/m2K\", \"tubeDiameterRatio\": 1.2";
        using (var plant = new TestPlant().WithFixture("wide-artefacts.csv")
                   .WithConfig("{ \"files\": [\"*.csv\"] }", TestPlant.Interchanger().Replace("\"u\": \"450 W/m2K\"", films)))
        {
            var d = Assert.IsType<DatasheetCleanReference>(PlantConfigurationReader.Load(plant.ConfigPath).Exchangers[0].Clean);
            Assert.Equal(0.6, d.TubeShare, 12);
            Assert.Equal(600, d.CleanU);
        }
        // a service U (with a fouling allowance) against clean films: 1/450 is 33 % above the films' 1/600
        var ex = Fails(TestPlant.Interchanger().Replace("\"u\": \"450 W/m2K\"", films.Replace("600 W/m2K", "450 W/m2K")));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].clean", e.Path);
        Assert.StartsWith("the film coefficients and the clean U disagree: 1/hShell + (Do/Di)/hTube = 0.00167 m2K/W but 1/U − wall = 0.00222 m2K/W", e.Message);
    }

    // The geometry method checks the bundle as a designer would and needs both fluids' transport properties.
    // 1000 tubes of 19.05 mm at 23.81 mm triangular pitch in a 489 mm shell: about 344 fit (CTP·(π/4)·Ds²/(CL·Pt²));
    // their surface 1000·π·0.01905·4.877 = 291.9 m² is 17 % off the stated 250 m².
    [Fact]
    public void A_geometry_that_cannot_be_built_or_fluids_without_transport_properties_are_refused()
    {
        var geometry = "\"method\": \"geometry\", \"shellDiameter\": \"489 mm\", \"tubeOuterDiameter\": \"19.05 mm\", " +
            "\"tubeInnerDiameter\": \"15.75 mm\", \"tubeLength\": \"4.877 m\", \"tubeCount\": 1000, \"tubePitch\": \"23.81 mm\", " +
            "\"tubePasses\": 2, \"baffleSpacing\": \"0.05 m\"";
        var ex = Fails(TestPlant.Interchanger().Replace("\"method\": \"datasheet\", \"u\": \"450 W/m2K\"", geometry));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].clean.tubeCount" && e.Message.StartsWith("1000 tubes do not fit a 489 mm shell", StringComparison.Ordinal));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].clean" && e.Message.StartsWith("the tubes' outside surface N·π·Do·L = 291.9 m2", StringComparison.Ordinal));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].clean.baffleSpacing");
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].clean" && e.Message.Contains("hot.fluid", StringComparison.Ordinal));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].clean" && e.Message.Contains("cold.fluid", StringComparison.Ordinal));
    }

    // Bell–Delaware's clearances mean nothing without a baffle cut, and a cut outside 15–45 % is outside the method.
    [Fact]
    public void Bell_Delaware_details_without_a_cut_or_with_an_impossible_cut_are_refused()
    {
        var geometry = "\"method\": \"geometry\", \"shellDiameter\": \"489 mm\", \"tubeOuterDiameter\": \"19.05 mm\", " +
            "\"tubeInnerDiameter\": \"15.75 mm\", \"tubeLength\": \"4.877 m\", \"tubeCount\": 300, \"tubePitch\": \"23.81 mm\", " +
            "\"tubePasses\": 2, \"baffleSpacing\": \"0.3 m\"";
        var noCut = Fails(TestPlant.Interchanger().Replace("\"method\": \"datasheet\", \"u\": \"450 W/m2K\"", geometry + ", \"sealingStripPairs\": 2"));
        Assert.Contains(noCut.Errors, e => e.Path == "exchangers[0].clean" && e.Message.Contains("needs \"baffleCut\"", StringComparison.Ordinal));
        var wideCut = Fails(TestPlant.Interchanger().Replace("\"method\": \"datasheet\", \"u\": \"450 W/m2K\"", geometry + ", \"baffleCut\": \"60 %\""));
        Assert.Contains(wideCut.Errors, e => e.Path == "exchangers[0].clean.baffleCut");
        // a small shell whose bundle clearance leaves the outer tube limit inside the cut line (29 + 19.05 mm > 0.3·150
        // mm): the window geometry is undefined
        var outside = Fails(TestPlant.Interchanger().Replace("\"method\": \"datasheet\", \"u\": \"450 W/m2K\"",
            geometry.Replace("489 mm", "150 mm") + ", \"baffleCut\": \"15 %\", \"bundleShellClearance\": \"29 mm\""));
        Assert.Contains(outside.Errors, e => e.Path == "exchangers[0].clean.baffleCut" && e.Message.Contains("does not cross the bundle", StringComparison.Ordinal));
    }

    // A property-corrected baseline needs a fluid whose viscosity and conductivity are known.
    [Fact]
    public void A_property_corrected_baseline_without_transport_properties_is_refused()
    {
        var ex = Fails(TestPlant.Interchanger().Replace("\"method\": \"datasheet\", \"u\": \"450 W/m2K\"",
            "\"method\": \"baseline\", \"propertyCorrected\": true"));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].clean.propertyCorrected", e.Path);
        Assert.StartsWith("needs the viscosity and conductivity of at least one single-phase fluid", e.Message);
    }

    // A petroleum liquid's viscosity needs two points with the lower viscosity at the higher temperature.
    [Fact]
    public void A_petroleum_viscosity_that_rises_with_temperature_is_refused()
    {
        var ex = Fails(TestPlant.Interchanger().Replace("\"watsonK\": 11.9 }",
            "\"watsonK\": 11.9, \"viscosity\": [[\"40 degC\", \"3 cSt\"], [\"100 degC\", \"9 cSt\"]] }"));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].hot.fluid.viscosity", e.Path);
        Assert.Equal("needs two different temperatures with the lower viscosity at the higher one.", e.Message);
    }

    [Fact]
    public void A_log_level_that_is_not_one_is_refused_with_the_levels()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }");
        File.WriteAllText(plant.ConfigPath, File.ReadAllText(plant.ConfigPath)
            .Replace("\"site\": {", "\"watch\": { \"logLevel\": \"chatty\" }, \"site\": {"));
        var e = Assert.Single(Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath)).Errors);
        Assert.Equal("watch.logLevel", e.Path);
        Assert.Equal("'chatty' is not a log level; use \"verbose\", \"debug\", \"information\", \"warning\", \"error\", \"fatal\".", e.Message);
    }

    [Fact]
    public void All_problems_are_reported_at_once()
    {
        var bad = TestPlant.Interchanger(flowUnit: "kg/fortnight")
            .Replace("\"250 m2\"", "\"-3 m2\"")
            .Replace("\"shell-and-tube\"", "\"shell-and-tub\"")
            .Replace("\"datasheet\"", "\"guess\"");
        var ex = Fails(bad);
        var paths = ex.Errors.Select(e => e.Path).ToList();
        Assert.Contains("exchangers[0].hot.flow.unit", paths);
        Assert.Contains("exchangers[0].area", paths);
        Assert.Contains("exchangers[0].arrangement", paths);
        Assert.Contains("exchangers[0].clean.method", paths);
        Assert.Contains("did you mean \"shell-and-tube\"?", ex.Errors.Single(e => e.Path == "exchangers[0].arrangement").Message);
        Assert.StartsWith($"{ex.Errors.Count} problems in plant.json:", ex.Message);
    }

    [Fact]
    public void Invalid_json_names_the_line()
    {
        var ex = Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Parse("{\n  \"site\": { \"name\": \"x\" }\n  \"data\": {}\n}", "plant.json"));
        Assert.StartsWith("line 3, column", Assert.Single(ex.Errors).Path);
    }

    [Fact]
    public void A_decimal_comma_with_the_comma_as_delimiter_is_refused()
    {
        var ex = Fails(TestPlant.Interchanger(), "{ \"files\": [\"*.csv\"], \"delimiter\": \",\", \"decimal\": \",\" }");
        var e = Assert.Single(ex.Errors);
        Assert.Equal("data.sources[0].decimal", e.Path);
        Assert.Equal("',' is also the delimiter; with a decimal comma the fields are split by \";\", \"\\t\" or \"|\": set delimiter to the one the export uses.", e.Message);
    }

    [Fact]
    public void A_file_pattern_matching_nothing_is_an_error()
    {
        using var plant = new TestPlant().WithConfig("{ \"files\": [\"exports/*.csv\"] }");
        var ex = Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath));
        Assert.Equal("data.sources[0].files[0]", Assert.Single(ex.Errors).Path);
        Assert.Contains("matches no file", ex.Errors[0].Message);
    }

    [Fact]
    public void A_volumetric_flow_needs_a_density()
    {
        var ex = Fails(TestPlant.Interchanger(flowUnit: "m3/h"));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].hot.flow.density", e.Path);
        Assert.StartsWith("is missing; a volumetric flow in 'm3/h' needs the fluid density", e.Message);
    }

    [Fact]
    public void Both_streams_on_one_side_is_refused()
    {
        var ex = Fails(TestPlant.Interchanger().Replace("\"side\": \"tube\"", "\"side\": \"shell\""));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].cold.side");
    }

    [Fact]
    public void Unknown_time_zone_is_refused()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }", timeZone: "Europe/Atlantis");
        var ex = Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath));
        Assert.Equal("site.timeZone", Assert.Single(ex.Errors).Path);
    }

    // Source: IPCC 2006 Guidelines, Vol. 2, ch. 1, Table 1.4: natural gas 56 100 kg CO2/TJ (default).
    [Fact]
    public void Economics_default_to_the_IPCC_factor_of_the_fuel()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv");
        plant.WithConfig("{ \"files\": [\"*.csv\"] }");
        var text = File.ReadAllText(plant.ConfigPath).Replace("\"data\":",
            "\"economics\": { \"currency\": \"EUR\", \"fuel\": \"natural-gas\", \"fuelPrice\": \"9 EUR/GJ\", \"heaterEfficiency\": \"85 %\", \"co2Price\": \"80 EUR/t\" },\n \"data\":");
        File.WriteAllText(plant.ConfigPath, text);
        var e = PlantConfigurationReader.Load(plant.ConfigPath).Economics;
        Assert.Equal(56_100e-12, e.Co2KilogramsPerJoule!.Value, 56_100e-12 * 1e-12);
        Assert.Equal(9e-9, e.FuelPricePerJoule!.Value, 9e-9 * 1e-12);
        Assert.Equal(0.85, e.HeaterEfficiency!.Value, 12);
        Assert.Equal(0.08, e.Co2PricePerKilogram!.Value, 12);
    }
}

public class EconomicsConfigurationTests
{
    private static EconomicsSettings Read(string economics)
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }");
        File.WriteAllText(plant.ConfigPath, File.ReadAllText(plant.ConfigPath).Replace("\"data\":", $"\"economics\": {economics},\n \"data\":"));
        return PlantConfigurationReader.Load(plant.ConfigPath).Economics;
    }

    // Energy units by NIST SP 811: MWh = 3.6e9 J; MMBtu = 1.05505585262e9 J.
    [Theory]
    [InlineData("34.2 EUR/MWh", 34.2 / 3.6e9)]
    [InlineData("10 EUR/MMBtu", 10 / 1.05505585262e9)]
    [InlineData("9 EUR/GJ", 9e-9)]
    public void Fuel_prices_convert_per_joule(string price, double perJoule)
        => Assert.Equal(perJoule, Read($"{{ \"currency\": \"EUR\", \"fuelPrice\": \"{price}\" }}").FuelPricePerJoule!.Value, perJoule * 1e-12);

    [Fact]
    public void A_price_in_another_currency_is_refused()
    {
        var ex = Assert.Throws<ConfigurationException>(() => Read("{ \"currency\": \"EUR\", \"fuelPrice\": \"9 USD/GJ\" }"));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("economics.fuelPrice", e.Path);
        Assert.Equal("'9 USD/GJ' is in USD, but the site currency is EUR; convert it or change economics.currency.", e.Message);
    }

    [Fact]
    public void An_explicit_CO2_factor_overrides_the_fuel_default()
        => Assert.Equal(70_000e-12, Read("{ \"currency\": \"EUR\", \"fuel\": \"natural-gas\", \"co2Factor\": \"70 t/TJ\" }").Co2KilogramsPerJoule!.Value, 1e-20);
}

public class DecisionSettingsTests
{
    // The keys of the uncertainty and decision settings read into SI with their documented defaults, and an impossible
    // value names its key and range.
    [Fact]
    public void Clean_uncertainty_and_cleaning_decision_keys_read_with_their_defaults()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }",
            TestPlant.Interchanger(extra: ", \"cleaning\": { \"cost\": \"30000 EUR\", \"downtime\": \"3 d\", \"unplannedStopCost\": \"45000 EUR\", \"leadTime\": \"7 d\" }")
                .Replace("\"u\": \"450 W/m2K\"", "\"u\": \"450 W/m2K\", \"uncertainty\": \"8 %\""));
        var x = PlantConfigurationReader.Load(plant.ConfigPath).Exchangers[0];
        Assert.Equal(0.08, Assert.IsType<DatasheetCleanReference>(x.Clean).RelativeUncertainty, 12);
        Assert.Equal(45000, x.Cleaning.UnplannedStopCost);
        Assert.Null(x.Cleaning.UnplannedDowntime);
        Assert.Null(x.Cleaning.DowntimeCostPerDay);
        Assert.Equal(TimeSpan.FromDays(7), x.Cleaning.LeadTime);

        using var defaults = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }");
        var d = PlantConfigurationReader.Load(defaults.ConfigPath);
        Assert.Equal(DatasheetCleanReference.DefaultUncertainty, Assert.IsType<DatasheetCleanReference>(d.Exchangers[0].Clean).RelativeUncertainty);
        Assert.Equal(EconomicsSettings.DefaultDecisionConfidence, d.Economics.DecisionConfidence);
    }

    [Fact]
    public void A_datasheet_uncertainty_beyond_half_the_clean_U_is_refused_with_its_key()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }",
            TestPlant.Interchanger().Replace("\"u\": \"450 W/m2K\"", "\"u\": \"450 W/m2K\", \"uncertainty\": \"80 %\""));
        var ex = Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].clean.uncertainty", e.Path);
        Assert.Equal("80 % is out of range; use 0 % to 50 %.", e.Message);
    }
}

public class ResultFolderTests
{
    // An id cannot point outside the results folder, and two ids that would share a folder are a configuration error.
    [Theory]
    [InlineData("..", "_..")]
    [InlineData(".hidden", "_.hidden")]
    [InlineData("E/101", "E_101")]
    [InlineData("E-101", "E-101")]
    public void Exchanger_ids_become_folder_names_inside_the_results(string id, string folder) =>
        Assert.Equal(folder, ExchangerConfiguration.FolderNameOf(id));

    [Fact]
    public void Two_ids_sharing_a_result_folder_are_refused_with_the_key()
    {
        var one = TestPlant.Interchanger(id: "E/101");
        var two = TestPlant.Interchanger(id: "E_101");
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }", one + ", " + two);
        var ex = Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[1].id", e.Path);
        Assert.Equal("'E_101' and 'E/101' would share the result folder 'E_101'; make the ids differ in letters or digits.", e.Message);
    }
}

public class AbsurdValueTests
{
    // A quantity too large for a double and a date centuries away are configuration errors naming the key.
    [Fact]
    public void An_infinite_quantity_and_a_date_in_year_9999_are_refused_with_their_keys()
    {
        var x = TestPlant.Interchanger().Replace("\"250 m2\"", "\"1e400 m2\"");
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }",
            x.Replace("\"clean\":", "\"maintenance\": [ { \"date\": \"9999-12-31\", \"action\": \"cleaned\" } ], \"clean\":"));
        var ex = Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].area" && e.Message == "'1e400 m2' is not a finite number; check the value.");
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].maintenance[0].date" && e.Message == "'9999-12-31' is outside the years 1900 to 2199; check the date.");
    }

    // Values no exchanger has (common practice ranges, see the reader): refused with the key and the range, instead of
    // every sample becoming downtime (design flow 1e12 t/h) or a U no deposit can explain.
    [Fact]
    public void Physically_impossible_area_clean_U_and_design_flow_are_refused_with_their_ranges()
    {
        var x = TestPlant.Interchanger().Replace("\"250 m2\"", "\"1e30 m2\"").Replace("\"450 W/m2K\"", "\"1e9 W/m2K\"")
            .Replace("\"120 t/h\"", "\"1e12 t/h\"");
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"*.csv\"] }", x);
        var ex = Assert.Throws<ConfigurationException>(() => PlantConfigurationReader.Load(plant.ConfigPath));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].area" && e.Message.Contains("at most 100000 m2", StringComparison.Ordinal));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].clean.u" && e.Message.Contains("at most 20000 W/m2K", StringComparison.Ordinal));
        Assert.Contains(ex.Errors, e => e.Path == "exchangers[0].hot.designFlow" && e.Message.Contains("at most", StringComparison.Ordinal));
    }
}
