namespace FoulingWatch.Ingest.Alignment;

/// <summary>Sums and counts of one tag's values per grid interval, stored in chunks so memory follows the span of data, not the file size.</summary>
internal sealed class BinAccumulator
{
    private const int ChunkBits = 12;
    private const int ChunkSize = 1 << ChunkBits;
    private readonly Dictionary<long, (double[] Sum, int[] Count)> _chunks = new();
    private long _lastChunkKey = long.MinValue;
    private (double[] Sum, int[] Count) _lastChunk;

    public long MinimumBin { get; private set; } = long.MaxValue;
    public long MaximumBin { get; private set; } = long.MinValue;
    public bool IsEmpty => MinimumBin == long.MaxValue;

    public void Add(long bin, double value)
    {
        var key = bin >> ChunkBits;
        if (key != _lastChunkKey)
        {
            if (!_chunks.TryGetValue(key, out _lastChunk))
            {
                _lastChunk = (new double[ChunkSize], new int[ChunkSize]);
                _chunks[key] = _lastChunk;
            }
            _lastChunkKey = key;
        }
        var i = (int)(bin & (ChunkSize - 1));
        _lastChunk.Sum[i] += value;
        _lastChunk.Count[i]++;
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
                var i = (int)(bin & (ChunkSize - 1));
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
