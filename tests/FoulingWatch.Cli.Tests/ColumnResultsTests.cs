using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;
using Xunit.Abstractions;

namespace FoulingWatch.Cli.Tests;

/// <summary>
/// The back-calculation stores its results in columns (<see cref="SampleColumns"/>); the per-sample record path
/// (<see cref="SampleEvaluator.Evaluate"/>, then <see cref="SampleEvaluator.Complete"/> and the Rf uncertainty) is what
/// it was before. On the whole sample plant the columns must hold what the record path gives, bit for bit, for every
/// interval and every quantity: storing in columns changes nothing that is computed. (A self-consistency check, not
/// an external one.)
/// </summary>
public sealed class ColumnResultsTests(ITestOutputHelper output)
{
    [Fact]
    public void Columns_equal_the_per_sample_records_bit_for_bit_on_the_sample_plant()
    {
        using var plant = new SamplePlantCopy(windowStart: null);
        var config = PlantConfigurationReader.Load(plant.ConfigPath);
        var ingest = HistorianIngest.Run(config);
        var settings = OperatingStateSettings.Default with { FrozenAfter = config.Data.FrozenAfter ?? DataSettings.DefaultFrozenAfter };
        var compared = 0;
        var completed = 0;
        foreach (var x in config.Exchangers)
        {
            var h = BackCalculator.Run(x, ingest, settings, config.Site.TimeZone);
            var c = h.Columns;
            Assert.Equal(ingest.IntervalCount, c.Count);
            var evaluator = new SampleEvaluator(x);
            var mismatches = new List<string>();
            void Same(string what, int k, double expected, double actual)
            {
                var equal = double.IsNaN(expected)
                    ? double.IsNaN(actual)
                    : BitConverter.DoubleToInt64Bits(expected) == BitConverter.DoubleToInt64Bits(actual);
                if (!equal && mismatches.Count < 5) mismatches.Add($"{x.Id} k={k} {what}: record {expected:R}, column {actual:R}");
            }
            for (var k = 0; k < c.Count; k++)
            {
                Assert.Equal(c.Timestamp(k), ingest.IntervalStart(k));
                var m = c.Measurements(k);
                for (var i = 0; i < Measurement.Count; i++) Same("measured", k, ingest.Series[Tag(x, i)][k], m[i]);
                if (c.Status[k] is SampleStatus.Missing or SampleStatus.Downtime or SampleStatus.Frozen)
                {
                    Same("U", k, double.NaN, c.UActual[k]);
                    continue;
                }
                var pHot = x.Hot.PressureTag is { } ph ? ingest.Series[ph.Tag][k] : x.Hot.PressurePascals;
                var pCold = x.Cold.PressureTag is { } pc ? ingest.Series[pc.Tag][k] : x.Cold.PressurePascals;
                var e = evaluator.Evaluate(m, pHot, pCold, reconcile: true);
                var used = e.Reconciliation?.Adjusted ?? e.Measurements;
                if (h.CleanModel is { } clean && e.UActual > 0)
                {
                    e = evaluator.Complete(e, clean, used);
                    completed++;
                    if (c.Status[k] == SampleStatus.Ok)
                    {
                        var instruments = evaluator.FoulingResistanceSigma(e.Measurements, pHot, pCold, clean);
                        var (tube, shell) = evaluator.BulkTemperatures(used);
                        var reference = clean.InverseSigma(e.TubeFlow, e.ShellFlow, tube, shell);
                        Same("sigma systematic", k, Math.Sqrt(instruments * instruments + reference * reference), c.SigmaSystematic[k]);
                    }
                }
                compared++;
                Same("duty hot", k, e.DutyHot, c.DutyHot[k]);
                Same("duty cold", k, e.DutyCold, c.DutyCold[k]);
                Same("duty", k, e.Duty, c.Duty[k]);
                Same("balance", k, e.BalanceMismatch, c.BalanceMismatch[k]);
                Same("LMTD", k, e.Lmtd, c.Lmtd[k]);
                Same("F", k, e.CorrectionFactor, c.CorrectionFactor[k]);
                Same("U", k, e.UActual, c.UActual[k]);
                Same("C hot", k, e.HotCapacityRate, c.HotCapacityRate[k]);
                Same("C cold", k, e.ColdCapacityRate, c.ColdCapacityRate[k]);
                Same("tube flow", k, e.TubeFlow, c.TubeFlow[k]);
                Same("shell flow", k, e.ShellFlow, c.ShellFlow[k]);
                Same("U clean", k, e.UClean, c.UClean[k]);
                Same("Rf", k, e.FoulingResistance, c.FoulingResistance[k]);
                Same("cleanliness", k, e.Cleanliness, c.Cleanliness[k]);
                Same("duty clean", k, e.DutyClean, c.DutyClean[k]);
                Same("duty rated", k, e.DutyRated, c.DutyRated[k]);
                Same("lost duty", k, e.LostDuty, c.LostDuty[k]);
                Same("hot outlet clean", k, e.HotOutletClean, c.HotOutletClean[k]);
                Same("cold outlet clean", k, e.ColdOutletClean, c.ColdOutletClean[k]);
                Assert.Equal(e.Reconciliation is null ? 0 : e.Reconciliation.GrossError ? 2 : 1, c.Reconciled[k]);
                if (e.Reconciliation is { } r)
                {
                    Same("global test", k, r.GlobalTest, c.GlobalTest[k]);
                    for (var i = 0; i < Measurement.Count; i++)
                    {
                        Same("adjusted", k, r.Adjusted[i], c.Adjusted[i][k]);
                        Same("normalised adjustment", k, r.NormalisedAdjustments[i], c.NormalisedAdjustments[i][k]);
                        Same("sensitivity", k, r.Sensitivities[i], c.Sensitivities[i][k]);
                    }
                }
                // a sample read back as a record is the sample stored
                var back = c.Evaluation(k);
                Same("record read back: Rf", k, c.FoulingResistance[k], back.FoulingResistance);
                Same("record read back: U", k, c.UActual[k], back.UActual);
            }
            Assert.True(mismatches.Count == 0, string.Join("\n", mismatches));
        }
        output.WriteLine($"{compared:N0} evaluated samples compared, {completed:N0} of them completed against the clean U");
        Assert.True(compared > 100_000, $"only {compared} samples compared");
        Assert.True(completed > 100_000, $"only {completed} samples completed");
    }

    /// <summary>analyze writes each exchanger's files as soon as it is analysed and then releases its samples; the files
    /// must be those of writing the whole result at the end, byte for byte (the report but for its run time).</summary>
    [Fact]
    public void Streamed_analyze_writes_the_files_of_the_whole_result_written_at_once()
    {
        using var plant = new SamplePlantCopy();
        Assert.Equal(0, SamplePlantCopy.Run("analyze", "--config", plant.ConfigPath, "--out", plant.Out("streamed"), "--quiet").Code);
        var result = Analysis.PlantAnalysis.Run(PlantConfigurationReader.Load(plant.ConfigPath));
        Assert.All(result.Exchangers, x => Assert.False(x.History.Columns.IsReleased));
        Reporting.Results.ResultWriter.Write(result, plant.Out("whole"));
        var streamed = Files(plant.Out("streamed"));
        var whole = Files(plant.Out("whole"));
        Assert.Equal(whole.Keys.Order(), streamed.Keys.Order());
        Assert.True(whole.Count > 20, $"only {whole.Count} files");
        foreach (var (name, bytes) in whole)
        {
            if (name == "report.html")
                Assert.Equal(WithoutRunTime(bytes), WithoutRunTime(streamed[name]));
            else Assert.True(bytes.AsSpan().SequenceEqual(streamed[name]), $"{name} differs");
        }

        var released = Analysis.PlantAnalysis.ReleaseSamples(result.Exchangers[0]);
        Assert.True(released.History.Columns.IsReleased);
        Assert.Equal(result.Exchangers[0].History.Columns.Count, released.History.Columns.Count);
        Assert.Empty(released.History.Columns.FoulingResistance);
        Assert.Throws<InvalidOperationException>(() => Reporting.Results.ResultWriter.WriteExchanger(released, plant.Out("x")));
    }

    private static Dictionary<string, byte[]> Files(string folder) =>
        Directory.GetFiles(folder, "*", SearchOption.AllDirectories)
            .ToDictionary(f => Path.GetRelativePath(folder, f), File.ReadAllBytes);

    private static string WithoutRunTime(byte[] html) =>
        System.Text.RegularExpressions.Regex.Replace(System.Text.Encoding.UTF8.GetString(html), " · run [^·]+·", " · run · ");

    private static string Tag(ExchangerConfiguration x, int i) => i switch
    {
        Measurement.HotFlow => x.Hot.Flow.Tag,
        Measurement.HotInlet => x.Hot.Inlet.Tag,
        Measurement.HotOutlet => x.Hot.Outlet.Tag,
        Measurement.ColdFlow => x.Cold.Flow.Tag,
        Measurement.ColdInlet => x.Cold.Inlet.Tag,
        _ => x.Cold.Outlet.Tag,
    };
}
