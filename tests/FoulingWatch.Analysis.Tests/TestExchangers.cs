using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Tests;

/// <summary>Builders for invented exchangers and fouling histories (test site "Heron Point").</summary>
public static class TestExchangers
{
    /// <summary>A one-exchanger plant with economics, a cleaning cost and one shutdown window <paramref name="windowStartDay"/>
    /// days after <see cref="Start"/>.</summary>
    public static (ExchangerConfiguration Exchanger, PlantConfiguration Plant) Plant(int windowStartDay)
    {
        var start = Start.AddDays(windowStartDay);
        var plant = PlantOf(maintenance: "[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]",
            extra: ", \"cleaning\": { \"cost\": \"30000 EUR\", \"downtime\": \"3 d\" }",
            top: """
                 "economics": { "currency": "EUR", "fuel": "natural-gas", "fuelPrice": "10 EUR/GJ", "heaterEfficiency": "85 %", "co2Price": "80 EUR/t" },
                 """ + $"\"shutdownWindows\": [ {{ \"name\": \"spring stop\", \"start\": \"{start:yyyy-MM-dd}\", " +
                 $"\"end\": \"{start.AddDays(10):yyyy-MM-dd}\", \"capacity\": 1 }} ],");
        return (plant.Exchangers[0], plant);
    }

    public static ExchangerConfiguration Simple(string maintenance = "[]", string limits = "{ \"foulingResistance\": \"0.0008 m2K/W\" }", string id = "X-1",
        string arrangement = "\"counterflow\"", string area = "120 m2", string hotFluid = "{ \"model\": \"constant-cp\", \"cp\": \"2300 J/kgK\" }",
        string coldFluid = "{ \"model\": \"constant-cp\", \"cp\": \"4100 J/kgK\" }", string basis = "mean", string hotPressure = "", string extra = "") =>
        PlantOf(maintenance, limits, id, arrangement, area, hotFluid, coldFluid, basis, hotPressure, extra).Exchangers[0];

    /// <summary>The plant around <see cref="Simple"/>; <paramref name="top"/> adds top-level keys (each ending in a comma).</summary>
    public static PlantConfiguration PlantOf(string maintenance = "[]", string limits = "{ \"foulingResistance\": \"0.0008 m2K/W\" }", string id = "X-1",
        string arrangement = "\"counterflow\"", string area = "120 m2", string hotFluid = "{ \"model\": \"constant-cp\", \"cp\": \"2300 J/kgK\" }",
        string coldFluid = "{ \"model\": \"constant-cp\", \"cp\": \"4100 J/kgK\" }", string basis = "mean", string hotPressure = "", string extra = "",
        string top = "")
    {
        var json = $$"""
            {
              "site": { "name": "Heron Point (fictional)" }, {{top}}
              "data": { "interval": "1 h", "sources": [ { "files": ["*.none"] } ] },
              "exchangers": [ {
                "id": "{{id}}", "arrangement": {{arrangement}}, "area": "{{area}}", "dutyBasis": "{{basis}}",
                "hot":  { "side": "shell", "fluid": {{hotFluid}}, "flow": { "tag": "FH", "unit": "kg/s" }, {{hotPressure}}
                          "inlet": { "tag": "TH1", "unit": "degC" }, "outlet": { "tag": "TH2", "unit": "degC" }, "designFlow": "25 kg/s" },
                "cold": { "side": "tube", "fluid": {{coldFluid}}, "flow": { "tag": "FC", "unit": "kg/s" },
                          "inlet": { "tag": "TC1", "unit": "degC" }, "outlet": { "tag": "TC2", "unit": "degC" }, "designFlow": "30 kg/s" },
                "clean": { "method": "datasheet", "u": "500 W/m2K" },
                "limits": {{limits}},
                "maintenance": {{maintenance}} {{extra}}
              } ]
            }
            """;
        var dir = Path.Combine(Path.GetTempPath(), "fw-x", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        File.WriteAllText(Path.Combine(dir, "x.none"), "");
        File.WriteAllText(Path.Combine(dir, "plant.json"), json);
        return PlantConfigurationReader.Load(Path.Combine(dir, "plant.json"));
    }

    public static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);

    /// <summary>A history of usable samples every 2 hours with Rf(day) plus Gaussian noise of σ (seeded); days in <paramref name="down"/> are downtime.</summary>
    /// <param name="typical">Fill steady operating conditions (flows, inlets, clean U, duty, lost duty) so the economics can price the samples.</param>
    public static ExchangerHistory History(ExchangerConfiguration x, Func<double, double> rf, int days, double sigma, int seed, Func<double, bool>? down = null,
        bool typical = false)
    {
        var rng = new Random(seed);
        var samples = new List<SampleResult>();
        for (var h = 0; h < days * 24; h += 2)
        {
            var d = h / 24.0;
            var t = Start.AddHours(h);
            if (down?.Invoke(d) == true)
            {
                samples.Add(new SampleResult(t, SampleStatus.Downtime, new SampleEvaluation { Status = SampleStatus.Downtime }, double.NaN));
                continue;
            }
            var noise = sigma * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
            var e = new SampleEvaluation { Status = SampleStatus.Ok, FoulingResistance = rf(d) + noise };
            if (typical)
            {
                const double uc = 500, ch = 25 * 2300, cc = 30 * 4100;
                var thi = Core.Quantities.Temperature.FromCelsius(150);
                var tci = Core.Quantities.Temperature.FromCelsius(30);
                var clean = Core.Exchangers.Rating.Rate(x.Arrangement, uc * x.Area, ch, cc, thi, tci).Duty;
                var now = Core.Exchangers.Rating.Rate(x.Arrangement, x.Area / (1 / uc + Math.Max(0, rf(d))), ch, cc, thi, tci).Duty;
                e = e with
                {
                    UClean = uc, HotCapacityRate = ch, ColdCapacityRate = cc, Duty = now, LostDuty = clean - now,
                    Measurements = [25, thi.Kelvin, 0, 30, tci.Kelvin, 0],
                };
            }
            samples.Add(new SampleResult(t, SampleStatus.Ok, e, sigma));
        }
        return new ExchangerHistory(x, samples, new CleanReferenceReport("datasheet", "test", null, 0, null, null, null),
            new SensorCheck(0, 0, null, null, null, null, null, false, "not checked"), null);
    }
}
