using FoulingWatch.Analysis.BackCalculation;

namespace FoulingWatch.Analysis.Tests;

/// <summary>Selection against a full sort (self-consistency, not an external check).</summary>
public sealed class SortingTests
{
    [Fact]
    public void Select_gives_the_element_a_full_sort_puts_at_k()
    {
        var random = new Random(11);
        for (var trial = 0; trial < 400; trial++)
        {
            var n = random.Next(1, 300);
            // ties on purpose: few distinct values in half the trials
            var values = Enumerable.Range(0, n).Select(_ => trial % 2 == 0 ? random.NextDouble() : random.Next(5)).ToArray();
            var sorted = values.Sorted();
            var k = random.Next(n);
            Assert.Equal(sorted[k], Sorting.Select((double[])values.Clone(), k));
        }
        Assert.Throws<ArgumentOutOfRangeException>(() => Sorting.Select([1.0], 1));
    }
}

/// <summary>Grouping samples by UTC day: one pass on forward timestamps, by key otherwise; the same days either way.</summary>
public sealed class UtcDaysTests
{
    [Fact]
    public void Days_are_the_same_whether_the_samples_run_forward_or_not()
    {
        var start = new DateTimeOffset(2026, 3, 28, 20, 0, 0, TimeSpan.Zero);
        var random = new Random(5);
        var times = Enumerable.Range(0, 300).Select(i => start.AddMinutes(37 * i)).ToList();
        var shuffled = times.OrderBy(_ => random.Next()).ToList();
        Dictionary<DateTime, int[]> Days(IReadOnlyList<DateTimeOffset> ts, Func<int, bool> include)
        {
            var samples = ts.Select(t => new SampleResult(t, SampleStatus.Ok, new SampleEvaluation { Status = SampleStatus.Ok }, 0))
                .ToList();
            var c = SampleColumns.From(samples);
            var days = c.UtcDays(include).ToList();
            Assert.Equal(days.Select(d => d.Day).Order(), days.Select(d => d.Day));
            return days.ToDictionary(d => d.Day,
                d => d.Samples.Select(k => (int)(c.Timestamp(k) - start).TotalMinutes).Order().ToArray());
        }
        var forward = Days(times, k => k % 3 != 0);
        var byKey = Days(shuffled, _ => true);
        Assert.Equal(9, Days(times, _ => true).Count); // 300 × 37 min from 28 March 20:00 run to 5 April 13:00: 9 UTC days
        Assert.All(forward, d => Assert.All(d.Value, minute => Assert.Equal(d.Key, start.AddMinutes(minute).UtcDateTime.Date)));
        Assert.Equal(Days(times, _ => true).Keys, byKey.Keys);
        foreach (var (day, minutes) in Days(times, _ => true)) Assert.Equal(minutes, byKey[day]);
    }
}
