namespace FoulingWatch.Ingest.Historian;

/// <summary>Why a value read from an export was not used.</summary>
public enum RejectReason
{
    /// <summary>The field is empty.</summary>
    Empty,
    /// <summary>Text stands where the number belongs (a word, a symbol such as "-" or "#N/A"): whatever a historian writes for
    /// a missing or invalid value. The distinct texts are tallied per tag.</summary>
    TextMarker,
    /// <summary>Something that starts like a number but is not one (e.g. "12,5" where the decimal is a point, "1.2.3"): usually
    /// a dialect setting to fix.</summary>
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
    /// <summary>The timestamp lies far from the bulk of the data (a stray row dated years away), beyond a gap of more than
    /// two years; the grid follows the bulk of the data, not the stray row.</summary>
    OutsidePlausibleSpan,
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
        RejectReason.OutsidePlausibleSpan => "outside-plausible-span",
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

    /// <summary>Takes away the counts of a file that a correction replaces (the watch store); marker texts that fall to zero go.</summary>
    public void Subtract(TagLedger other)
    {
        Read -= other.Read;
        Used -= other.Used;
        for (var i = 0; i < Rejected.Length; i++) Rejected[i] -= other.Rejected[i];
        foreach (var (k, v) in other.Markers)
        {
            var left = Markers.GetValueOrDefault(k) - v;
            if (left > 0) Markers[k] = left;
            else Markers.Remove(k);
        }
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

    /// <summary>Distinct marker texts tallied per tag; beyond this the ordinally largest are folded into
    /// <see cref="OtherTexts"/>, which keeps memory bounded and the tally the same however the file is cut (the kept set is
    /// always the smallest texts of the union).</summary>
    public const int MarkerTextLimit = 1000;
    public const string OtherTexts = "(other texts)";
    private const int MarkerTextLength = 40;

    internal void CountMarker(string marker)
    {
        if (marker.Length > MarkerTextLength) marker = marker[..MarkerTextLength] + "…";
        Add(marker, 1);
    }

    private void Add(string marker, long count)
    {
        Markers.TryGetValue(marker, out var n);
        Markers[marker] = n + count;
        while (Markers.Count - (Markers.ContainsKey(OtherTexts) ? 1 : 0) > MarkerTextLimit)
        {
            var largest = Markers.Keys.Last(k => k != OtherTexts);
            var folded = Markers[largest];
            Markers.Remove(largest);
            Markers.TryGetValue(OtherTexts, out var other);
            Markers[OtherTexts] = other + folded;
        }
    }

    /// <summary>The most frequent marker texts, most frequent first (ties by text), with the rest summed as
    /// <see cref="OtherTexts"/>.</summary>
    public IReadOnlyList<KeyValuePair<string, long>> TopMarkers(int count)
    {
        var texts = Markers.Where(m => m.Key != OtherTexts).OrderByDescending(m => m.Value).ThenBy(m => m.Key, StringComparer.Ordinal).ToList();
        var top = texts.Take(count).ToList();
        var rest = texts.Skip(count).Sum(m => m.Value) + Markers.GetValueOrDefault(OtherTexts);
        if (rest > 0) top.Add(new KeyValuePair<string, long>(OtherTexts, rest));
        return top;
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
        foreach (var (k, v) in other.Markers) Add(k, v);
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
