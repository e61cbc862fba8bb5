using System.IO.Compression;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Fuzz;

/// <summary>What one input gave: read, refused with a documented error, or a failure of one of the checks.</summary>
public enum Verdict { Read, Refused, Failed }

/// <summary>
/// Reads mutated exports through the ingest, each with one part holding the whole file and with two small part sizes,
/// and checks what the design promises: no exception but the documented ones (<see cref="IngestException"/>,
/// <see cref="ConfigurationException"/>); the same outcome for every part size (ledgers, examples, grid, means, file
/// reports); read = used + rejected for every tag; every data record read for every tag of the header (wide) or
/// counted under a tag or as another tag's row (long); and no run of lines swallowed into one record.
/// </summary>
public sealed class FuzzWorker : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "fw-fuzz", Guid.NewGuid().ToString("N"));
    private readonly Dictionary<string, PlantConfiguration> _configs = [];

    /// <summary>Whole stack traces in failure details (for one reproducer at a time).</summary>
    public static bool Verbose { get; set; }

    public (Verdict Verdict, string Detail) Check(Seed seed, byte[] file, Random rng)
    {
        var folder = Path.Combine(_dir, seed.Name);
        Directory.CreateDirectory(folder);
        File.WriteAllBytes(Path.Combine(folder, seed.FileName), file);
        if (!_configs.TryGetValue(seed.Name, out var config))
        {
            var json = Path.Combine(folder, "plant.json");
            File.WriteAllText(json, PlantJson(seed.SourceJson));
            _configs[seed.Name] = config = PlantConfigurationReader.Load(json);
        }
        var sizes = new int?[] { null, rng.Next(16, 512), rng.Next(512, 8192) };
        var outcomes = sizes.Select(size => Read(config, size)).ToArray();
        if (outcomes.FirstOrDefault(o => o.Unexpected is not null) is { Unexpected: { } ex })
            return (Verdict.Failed, $"unhandled {ex.GetType().Name}: {ex.Message} at {(Verbose ? ex.StackTrace : ex.StackTrace?.Split('\n').FirstOrDefault()?.Trim())}");
        for (var i = 1; i < outcomes.Length; i++)
            if (Difference(outcomes[0], outcomes[i]) is { } diff) return (Verdict.Failed, $"part size {sizes[i]} differs from one part: {diff}");
        var first = outcomes[0];
        if (first.Result is null) return (Verdict.Refused, Class(first.Error!));
        return Accounting(first.Result, seed, file) is { } problem ? (Verdict.Failed, problem) : (Verdict.Read, "");
    }

    /// <summary>Rows and counts of one read at one part size (for looking into a reproducer).</summary>
    public string Describe(Seed seed, byte[] file, int? partBytes)
    {
        Check(seed, file, new Random(1));
        var o = Read(_configs[seed.Name], partBytes);
        return o.Result is { } r ? $"rows {r.Files[0].DataRows}; " + string.Join("; ", r.TagLedgers.Select(kv => $"{kv.Key} {Counts(kv.Value)}")) : o.Error ?? o.Unexpected!.Message;
    }

    private sealed record Outcome(IngestResult? Result, string? Error, Exception? Unexpected);

    private static Outcome Read(PlantConfiguration config, int? partBytes)
    {
        HistorianIngest.PartBytesForTests = partBytes;
        try { return new Outcome(HistorianIngest.Run(config), null, null); }
        catch (Exception ex) when (ex is IngestException or ConfigurationException) { return new Outcome(null, ex.Message, null); }
        catch (Exception ex) { return new Outcome(null, null, ex); }
        finally { HistorianIngest.PartBytesForTests = null; }
    }

    /// <summary>The kind of a documented error, for the summary: its message with numbers and quoted text taken out.</summary>
    private static string Class(string message)
    {
        var text = message.Contains(": ") ? message[(message.IndexOf(": ", StringComparison.Ordinal) + 2)..] : message;
        text = System.Text.RegularExpressions.Regex.Replace(text, "'[^']*'|\"[^\"]*\"|[0-9][0-9,.]*", "#");
        return text.Length > 90 ? text[..90] : text;
    }

    private static string? Difference(Outcome a, Outcome b)
    {
        if (a.Result is null || b.Result is null)
            return a.Error == b.Error ? null : $"outcome '{a.Error ?? "read"}' vs '{b.Error ?? "read"}'";
        var (x, y) = (a.Result, b.Result);
        if (x.GridStart != y.GridStart || x.IntervalCount != y.IntervalCount) return $"grid {x.GridStart:O}+{x.IntervalCount} vs {y.GridStart:O}+{y.IntervalCount}";
        if (x.RowsOfOtherTags != y.RowsOfOtherTags) return $"rows of other tags {x.RowsOfOtherTags} vs {y.RowsOfOtherTags}";
        var fx = string.Join(";", x.Files.Select(f => $"{f.DataRows}/{f.HeaderLine}/{f.MetadataRows}/{f.AmbiguousLocalTimesAsDaylight}/{f.AmbiguousLocalTimesAsStandard}"));
        var fy = string.Join(";", y.Files.Select(f => $"{f.DataRows}/{f.HeaderLine}/{f.MetadataRows}/{f.AmbiguousLocalTimesAsDaylight}/{f.AmbiguousLocalTimesAsStandard}"));
        if (fx != fy) return $"file reports {fx} vs {fy}";
        foreach (var (tag, l) in x.TagLedgers)
        {
            if (!y.TagLedgers.TryGetValue(tag, out var m)) return $"{tag}: ledger missing";
            if (l.Read != m.Read || l.Used != m.Used || !l.Rejected.SequenceEqual(m.Rejected)) return $"{tag}: counts {Counts(l)} vs {Counts(m)}";
            if (!l.Markers.SequenceEqual(m.Markers)) return $"{tag}: markers differ";
            if (!l.Examples.SequenceEqual(m.Examples)) return $"{tag}: examples differ ({l.Examples.FirstOrDefault()} vs {m.Examples.FirstOrDefault()})";
            if ((l.IntervalsWithData, l.IntervalsBridged, l.IntervalsMissing) != (m.IntervalsWithData, m.IntervalsBridged, m.IntervalsMissing)) return $"{tag}: interval counts differ";
            var (s, t) = (x.Series[tag], y.Series[tag]);
            for (var k = 0; k < s.Length; k++)
                if (double.IsNaN(s[k]) != double.IsNaN(t[k]) || Math.Abs(s[k] - t[k]) > 1e-12 * Math.Abs(s[k])) return $"{tag}[{k}]: {s[k]:R} vs {t[k]:R}";
        }
        return y.TagLedgers.Count == x.TagLedgers.Count ? null : "tags differ";
    }

    private static string Counts(TagLedger l) => $"read {l.Read} used {l.Used} rejected [{string.Join(",", l.Rejected)}]";

    /// <summary>Row accounting on a file that was read.</summary>
    private static string? Accounting(IngestResult r, Seed seed, byte[] file)
    {
        foreach (var (tag, l) in r.TagLedgers)
            if (l.Read != l.Used + l.RejectedTotal) return $"{tag}: read {l.Read} ≠ used {l.Used} + rejected {l.RejectedTotal}";
        var report = r.Files.Single();
        var wide = !seed.SourceJson.Contains("\"long\"");
        if (wide)
        {
            foreach (var (tag, l) in r.TagLedgers)
                if (l.Read != 0 && l.Read != report.DataRows) return $"{tag}: {l.Read} values read from {report.DataRows} data records";
        }
        else
        {
            var tagRows = r.TagLedgers.Values.Sum(l => l.Read) + r.RowsOfOtherTags;
            if (tagRows != report.DataRows) return $"long: {tagRows} rows counted under tags of {report.DataRows} data records";
        }
        // Every line a record: without quotes, each non-empty line after the header and its metadata rows is one data
        // record (a line of blanks too); with quotes, a field may span at most three lines, so no run is swallowed.
        var text = seed.Compressed ? Decompress(file) : file;
        if (text is null) return null;
        var body = LinesAfter(text, report.HeaderLine) - report.MetadataRows;
        if (Array.IndexOf(text, (byte)'"') < 0)
            return body == report.DataRows ? null : $"{body} non-empty lines after the header but {report.DataRows} data records";
        return body > 3 * report.DataRows + 3 ? $"{body} non-empty lines after the header but only {report.DataRows} data records" : null;
    }

    /// <summary>Non-empty lines after line <paramref name="header"/> (1-based, every line counted; LF, CRLF or lone CR ends).</summary>
    private static long LinesAfter(byte[] text, int header)
    {
        long line = 1, count = 0;
        var empty = true;
        for (var i = 0; i < text.Length; i++)
        {
            var c = text[i];
            if (c is (byte)'\n' or (byte)'\r')
            {
                if (!empty && line > header) count++;
                line++;
                empty = true;
                if (c == '\r' && i + 1 < text.Length && text[i + 1] == '\n') i++;
            }
            else empty = false;
        }
        return count + (!empty && line > header ? 1 : 0);
    }

    private static byte[]? Decompress(byte[] file)
    {
        try
        {
            using var z = new GZipStream(new MemoryStream(file), CompressionMode.Decompress);
            var ms = new MemoryStream();
            z.CopyTo(ms);
            return ms.ToArray();
        }
        catch (InvalidDataException) { return null; }
    }

    private static string PlantJson(string source) => $$"""
        {
          "site": { "name": "Kestrel Bay (fictional)" },
          "data": { "interval": "10 min", "frozenAfter": "0 h", "sources": [ {{source}} ] },
          "exchangers": [ {
            "id": "E-101", "arrangement": "counterflow", "area": "250 m2",
            "hot":  { "side": "shell", "fluid": { "model": "constant-cp", "cp": "2.3 kJ/kgK" }, "flow": { "tag": "FI-101", "unit": "t/h" },
                      "inlet": { "tag": "TI-101", "unit": "degC" }, "outlet": { "tag": "TI-102", "unit": "degC" }, "designFlow": "120 t/h" },
            "cold": { "side": "tube", "fluid": { "model": "constant-cp", "cp": "2.1 kJ/kgK" }, "flow": { "tag": "FI-201", "unit": "t/h" },
                      "inlet": { "tag": "TI-201", "unit": "degC" }, "outlet": { "tag": "TI-202", "unit": "degC" }, "designFlow": "90 t/h" },
            "clean": { "method": "datasheet", "u": "450 W/m2K" }
          } ]
        }
        """;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
