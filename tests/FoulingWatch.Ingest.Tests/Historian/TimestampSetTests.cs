using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Ingest.Tests.Historian;

/// <summary>Reference: a plain hash set of the same timestamps (set membership is the definition of a duplicate).</summary>
public class TimestampSetTests
{
    [Theory]
    [InlineData(0)]   // strictly in time order: the list alone
    [InlineData(1)]   // in order, with an exported-twice block and repeated rows
    [InlineData(2)]   // random order
    public void Adds_and_lookups_agree_with_a_hash_set(int shape)
    {
        var rng = new Random(42 + shape);
        var times = shape switch
        {
            0 => Enumerable.Range(0, 5000).Select(i => 600_000_000L * i).ToList(),
            1 => Enumerable.Range(0, 5000).Select(i => 600_000_000L * (i < 3000 ? i : i - 700)).Concat([0L, 5L, 5L]).ToList(),
            _ => Enumerable.Range(0, 5000).Select(_ => (long)rng.Next(0, 3000)).ToList(),
        };
        var set = new TimestampSet();
        var reference = new HashSet<long>();
        foreach (var t in times)
        {
            Assert.Equal(reference.Contains(t - 1), set.Contains(t - 1));
            Assert.Equal(reference.Add(t), set.Add(t));
            Assert.Equal(reference.Count, set.Count);
            Assert.Equal(reference.Max(), set.Latest);
        }
        foreach (var t in times.Select(t => t + 1)) Assert.Equal(reference.Contains(t), set.Contains(t));
        set.Clear();
        Assert.True(set.Count == 0 && set.Latest == long.MinValue && !set.Contains(times[0]));
    }
}
