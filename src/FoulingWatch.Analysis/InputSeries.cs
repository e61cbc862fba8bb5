using System.Collections.Concurrent;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis;

/// <summary>The aligned input series of a run, each dropped once every exchanger that reads it is finished.</summary>
/// <remarks>The series are read concurrently by the exchangers being analysed, hence a concurrent dictionary; a tag shared
/// by several exchangers (a common header, a pressure) stays until the last of them is finished. Nothing after the
/// exchangers reads the series (the site's files use the ledgers and counts).</remarks>
public sealed class InputSeries
{
    private readonly ConcurrentDictionary<string, double[]> _series;
    private readonly Dictionary<string, int> _readers = new(StringComparer.Ordinal);

    public InputSeries(PlantConfiguration config, IngestResult ingest)
    {
        _series = new ConcurrentDictionary<string, double[]>(ingest.Series, StringComparer.Ordinal);
        Ingest = ingest with { Series = _series };
        foreach (var x in config.Exchangers)
            foreach (var tag in TagsOf(x))
                _readers[tag] = _readers.GetValueOrDefault(tag) + 1;
    }

    /// <summary>The ingest result to analyse with: the same, over series that can be dropped.</summary>
    public IngestResult Ingest { get; }

    /// <summary>The exchanger no longer reads its series: those no other unfinished exchanger reads are dropped.</summary>
    public void Finished(ExchangerConfiguration x)
    {
        lock (_readers)
            foreach (var tag in TagsOf(x))
                if (--_readers[tag] == 0) _series.TryRemove(tag, out _);
    }

    private static IEnumerable<string> TagsOf(ExchangerConfiguration x) =>
        x.Tags().Select(t => t.Tag).Distinct(StringComparer.Ordinal);
}
