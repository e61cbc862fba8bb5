using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Ingest.Tests.Historian;

public class TagLedgerTests
{
    // Any text where a number belongs is a marker, whatever its words; the distinct texts are tallied and the report
    // lists the most frequent first, the rest summed.
    [Fact]
    public void Unknown_texts_are_tallied_per_tag_most_frequent_first()
    {
        var l = new TagLedger("TI-7");
        foreach (var t in new[] { "held", "void", "held", "#N/A", "-", "held", "void" }) l.CountMarker(t);
        Assert.Equal(3, l.Markers["held"]);
        var top = l.TopMarkers(2);
        Assert.Equal(["held", "void", TagLedger.OtherTexts], top.Select(m => m.Key));
        Assert.Equal([3L, 2L, 2L], top.Select(m => m.Value));
    }

    // Bounded memory: beyond the limit the ordinally largest texts fold into "(other texts)", and the tally is the same
    // whichever way the texts are split into parts and merged (the kept set is always the smallest texts of the union).
    [Fact]
    public void The_text_tally_is_bounded_and_independent_of_how_the_file_is_cut()
    {
        var texts = Enumerable.Range(0, 2500).Select(i => $"t{(i * 7919) % 1700:D4}").ToArray();
        var whole = new TagLedger("FI-1");
        foreach (var t in texts) whole.CountMarker(t);
        var merged = new TagLedger("FI-1");
        foreach (var chunk in texts.Chunk(333))
        {
            var part = new TagLedger("FI-1");
            foreach (var t in chunk) part.CountMarker(t);
            merged.Merge(part);
        }
        Assert.Equal(TagLedger.MarkerTextLimit + 1, whole.Markers.Count);
        Assert.Equal(whole.Markers, merged.Markers);
        Assert.Equal(2500, whole.Markers.Values.Sum());
    }
}
