using System.Text;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

/// <summary>
/// The geometry method end to end on an invented crude/water cooler ("Plover Reach"): the export is made from a known
/// fouling history with the same geometry model (synthetic, a self-consistency check; the external checks of the
/// correlations and the bundle are in the Core tests), so the analysis must give the history back whatever the flows
/// and inlet temperatures do.
/// </summary>
public class GeometryCleanUTests
{
    private const string Geometry = """
        "shellDiameter": "489 mm", "tubeOuterDiameter": "19.05 mm", "tubeInnerDiameter": "15.75 mm", "tubeLength": "4.877 m",
        "tubeCount": 300, "tubePitch": "23.81 mm", "layout": "triangular", "tubePasses": 2, "baffleSpacing": "0.3 m", "wallConductivity": "50 W/mK"
        """;

    private const string Crude = """{ "model": "petroleum", "sg": 0.85, "watsonK": 11.8, "viscosity": [["40 degC", "9 cSt"], ["100 degC", "2.6 cSt"]] }""";

    [Fact]
    public void A_known_fouling_history_is_recovered_with_the_clean_U_from_the_geometry()
    {
        var dir = Path.Combine(Path.GetTempPath(), "fw-geometry", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        try
        {
            var g = new ShellAndTubeGeometry(0.489, 0.01905, 0.01575, 4.877, 300, 0.02381, TubeLayout.Triangular, 2, 0.3, 50);
            var water = new IapwsWater();
            var crude = new PetroleumLiquidTransport(new KeslerLeePetroleumLiquid(0.85, 11.8), 0.85, new WaltherViscosity(313.15, 9e-6, 373.15, 2.6e-6));
            var model = new GeometryCleanU(new GeometryCleanReference(g), water, 3e5, crude, 8e5);
            double Rf(double d) => 1e-5 + 4e-6 * d;
            var csv = new StringBuilder("Timestamp,FH,TH1,TH2,FC,TC1,TC2,DPT\n");
            var start = new DateTimeOffset(2026, 3, 1, 0, 0, 0, TimeSpan.Zero);
            var pw = new Pressure(3e5);
            var pc = new Pressure(8e5);
            for (var h = 0; h < 40 * 24; h++)
            {
                var d = h / 24.0;
                var mh = 15 * (1 + 0.15 * Math.Sin(2 * Math.PI * d / 5.3));
                var mc = 20 * (1 + 0.15 * Math.Sin(2 * Math.PI * d / 3.1 + 1));
                var thi = 150 + 10 * Math.Sin(2 * Math.PI * d / 9);
                var tci = 30 + 4 * Math.Cos(2 * Math.PI * d / 7);
                double tho = thi - 40, tco = tci + 10;
                RatingResult r = default;
                for (var it = 0; it < 30; it++)   // outlets and the bulk temperatures they set, to a fixed point
                {
                    var uc = model.CleanU(mc, mh, 0.5 * (tci + tco) + 273.15, 0.5 * (thi + tho) + 273.15);
                    var u = 1 / (1 / uc + Rf(d));
                    var cph = ((IFluidModel)crude).MeanSpecificHeat(Temperature.FromCelsius(thi), Temperature.FromCelsius(tho), pc);
                    var cpc = ((IFluidModel)water).MeanSpecificHeat(Temperature.FromCelsius(tci), Temperature.FromCelsius(tco), pw);
                    r = Rating.Rate(Counterflow.Instance, u * g.OutsideArea, mh * cph, mc * cpc, Temperature.FromCelsius(thi), Temperature.FromCelsius(tci));
                    (tho, tco) = (r.HotOutlet.Celsius, r.ColdOutlet.Celsius);
                }
                // the tube-side drop: the clean one at this flow and bulk temperature, 10 % up over the 40 days
                var dpClean = g.TubePressureDrop(mc, water, Temperature.FromCelsius(0.5 * (tci + tco)), pw);
                csv.Append(FormattableString.Invariant($"{start.AddHours(h):yyyy-MM-ddTHH:mm:ssZ},{mh:R},{thi:R},{tho:R},{mc:R},{tci:R},{tco:R},{dpClean * (1 + 0.1 * d / 40) / 1e3:R}\n"));
            }
            File.WriteAllText(Path.Combine(dir, "export.csv"), csv.ToString());
            File.WriteAllText(Path.Combine(dir, "plant.json"), $$"""
                {
                  "site": { "name": "Plover Reach (fictional)", "timeZone": "UTC" },
                  "data": { "interval": "1 h", "sources": [ { "files": ["export.csv"] } ] },
                  "exchangers": [ {
                    "id": "G-1", "arrangement": "counterflow", "area": "{{g.OutsideArea.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}} m2",
                    "hot":  { "side": "shell", "fluid": {{Crude}}, "pressure": "8 bar", "flow": { "tag": "FH", "unit": "kg/s" },
                              "inlet": { "tag": "TH1", "unit": "degC" }, "outlet": { "tag": "TH2", "unit": "degC" } },
                    "cold": { "side": "tube", "fluid": { "model": "water" }, "pressure": "3 bar", "flow": { "tag": "FC", "unit": "kg/s" },
                              "inlet": { "tag": "TC1", "unit": "degC" }, "outlet": { "tag": "TC2", "unit": "degC" },
                              "pressureDrop": { "tag": "DPT", "unit": "kPa" } },
                    "clean": { "method": "geometry", {{Geometry}} },
                    "maintenance": [ { "date": "2026-03-01", "action": "cleaned" } ]
                  } ]
                }
                """);
            var x = AnalyseAndCheckHistory(dir, start, Rf);
            Assert.StartsWith("geometry: 300 tubes 19.05/15.75 mm", x.History.CleanReference.Description);
            // measured over clean drop in the last week (hours 33 d 1 h … 39 d 23 h): 1 + 0.1·36.48/40 = 1.0912 at its middle
            var dp = Assert.Single(x.PressureDrops);
            Assert.Equal(1 + 0.1 * ((33 + 1.0 / 24 + 39 + 23.0 / 24) / 2) / 40, dp.CleanRatio!.Value, 3);
            Assert.Contains("measured over clean (geometry) 1.09 in the last week", dp.Statement);
        }
        finally { Directory.Delete(dir, recursive: true); }
    }

    // The same for a chevron-plate pack ("plate" arrangement, Martin on both sides): water against water, 30 days, flows
    // keeping both sides above Re 2000 (Martin's friction changes form there, a step of a few per cent in h).
    [Fact]
    public void A_known_fouling_history_is_recovered_with_the_clean_U_of_a_plate_pack()
    {
        var dir = Path.Combine(Path.GetTempPath(), "fw-plate", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        try
        {
            var pack = new PlateGeometry(101, 0.5, 0.7, 0.003, 60, 1.17, 0.0006, 16);
            var water = new IapwsWater();
            var model = new PlateGeometryCleanU(new PlateGeometryCleanReference(pack), water, 5e5, water, 4e5);
            double Rf(double d) => 5e-6 + 2e-6 * d;
            var csv = new StringBuilder("Timestamp,FH,TH1,TH2,FC,TC1,TC2\n");
            var start = new DateTimeOffset(2026, 3, 1, 0, 0, 0, TimeSpan.Zero);
            for (var h = 0; h < 30 * 24; h++)
            {
                var d = h / 24.0;
                var mh = 30 * (1 + 0.15 * Math.Sin(2 * Math.PI * d / 5.3));
                var mc = 40 * (1 + 0.15 * Math.Sin(2 * Math.PI * d / 3.1 + 1));
                var thi = 80 + 5 * Math.Sin(2 * Math.PI * d / 9);
                var tci = 25 + 4 * Math.Cos(2 * Math.PI * d / 7);
                double tho = thi - 20, tco = tci + 15;
                for (var it = 0; it < 30; it++)
                {
                    var u = 1 / (1 / model.CleanU(mh, mc, 0.5 * (thi + tho) + 273.15, 0.5 * (tci + tco) + 273.15) + Rf(d));
                    var cph = ((IFluidModel)water).MeanSpecificHeat(Temperature.FromCelsius(thi), Temperature.FromCelsius(tho), new Pressure(5e5));
                    var cpc = ((IFluidModel)water).MeanSpecificHeat(Temperature.FromCelsius(tci), Temperature.FromCelsius(tco), new Pressure(4e5));
                    var r = Rating.Rate(new PlateAsCounterflow(), u * pack.Area, mh * cph, mc * cpc, Temperature.FromCelsius(thi), Temperature.FromCelsius(tci));
                    (tho, tco) = (r.HotOutlet.Celsius, r.ColdOutlet.Celsius);
                }
                csv.Append(FormattableString.Invariant($"{start.AddHours(h):yyyy-MM-ddTHH:mm:ssZ},{mh:R},{thi:R},{tho:R},{mc:R},{tci:R},{tco:R}\n"));
            }
            File.WriteAllText(Path.Combine(dir, "export.csv"), csv.ToString());
            File.WriteAllText(Path.Combine(dir, "plant.json"), $$"""
                {
                  "site": { "name": "Plover Reach (fictional)", "timeZone": "UTC" },
                  "data": { "interval": "1 h", "sources": [ { "files": ["export.csv"] } ] },
                  "exchangers": [ {
                    "id": "PX-1", "arrangement": "plate", "area": "{{pack.Area.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}} m2",
                    "hot":  { "side": "tube", "fluid": { "model": "water" }, "pressure": "5 bar", "flow": { "tag": "FH", "unit": "kg/s" },
                              "inlet": { "tag": "TH1", "unit": "degC" }, "outlet": { "tag": "TH2", "unit": "degC" } },
                    "cold": { "side": "shell", "fluid": { "model": "water" }, "pressure": "4 bar", "flow": { "tag": "FC", "unit": "kg/s" },
                              "inlet": { "tag": "TC1", "unit": "degC" }, "outlet": { "tag": "TC2", "unit": "degC" } },
                    "clean": { "method": "geometry", "plateCount": 101, "plateWidth": "0.5 m", "plateLength": "0.7 m",
                               "channelGap": "3 mm", "chevronAngle": 60 },
                    "maintenance": [ { "date": "2026-03-01", "action": "cleaned" } ]
                  } ]
                }
                """);
            var x = AnalyseAndCheckHistory(dir, start, Rf);
            Assert.StartsWith("geometry: 101 chevron plates 500 × 700 mm", x.History.CleanReference.Description);
        }
        finally { Directory.Delete(dir, recursive: true); }
    }

    /// <summary>Analyses the plant in <paramref name="dir"/> and checks that nine tenths of its samples are usable and
    /// every usable Rf is within 2e-7 m²K/W of the history the export was made from.</summary>
    private static ExchangerResult AnalyseAndCheckHistory(string dir, DateTimeOffset start, Func<double, double> rf)
    {
        var x = PlantAnalysis.Run(PlantConfigurationReader.Load(Path.Combine(dir, "plant.json"))).Exchangers[0];
        var ok = x.History.Samples.Where(s => s.Status == SampleStatus.Ok).ToList();
        Assert.True(ok.Count > 0.9 * x.History.Samples.Count, $"{ok.Count} of {x.History.Samples.Count} usable");
        var worst = ok.Max(s => Math.Abs(s.Evaluation.FoulingResistance - rf((s.Timestamp - start).TotalDays)));
        Assert.True(worst < 2e-7, $"worst Rf error {worst:G3} m2K/W");
        return x;
    }
}
