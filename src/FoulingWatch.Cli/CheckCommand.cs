using System.Globalization;
using System.Text.Json;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;
using FoulingWatch.Reporting.Results;

namespace FoulingWatch.Cli;

/// <summary><c>foulingwatch check</c>: validates configuration and data and shows what was used and rejected, without analysing.</summary>
public static class CheckCommand
{
    public static int Run(string configPath, bool json, TextWriter output, TextWriter error)
    {
        var config = PlantConfigurationReader.Load(configPath);
        // a one-line progress display on an interactive terminal (reading the exports is what takes the time)
        var progress = AnalyzeCommand.ProgressOn(json, error);
        var ingest = HistorianIngest.Run(config, progress is null ? null
            : new Progress<(string File, double Fraction)>(p => progress.Report(($"reading {Path.GetFileName(p.File)}", p.Fraction))));
        if (progress is not null) error.Write("\r" + new string(' ', 90) + "\r");
        if (json)
        {
            output.WriteLine(JsonSerializer.Serialize(new
            {
                site = config.Site.Name,
                grid = new { start = NumberText.Utc(ingest.GridStart), interval_s = ingest.Interval.TotalSeconds, intervals = ingest.IntervalCount },
                files = ingest.Files.Select(f => new { file = Path.GetFileName(f.File), encoding = f.Encoding, delimiter = f.Delimiter.ToString(), decimal_separator = f.DecimalSeparator.ToString(), header_line = f.HeaderLine, unit_rows = f.MetadataRows, data_rows = f.DataRows }),
                rows_of_other_tags = ingest.RowsOfOtherTags,
                exchangers = config.Exchangers.Select(x => new
                {
                    id = x.Id,
                    values = ResultWriter.Ledger(ingest.ExchangerLedger(x)),
                    tags = x.Tags().Select(t => t.Tag).Distinct().Select(t => new { tag = t, ledger = ResultWriter.Ledger(ingest.TagLedgers[t]) }),
                }),
                unusable = Unusable(config, ingest),
            }, ResultWriter.Json));
            return Unusable(config, ingest).Count == 0 ? FoulingWatchCommand.Success : FoulingWatchCommand.DataError;
        }
        output.WriteLine($"Configuration {Path.GetFileName(configPath)}: valid; site {config.Site.Name}, {config.Exchangers.Count} exchanger(s).");
        foreach (var w in Warnings(config, File.ReadAllLines(configPath), ingest)) output.WriteLine("warning: " + w);
        var unusable = Unusable(config, ingest);
        foreach (var u in unusable) output.WriteLine("error: " + u);
        output.WriteLine($"Grid: {ingest.IntervalCount} intervals of {ingest.Interval.TotalMinutes:0.#} min from {ingest.GridStart:yyyy-MM-dd HH:mm} UTC.");
        output.WriteLine();
        var files = new TextTable("file", "encoding", "delim", "decimal", "header line", "unit rows", "data rows", "DST repeated hr");
        foreach (var f in ingest.Files)
            files.Add(Path.GetFileName(f.File), f.Encoding, f.Delimiter == '\t' ? "tab" : f.Delimiter.ToString(), f.DecimalSeparator.ToString(),
                f.HeaderLine, f.MetadataRows, f.DataRows, $"{f.AmbiguousLocalTimesAsDaylight}+{f.AmbiguousLocalTimesAsStandard}");
        output.Write(files);
        if (ingest.RowsOfOtherTags > 0) output.WriteLine($"({ingest.RowsOfOtherTags} rows of tags not in the configuration were skipped.)");
        output.WriteLine();
        foreach (var x in config.Exchangers)
        {
            output.WriteLine($"{x.Id} — {x.Service}");
            var t = new TextTable(["tag", "read", "used", .. RejectReasons.All.Select(r => r.Key()), "intervals ok", "bridged", "missing"]);
            foreach (var tag in x.Tags().Select(r => r.Tag).Distinct())
            {
                var l = ingest.TagLedgers[tag];
                t.Add([tag, l.Read, l.Used, .. l.Rejected.Cast<object>(), l.IntervalsWithData, l.IntervalsBridged, l.IntervalsMissing]);
            }
            output.Write(t);
            foreach (var e in x.Tags().SelectMany(r => ingest.TagLedgers[r.Tag].Examples).Distinct().Take(6)) output.WriteLine("  " + e);
            output.WriteLine();
        }
        if (unusable.Count > 0)
            output.WriteLine($"Some tags have no usable value (see the errors at the top); exit code {FoulingWatchCommand.DataError}.");
        return unusable.Count == 0 ? FoulingWatchCommand.Success : FoulingWatchCommand.DataError;
    }

    /// <summary>Configured tags that were read but of which no value can be used, each with why and what to change
    /// (check then ends with the data-error code: an analysis of them would have nothing to work on).</summary>
    public static List<string> Unusable(PlantConfiguration config, IngestResult ingest)
    {
        var zone = config.Site.TimeZone;
        string Day(DateTimeOffset? t) => t is { } v ? TimeZoneInfo.ConvertTime(v, zone).ToString("yyyy-MM-dd", CultureInfo.InvariantCulture) : "…";
        var window = $"data.window ({Day(config.Data.WindowStart)} to {Day(config.Data.WindowEnd)})";
        var groups = new SortedDictionary<string, List<string>>(StringComparer.Ordinal);
        foreach (var tag in config.Exchangers.SelectMany(x => x.Tags()).Select(t => t.Tag).Distinct(StringComparer.Ordinal))
        {
            if (!ingest.TagLedgers.TryGetValue(tag, out var l) || l.Read == 0 || l.Used > 0) continue;
            var top = RejectReasons.All.MaxBy(r => l.Rejected[(int)r]);
            var why = top switch
            {
                RejectReason.BadTimestamp when l.Rejected[(int)top] == l.Read => "every value has an unreadable timestamp; set the source's timestamp.format.",
                RejectReason.OutsideWindow when l.Rejected[(int)top] == l.Read => $"every value lies outside {window}; move or remove the window.",
                _ => $"no value is usable (most are {top.Key()}); see the examples below.",
            };
            if (!groups.TryGetValue(why, out var list)) groups[why] = list = [];
            list.Add(tag);
        }
        return groups.Select(g => $"{string.Join(", ", g.Value.Take(6))}{(g.Value.Count > 6 ? $" and {g.Value.Count - 6} more" : "")}" +
            $" ({g.Value.Count} tag{(g.Value.Count == 1 ? "" : "s")}): {g.Key}").ToList();
    }

    /// <summary>What the configuration still lacks for the whole job, each with its key: open CHECK marks, missing limits,
    /// cleaning costs and pricing (tags with no usable value are errors: <see cref="Unusable"/>).</summary>
    public static IEnumerable<string> Warnings(PlantConfiguration config, IReadOnlyList<string> lines, IngestResult ingest)
    {
        var marks = lines.Select((l, i) => (Line: i + 1, Text: l)).Where(l => l.Text.Contains("CHECK", StringComparison.Ordinal)).ToList();
        if (marks.Count > 0)
            yield return $"{Path.GetFileName(config.File)}: {marks.Count} open CHECK mark(s) (line {string.Join(", ", marks.Select(m => m.Line))}); confirm each guess and remove its mark.";
        var e = config.Economics;
        var sitePriced = e.LostCoolingCostPerJoule is not null || (e.FuelPricePerJoule is not null && e.HeaterEfficiency is not null);
        for (var i = 0; i < config.Exchangers.Count; i++)
        {
            var x = config.Exchangers[i];
            if (x.Limits.FoulingResistance is null && x.Limits.MinimumDuty is null && x.Limits.MinimumColdOutlet is null)
                yield return $"exchangers[{i}].limits: {x.Id} has no limit; the forecast and the cleaning plan need limits.foulingResistance, minimumDuty or minimumColdOutlet.";
            if (x.Cleaning.Cost is null)
                yield return $"exchangers[{i}].cleaning.cost: {x.Id} has no cleaning cost; the cleaning plan needs it (and cleaning.downtime).";
            var priced = x.Economics is { } own ? own.LostCoolingCostPerJoule is not null || (own.FuelPricePerJoule is not null && own.HeaterEfficiency is not null) : sitePriced;
            if (!priced)
                yield return $"economics.fuelPrice: {x.Id} is not priced; give economics.fuelPrice and economics.heaterEfficiency (or lostCoolingCost for a cooler).";
        }
    }
}
