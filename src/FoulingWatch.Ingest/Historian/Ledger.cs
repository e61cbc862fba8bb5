namespace FoulingWatch.Ingest.Historian;

/// <summary>Why a value read from an export was not used.</summary>
public enum RejectReason
{
    /// <summary>The field is empty.</summary>
    Empty,
    /// <summary>A historian text marker such as "Bad" or "I/O Timeout" stands where the number belongs.</summary>
    TextMarker,
    /// <summary>Text that is neither a number nor a known marker.</summary>
    NotANumber,
    /// <summary>The quality column says the value is not good.</summary>
    BadQuality,
    /// <summary>A second value for a timestamp already read (the first one is kept).</summary>
    Duplicate,
    /// <summary>Outside the tag's physical range (negative flow, temperature beyond the plausible band).</summary>
    OutOfRange,
    /// <summary>The timestamp lies outside the configured analysis window.</summary>
    OutsideWindow,
    /// <summary>The row's timestamp cannot be read.</summary>
    BadTimestamp,
    /// <summary>A local time inside the skipped spring hour, which no correct clock shows.</summary>
    NonexistentLocalTime,
}

public static class RejectReasons
{
    public static readonly RejectReason[] All = Enum.GetValues<RejectReason>();

    /// <summary>Key used in ledgers and JSON, e.g. "text-marker".</summary>
    public static string Key(this RejectReason r) => r switch
    {
        RejectReason.Empty => "empty",
        RejectReason.TextMarker => "text-marker",
        RejectReason.NotANumber => "not-a-number",
        RejectReason.BadQuality => "bad-quality",
        RejectReason.Duplicate => "duplicate",
        RejectReason.OutOfRange => "out-of-range",
        RejectReason.OutsideWindow => "outside-window",
        RejectReason.BadTimestamp => "bad-timestamp",
        RejectReason.NonexistentLocalTime => "nonexistent-local-time",
        _ => r.ToString(),
    };
}

/// <summary>What happened to every value of one tag: read = used + Σ rejected, and how the grid intervals were filled.</summary>
public sealed class TagLedger
{
    private const int MaxExamples = 5;

    private const int ExamplesPerReason = 2;
    private readonly int _exampleCap = MaxExamples;
    private readonly List<RejectReason>? _exampleReasons;

    public TagLedger(string tag) => Tag = tag;

    /// <summary>
    /// A ledger of one part of a file, merged later into the file's ledger in file order. It keeps the first two
    /// examples of every reason (not only the first five in all), so that the merge can pick exactly the examples
    /// a single pass over the whole file would have kept.
    /// </summary>
    internal static TagLedger Part(string tag) => new(tag, partial: true);

    private TagLedger(string tag, bool partial)
    {
        Tag = tag;
        _exampleCap = ExamplesPerReason * RejectReasons.All.Length;
        _exampleReasons = [];
    }

    public string Tag { get; }
    public long Read { get; private set; }
    public long Used { get; private set; }
    public long[] Rejected { get; } = new long[RejectReasons.All.Length];
    public SortedDictionary<string, long> Markers { get; } = new(StringComparer.Ordinal);
    public List<string> Examples { get; } = [];
    public long IntervalsWithData { get; set; }
    public long IntervalsBridged { get; set; }
    public long IntervalsMissing { get; set; }
    public long RejectedTotal => Rejected.Sum();

    /// <summary>Moves values counted as used to another reason (the watch store finds some values it already holds: duplicates).</summary>
    public void Reclassify(long count, RejectReason reason)
    {
        Used -= count;
        Rejected[(int)reason] += count;
    }

    /// <summary>Restores counts kept in a store.</summary>
    public void Restore(long read, long used, long[] rejected, IReadOnlyDictionary<string, long> markers)
    {
        Read = read;
        Used = used;
        Array.Copy(rejected, Rejected, Math.Min(rejected.Length, Rejected.Length));
        foreach (var (k, v) in markers) Markers[k] = v;
    }

    internal void CountUsed(long count = 1)
    {
        Read += count;
        Used += count;
    }

    internal void CountRejected(RejectReason reason, Func<string>? example = null)
    {
        Read++;
        Rejected[(int)reason]++;
        if (example is not null && Examples.Count < _exampleCap && Rejected[(int)reason] <= ExamplesPerReason)
        {
            Examples.Add(example());
            _exampleReasons?.Add(reason);
        }
    }

    internal void CountMarker(string marker)
    {
        Markers.TryGetValue(marker, out var n);
        Markers[marker] = n + 1;
    }

    public void Merge(TagLedger other)
    {
        if (other._exampleReasons is { } reasons)
        {
            // The k-th example of a reason in the part is the (before + k)-th of the whole: kept as one pass would keep it.
            var before = (long[])Rejected.Clone();
            var seen = new int[Rejected.Length];
            for (var i = 0; i < other.Examples.Count; i++)
            {
                var r = (int)reasons[i];
                if (before[r] + ++seen[r] <= ExamplesPerReason && Examples.Count < _exampleCap) Examples.Add(other.Examples[i]);
            }
        }
        else foreach (var e in other.Examples) if (Examples.Count < _exampleCap) Examples.Add(e);
        Read += other.Read;
        Used += other.Used;
        for (var i = 0; i < Rejected.Length; i++) Rejected[i] += other.Rejected[i];
        foreach (var (k, v) in other.Markers) { Markers.TryGetValue(k, out var n); Markers[k] = n + v; }
    }
}

/// <summary>How one export file was read.</summary>
public sealed record FileReport(
    string File,
    string Encoding,
    char Delimiter,
    char DecimalSeparator,
    int HeaderLine,
    int MetadataRows,
    long DataRows,
    long AmbiguousLocalTimesAsDaylight,
    long AmbiguousLocalTimesAsStandard,
    IReadOnlyList<string> Columns);

/// <summary>Receives every value used by an ingest (tag, UTC ticks, SI value); called from several threads at once.</summary>
public sealed class RawValueSink
{
    private readonly object _gate = new();
    private readonly List<(string Tag, long UtcTicks, double Value)> _values = [];

    public void Add(string tag, long utcTicks, double value)
    {
        lock (_gate) _values.Add((tag, utcTicks, value));
    }

    /// <summary>The values in a deterministic order (tag, then time).</summary>
    public List<(string Tag, long UtcTicks, double Value)> Values()
    {
        lock (_gate) return _values.OrderBy(v => v.Tag, StringComparer.Ordinal).ThenBy(v => v.UtcTicks).ToList();
    }
}
