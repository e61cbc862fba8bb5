using FoulingWatch.Analysis.Economics;
using System.Globalization;
using FoulingWatch.Analysis;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Reporting.Results;

namespace FoulingWatch.Cli;

/// <summary><c>foulingwatch analyze</c>: the whole pipeline on a plant, results into a folder.</summary>
public static class AnalyzeCommand
{
    public static int Run(string configPath, string outDirectory, bool json, bool quiet, TextWriter output, TextWriter error,
        DateTimeOffset? auditFrom = null, DateTimeOffset? auditTo = null)
    {
        var config = StageClock.Time("configuration", () => PlantConfigurationReader.Load(configPath));
        var progress = ProgressOn(quiet || json, error);
        var (result, written) = Streamed(config, outDirectory, progress);
        if (auditFrom is not null || auditTo is not null)
            result = result with { AuditPeriod = (auditFrom ?? result.Ingest.GridStart, auditTo ?? result.Ingest.IntervalStart(result.Ingest.IntervalCount)) };
        if (progress is not null) error.Write("\r" + new string(' ', 90) + "\r");
        ResultWriter.Write(result, outDirectory, written);
        if (json)
        {
            output.WriteLine(System.Text.Json.JsonSerializer.Serialize(ResultWriter.Summary(result), ResultWriter.Json));
            return FoulingWatchCommand.Success;
        }
        if (quiet) return FoulingWatchCommand.Success;
        output.WriteLine($"{config.Site.Name}: {result.Exchangers.Count} exchangers, {result.Ingest.IntervalCount} intervals of {result.Ingest.Interval.TotalMinutes:0} min from {result.Ingest.GridStart:yyyy-MM-dd}.");
        // Rf and its σ in units of 1e-4 m²K/W (one notation everywhere); notes go under the table so it fits 120 columns.
        var t = new TextTable("exchanger", "usable", "U W/m2K", "U clean", "CF", "Rf e-4 m2K/W", "± σ", "lost kW", "model",
            "limit P10…P50…P90");
        var notes = new List<string>();
        foreach (var x in result.Exchangers)
        {
            var c = x.Current;
            var note = PlantAnalysis.NoUsableIntervals(x.StatusCounts) ?? x.History.Refusal
                       ?? (x.History.SensorCheck.LikelyFault ? $"check {x.History.SensorCheck.Tag}; no forecast" : "");
            if (x.History.Drift is { } drift)
                note = (drift.SingleSensor
                    ? $"drift on {string.Join(" or ", drift.Suspects)} from {SiteCalendar.Date(drift.Onset, config.Site.TimeZone)}"
                    : $"heat balance changed from {SiteCalendar.Date(drift.Onset, config.Site.TimeZone)}, no single sensor explains it")
                    + "; later data not used" + (note.Length > 0 ? "; " + note : "");
            foreach (var dp in x.PressureDrops.Where(p => p.Change > 0.15))
                note += (note.Length > 0 ? "; " : "") + FormattableString.Invariant($"{dp.Side} pressure drop {dp.Change:+0%} at reference flow");
            note = (x.Trend.Rate?.Jump == true ? "rate jump! " : "") + note;
            if (PlantAnalysis.DaysStale(x, result.Ingest) is { } stale)
                note = $"STALE: latest usable data {SiteCalendar.Date(x.Current.LastUsable, config.Site.TimeZone)}, {stale:0} days before the end of the data" + (note.Length > 0 ? "; " + note : "");
            if (note.Length > 0) notes.Add($"{x.History.Exchanger.Id}: {note}");
            t.Add(x.History.Exchanger.Id, $"{x.StatusCounts["ok"] * 100.0 / Math.Max(1, x.History.Columns.Count):0}%",
                F(c.UActual, "0"), F(c.UClean, "0"), F(c.Cleanliness, "0.00"), F(c.FoulingResistance * 1e4, "0.00"), F(c.FoulingResistanceSigma * 1e4, "0.00"),
                F(c.LostDuty / 1000, "0"), x.Trend.Cycles.LastOrDefault()?.Chosen?.Model.Key ?? "—", LimitText(x.Trend.Forecast, config.Site.TimeZone));
        }
        output.Write(t);
        foreach (var n in notes) Wrapped(output, n, "  ");
        output.WriteLine();
        WritePlan(result, output);
        output.WriteLine($"Results: {Path.GetFullPath(outDirectory)} (summary.json, plan.csv, <exchanger>/timeseries.csv, charts/)");
        output.WriteLine($"Report:  {Path.Combine(Path.GetFullPath(outDirectory), "report.html")} (opens offline in a browser)");
        return FoulingWatchCommand.Success;
    }

    /// <summary>The pipeline with each exchanger's own files (time series, charts) written as soon as it is analysed and its
    /// samples then released: the run holds one or two exchangers' samples at a time, whatever the size of the fleet.</summary>
    private static (PlantResult Result, IReadOnlyDictionary<string, IReadOnlyList<Reporting.Charts.Chart>> Written) Streamed(
        PlantConfiguration config, string outDirectory, IProgress<(string Stage, double Fraction)>? progress)
    {
        var written = new System.Collections.Concurrent.ConcurrentDictionary<string, IReadOnlyList<Reporting.Charts.Chart>>();
        var result = PlantAnalysis.Run(config, progress, x =>
        {
            written[x.History.Exchanger.Id] = ResultWriter.WriteExchanger(x, outDirectory);
            return PlantAnalysis.ReleaseSamples(x);
        });
        return (result, written);
    }

    /// <summary>A one-line progress display on an interactive terminal's standard error, or null (quiet, JSON, redirected).</summary>
    internal static IProgress<(string Stage, double Fraction)>? ProgressOn(bool silent, TextWriter error) =>
        silent || Console.IsErrorRedirected || !ReferenceEquals(error, Console.Error) ? null
            : new Progress<(string Stage, double Fraction)>(p => error.Write("\r" + ProgressLine(p.Stage, p.Fraction)));

    /// <summary><c>foulingwatch plan</c>: the same run as analyze (the plan needs the whole pipeline), printing the ranked plan.</summary>
    public static int RunPlan(string configPath, string outDirectory, bool json, bool quiet, TextWriter output, TextWriter error)
    {
        var config = PlantConfigurationReader.Load(configPath);
        var progress = ProgressOn(quiet || json, error);
        var (result, written) = Streamed(config, outDirectory, progress);
        if (progress is not null) error.Write("\r" + new string(' ', 90) + "\r");
        ResultWriter.Write(result, outDirectory, written);
        if (json) output.WriteLine(System.Text.Json.JsonSerializer.Serialize(ResultWriter.Plan(result), ResultWriter.Json));
        else if (!quiet)
        {
            WritePlan(result, output);
            output.WriteLine($"Plan: {Path.Combine(Path.GetFullPath(outDirectory), "plan.csv")}");
        }
        return FoulingWatchCommand.Success;
    }

    public static void WritePlan(PlantResult result, TextWriter output)
    {
        var currency = result.Configuration.Economics.Currency;
        var zone = result.Configuration.Site.TimeZone;
        Wrapped(output, $"Cleaning plan: {result.Plan.Method}.");
        var p = new TextTable("rank", "exchanger", "action", "date", $"saving {currency}", "90 % interval", "P(saves)", "P(best)",
            "CO2 avoided t");
        foreach (var e in result.Plan.Entries)
        {
            var o = e.Option;
            p.Add(e.Rank, e.ExchangerId, o is null ? "—" : o.Kind == "window" ? o.Label : o.Kind, o is null ? "—" : DecisionText.Date(o.Date, zone),
                o is null ? "—" : o.Saving.ToString("N0", CultureInfo.InvariantCulture),
                o is null ? "—" : $"{o.SavingLow.ToString("N0", CultureInfo.InvariantCulture)} … {o.SavingHigh.ToString("N0", CultureInfo.InvariantCulture)}",
                o is null ? "—" : F(o.ProbabilitySaving * 100, "0") + (double.IsFinite(o.ProbabilitySaving) ? " %" : ""),
                double.IsFinite(e.ProbabilityBest) ? F(e.ProbabilityBest * 100, "0") + " %" : "—",
                o is null ? "—" : F(o.Co2Avoided / 1000, "0"));
        }
        output.Write(p);
        foreach (var e in result.Plan.Entries.Where(e => e.Warning is not null || e.Note.Length > 0))
        {
            if (e.Warning is not null) Wrapped(output, $"{e.ExchangerId}: {e.Warning}", "  ");
            if (e.Note.Length > 0) Wrapped(output, $"{e.ExchangerId}: {e.Note}", "  ");
        }
        Wrapped(output, $"Total expected saving of the plan: {result.Plan.TotalSaving.ToString("N0", CultureInfo.InvariantCulture)} {currency}, " +
                        "against running each exchanger to its limit (or never cleaning where no limit applies), over three years.");
        Wrapped(output, Caution);
    }

    public const int ConsoleWidth = 120;

    /// <summary>Writes text word-wrapped to <see cref="ConsoleWidth"/> columns, left-aligned, continuation lines indented.</summary>
    public static void Wrapped(TextWriter output, string text, string indent = "")
    {
        var line = new System.Text.StringBuilder(indent);
        foreach (var word in text.Split(' '))
        {
            if (line.Length > indent.Length && line.Length + 1 + word.Length > ConsoleWidth)
            {
                output.WriteLine(line.ToString());
                line.Clear().Append(indent).Append("    ");
            }
            else if (line.Length > indent.Length && !line.ToString().EndsWith("    ", StringComparison.Ordinal)) line.Append(' ');
            line.Append(word);
        }
        output.WriteLine(line.ToString());
    }

    public const string Caution =
        "Caution: advice only; results depend on instrument quality. Cleaning, isolation and operating changes of pressure " +
        "equipment follow site procedures, local codes and licensed engineering practice.";

    private static string LimitText(Analysis.Trends.LimitForecast? f, TimeZoneInfo zone) => f switch
    {
        null => "—",
        { AlreadyReached: true } => "reached",
        { State: Analysis.Trends.ForecastState.AtLimit } => $"at limit ({f.ProbabilityReachedNow * 100:0} %)",
        { BeyondHorizon: true } => "beyond horizon",
        _ => $"{D(f.P10, zone)}…{D(f.Date, zone)}…{D(f.P90, zone)}",
    };

    private static string D(DateTimeOffset? t, TimeZoneInfo zone) => t is null ? "later" : DecisionText.Date(t, zone);

    /// <summary>A one-line progress bar for an interactive terminal: "[#######.........]  45 %  reading file.csv".</summary>
    public static string ProgressLine(string stage, double fraction)
    {
        const int width = 24;
        var filled = (int)Math.Round(Math.Clamp(fraction, 0, 1) * width);
        var text = $"[{new string('#', filled)}{new string('.', width - filled)}] {fraction * 100,3:0} %  {stage}";
        return text.Length > 90 ? text[..90] : text.PadRight(90);
    }

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
