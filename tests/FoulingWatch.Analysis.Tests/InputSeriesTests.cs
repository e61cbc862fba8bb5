using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis.Tests;

/// <summary>A streamed run drops each aligned input series once every exchanger reading it is finished (memory), and never
/// one that an unfinished exchanger still reads (correctness). Self-consistency, no external reference.</summary>
public class InputSeriesTests
{
    [Fact]
    public void A_series_is_dropped_when_the_last_exchanger_reading_it_is_finished()
    {
        var a = TestExchangers.Simple(id: "X-1", hotPressure: "\"pressure\": { \"tag\": \"PH-A\", \"unit\": \"bar\" },");
        var b = TestExchangers.Simple(id: "X-2");
        var plant = TestExchangers.PlantOf() with { Exchangers = [a, b] };
        string[] tags = ["FH", "TH1", "TH2", "FC", "TC1", "TC2", "PH-A"];
        Assert.Subset(a.Tags().Select(t => t.Tag).ToHashSet(), tags.ToHashSet());
        var series = tags.ToDictionary(t => t, _ => new double[3]);
        var ingest = new IngestResult(DateTimeOffset.UnixEpoch, TimeSpan.FromHours(1), 3, series,
            new Dictionary<string, TagLedger>(), [], 0);
        var inputs = new InputSeries(plant, ingest);
        Assert.Equal(tags.Length, inputs.Ingest.Series.Count);
        inputs.Finished(a);
        // X-1's own pressure is gone; the tags X-2 shares stay, the same arrays
        Assert.False(inputs.Ingest.Series.ContainsKey("PH-A"));
        foreach (var t in b.Tags()) Assert.Same(series[t.Tag], inputs.Ingest.Series[t.Tag]);
        inputs.Finished(b);
        Assert.Empty(inputs.Ingest.Series);
        Assert.Equal(tags.Length, ingest.Series.Count); // the caller's own result is left as it was
    }
}
