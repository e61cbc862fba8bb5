using System.Globalization;
using FoulingWatch.Analysis;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Reporting.Results;

namespace FoulingWatch.Cli;

/// <summary><c>foulingwatch analyze</c>: the whole pipeline on a plant, results into a folder.</summary>
public static class AnalyzeCommand
{
    public static int Run(string configPath, string outDirectory, bool json, bool quiet, TextWriter output, TextWriter error)
    {
        var config = PlantConfigurationReader.Load(configPath);
        var progress = quiet || json || Console.IsErrorRedirected || !ReferenceEquals(error, Console.Error) ? null : new Progress<(string Stage, double Fraction)>(p => error.Write($"\r{p.Stage,-60}"));
        var result = PlantAnalysis.Run(config, progress);
        if (progress is not null) error.Write("\r" + new string(' ', 60) + "\r");
        ResultWriter.Write(result, outDirectory);
        if (json)
        {
            output.WriteLine(System.Text.Json.JsonSerializer.Serialize(ResultWriter.Summary(result), ResultWriter.Json));
            return FoulingWatchCommand.Success;
        }
        if (quiet) return FoulingWatchCommand.Success;
        output.WriteLine($"{config.Site.Name}: {result.Exchangers.Count} exchangers, {result.Ingest.IntervalCount} intervals of {result.Ingest.Interval.TotalMinutes:0} min from {result.Ingest.GridStart:yyyy-MM-dd}.");
        var t = new TextTable("exchanger", "usable", "U W/m2K", "U clean", "cleanliness", "Rf m2K/W", "± σ", "lost duty kW", "model", "limit reached", "note");
        foreach (var x in result.Exchangers)
        {
            var c = x.Current;
            var note = x.History.Refusal ?? (x.History.SensorCheck.LikelyFault ? $"check {x.History.SensorCheck.Tag}" : "");
            t.Add(x.History.Exchanger.Id, $"{x.StatusCounts["ok"] * 100.0 / Math.Max(1, x.History.Samples.Count):0}%",
                F(c.UActual, "0"), F(c.UClean, "0"), F(c.Cleanliness, "0.00"), F(c.FoulingResistance, "0.000000"), F(c.FoulingResistanceSigma, "0.000000"),
                F(c.LostDuty / 1000, "0"), x.Trend.Cycles.LastOrDefault()?.Chosen?.Model.Key ?? "—", LimitText(x.Trend.Forecast),
                (x.Trend.Rate?.Jump == true ? "rate jump! " : "") + note);
        }
        output.Write(t);
        output.WriteLine($"Results: {Path.GetFullPath(outDirectory)} (summary.json, <exchanger>/timeseries.csv)");
        return FoulingWatchCommand.Success;
    }

    private static string LimitText(Analysis.Trends.LimitForecast? f) => f switch
    {
        null => "—",
        { AlreadyReached: true } => "reached",
        { BeyondHorizon: true } => "beyond horizon",
        _ => $"{f.Date:yyyy-MM-dd} ({(f.Low is { } lo ? lo.ToString("yyyy-MM") : "now")}…{(f.High is { } hi ? hi.ToString("yyyy-MM") : "later")})",
    };

    private static string F(double v, string format) => double.IsFinite(v) ? v.ToString(format, CultureInfo.InvariantCulture) : "—";

    /// <summary>Finds the bundled sample plant: sample-data/plant.json in the current folder or above it, or above the program.</summary>
    public static string? FindSamplePlant()
    {
        foreach (var start in new[] { Directory.GetCurrentDirectory(), AppContext.BaseDirectory })
        {
            for (var d = new DirectoryInfo(start); d is not null; d = d.Parent)
            {
                var candidate = Path.Combine(d.FullName, "sample-data", "plant.json");
                if (File.Exists(candidate)) return candidate;
            }
        }
        return null;
    }
}
