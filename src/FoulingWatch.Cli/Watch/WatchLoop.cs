using FoulingWatch.Analysis.Trends;
using System.IO.Enumeration;
using System.Security.Cryptography;
using System.Text.Json;
using FoulingWatch.Analysis;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;
using FoulingWatch.Reporting.Results;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.Logging;

namespace FoulingWatch.Cli.Watch;

/// <summary>
/// One pass of the monitoring service: pick up new or grown exports in the drop folder once they have stopped changing,
/// ingest only what is new (one transaction per file), re-analyse, rewrite the reports atomically, and raise or clear alerts.
/// </summary>
public sealed class WatchLoop(PlantConfiguration config, WatchSettings settings, WatchStore store, TimeProvider clock, ILogger log)
{
    private readonly Dictionary<string, (long Length, DateTime Modified, DateTimeOffset Since)> _observed = new(StringComparer.Ordinal);
    private readonly Dictionary<string, string> _hashes = new(StringComparer.Ordinal);
    private bool _analysedOnce;

    public string AlertsFile => Path.Combine(settings.Out, "alerts.jsonl");

    /// <summary>Alert lines keep +, &lt;, &gt;, &amp; and non-ASCII letters as written (the file is read by people and log
    /// tools, not embedded in HTML).</summary>
    private static readonly JsonSerializerOptions AlertJson = new() { Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    private readonly HashSet<string> _unmatched = new(StringComparer.Ordinal);

    /// <summary>Runs one pass; returns the number of files ingested.</summary>
    public int Poll()
    {
        Directory.CreateDirectory(settings.DropFolder);
        var ingested = 0;
        foreach (var path in Directory.GetFiles(settings.DropFolder).Order(StringComparer.Ordinal))
        {
            var name = Path.GetFileName(path);
            if (name.EndsWith(".tmp", StringComparison.OrdinalIgnoreCase) || name.StartsWith('.')) continue;
            var source = config.Data.Sources.FirstOrDefault(s => s.Patterns.Any(p => FileSystemName.MatchesSimpleExpression(p, name)));
            if (source is null)
            {
                if (_unmatched.Add(name))
                    log.LogWarning("Ignoring {File} in the drop folder: it matches no source's file patterns ({Patterns}); rename it or add a pattern to data.sources[].files",
                        name, string.Join(", ", config.Data.Sources.SelectMany(s => s.Patterns)));
                continue;
            }
            // Whatever goes wrong with one file (unreadable, a dangling link, damaged compression, bad data) is recorded as
            // refused with its reason, once; the pass goes on with the next file.
            try
            {
                if (!IsSettled(path)) continue;
                if (IngestFile(path, source)) ingested++;
            }
            catch (Exception ex) when (ex is not SqliteException and not OutOfMemoryException)
            {
                Refuse(path, ex);
            }
        }
        if (ingested > 0 || (!_analysedOnce && store.ValueCount() > 0)) Analyse();
        EvaluateStaleData();
        return ingested;
    }

    /// <summary>Records a file that cannot be read, under its content hash (or its name when it cannot even be opened), so
    /// it is skipped until its content changes; logged once.</summary>
    private void Refuse(string path, Exception ex)
    {
        var name = Path.GetFileName(path);
        string key;
        long length = 0;
        try { key = Hash(path); length = new FileInfo(path).Length; }
        catch (Exception) { key = "unreadable:" + name; }
        if (store.FileByHash(key) is not null) return;
        var reason = ex is IngestException or ConfigurationException or InvalidDataException or IOException or UnauthorizedAccessException
            ? ex.Message : $"{ex.GetType().Name}: {ex.Message}";
        log.LogError("Refused {File}: {Reason}. It is skipped until its content changes; later files go on", name, reason);
        store.RecordFailure(new StoredFile(key, name, length, 0, clock.GetUtcNow(), reason));
    }

    /// <summary>A file is taken only when its size and time stamp have not changed for the settle time (a file still being written is waited for).</summary>
    private bool IsSettled(string path)
    {
        var info = new FileInfo(path);
        var now = clock.GetUtcNow();
        if (!_observed.TryGetValue(path, out var seen) || seen.Length != info.Length || seen.Modified != info.LastWriteTimeUtc)
        {
            _observed[path] = (info.Length, info.LastWriteTimeUtc, now);
            return settings.SettleTime <= TimeSpan.Zero && info.Length > 0;
        }
        return info.Length > 0 && now - seen.Since >= settings.SettleTime;
    }

    private string Hash(string path)
    {
        var info = new FileInfo(path);
        var key = $"{path}|{info.Length}|{info.LastWriteTimeUtc.Ticks}";
        if (_hashes.TryGetValue(key, out var h)) return h;
        using var fs = File.OpenRead(path);
        return _hashes[key] = Convert.ToHexString(SHA256.HashData(fs));
    }

    private static string PrefixHash(string path, long length)
    {
        using var fs = File.OpenRead(path);
        using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        var buffer = new byte[1 << 16];
        var left = length;
        while (left > 0)
        {
            var n = fs.Read(buffer, 0, (int)Math.Min(buffer.Length, left));
            if (n == 0) break;
            sha.AppendData(buffer, 0, n);
            left -= n;
        }
        return Convert.ToHexString(sha.GetHashAndReset());
    }

    /// <summary>
    /// Ingests a settled file. Known content is skipped. A file that grew from one already read (same bytes up to its
    /// length) is read from where that one ended, or whole again when that one ended inside a line (its last values are
    /// then replaced by the finished line). Other content under a known name is a correction (<see cref="WatchSettings.Corrections"/>).
    /// A compressed file is read only when its stream is complete and its check values hold.
    /// </summary>
    private bool IngestFile(string path, HistorianSource source)
    {
        var name = Path.GetFileName(path);
        var hash = Hash(path);
        if (store.FileByHash(hash) is not null) return false;
        var length = new FileInfo(path).Length;
        var compressed = path.EndsWith(".gz", StringComparison.OrdinalIgnoreCase);
        if (compressed) CheckCompressed(path);
        var earlier = store.Files().Where(f => f.Name == name && f.Error is null && f.SupersededAt is null).ToList();
        var readFrom = 0L;
        var mode = StoreMode.Add;
        IReadOnlyList<StoredFile> supersedes = [];
        var kind = "whole file";
        if (earlier.Count > 0)
        {
            var latest = earlier.MaxBy(f => f.Length)!;
            var grown = !compressed && latest.Length < length && PrefixHash(path, latest.Length) == latest.Hash;
            if (grown && EndsLine(path, latest.Length)) (readFrom, kind) = (latest.Length, "new rows only");
            else if (grown || settings.Corrections == "latest")
                (mode, supersedes, kind) = (StoreMode.Replace, earlier, grown ? "grown from an unfinished line, read again" : "correction, replaces the earlier export");
            else kind = "same name, other content; stored values kept";
        }
        var work = readFrom > 0 ? Excerpt(path, source, readFrom, length) : path;
        try
        {
            var single = config with { Data = config.Data with { Sources = [source with { Files = [work] }] } };
            var sink = new RawValueSink();
            var result = HistorianIngest.Run(single, sink: sink, requireAllTags: false);
            var stored = new StoredFile(hash, name, length, 0, clock.GetUtcNow(), null);
            var outcome = store.Ingest(stored, sink.Values(), result.TagLedgers.Where(kv => kv.Value.Read > 0).ToDictionary(kv => kv.Key, kv => kv.Value),
                mode, supersedes);
            log.LogInformation("Ingested {File} ({Mode}): {New} new values, {Replaced} replaced, of {Read} read, {Rejected} rejected",
                name, kind, outcome.Inserted.Values.Sum(), outcome.Replaced.Values.Sum(), result.TagLedgers.Values.Sum(l => l.Read),
                result.TagLedgers.Values.Sum(l => l.RejectedTotal));
            // One line per file for the rejections, by tag and reason (routine text markers are no reason for a line each).
            var rejected = result.TagLedgers.Where(kv => kv.Value.RejectedTotal > 0).OrderBy(kv => kv.Key, StringComparer.Ordinal)
                .Select(kv => $"{kv.Key} " + string.Join(" ", RejectReasons.All.Where(r => kv.Value.Rejected[(int)r] > 0).Select(r => $"{r.Key()} {kv.Value.Rejected[(int)r]}")))
                .ToList();
            if (rejected.Count > 0) log.LogInformation("Rejected values in {File} by tag and reason: {Reasons}", name, string.Join("; ", rejected));
            return true;
        }
        finally
        {
            if (work != path) File.Delete(work);
        }
    }

    /// <summary>Reads a compressed file to its end: the decompressor checks the deflate data and CRC-32, the size check
    /// the trailer's length (RFC 1952), so a copy still running or cut short is refused, never half stored.</summary>
    private static void CheckCompressed(string path)
    {
        try
        {
            using var s = ExportStream.Open(path);
            var buffer = new byte[1 << 16];
            while (s.Read(buffer, 0, buffer.Length) > 0) { }
        }
        catch (Exception ex) when (ex is InvalidDataException or EndOfStreamException)
        {
            // the runtime names a failed CRC "an unsupported compression method": say what it means
            throw new IngestException(path, null, null, $"the compressed stream is damaged or incomplete (its data, CRC-32 or size do not check); " +
                "it is read again when the file changes, e.g. when a copy still running ends");
        }
    }

    /// <summary>Whether the byte before <paramref name="at"/> ends a line.</summary>
    private static bool EndsLine(string path, long at)
    {
        using var fs = File.OpenRead(path);
        fs.Position = at - 1;
        var b = fs.ReadByte();
        return b is '\n' or '\r';
    }

    /// <summary>A temporary export holding the header part of the file (up to the first data row) and its bytes [from, to).</summary>
    private string Excerpt(string path, HistorianSource source, long from, long to)
    {
        var dialect = FileDialectDetector.Detect(path, source);
        var bytes = File.ReadAllBytes(path);
        var dataStart = dialect.HeaderByteOffset;
        for (var lines = 0; lines < 1 + dialect.MetadataRows && dataStart < bytes.Length; dataStart++)
            if (bytes[dataStart] == (byte)'\n') lines++;
        var temp = Path.Combine(Path.GetTempPath(), $"fw-watch-{Guid.NewGuid():N}-{Path.GetFileName(path)}");
        using (var fs = File.Create(temp))
        {
            fs.Write(bytes, 0, (int)dataStart);
            var start = Math.Max(from, dataStart);
            fs.Write(bytes, (int)start, (int)(to - start));
        }
        return temp;
    }

    /// <summary>Re-analyses everything in the store and rewrites the result files (each written to a temporary file and renamed).</summary>
    public PlantResult? Analyse()
    {
        _analysedOnce = true;
        var aligned = HistorianIngest.Align(config, store.Values(), store.Ledgers(), []);
        if (aligned.IntervalCount == 0) return null;
        var result = PlantAnalysis.Run(config, aligned);
        ResultWriter.Write(result, settings.Out);
        var summary = JsonSerializer.Serialize(ResultWriter.Summary(result), ResultWriter.Json);
        store.SaveAnalysis(clock.GetUtcNow(), summary, result.Exchangers.SelectMany(x =>
        {
            var c = x.History.Columns;
            return Enumerable.Range(0, c.Count).Select(k => (x.History.Exchanger.Id, c.Timestamp(k).UtcTicks, c.Status[k].Key(),
                c.FoulingResistance[k], c.Sigma[k], c.UActual[k], c.UClean[k], c.LostDuty[k]));
        }));
        log.LogInformation("Analysed {Exchangers} exchangers over {Intervals} intervals; report at {Report}", result.Exchangers.Count, aligned.IntervalCount, Path.Combine(settings.Out, "report.html"));
        UpdateAlerts(Conditions(result), ["limit", "rate-jump", "sensor-fault", "balance", "instrument-drift", "pressure-drop-tube", "pressure-drop-shell"]);
        return result;
    }

    /// <summary>The alert conditions that hold now, from an analysis.</summary>
    public List<(string Exchanger, string Kind, string Message)> Conditions(PlantResult result)
    {
        var now = clock.GetUtcNow();
        var list = new List<(string, string, string)>();
        foreach (var x in result.Exchangers)
        {
            var id = x.History.Exchanger.Id;
            var f = x.Trend.Forecast;
            // The risk-aware date: the limit's P10 (one chance in ten it comes earlier), or a limit reached within uncertainty.
            if (f is not null && (f.State is ForecastState.Reached or ForecastState.AtLimit || (f.P10 is { } d && d - now <= settings.AlertHorizon)))
                list.Add((id, "limit", f.Statement));
            if (x.Trend.Rate?.Jump == true) list.Add((id, "rate-jump", x.Trend.Rate.Statement));
            if (x.History.SensorCheck.LikelyFault) list.Add((id, "sensor-fault", x.History.SensorCheck.Statement));
            if (x.History.Drift is { } drift) list.Add((id, "instrument-drift", drift.Statement));
            foreach (var dp in x.PressureDrops.Where(p => p.Change > 0.15)) list.Add((id, $"pressure-drop-{dp.Side}", dp.Statement));
            var last = x.History.Columns.Status.Where(s => s != SampleStatus.Missing).TakeLast(144).ToList();
            if (last.Count >= 36 && last.Count(s => s == SampleStatus.Balance) * 2 > last.Count)
                list.Add((id, "balance", FormattableString.Invariant(
                    $"hot and cold duties disagree beyond tolerance in {last.Count(s => s == SampleStatus.Balance)} of the last {last.Count} samples")));
        }
        return list;
    }

    private void EvaluateStaleData()
    {
        var last = store.LastTimestamp();
        var active = new List<(string, string, string)>();
        if (last is { } t && clock.GetUtcNow() - new DateTimeOffset(t, TimeSpan.Zero) > settings.StaleAfter)
            active.Add(("site", "data-stopped", FormattableString.Invariant($"no new historian data since {new DateTimeOffset(t, TimeSpan.Zero):yyyy-MM-dd HH:mm} UTC")));
        UpdateAlerts(active, ["data-stopped"]);
    }

    /// <summary>Raises each condition once per episode and clears episodes whose condition has ended (only among the given kinds).</summary>
    private void UpdateAlerts(List<(string Exchanger, string Kind, string Message)> now, string[] kinds)
    {
        var active = store.Alerts(activeOnly: true).Where(a => kinds.Contains(a.Kind)).ToList();
        var at = clock.GetUtcNow();
        foreach (var c in now)
        {
            if (active.FirstOrDefault(a => a.Exchanger == c.Exchanger && a.Kind == c.Kind) is { } open)
            {
                // Same episode, new facts (a later date, a larger bias): the text follows them.
                if (open.Message != c.Message)
                {
                    store.UpdateAlertMessage(open.Id, c.Message);
                    log.LogInformation("Alert updated for {ExchangerId}: {Kind}: {Message}", c.Exchanger, c.Kind, c.Message);
                    AppendAlertLine(new { time = at.ToString("O"), exchanger = c.Exchanger, kind = c.Kind, state = "updated", message = c.Message, id = open.Id });
                }
                continue;
            }
            var alert = store.RaiseAlert(c.Exchanger, c.Kind, c.Message, at);
            log.LogWarning("Alert raised for {ExchangerId}: {Kind}: {Message}", c.Exchanger, c.Kind, c.Message);
            AppendAlertLine(new { time = at.ToString("O"), exchanger = c.Exchanger, kind = c.Kind, state = "raised", message = c.Message, id = alert.Id });
        }
        foreach (var a in active.Where(a => !now.Any(c => c.Exchanger == a.Exchanger && c.Kind == a.Kind)))
        {
            store.ClearAlert(a.Id, at);
            log.LogInformation("Alert cleared for {ExchangerId}: {Kind}", a.Exchanger, a.Kind);
            AppendAlertLine(new { time = at.ToString("O"), exchanger = a.Exchanger, kind = a.Kind, state = "cleared", message = a.Message, id = a.Id });
        }
    }

    private void AppendAlertLine(object line)
    {
        Directory.CreateDirectory(settings.Out);
        File.AppendAllText(AlertsFile, JsonSerializer.Serialize(line, AlertJson) + "\n");
    }
}
