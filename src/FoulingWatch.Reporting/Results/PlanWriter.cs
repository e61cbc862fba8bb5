using System.Text;
using FoulingWatch.Analysis;

namespace FoulingWatch.Reporting.Results;

/// <summary>Writes plan.csv: the ranked fleet cleaning plan, one row per exchanger, money in the site currency.</summary>
public static class PlanWriter
{
    public static readonly string[] Columns =
    [
        "rank", "exchanger", "service", "action", "window", "date", "net_saving", "net_saving_90_low", "net_saving_90_high",
        "probability_saving", "probability_best", "payback_days", "energy_avoided_GJ", "co2_avoided_t", "probability_unplanned_stop",
        "cost_per_day_now", "currency", "warning", "note",
    ];

    public static void Write(string path, PlantResult r)
    {
        var sb = new StringBuilder();
        sb.AppendJoin(',', Columns).Append('\n');
        var zone = r.Configuration.Site.TimeZone;
        string D(DateTimeOffset? t) => t is { } v ? TimeZoneInfo.ConvertTime(v, zone).ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture) : "";
        foreach (var p in r.Plan.Entries)
        {
            var econ = r.Exchangers.First(x => x.History.Exchanger.Id == p.ExchangerId).Economics;
            string[] cells =
            [
                p.Rank.ToString(System.Globalization.CultureInfo.InvariantCulture), Quote(p.ExchangerId), Quote(p.Service), Quote(p.Option?.Kind),
                Quote(p.Window?.Name), D(p.Option?.Date),
                NumberText.Csv(p.Option?.Saving ?? double.NaN), NumberText.Csv(p.Option?.SavingLow ?? double.NaN), NumberText.Csv(p.Option?.SavingHigh ?? double.NaN),
                NumberText.Csv(p.Option?.ProbabilitySaving ?? double.NaN), NumberText.Csv(p.ProbabilityBest),
                NumberText.Csv(p.Option?.PaybackDays ?? double.NaN), NumberText.Csv((p.Option?.EnergyAvoided ?? double.NaN) / 1e9),
                NumberText.Csv((p.Option?.Co2Avoided ?? double.NaN) / 1000), NumberText.Csv(p.Option?.ProbabilityUnplannedStop ?? double.NaN),
                NumberText.Csv(econ.CostPerDayNow), r.Configuration.Economics.Currency, Quote(p.Warning), Quote(p.Note),
            ];
            sb.AppendJoin(',', cells).Append('\n');
        }
        AtomicFile.WriteAllText(path, sb.ToString());
    }

    /// <summary>A text cell, quoted as RFC 4180 needs; a text starting with '=', '+', '-', '@', tab or CR gets a leading
    /// apostrophe so that a spreadsheet shows it rather than evaluating it (OWASP, "CSV Injection").</summary>
    public static string Quote(string? text)
    {
        if (string.IsNullOrEmpty(text)) return "";
        if (text[0] is '=' or '+' or '-' or '@' or '\t' or '\r') text = "'" + text;
        return text.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? $"\"{text.Replace("\"", "\"\"")}\"" : text;
    }
}
