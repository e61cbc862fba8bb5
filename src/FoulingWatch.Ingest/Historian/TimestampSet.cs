namespace FoulingWatch.Ingest.Historian;

/// <summary>
/// The timestamps already read for one set of columns, to find duplicates. Exports are written in time order, so a
/// timestamp later than every one before it is new without a lookup: such timestamps are kept in a sorted list, and a
/// hash set is built only when an earlier timestamp arrives (an overlapping export, a clock set back).
/// </summary>
internal sealed class TimestampSet
{
    private readonly List<long> _inOrder = [];
    private HashSet<long>? _set;

    /// <summary>The latest timestamp in the set (long.MinValue when empty).</summary>
    public long Latest { get; private set; } = long.MinValue;

    public int Count => _set?.Count ?? _inOrder.Count;

    /// <summary>Adds <paramref name="utc"/>; false when it was already there.</summary>
    public bool Add(long utc)
    {
        if (_set is null)
        {
            if (utc > Latest)
            {
                _inOrder.Add(utc);
                Latest = utc;
                return true;
            }
            _set = new HashSet<long>(_inOrder);
            _inOrder.Clear();
        }
        if (!_set.Add(utc)) return false;
        if (utc > Latest) Latest = utc;
        return true;
    }

    public bool Contains(long utc) => utc <= Latest && (_set?.Contains(utc) ?? _inOrder.BinarySearch(utc) >= 0);

    public void Clear()
    {
        _inOrder.Clear();
        _set = null;
        Latest = long.MinValue;
    }
}
