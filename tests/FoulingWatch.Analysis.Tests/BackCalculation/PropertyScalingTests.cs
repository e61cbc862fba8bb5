using System.Globalization;
using System.Text;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;
using Xunit.Abstractions;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

/// <summary>A cooling-water cooler through a year: the water inlet swings ±6 K with the season, which moves the tube
/// film by a tenth at the same flow. Synthetic (not an external check): the export is made with the tube film scaled
/// by the water's properties; the external checks of the properties themselves are in WaterTransportTests.</summary>
public class PropertyScalingTests(ITestOutputHelper output)
{
    private const double Area = 90, DesignCold = 40, DesignHot = 30, U = 600, CpHot = 2100;

    private static (string Dir, Func<double, double> TrueRf) Write(bool scaled)
    {
        var dir = Path.Combine(Path.GetTempPath(), "fw-props", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        var water = new IapwsWater();
        var p = 3e5;
        var scaling = new FilmPropertyScaling(water, p, 303.15, 0.8);
        double Rf(double d) => 2e-5 + 3e-7 * d;
        var csv = new StringBuilder("Timestamp,FH,TH1,TH2,FC,TC1,TC2\n");
        var start = new DateTimeOffset(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
        for (var h = 0; h < 365 * 24; h += 2)
        {
            var d = h / 24.0;
            var mh = DesignHot * (1 + 0.1 * Math.Sin(2 * Math.PI * d / 5.3));
            var mc = DesignCold * (1 + 0.1 * Math.Sin(2 * Math.PI * d / 3.1 + 1));
            var tci = 25 - 6 * Math.Cos(2 * Math.PI * (d - 15) / 365);
            var thi = 90 + 2 * Math.Sin(2 * Math.PI * d / 11);
            var tco = tci + 5;
            RatingResult r = default;
            for (var it = 0; it < 4; it++)
            {
                var f = scaling.InverseFactor(0.5 * (tci + tco) + 273.15);
                var inverse = 0.5 / U * Math.Pow(DesignCold / mc, 0.8) * f + 0.5 / U * Math.Pow(DesignHot / mh, 0.6) + Rf(d);
                var cp = ((IFluidModel)water).MeanSpecificHeat(Temperature.FromCelsius(tci), Temperature.FromCelsius(tco), new Pressure(p));
                r = Rating.Rate(Counterflow.Instance, Area / inverse, mh * CpHot, mc * cp, Temperature.FromCelsius(thi), Temperature.FromCelsius(tci));
                tco = r.ColdOutlet.Celsius;
            }
            csv.Append(FormattableString.Invariant($"{start.AddHours(h):yyyy-MM-ddTHH:mm:ssZ},{mh:R},{thi:R},{r.HotOutlet.Celsius:R},{mc:R},{tci:R},{tco:R}\n"));
        }
        File.WriteAllText(Path.Combine(dir, "export.csv"), csv.ToString());
        var bulk = scaled ? ", \"tubeBulkTemperature\": \"30 degC\"" : "";
        File.WriteAllText(Path.Combine(dir, "plant.json"), $$"""
            {
              "site": { "name": "Curlew Flats (fictional)", "timeZone": "UTC" },
              "data": { "interval": "2 h", "sources": [ { "files": ["export.csv"] } ] },
              "exchangers": [ {
                "id": "CW-1", "arrangement": "counterflow", "area": "{{Area}} m2",
                "hot":  { "side": "shell", "fluid": { "model": "constant-cp", "cp": "{{CpHot}} J/kgK" }, "flow": { "tag": "FH", "unit": "kg/s" },
                          "inlet": { "tag": "TH1", "unit": "degC" }, "outlet": { "tag": "TH2", "unit": "degC" }, "designFlow": "{{DesignHot}} kg/s" },
                "cold": { "side": "tube", "fluid": { "model": "water" }, "pressure": "3 bar", "flow": { "tag": "FC", "unit": "kg/s" },
                          "inlet": { "tag": "TC1", "unit": "degC" }, "outlet": { "tag": "TC2", "unit": "degC" }, "designFlow": "{{DesignCold}} kg/s" },
                "clean": { "method": "datasheet", "u": "{{U}} W/m2K", "tubeShare": "50 %"{{bulk}} },
                "maintenance": [ { "date": "2026-01-01", "action": "cleaned" } ]
              } ]
            }
            """);
        return (dir, Rf);
    }

    /// <summary>Root-mean-square error of the usable samples' Rf against the truth, m²K/W.</summary>
    private static double RmsError(bool scaled)
    {
        var (dir, rf) = Write(scaled);
        try
        {
            var history = PlantAnalysis.Run(PlantConfigurationReader.Load(Path.Combine(dir, "plant.json"))).Exchangers[0].History;
            var start = history.Samples[0].Timestamp;
            var errors = history.Samples.Where(s => s.Status == SampleStatus.Ok)
                .Select(s => s.Evaluation.FoulingResistance - rf((s.Timestamp - start).TotalDays)).ToList();
            Assert.True(errors.Count > 3000, $"{errors.Count} usable samples");
            return Math.Sqrt(errors.Average(e => e * e));
        }
        finally { Directory.Delete(dir, recursive: true); }
    }

    // Without the property scaling the seasonal swing of the tube film reads as fouling that comes and goes; with the
    // design bulk temperature given, the clean U follows the water's viscosity and conductivity and the error is small.
    [Fact]
    public void Scaling_the_water_film_with_its_properties_removes_the_seasonal_false_fouling()
    {
        var flowOnly = RmsError(scaled: false);
        var withProperties = RmsError(scaled: true);
        output.WriteLine(FormattableString.Invariant($"RMS error of Rf: flow scaling only {flowOnly:G3}, with property scaling {withProperties:G3} m2K/W"));
        Assert.True(flowOnly > 2e-5, $"the seasonal effect should show without the scaling ({flowOnly:G3})");
        Assert.True(withProperties < 0.2 * flowOnly, $"with the scaling {withProperties:G3} against {flowOnly:G3}");
    }
}
