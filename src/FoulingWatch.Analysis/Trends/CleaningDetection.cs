namespace FoulingWatch.Analysis.Trends;

/// <summary>How a cycle boundary is known.</summary>
public enum CleaningSource { Logged, Detected }

/// <summary>A cleaning: its date, how it is known, and the evidence in the data (daily medians before and after).</summary>
/// <param name="Date">The cycle boundary: the restart after the cleaning's outage when one is found in the data, else the
/// logged date or the first day after the fall.</param>
/// <param name="OutageStart">Start of the outage around the cleaning (flows below the downtime fraction), when found.</param>
public sealed record Cleaning(DateTimeOffset Date, CleaningSource Source, double? RfBefore, double? RfAfter, double? Drop, double? DropSigma,
    DateTimeOffset? OutageStart = null, DateTimeOffset? OutageEnd = null);

/// <summary>Finds cleanings in the daily Rf as a sharp, sustained fall: the median of the days after a point lies well below the median of the days before it.</summary>
/// <remarks>
/// Rule (documented, common practice for step detection on noisy series): for each day, compare the medians of the
/// five usable days before and after it (gaps such as a downtime are skipped, so a fall across a shutdown counts);
/// a fall is a cleaning when it exceeds 4 combined standard errors (the larger of the days' own and the robust spread
/// 1.4826·MAD of all windowed falls, which carries the process's day-to-day wander), 30 % of the level before, and
/// 5e-5 m²·K/W; the day
/// of the largest fall in a ±7-day neighbourhood is taken. Falls within 7 days of a logged cleaning belong to it; a
/// maintenance entry "not-cleaned" within 3 days suppresses a detection.
/// </remarks>
public static class CleaningDetection
{
    public const int Window = 5;
    public const double SigmaFactor = 4, RelativeDrop = 0.3, MinimumDrop = 5e-5;

    public static List<Cleaning> Detect(IReadOnlyList<DailyPoint> days, IReadOnlyList<DateTimeOffset> logged, IReadOnlyList<DateTimeOffset> suppressed)
    {
        var windows = new List<(int Index, double Drop, double Sigma, double Before, double After)>();
        for (var i = Window; i + Window <= days.Count; i++)
        {
            var before = days.Skip(i - Window).Take(Window).ToList();
            var after = days.Skip(i).Take(Window).ToList();
            var b = DailyFouling.Median(before.Select(d => d.FoulingResistance).Sorted());
            var a = DailyFouling.Median(after.Select(d => d.FoulingResistance).Sorted());
            var sb = Math.Sqrt(Math.PI / 2) * Math.Sqrt(before.Average(d => d.Sigma * d.Sigma) / Window);
            var sa = Math.Sqrt(Math.PI / 2) * Math.Sqrt(after.Average(d => d.Sigma * d.Sigma) / Window);
            windows.Add((i, b - a, Math.Sqrt(sa * sa + sb * sb), b, a));
        }
        // The day-to-day wander of a process (serially correlated, larger than the scatter within a day) moves the windowed
        // medians too: the robust spread of all the windowed falls is the empirical null, and cleanings are its outliers.
        var falls = windows.Select(w => w.Drop).Sorted();
        var centre = DailyFouling.Median(falls);
        var wander = falls.Length == 0 ? 0 : 1.4826 * DailyFouling.Median(falls.Select(f => Math.Abs(f - centre)).Sorted());
        var candidates = windows.Select(w => w with { Sigma = Math.Max(w.Sigma, wander) })
            .Where(w => w.Drop > SigmaFactor * w.Sigma && w.Drop > RelativeDrop * Math.Abs(w.Before) && w.Drop > MinimumDrop).ToList();
        var result = new List<Cleaning>();
        foreach (var c in candidates)
        {
            var day = days[c.Index].Day;
            if (candidates.Any(o => Math.Abs((days[o.Index].Day - day).TotalDays) <= 7 && o.Drop > c.Drop)) continue;
            if (result.Any(r => Math.Abs((r.Date - day).TotalDays) <= 7)) continue;
            if (logged.Any(l => Math.Abs((l - day).TotalDays) <= 7)) continue;
            // The windowed medians locate the fall to within a few days; the cleaning lies at the largest fall from one
            // usable day to the next (often across the downtime of the cleaning), and the new cycle starts on the day after it.
            var step = Enumerable.Range(Math.Max(1, c.Index - Window + 1), Math.Min(days.Count - 1, c.Index + Window - 1) - Math.Max(1, c.Index - Window + 1) + 1)
                .MaxBy(j => days[j - 1].FoulingResistance - days[j].FoulingResistance);
            day = days[step].Day;
            if (suppressed.Any(s => Math.Abs((s - day).TotalDays) <= 3)) continue;
            if (result.Any(r => Math.Abs((r.Date - day).TotalDays) <= 7)) continue;
            result.Add(new Cleaning(day, CleaningSource.Detected, c.Before, c.After, c.Drop, c.Sigma));
        }
        return result;
    }
}
