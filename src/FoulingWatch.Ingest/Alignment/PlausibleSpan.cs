namespace FoulingWatch.Ingest.Alignment;

/// <summary>The time span of the bulk of the data: the grid follows it, so one stray row dated years away cannot make it
/// (and memory) explode.</summary>
/// <remarks>
/// The occupied chunks of 4096 intervals of every tag are split into clusters wherever no value lies within
/// <see cref="MaximumGap"/>; the cluster holding the most values is the bulk (the later one on a tie). Real exports have
/// no gap of two years inside one analysis; a timestamp beyond one is a typing or clock error (common practice).
/// </remarks>
internal static class PlausibleSpan
{
    public static readonly TimeSpan MaximumGap = TimeSpan.FromDays(2 * 365);

    /// <summary>Grid values (intervals × tags) one run may hold: 250 million doubles, 2 GB.</summary>
    public const long MaximumValues = 250_000_000;

    public static (long First, long Last) Of(IReadOnlyList<BinAccumulator> bins, long intervalTicks)
    {
        var perChunk = new SortedDictionary<long, long>();
        foreach (var b in bins)
        foreach (var (chunk, count) in b.ChunkValues())
            perChunk[chunk] = perChunk.GetValueOrDefault(chunk) + count;
        if (perChunk.Count == 0) return (0, -1);
        var chunkTicks = (double)intervalTicks * (1L << BinAccumulator.ChunkShift);
        var gapChunks = Math.Max(1, (long)Math.Ceiling(MaximumGap.Ticks / chunkTicks));
        long bestFrom = 0, bestTo = 0, bestValues = -1, from = long.MinValue, to = long.MinValue, values = 0;
        foreach (var (chunk, n) in perChunk)
        {
            if (from != long.MinValue && chunk - to > gapChunks)
            {
                if (values >= bestValues) (bestFrom, bestTo, bestValues) = (from, to, values);
                from = long.MinValue;
                values = 0;
            }
            if (from == long.MinValue) from = chunk;
            to = chunk;
            values += n;
        }
        if (values >= bestValues) (bestFrom, bestTo) = (from, to);
        long first = long.MaxValue, last = long.MinValue;
        foreach (var b in bins)
            if (b.Extent(bestFrom, bestTo) is { } e) { first = Math.Min(first, e.First); last = Math.Max(last, e.Last); }
        return (first, last);
    }
}
