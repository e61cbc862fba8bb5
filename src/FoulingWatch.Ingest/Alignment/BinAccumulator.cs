namespace FoulingWatch.Ingest.Alignment;

/// <summary>Sums and counts of one tag's values per grid interval, stored in chunks so memory follows the span of data, not the file size.</summary>
internal sealed class BinAccumulator
{
    private const int ChunkBits = 12;
    private const long Mask = (1L << ChunkBits) - 1;
    private readonly Dictionary<long, (double[] Sum, int[] Count)> _chunks = new();
    private long _lastChunkKey = long.MinValue;
    private (double[] Sum, int[] Count) _lastChunk;

    public long MinimumBin { get; private set; } = long.MaxValue;
    public long MaximumBin { get; private set; } = long.MinValue;
    public bool IsEmpty => MinimumBin == long.MaxValue;

    public void Add(long bin, double value) => Add(bin, value, 1);

    /// <summary>Adds a sum of <paramref name="count"/> values to one interval.</summary>
    public void Add(long bin, double sum, int count)
    {
        var key = bin >> ChunkBits;
        if (key != _lastChunkKey)
        {
            if (!_chunks.TryGetValue(key, out _lastChunk))
            {
                _lastChunk = (new double[1 << ChunkBits], new int[1 << ChunkBits]);
                _chunks[key] = _lastChunk;
            }
            _lastChunkKey = key;
        }
        var i = (int)(bin & Mask);
        _lastChunk.Sum[i] += sum;
        _lastChunk.Count[i] += count;
        if (bin < MinimumBin) MinimumBin = bin;
        if (bin > MaximumBin) MaximumBin = bin;
    }

    /// <summary>Mean per interval over [firstBin, firstBin + count); NaN where the interval holds no value.</summary>
    public double[] Means(long firstBin, int count)
    {
        var result = new double[count];
        for (var k = 0; k < count; k++)
        {
            var bin = firstBin + k;
            if (_chunks.TryGetValue(bin >> ChunkBits, out var chunk))
            {
                var i = (int)(bin & Mask);
                result[k] = chunk.Count[i] > 0 ? chunk.Sum[i] / chunk.Count[i] : double.NaN;
            }
            else result[k] = double.NaN;
        }
        return result;
    }
}

/// <summary>Fills empty intervals by linear interpolation between the nearest intervals with data when they are at most the maximum gap apart; longer gaps stay missing.</summary>
public static class GapBridge
{
    /// <returns>(intervals with data, intervals bridged, intervals missing).</returns>
    public static (long WithData, long Bridged, long Missing) Bridge(double[] values, int maxGapIntervals)
    {
        long withData = 0, bridged = 0, missing = 0;
        var previous = -1;
        for (var i = 0; i < values.Length; i++)
        {
            if (double.IsNaN(values[i])) continue;
            withData++;
            if (previous >= 0 && i - previous > 1)
            {
                if (i - previous <= maxGapIntervals)
                {
                    for (var k = previous + 1; k < i; k++)
                        values[k] = values[previous] + (values[i] - values[previous]) * (k - previous) / (i - previous);
                    bridged += i - previous - 1;
                }
                else missing += i - previous - 1;
            }
            else if (previous < 0) missing += i;
            previous = i;
        }
        missing += previous < 0 ? values.Length : values.Length - 1 - previous;
        return (withData, bridged, missing);
    }
}

/// <summary>
/// Sums and counts of all the columns of one part of a wide export, per grid interval: the cells of one interval
/// lie side by side, so a record's values go to adjacent cells found once per record. Blocks are reused after
/// <see cref="Clear"/>, so a worker reading part after part allocates nothing new.
/// </summary>
internal sealed class PartBins(int columns)
{
    private const int BlockBits = 8;
    private const int BlockIntervals = 1 << BlockBits;
    private readonly Dictionary<long, (double[] Sum, int[] Count)> _blocks = new();
    private readonly Stack<(double[] Sum, int[] Count)> _free = new();
    private long _lastKey = long.MinValue;
    private (double[] Sum, int[] Count) _last;

    public int Columns { get; } = columns;

    /// <summary>The cells of interval <paramref name="bin"/>: column j's sum and count are at [offset + j].</summary>
    public (double[] Sum, int[] Count, int Offset) Cells(long bin)
    {
        var key = bin >> BlockBits;
        if (key != _lastKey)
        {
            if (!_blocks.TryGetValue(key, out _last))
            {
                _last = _free.Count > 0 ? _free.Pop() : (new double[BlockIntervals * Columns], new int[BlockIntervals * Columns]);
                _blocks[key] = _last;
            }
            _lastKey = key;
        }
        return (_last.Sum, _last.Count, (int)(bin & (BlockIntervals - 1)) * Columns);
    }

    /// <summary>Adds the part's sums and counts to the file's per-tag accumulators, in interval order.</summary>
    public void MergeInto(BinAccumulator[] whole)
    {
        foreach (var key in _blocks.Keys.Order())
        {
            var (sum, count) = _blocks[key];
            // Column by column, so that each tag's storage is written in sequence (interval by interval it would
            // jump between all the tags' arrays, a cache miss per cell).
            for (var j = 0; j < Columns; j++)
            for (var k = 0; k < BlockIntervals; k++)
            {
                var cell = k * Columns + j;
                if (count[cell] > 0) whole[j].Add((key << BlockBits) + k, sum[cell], count[cell]);
            }
        }
    }

    public void Clear()
    {
        foreach (var block in _blocks.Values)
        {
            Array.Clear(block.Sum);
            Array.Clear(block.Count);
            _free.Push(block);
        }
        _blocks.Clear();
        _lastKey = long.MinValue;
    }
}
