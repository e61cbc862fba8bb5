using System.Globalization;
using System.Text;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;
using Xunit.Abstractions;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

/// <summary>A cooling-water cooler through a year: the water inlet swings ±8 K with the season, which moves the tube
/// film by a tenth at the same flow; and a crude preheater whose crude inlet swings ±15 K with the upstream train.
/// Synthetic (not an external check): the export is made with the tube film scaled by the fluid's properties; the
/// external checks of the properties themselves are in WaterTransportTests and PetroleumTransportTests.</summary>
public class PropertyScalingTests(ITestOutputHelper output)
{
    private const double Area = 90, DesignCold = 40, DesignHot = 30, U = 600, CpHot = 2100;

    /// <summary>The tube-side fluid of a case, its configuration, inlet temperature (mean, seasonal swing), design bulk
    /// temperature and hot inlet, °C.</summary>
    private sealed record Case(ITransportFluid Fluid, string Json, double Inlet, double Swing, double DesignBulk, double HotInlet,
        bool GnielinskiTruth = false);

    /// <summary>A bundle whose true tube film is Gnielinski's (with Petukhov friction) rather than the Dittus–Boelter form
    /// the datasheet scaling assumes: a model-form mismatch.</summary>
    private static readonly ShellAndTubeGeometry Bundle = new(0.489, 0.01905, 0.01575, 4.877, 300, 0.02381, TubeLayout.Triangular, 2, 0.3, 50);

    private static readonly Case Water = new(new IapwsWater(), "{ \"model\": \"water\" }", 25, 8, 30, 90);

    private static readonly Case Crude = new(new PetroleumLiquidTransport(new KeslerLeePetroleumLiquid(0.85, 11.8), 0.85,
            new WaltherViscosity(313.15, 9e-6, 373.15, 2.6e-6)),
        "{ \"model\": \"petroleum\", \"sg\": 0.85, \"watsonK\": 11.8, \"viscosity\": [[\"40 degC\", \"9 cSt\"], [\"100 degC\", \"2.6 cSt\"]] }",
        120, 15, 125, 250);

    private static (string Dir, Func<double, double> TrueRf) Write(bool scaled, Case c, bool baseline = false)
    {
        var dir = Path.Combine(Path.GetTempPath(), "fw-props", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        var water = c.Fluid;
        var p = 3e5;
        var scaling = new FilmPropertyScaling(water, p, c.DesignBulk + 273.15, 0.8);
        double TubeFilm(double flow, double bulkK) => Bundle.TubeFilm(flow, water, Temperature.FromKelvin(bulkK), new Pressure(p), out _);
        var designFilm = TubeFilm(DesignCold, c.DesignBulk + 273.15);
        double Rf(double d) => 2e-5 + 3e-7 * d;
        var csv = new StringBuilder("Timestamp,FH,TH1,TH2,FC,TC1,TC2\n");
        var start = new DateTimeOffset(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
        for (var h = 0; h < 365 * 24; h += 2)
        {
            var d = h / 24.0;
            var mh = DesignHot * (1 + 0.1 * Math.Sin(2 * Math.PI * d / 5.3));
            var mc = DesignCold * (1 + 0.1 * Math.Sin(2 * Math.PI * d / 3.1 + 1));
            var tci = c.Inlet - c.Swing * Math.Cos(2 * Math.PI * (d - 15) / 365);
            var thi = c.HotInlet + 2 * Math.Sin(2 * Math.PI * d / 11);
            var tco = tci + 5;
            RatingResult r = default;
            for (var it = 0; it < 4; it++)
            {
                var tubeBulk = 0.5 * (tci + tco) + 273.15;
                var tube = c.GnielinskiTruth ? designFilm / TubeFilm(mc, tubeBulk) : Math.Pow(DesignCold / mc, 0.8) * scaling.InverseFactor(tubeBulk);
                var inverse = 0.5 / U * tube + 0.5 / U * Math.Pow(DesignHot / mh, 0.6) + Rf(d);
                var cp = ((IFluidModel)water).MeanSpecificHeat(Temperature.FromCelsius(tci), Temperature.FromCelsius(tco), new Pressure(p));
                r = Rating.Rate(Counterflow.Instance, Area / inverse, mh * CpHot, mc * cp, Temperature.FromCelsius(thi), Temperature.FromCelsius(tci));
                tco = r.ColdOutlet.Celsius;
            }
            csv.Append(FormattableString.Invariant($"{start.AddHours(h):yyyy-MM-ddTHH:mm:ssZ},{mh:R},{thi:R},{r.HotOutlet.Celsius:R},{mc:R},{tci:R},{tco:R}\n"));
        }
        File.WriteAllText(Path.Combine(dir, "export.csv"), csv.ToString());
        var bulk = scaled ? FormattableString.Invariant($", \"tubeBulkTemperature\": \"{c.DesignBulk} degC\"") : "";
        var clean = baseline
            ? $"\"method\": \"baseline\", \"duration\": \"20 d\", \"propertyCorrected\": {(scaled ? "true" : "false")}"
            : $"\"method\": \"datasheet\", \"u\": \"{U} W/m2K\", \"tubeShare\": \"50 %\"{bulk}";
        File.WriteAllText(Path.Combine(dir, "plant.json"), $$"""
            {
              "site": { "name": "Curlew Flats (fictional)", "timeZone": "UTC" },
              "data": { "interval": "2 h", "sources": [ { "files": ["export.csv"] } ] },
              "exchangers": [ {
                "id": "CW-1", "arrangement": "counterflow", "area": "{{Area}} m2",
                "hot":  { "side": "shell", "fluid": { "model": "constant-cp", "cp": "{{CpHot}} J/kgK" }, "flow": { "tag": "FH", "unit": "kg/s" },
                          "inlet": { "tag": "TH1", "unit": "degC" }, "outlet": { "tag": "TH2", "unit": "degC" }, "designFlow": "{{DesignHot}} kg/s" },
                "cold": { "side": "tube", "fluid": {{c.Json}}, "pressure": "3 bar", "flow": { "tag": "FC", "unit": "kg/s" },
                          "inlet": { "tag": "TC1", "unit": "degC" }, "outlet": { "tag": "TC2", "unit": "degC" }, "designFlow": "{{DesignCold}} kg/s" },
                "clean": { {{clean}} },
                "maintenance": [ { "date": "2026-01-01", "action": "cleaned" } ]
              } ]
            }
            """);
        return (dir, Rf);
    }

    /// <summary>Root-mean-square error of the usable samples' Rf against the truth, m²K/W.</summary>
    private static double RmsError(bool scaled, Case c, bool baseline = false)
    {
        var (dir, rf) = Write(scaled, c, baseline);
        try
        {
            var history = PlantAnalysis.Run(PlantConfigurationReader.Load(Path.Combine(dir, "plant.json"))).Exchangers[0].History;
            var start = history.Samples[0].Timestamp;
            var errors = history.Samples.Where(s => s.Status == SampleStatus.Ok)
                // a baseline learns the clean U at the cleaning, deposits then present included: Rf counts from there
                .Select(s => s.Evaluation.FoulingResistance - rf((s.Timestamp - start).TotalDays) + (baseline ? rf(0) : 0)).ToList();
            Assert.True(errors.Count > 3000, $"{errors.Count} usable samples");
            return Math.Sqrt(errors.Average(e => e * e));
        }
        finally { Directory.Delete(dir, recursive: true); }
    }

    // Without the property scaling the seasonal swing of the tube film reads as fouling that comes and goes; with the
    // design bulk temperature given, the clean U follows the water's viscosity and conductivity and the error is small.
    [Fact]
    public void Scaling_the_water_film_with_its_properties_removes_the_seasonal_false_fouling() => Check(Water);

    // Adversarial, model-form mismatch: the water film truly follows Gnielinski's correlation (Re about 27,000) while
    // the datasheet scaling assumes Dittus–Boelter's exponents (Re^0.8 for the ±10 % flow swings, Pr^0.4). Measured:
    // flow scaling only 4.7e-5, with property scaling 5.6e-6 m²K/W RMS: the seasonal part is removed, what remains is the
    // exponents' mismatch (the geometry method, which uses Gnielinski itself, has none). Bound: 15 % of the flow-only
    // error and 8e-6.
    [Fact]
    public void The_seasonal_correction_holds_when_the_true_film_follows_another_correlation() =>
        Check(Water with { GnielinskiTruth = true }, limit: 8e-6, share: 0.15);

    // The baseline method learns the clean U in the 20 winter days after the cleaning (water at about 17 °C); without
    // the property correction the summer's warmer, thinner water reads as un-fouling; with it the film term follows the
    // water's properties from the window's median bulk temperature.
    [Fact]
    public void A_property_corrected_baseline_removes_the_seasonal_false_fouling()
    {
        var plain = RmsError(scaled: false, Water, baseline: true);
        var corrected = RmsError(scaled: true, Water, baseline: true);
        output.WriteLine(FormattableString.Invariant($"baseline RMS error of Rf: plain {plain:G3}, property-corrected {corrected:G3} m2K/W"));
        Assert.True(plain > 2e-5, $"the seasonal effect should show without the correction ({plain:G3})");
        Assert.True(corrected < 5e-6 && corrected < 0.2 * plain, $"corrected {corrected:G3} against {plain:G3}");
    }

    // The same for a crude: its viscosity (ASTM D341 from two assay points) moves the film far more than water's.
    [Fact]
    public void Scaling_a_crude_film_with_its_assay_viscosity_removes_the_false_fouling_of_inlet_swings() => Check(Crude);

    private void Check(Case c, double limit = 5e-6, double share = 0.2)
    {
        var flowOnly = RmsError(scaled: false, c);
        var withProperties = RmsError(scaled: true, c);
        output.WriteLine(FormattableString.Invariant($"RMS error of Rf: flow scaling only {flowOnly:G3}, with property scaling {withProperties:G3} m2K/W"));
        Assert.True(flowOnly > 2e-5, $"the seasonal effect should show without the scaling ({flowOnly:G3})");
        Assert.True(withProperties < share * flowOnly, $"with the scaling {withProperties:G3} against {flowOnly:G3}");
        Assert.True(withProperties < limit, $"with the scaling Rf must stay flat within {limit:G2} m2K/W ({withProperties:G3})");
    }
}
