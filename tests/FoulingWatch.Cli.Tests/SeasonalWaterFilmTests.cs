using FoulingWatch.Analysis;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Cli.Tests;

/// <summary>
/// The sample plant's cooling-water cooler C-201: its water inlet swings ±5 K with the season and the sample exports
/// are made with a water film that follows the water's properties (SampleData's generator, written apart from the
/// analysis). With the datasheet film scaled by the water's properties (clean.tubeBulkTemperature) the daily Rf follows
/// the generator's history, 2e-5 + 1.5e-6 m²K/W per day since the cleaning of 2025-11-01; with flow scaling only, the
/// season reads as fouling that comes and goes.
/// </summary>
public class SeasonalWaterFilmTests
{
    private static (double Rms, double Span) DailyError(PlantConfiguration config)
    {
        var x = PlantAnalysis.Run(config).Exchangers.Single();
        var cleaned = new DateTimeOffset(2025, 11, 1, 0, 0, 0, TimeSpan.Zero);
        var driftFrom = new DateTimeOffset(2026, 9, 1, 0, 0, 0, TimeSpan.Zero);   // the generator drifts the outlet from here
        var days = x.History.Samples.Where(s => s.Status == SampleStatus.Ok && s.Timestamp < driftFrom)
            .GroupBy(s => s.Timestamp.UtcDateTime.Date)
            .Select(g =>
            {
                var e = g.Select(s => s.Evaluation.FoulingResistance - (2e-5 + 1.5e-6 * (s.Timestamp - cleaned).TotalDays)).Order().ToArray();
                return e[e.Length / 2];
            }).ToList();
        Assert.True(days.Count > 250, $"{days.Count} days");
        return (Math.Sqrt(days.Average(e => e * e)), days.Max() - days.Min());
    }

    [Fact]
    public void The_cooling_water_season_no_longer_reads_as_fouling_with_the_property_scaled_film()
    {
        using var plant = new SamplePlantCopy(windowStart: null);
        var full = PlantConfigurationReader.Load(plant.ConfigPath);
        var c201 = full.Exchangers.Single(x => x.Id == "C-201");
        var config = full with
        {
            Exchangers = [c201],
            Data = full.Data with { Sources = full.Data.Sources.Where(s => s.Patterns.Any(p => p.Contains("utilities"))).ToList() },
        };
        Assert.NotNull(((DatasheetCleanReference)c201.Clean).TubeBulkTemperature);
        var scaled = DailyError(config);
        var flowOnly = DailyError(config with { Exchangers = [c201 with { Clean = (DatasheetCleanReference)c201.Clean with { TubeBulkTemperature = null } }] });
        Assert.True(scaled.Rms < 3e-6, $"with property scaling: RMS {scaled.Rms:G3}, span {scaled.Span:G3} m2K/W");
        Assert.True(flowOnly.Rms > 2e-5 && flowOnly.Span > 8e-5, $"flow scaling only: RMS {flowOnly.Rms:G3}, span {flowOnly.Span:G3} m2K/W");
    }
}
