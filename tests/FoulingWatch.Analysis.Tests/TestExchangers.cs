using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Tests;

/// <summary>Builders for invented exchangers and fouling histories (test site "Heron Point").</summary>
public static class TestExchangers
{
    public static ExchangerConfiguration Simple(string maintenance = "[]", string limits = "{ \"foulingResistance\": \"0.0008 m2K/W\" }", string id = "X-1",
        string arrangement = "\"counterflow\"", string area = "120 m2", string hotFluid = "{ \"model\": \"constant-cp\", \"cp\": \"2300 J/kgK\" }",
        string coldFluid = "{ \"model\": \"constant-cp\", \"cp\": \"4100 J/kgK\" }", string basis = "mean", string hotPressure = "", string extra = "")
    {
        var json = $$"""
            {
              "site": { "name": "Heron Point (fictional)" },
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
        return PlantConfigurationReader.Load(Path.Combine(dir, "plant.json")).Exchangers[0];
    }

    public static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);

    /// <summary>A history of usable samples every 2 hours with Rf(day) plus Gaussian noise of σ (seeded); days in <paramref name="down"/> are downtime.</summary>
    public static ExchangerHistory History(ExchangerConfiguration x, Func<double, double> rf, int days, double sigma, int seed, Func<double, bool>? down = null)
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
            samples.Add(new SampleResult(t, SampleStatus.Ok, new SampleEvaluation { Status = SampleStatus.Ok, FoulingResistance = rf(d) + noise }, sigma));
        }
        return new ExchangerHistory(x, samples, new CleanReferenceReport("datasheet", "test", null, 0, null, null, null),
            new SensorCheck(0, 0, null, null, null, null, null, false, "not checked"), null);
    }
}
