using System.Globalization;
using System.Text;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;
using Xunit.Abstractions;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

/// <summary>Calibration of the per-interval σ(Rf) through the whole back-calculation, on invented exchangers whose
/// instruments are biased as their stated accuracies allow and whose datasheet clean U is off as its stated uncertainty
/// allows.</summary>
public class UncertaintyCalibrationTests(ITestOutputHelper output)
{
    private const double CpHot = 2300, CpCold = 4100, Area = 120, DesignHot = 25, DesignCold = 30, TrueCleanU = 500, TubeShare = 0.45;
    private const double TemperatureAccuracy = 0.3, FlowAccuracy = 0.015, CleanUncertainty = 0.05;

    private static double Gaussian(Random rng) => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());

    /// <summary>Writes a 10-day hourly export of one counterflow exchanger with per-sensor biases and white noise, and its
    /// configuration; returns the configuration path and the true Rf by hour.</summary>
    private static (string Config, Func<double, double> TrueRf) Write(string dir, Random rng)
    {
        var biases = new[] { FlowAccuracy, TemperatureAccuracy, TemperatureAccuracy, FlowAccuracy, TemperatureAccuracy, TemperatureAccuracy }
            .Select(a => a * Gaussian(rng)).ToArray();
        var rate = 2e-6 + 6e-6 * rng.NextDouble();
        // the true film split and exponents differ from the configured 45 %, 0.8 and 0.6 by draws from their assumed σ
        var share = TubeShare + DatasheetCleanU.ShareUncertainty * Gaussian(rng);
        var nTube = 0.8 + DatasheetCleanU.ExponentUncertainty * Gaussian(rng);
        var nShell = 0.6 + DatasheetCleanU.ExponentUncertainty * Gaussian(rng);
        double Rf(double d) => 5e-5 + rate * d;
        var csv = new StringBuilder("Timestamp,FH,TH1,TH2,FC,TC1,TC2\n");
        var start = new DateTimeOffset(2026, 3, 1, 0, 0, 0, TimeSpan.Zero);
        for (var h = 0; h < 240; h++)
        {
            var d = h / 24.0;
            var mh = DesignHot * (1 + 0.25 * Math.Sin(2 * Math.PI * d / 2.3));
            var mc = DesignCold * (1 + 0.25 * Math.Sin(2 * Math.PI * d / 1.7 + 1));
            var thi = 150 + 5 * Math.Sin(d);
            var tci = 30 + 3 * Math.Cos(d / 2);
            var clean = 1 / (share / TrueCleanU * Math.Pow(DesignCold / mc, nTube) + (1 - share) / TrueCleanU * Math.Pow(DesignHot / mh, nShell));
            var u = 1 / (1 / clean + Rf(d));
            var r = Rating.Rate(new Counterflow(), u * Area, mh * CpHot, mc * CpCold, Temperature.FromCelsius(thi), Temperature.FromCelsius(tci));
            double[] m = [mh, thi, r.HotOutlet.Celsius, mc, tci, r.ColdOutlet.Celsius];
            for (var i = 0; i < 6; i++)
            {
                var isFlow = i is 0 or 3;
                m[i] += isFlow ? m[i] * (biases[i] + 0.003 * Gaussian(rng)) : biases[i] + 0.05 * Gaussian(rng);
            }
            csv.Append(FormattableString.Invariant(
                $"{start.AddHours(h):yyyy-MM-ddTHH:mm:ssZ},{m[0] * 3.6:R},{m[1]:R},{m[2]:R},{m[3] * 3.6:R},{m[4]:R},{m[5]:R}\n"));
        }
        File.WriteAllText(Path.Combine(dir, "export.csv"), csv.ToString());
        var datasheetU = TrueCleanU * (1 + CleanUncertainty * Gaussian(rng));
        string Tag(string tag, string unit, string accuracy) => $"{{ \"tag\": \"{tag}\", \"unit\": \"{unit}\", \"accuracy\": \"{accuracy}\" }}";
        var flowAcc = (FlowAccuracy * 100).ToString("0.###", CultureInfo.InvariantCulture) + " %";
        var tAcc = TemperatureAccuracy.ToString("0.###", CultureInfo.InvariantCulture) + " K";
        var json = $$"""
            {
              "site": { "name": "Heron Point (fictional)", "timeZone": "UTC" },
              "data": { "interval": "1 h", "sources": [ { "files": ["export.csv"] } ] },
              "exchangers": [ {
                "id": "X-1", "arrangement": "counterflow", "area": "{{Area}} m2", "dutyBasis": "mean",
                "hot":  { "side": "shell", "fluid": { "model": "constant-cp", "cp": "{{CpHot}} J/kgK" }, "flow": {{Tag("FH", "t/h", flowAcc)}},
                          "inlet": {{Tag("TH1", "degC", tAcc)}}, "outlet": {{Tag("TH2", "degC", tAcc)}}, "designFlow": "{{DesignHot}} kg/s" },
                "cold": { "side": "tube", "fluid": { "model": "constant-cp", "cp": "{{CpCold}} J/kgK" }, "flow": {{Tag("FC", "t/h", flowAcc)}},
                          "inlet": {{Tag("TC1", "degC", tAcc)}}, "outlet": {{Tag("TC2", "degC", tAcc)}}, "designFlow": "{{DesignCold}} kg/s" },
                "clean": { "method": "datasheet", "u": "{{datasheetU.ToString("R", CultureInfo.InvariantCulture)}} W/m2K", "tubeShare": "45 %", "uncertainty": "5 %" },
                "maintenance": [ { "date": "2026-03-01", "action": "cleaned" } ]
              } ]
            }
            """;
        File.WriteAllText(Path.Combine(dir, "plant.json"), json);
        return (Path.Combine(dir, "plant.json"), Rf);
    }

    // Synthetic, seeded, 100 exchangers: each of the six instruments biased by a draw from its stated accuracy (σ), white
    // noise on every reading, a datasheet clean U off by a draw from its stated 5 %, and a true film split and flow
    // exponents off by draws from their assumed uncertainties. Target from the issue: the
    // per-interval 95 % band rf ± 1.96·σ covers the true Rf in 90–98 % of the usable intervals. The share covered by the
    // systematic part alone is printed for comparison.
    [Fact]
    public void The_per_interval_95_percent_band_covers_the_true_fouling_resistance()
    {
        int inside = 0, total = 0, randomOnly = 0;
        for (var seed = 0; seed < 100; seed++)
        {
            var dir = Path.Combine(Path.GetTempPath(), "fw-unc", Guid.NewGuid().ToString("N"));
            Directory.CreateDirectory(dir);
            try
            {
                var (config, rf) = Write(dir, new Random(300 + seed));
                var history = PlantAnalysis.Run(PlantConfigurationReader.Load(config)).Exchangers[0].History;
                var start = history.Samples[0].Timestamp;
                foreach (var s in history.Samples.Where(s => s.Status == SampleStatus.Ok))
                {
                    var error = Math.Abs(s.Evaluation.FoulingResistance - rf((s.Timestamp - start).TotalDays));
                    total++;
                    if (error <= 1.96 * s.FoulingResistanceSigma) inside++;
                    if (error <= 1.96 * s.SigmaRandom) randomOnly++;
                }
            }
            finally { Directory.Delete(dir, recursive: true); }
        }
        output.WriteLine($"per-interval 95 % band coverage: {inside / (double)total:P1} of {total} intervals (random part alone: {randomOnly / (double)total:P1})");
        Assert.InRange(inside / (double)total, 0.90, 0.98);
    }
}
