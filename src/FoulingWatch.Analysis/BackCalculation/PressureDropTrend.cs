using System.Globalization;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis;

/// <summary>How one side's pressure drop at a reference flow moved over the current cycle: a second sign of deposits,
/// independent of the temperature and flow instruments behind Rf.</summary>
/// <param name="ReferenceFlow">Mass flow the drops are referred to (kg/s): the design flow, else the median flow.</param>
/// <param name="First">Median referred drop (Pa) over the first week from <paramref name="From"/>.</param>
/// <param name="Last">Median referred drop (Pa) over the last week to <paramref name="To"/>.</param>
public sealed record PressureDropChange(string Side, string Tag, double ReferenceFlow, DateTimeOffset From, double First,
    DateTimeOffset To, double Last, string Statement)
{
    public double Change => Last / First - 1;
}

/// <summary>
/// Each side's measured pressure drop referred to one flow, ΔP_ref = ΔP·(ṁ_ref/ṁ)^1.8 (turbulent friction, ΔP ∝ ṁ^1.75–2;
/// common practice), compared between the first and the last week of the current cycle with data (since the last logged
/// cleaning, else the data's start). Samples at downtime or with a missing measurement are left out.
/// </summary>
public static class PressureDropTrend
{
    public const double FlowExponent = 1.8;
    private static readonly TimeSpan Week = TimeSpan.FromDays(7);

    public static IReadOnlyList<PressureDropChange> Evaluate(ExchangerConfiguration x, IngestResult data, IReadOnlyList<SampleResult> samples,
        TimeZoneInfo zone)
    {
        var list = new List<PressureDropChange>();
        foreach (var (side, stream) in new[] { ("tube", x.Tube), ("shell", x.Shell) })
        {
            if (stream.PressureDropTag is not { } tag || !data.Series.TryGetValue(tag.Tag, out var dp)) continue;
            var flow = data.Series[stream.Flow.Tag];
            var running = Enumerable.Range(0, Math.Min(samples.Count, dp.Length))
                .Where(k => samples[k].Status is not (SampleStatus.Missing or SampleStatus.Downtime) && dp[k] > 0 && flow[k] > 0).ToList();
            if (running.Count < 10) continue;
            var reference = stream.DesignFlow ?? Median(running.Select(k => flow[k]));
            var gridEnd = data.IntervalStart(data.IntervalCount);
            var start = x.Maintenance.Where(m => m.IsCleaning && m.Date < gridEnd).Select(m => (DateTimeOffset?)m.Date).LastOrDefault() ?? data.GridStart;
            double Referred(int k) => dp[k] * Math.Pow(reference / flow[k], FlowExponent);
            // the cycle's first week with data (a window may start after the cleaning)
            if (running.FirstOrDefault(k => data.IntervalStart(k) >= start, -1) is var firstIndex && firstIndex < 0) continue;
            start = data.IntervalStart(firstIndex);
            var first = running.Where(k => data.IntervalStart(k) >= start && data.IntervalStart(k) < start + Week).Select(Referred).ToList();
            var end = data.IntervalStart(running[^1]);
            var last = running.Where(k => data.IntervalStart(k) > end - Week).Select(Referred).ToList();
            if (first.Count < 5 || last.Count < 5 || end - start < 2 * Week) continue;
            var (a, b) = (Median(first), Median(last));
            var unit = tag.Unit;
            var text = string.Create(CultureInfo.InvariantCulture,
                $"{side}-side pressure drop at {reference * 3.6:0.#} t/h: {unit.FromSi(a):0.###} → {unit.FromSi(b):0.###} {unit.Symbol} ({b / a - 1:+0%;-0%}) " +
                $"from the week of {SiteCalendar.Date(start, zone)} to that of {SiteCalendar.Date(end, zone)}") +
                (b / a - 1 > 0.15 ? "; rising with deposits on this side, or a partly closed valve" : "");
            list.Add(new PressureDropChange(side, tag.Tag, reference, start, a, end, b, text));
        }
        return list;
    }

    private static double Median(IEnumerable<double> values)
    {
        var v = values.Order().ToArray();
        return v.Length % 2 == 1 ? v[v.Length / 2] : 0.5 * (v[v.Length / 2 - 1] + v[v.Length / 2]);
    }
}
