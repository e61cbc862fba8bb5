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

    public void Add(long bin, double value)
    {
        var chunk = Chunk(bin >> ChunkBits);
        var i = (int)(bin & Mask);
        chunk.Sum[i] += value;
        chunk.Count[i]++;
        if (bin < MinimumBin) MinimumBin = bin;
        if (bin > MaximumBin) MaximumBin = bin;
    }

    /// <summary>
    /// Adds a run of intervals' sums and counts, starting at <paramref name="firstBin"/>; the run must not cross a
    /// chunk (a run aligned to a power of two no larger than the chunk never does). Intervals with no values are skipped.
    /// </summary>
    public void AddRun(long firstBin, ReadOnlySpan<double> sums, ReadOnlySpan<int> counts)
    {
        var key = firstBin >> ChunkBits;
        if (key != (firstBin + sums.Length - 1) >> ChunkBits) throw new ArgumentException("the run crosses a chunk", nameof(firstBin));
        var at = (int)(firstBin & Mask);
        (double[] Sum, int[] Count)? chunk = null;
        int first = -1, last = -1;
        for (var k = 0; k < counts.Length; k++)
        {
            if (counts[k] == 0) continue;
            var (sum, count) = chunk ??= Chunk(key);
            sum[at + k] += sums[k];
            count[at + k] += counts[k];
            if (first < 0) first = k;
            last = k;
        }
        if (first < 0) return;
        if (firstBin + first < MinimumBin) MinimumBin = firstBin + first;
        if (firstBin + last > MaximumBin) MaximumBin = firstBin + last;
    }

    /// <summary>The chunk holding the intervals of <paramref name="key"/>, made when first needed; the last one is kept at hand.</summary>
    private (double[] Sum, int[] Count) Chunk(long key)
    {
        if (key != _lastChunkKey)
        {
            if (!_chunks.TryGetValue(key, out _lastChunk))
            {
                _lastChunk = (new double[1 << ChunkBits], new int[1 << ChunkBits]);
                _chunks[key] = _lastChunk;
            }
            _lastChunkKey = key;
        }
        return _lastChunk;
    }

    /// <summary>The number of values in each chunk of 4096 intervals that holds any (chunk index = bin >> 12).</summary>
    public IEnumerable<(long Chunk, long Values)> ChunkValues() =>
        _chunks.Select(kv => (kv.Key, kv.Value.Count.Sum(c => (long)c))).Where(c => c.Item2 > 0);

    public const int ChunkShift = ChunkBits;

    /// <summary>The first and last interval holding a value within chunks [fromChunk, toChunk], or null.</summary>
    public (long First, long Last)? Extent(long fromChunk, long toChunk)
    {
        long first = long.MaxValue, last = long.MinValue;
        foreach (var (key, chunk) in _chunks)
        {
            if (key < fromChunk || key > toChunk) continue;
            for (var i = 0; i < chunk.Count.Length; i++)
            {
                if (chunk.Count[i] == 0) continue;
                var bin = (key << ChunkBits) + i;
                first = Math.Min(first, bin);
                last = Math.Max(last, bin);
            }
        }
        return first == long.MaxValue ? null : (first, last);
    }

    /// <summary>Number of values in intervals outside [firstBin, lastBin].</summary>
    public long ValuesOutside(long firstBin, long lastBin)
    {
        long n = 0;
        foreach (var (key, chunk) in _chunks)
            for (var i = 0; i < chunk.Count.Length; i++)
            {
                var bin = (key << ChunkBits) + i;
                if (chunk.Count[i] > 0 && (bin < firstBin || bin > lastBin)) n += chunk.Count[i];
            }
        return n;
    }

    /// <summary>Drops every chunk (the accumulator is then empty): once a tag's means are taken its sums need no memory,
    /// so the run holds about 12 bytes per tag and interval at its peak, not the sums and the means together (20).</summary>
    public void Release()
    {
        _chunks.Clear();
        _chunks.TrimExcess();
        (_lastChunkKey, _lastChunk) = (long.MinValue, default);
        (MinimumBin, MaximumBin) = (long.MaxValue, long.MinValue);
    }

    /// <summary>Mean per interval over [firstBin, firstBin + count); NaN where the interval holds no value.</summary>
    public double[] Means(long firstBin, int count)
    {
        // Every element is written below, so the array need not be zeroed first.
        var result = GC.AllocateUninitializedArray<double>(count);
        // Chunk by chunk: one lookup per chunk, not per interval.
        for (var k = 0; k < count;)
        {
            var bin = firstBin + k;
            var i = (int)(bin & Mask);
            var run = (int)Math.Min(count - k, (1 << ChunkBits) - i);
            var target = result.AsSpan(k, run);
            if (_chunks.TryGetValue(bin >> ChunkBits, out var chunk))
            {
                var sums = chunk.Sum.AsSpan(i, run);
                var counts = chunk.Count.AsSpan(i, run);
                for (var m = 0; m < target.Length; m++)
                    target[m] = counts[m] > 0 ? sums[m] / counts[m] : double.NaN;
            }
            else target.Fill(double.NaN);
            k += run;
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
/// Sums and counts of all the columns of one part of a wide export, per grid interval, in blocks of 256 intervals.
/// Within a block each column's cells lie in sequence (column j at [j · Stride, j · Stride + 256)), so the merge into
/// the per-tag accumulators reads and writes in sequence; the stride is padded past a power of two so that a record's
/// cells, one per column, do not all fall into the same few cache sets. Blocks are reused after <see cref="Clear"/>,
/// so a worker reading part after part allocates nothing new.
/// </summary>
internal sealed class PartBins(int columns)
{
    private const int BlockBits = 8;
    private const int BlockIntervals = 1 << BlockBits;

    /// <summary>Cells from one column to the next within a block.</summary>
    public const int Stride = BlockIntervals + 8;

    /// <summary>One block's cells, and the first and last of its intervals that were written.</summary>
    private sealed class Block(int columns)
    {
        public readonly double[] Sum = new double[Stride * columns];
        public readonly int[] Count = new int[Stride * columns];
        public int First = int.MaxValue, Last = -1;
    }

    private readonly Dictionary<long, Block> _blocks = new();
    private readonly Stack<Block> _free = new();
    private long _lastKey = long.MinValue;
    private Block _last = null!;

    public int Columns { get; } = columns;

    /// <summary>The cells of interval <paramref name="bin"/>: column j's sum and count are at [offset + j · <see cref="Stride"/>].</summary>
    public (double[] Sum, int[] Count, int Offset) Cells(long bin)
    {
        var key = bin >> BlockBits;
        if (key != _lastKey)
        {
            if (!_blocks.TryGetValue(key, out _last!))
            {
                _last = _free.Count > 0 ? _free.Pop() : new Block(Columns);
                _blocks[key] = _last;
            }
            _lastKey = key;
        }
        var k = (int)(bin & (BlockIntervals - 1));
        if (k < _last.First) _last.First = k;
        if (k > _last.Last) _last.Last = k;
        return (_last.Sum, _last.Count, k);
    }

    /// <summary>Adds the part's sums and counts to the file's per-tag accumulators, in interval order.</summary>
    public void MergeInto(BinAccumulator[] whole)
    {
        foreach (var key in _blocks.Keys.Order())
        {
            var block = _blocks[key];
            var length = block.Last - block.First + 1;
            for (var j = 0; j < Columns; j++)
                whole[j].AddRun((key << BlockBits) + block.First, block.Sum.AsSpan(j * Stride + block.First, length), block.Count.AsSpan(j * Stride + block.First, length));
        }
    }

    public void Clear()
    {
        foreach (var block in _blocks.Values)
        {
            var length = block.Last - block.First + 1;
            for (var j = 0; j < Columns; j++)
            {
                block.Sum.AsSpan(j * Stride + block.First, length).Clear();
                block.Count.AsSpan(j * Stride + block.First, length).Clear();
            }
            (block.First, block.Last) = (int.MaxValue, -1);
            _free.Push(block);
        }
        _blocks.Clear();
        _lastKey = long.MinValue;
    }
}
