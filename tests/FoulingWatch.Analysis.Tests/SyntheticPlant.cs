using System.Globalization;
using System.Text;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Tests;

/// <summary>
/// An invented exchanger ("Heron Point" test site) whose historian export is computed exactly from a known fouling
/// history with the Core physics: constant-cp streams, clean U following the datasheet law, outlets by ε-NTU. With
/// constant flows (no swing) the readings repeat exactly, so the frozen-value check is turned off for that case.
/// </summary>
public sealed class SyntheticPlant : IDisposable
{
    public const double CpHot = 2300, CpCold = 4100, Area = 120;
    public const double DesignHot = 25, DesignCold = 30, CleanUDesign = 500, TubeShare = 0.45;

    public SyntheticPlant(string arrangementJson, FlowArrangement arrangement, Func<double, double> rfOfDay, int days = 60,
        string clean = "{ \"method\": \"datasheet\", \"u\": \"500 W/m2K\", \"tubeShare\": \"45 %\" }", double flowSwing = 0.3, string dutyBasis = "mean")
    {
        Directory = Path.Combine(Path.GetTempPath(), "fw-analysis-tests", Guid.NewGuid().ToString("N"));
        System.IO.Directory.CreateDirectory(Directory);
        var inv = CultureInfo.InvariantCulture;
        var csv = new StringBuilder("Timestamp,FH,TH1,TH2,FC,TC1,TC2\n");
        var start = new DateTimeOffset(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
        for (var h = 0; h < days * 24; h++)
        {
            var d = h / 24.0;
            // hot on the shell side, cold in the tubes; flows swing independently by up to ±flowSwing
            var mh = DesignHot * (1 + flowSwing * Math.Sin(2 * Math.PI * d / 5.3));
            var mc = DesignCold * (1 + flowSwing * Math.Sin(2 * Math.PI * d / 3.1 + 1));
            var thi = 150 + 5 * Math.Sin(d);
            var tci = 30 + 3 * Math.Cos(d / 2);
            var u = 1 / (1 / TrueCleanU(mc, mh) + rfOfDay(d));
            var r = Rating.Rate(arrangement, u * Area, mh * CpHot, mc * CpCold, Temperature.FromCelsius(thi), Temperature.FromCelsius(tci));
            csv.Append(FormattableString.Invariant($"{start.AddHours(h):yyyy-MM-ddTHH:mm:ssZ},{mh * 3.6:R},{thi:R},{r.HotOutlet.Celsius:R},{mc * 3.6:R},{tci:R},{r.ColdOutlet.Celsius:R}\n"));
        }
        File.WriteAllText(Path.Combine(Directory, "export.csv"), csv.ToString());
        var json = $$"""
            {
              "site": { "name": "Heron Point (fictional)", "timeZone": "UTC" },
              "data": { "interval": "1 h", {{(flowSwing == 0 ? "\"frozenAfter\": \"0 h\", " : "")}}"sources": [ { "files": ["export.csv"] } ] },
              "exchangers": [ {
                "id": "X-1", "service": "synthetic", "arrangement": {{arrangementJson}}, "area": "{{Area}} m2", "dutyBasis": "{{dutyBasis}}",
                "hot":  { "side": "shell", "fluid": { "model": "constant-cp", "cp": "{{CpHot}} J/kgK" }, "flow": { "tag": "FH", "unit": "t/h" },
                          "inlet": { "tag": "TH1", "unit": "degC" }, "outlet": { "tag": "TH2", "unit": "degC" }, "designFlow": "{{DesignHot}} kg/s" },
                "cold": { "side": "tube", "fluid": { "model": "constant-cp", "cp": "{{CpCold}} J/kgK" }, "flow": { "tag": "FC", "unit": "t/h" },
                          "inlet": { "tag": "TC1", "unit": "degC" }, "outlet": { "tag": "TC2", "unit": "degC" }, "designFlow": "{{DesignCold}} kg/s" },
                "clean": {{clean}},
                "maintenance": [ { "date": "2026-01-01", "action": "cleaned" } ]
              } ]
            }
            """;
        File.WriteAllText(ConfigPath, json);
        Start = start;
    }

    /// <summary>The datasheet clean-U law the export is built from: tube n = 0.8, shell n = 0.6, no wall.</summary>
    public static double TrueCleanU(double tubeFlow, double shellFlow) =>
        1 / (TubeShare / CleanUDesign * Math.Pow(DesignCold / tubeFlow, 0.8) + (1 - TubeShare) / CleanUDesign * Math.Pow(DesignHot / shellFlow, 0.6));

    public string Directory { get; }
    public string ConfigPath => Path.Combine(Directory, "plant.json");
    public DateTimeOffset Start { get; }

    public PlantResult Analyse() => PlantAnalysis.Run(PlantConfigurationReader.Load(ConfigPath));

    public void Dispose()
    {
        try { System.IO.Directory.Delete(Directory, recursive: true); } catch (IOException) { }
    }
}
