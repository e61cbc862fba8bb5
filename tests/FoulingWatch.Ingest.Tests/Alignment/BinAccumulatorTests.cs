using FoulingWatch.Ingest.Alignment;

namespace FoulingWatch.Ingest.Tests.Alignment;

/// <summary>
/// Reference (analytic): the mean of an interval is the arithmetic mean of the values added to it, and an interval
/// with none is missing (NaN), wherever the interval falls among the accumulator's chunks.
/// </summary>
public class BinAccumulatorTests
{
    [Fact]
    public void Means_are_the_mean_of_each_interval_across_chunks_and_gaps()
    {
        var rng = new Random(41);
        var accumulator = new BinAccumulator();
        var expected = new Dictionary<long, List<double>>();
        // Values in scattered intervals over several 4096-interval chunks, negative intervals included, with whole
        // chunks left empty in between; some by single values, some by runs.
        foreach (var bin in Enumerable.Range(0, 3000).Select(_ => (long)rng.Next(-5000, 20000)).Where(b => b is < 6000 or > 12500))
        {
            var value = 100 * rng.NextDouble();
            accumulator.Add(bin, value);
            (expected.TryGetValue(bin, out var list) ? list : expected[bin] = []).Add(value);
        }
        var runSums = new double[256];
        var runCounts = new int[256];
        for (var k = 0; k < 256; k += 3) { runSums[k] = 2.0 * k; runCounts[k] = 2; }
        accumulator.AddRun(16384, runSums, runCounts);
        for (var k = 0; k < 256; k += 3)
            (expected.TryGetValue(16384 + k, out var list) ? list : expected[16384 + k] = []).AddRange([k, k]);

        const long first = -4700; // mid-chunk, and the window runs past the last value
        var means = accumulator.Means(first, 26000);
        for (var k = 0; k < means.Length; k++)
        {
            if (expected.TryGetValue(first + k, out var values))
                Assert.True(Math.Abs(values.Average() - means[k]) <= 1e-12 * values.Average(), $"interval {first + k}: {means[k]:R} vs {values.Average():R}");
            else Assert.True(double.IsNaN(means[k]), $"interval {first + k} has no value but a mean of {means[k]:R}");
        }
        Assert.Equal(expected.Keys.Min(), accumulator.MinimumBin);
        Assert.Equal(expected.Keys.Max(), accumulator.MaximumBin);
    }
}
