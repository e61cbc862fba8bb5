using System.Globalization;
using FoulingWatch.Analysis.Trends;

namespace FoulingWatch.Analysis.Economics;

/// <summary>The words of a cleaning decision, dates in the site's local calendar.</summary>
public static class DecisionText
{
    public static string Date(DateTimeOffset? t, TimeZoneInfo zone) => SiteCalendar.Date(t, zone);

    private static string M(double v) => v.ToString("N0", CultureInfo.InvariantCulture);

    /// <summary>The limit's state in a few words, or null when the limit lies comfortably ahead.</summary>
    public static string? LimitWarning(CleaningDecision d, DecisionOption chosen, TimeZoneInfo zone)
    {
        if (d.Limit is not { } f) return null;
        return f.State switch
        {
            ForecastState.Reached => string.Create(CultureInfo.InvariantCulture,
                $"LIMIT ALREADY PASSED (probability {f.ProbabilityReachedNow:P0}): clean at the earliest possible date"),
            ForecastState.AtLimit => string.Create(CultureInfo.InvariantCulture,
                $"AT THE LIMIT within uncertainty (probability {f.ProbabilityReachedNow:P0} it is already reached)") +
                (chosen.Kind == "at-limit"
                    ? string.Create(CultureInfo.InvariantCulture,
                        $"; running on means an UNPLANNED STOP when it is reached (P50 {Date(f.Date, zone)}); it costs {M(d.UnplannedStopCost)} {d.Currency}")
                    : ""),
            _ when chosen.Kind == "at-limit" => string.Create(CultureInfo.InvariantCulture,
                $"UNPLANNED STOP needed when the limit is reached (P10 {Date(f.P10, zone)}, P50 {Date(f.Date, zone)}); it costs {M(d.UnplannedStopCost)} {d.Currency}"),
            _ when chosen.ProbabilityUnplannedStop >= 0.10 && f.P10 is { } p10 => string.Create(CultureInfo.InvariantCulture,
                $"UNPLANNED STOP may be needed by {Date(p10, zone)} (P10 of the limit date; probability {chosen.ProbabilityUnplannedStop:P0} the limit comes first); it costs {M(d.UnplannedStopCost)} {d.Currency}"),
            _ => null,
        };
    }

    public static string Action(DecisionOption o, TimeZoneInfo zone) => o.Kind switch
    {
        "window" => $"clean in '{o.Label}' ({Date(o.Date, zone)})",
        "earliest" => $"clean at the earliest date ({Date(o.Date, zone)})",
        "at-limit" => $"run to the limit, then stop (P10 {Date(o.Date, zone)})",
        _ => "no cleaning within the horizon",
    };

    public static string Statement(CleaningDecision d, TimeZoneInfo zone)
    {
        var r = d.Recommended;
        var parts = new List<string>();
        if (LimitWarning(d, r, zone) is { } warning) parts.Add(warning);
        var against = d.Reference.Kind == "at-limit" ? "running to the limit" : "never cleaning";
        parts.Add(r == d.Reference
            ? string.Create(CultureInfo.InvariantCulture,
                $"{Action(r, zone)}: no planned cleaning is expected to save money against {against} over {d.HorizonDays / 365:0} years")
            : string.Create(CultureInfo.InvariantCulture,
                $"{Action(r, zone)}: expected saving {M(r.Saving)} {d.Currency} against {against} over {d.HorizonDays / 365:0} years (90 % interval {M(r.SavingLow)} to {M(r.SavingHigh)}; probability it saves {r.ProbabilitySaving:P0})"));
        parts.Add(string.Create(CultureInfo.InvariantCulture, $"probability this is the best option {d.ProbabilityRecommendedBest:P0}") +
                  (d.Uncertain ? $" — UNCERTAIN: {d.Settle}" : ""));
        if (d.BreakEvenRate is { } be)
            parts.Add(string.Create(CultureInfo.InvariantCulture,
                $"cleaning would pay above a fouling rate of {be:0.0e0} m2K/W per day (now {d.FoulingRateNow:0.0e0})"));
        parts.Add(d.OptimalIntervalDays is { } t
            ? string.Create(CultureInfo.InvariantCulture, $"cost-optimal cycle {t:0} days")
            : "no finite cost-optimal cycle: on this path a cleaning never pays for itself within five years");
        return string.Join("; ", parts);
    }
}
