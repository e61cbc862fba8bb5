using System.Collections.Concurrent;
using System.Diagnostics;

namespace FoulingWatch.Analysis;

/// <summary>Wall time spent per stage of a run, summed over calls (for the benchmark's breakdown; printed by the command
/// line when FOULINGWATCH_TIMINGS=1).</summary>
public static class StageClock
{
    private static readonly ConcurrentDictionary<string, long> Ticks = new();
    private static readonly ConcurrentQueue<string> Order = new();

    public static T Time<T>(string stage, Func<T> body)
    {
        var start = Stopwatch.GetTimestamp();
        try { return body(); }
        finally { Add(stage, Stopwatch.GetTimestamp() - start); }
    }

    public static void Time(string stage, Action body) => Time(stage, () => { body(); return 0; });

    private static void Add(string stage, long ticks)
    {
        if (Ticks.TryAdd(stage, ticks)) Order.Enqueue(stage);
        else Ticks.AddOrUpdate(stage, ticks, (_, t) => t + ticks);
    }

    /// <summary>Stages in first-seen order with their seconds.</summary>
    public static IReadOnlyList<(string Stage, double Seconds)> Totals() =>
        Order.Select(s => (s, Ticks[s] / (double)Stopwatch.Frequency)).ToList();
}
