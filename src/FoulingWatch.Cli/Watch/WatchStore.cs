using System.Text.Json;
using FoulingWatch.Ingest.Historian;
using Microsoft.Data.Sqlite;

namespace FoulingWatch.Cli.Watch;

/// <summary>A file the store has ingested: recognised by the SHA-256 of its content, not by its name. A file that a
/// correction under the same name replaced keeps its row with the time it was superseded.</summary>
public sealed record StoredFile(string Hash, string Name, long Length, long Values, DateTimeOffset IngestedAt, string? Error,
    DateTimeOffset? SupersededAt = null);

/// <summary>How a file's values enter the store: <see cref="Add"/> keeps values already held (they count as duplicates);
/// <see cref="Replace"/> overwrites them (a correction, or a file whose unfinished last line was read before).</summary>
public enum StoreMode { Add, Replace }

/// <summary>An alert episode: raised once when its condition starts, cleared when it ends.</summary>
public sealed record StoredAlert(long Id, string Exchanger, string Kind, string Message, DateTimeOffset RaisedAt, DateTimeOffset? ClearedAt);

/// <summary>
/// The monitoring service's embedded store (SQLite): ingested values, files by content hash, the quality ledger,
/// per-sample results, the latest summary, and alerts. Each ingest is one transaction, so a process killed at any
/// moment leaves either all of a file or none of it; values are keyed by (tag, timestamp), so nothing is stored twice.
/// </summary>
public sealed class WatchStore : IDisposable
{
    /// <summary>Schema versions, each a migration from the one before. Version 1 lacked the per-sample results and alert
    /// clearing; version 2 the counts per file, which let a correction replace an earlier file's counts.</summary>
    public static readonly string[] Migrations =
    [
        """
        CREATE TABLE files (hash TEXT PRIMARY KEY, name TEXT NOT NULL, length INTEGER NOT NULL, "values" INTEGER NOT NULL, ingested_at TEXT NOT NULL, error TEXT);
        CREATE TABLE raw_values (tag TEXT NOT NULL, ts INTEGER NOT NULL, value REAL NOT NULL, PRIMARY KEY (tag, ts)) WITHOUT ROWID;
        CREATE TABLE ledger (tag TEXT PRIMARY KEY, read INTEGER NOT NULL, used INTEGER NOT NULL, rejected TEXT NOT NULL, markers TEXT NOT NULL);
        CREATE TABLE alerts (id INTEGER PRIMARY KEY AUTOINCREMENT, exchanger TEXT NOT NULL, kind TEXT NOT NULL, message TEXT NOT NULL, raised_at TEXT NOT NULL);
        CREATE TABLE analyses (id INTEGER PRIMARY KEY CHECK (id = 1), analysed_at TEXT NOT NULL, summary TEXT NOT NULL);
        """,
        """
        ALTER TABLE alerts ADD COLUMN cleared_at TEXT;
        CREATE TABLE sample_results (exchanger TEXT NOT NULL, ts INTEGER NOT NULL, status TEXT NOT NULL, rf REAL, rf_sigma REAL, u_actual REAL, u_clean REAL, lost_duty REAL,
            PRIMARY KEY (exchanger, ts)) WITHOUT ROWID;
        """,
        """
        ALTER TABLE files ADD COLUMN superseded_at TEXT;
        CREATE TABLE file_ledgers (hash TEXT NOT NULL, tag TEXT NOT NULL, read INTEGER NOT NULL, used INTEGER NOT NULL, rejected TEXT NOT NULL,
            markers TEXT NOT NULL, PRIMARY KEY (hash, tag)) WITHOUT ROWID;
        """,
    ];

    public static int CurrentVersion => Migrations.Length;

    private readonly SqliteConnection _db;

    public WatchStore(string path)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        _db = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = path, Pooling = false }.ToString());
        _db.Open();
        Execute("PRAGMA journal_mode=WAL; PRAGMA synchronous=FULL; PRAGMA busy_timeout=5000;");
        Migrate();
    }

    public int SchemaVersion => Convert.ToInt32(Scalar("PRAGMA user_version"));

    private void Migrate()
    {
        var version = SchemaVersion;
        if (version > CurrentVersion)
            throw new InvalidOperationException($"the store was written by a newer FoulingWatch (schema {version}, this one knows {CurrentVersion}); use that version or a new store file");
        for (var v = version; v < CurrentVersion; v++)
        {
            using var tx = _db.BeginTransaction();
            Execute(Migrations[v], tx);
            Execute($"PRAGMA user_version = {v + 1}", tx);
            tx.Commit();
        }
    }

    private void Execute(string sql, SqliteTransaction? tx = null)
    {
        using var c = _db.CreateCommand();
        c.CommandText = sql;
        c.Transaction = tx;
        c.ExecuteNonQuery();
    }

    private object? Scalar(string sql)
    {
        using var c = _db.CreateCommand();
        c.CommandText = sql;
        return c.ExecuteScalar();
    }

    /// <summary>The stored file with this content hash (ingested or refused), unless a correction superseded it.</summary>
    public StoredFile? FileByHash(string hash) => Files().FirstOrDefault(f => f.Hash == hash && f.SupersededAt is null);

    public IReadOnlyList<StoredFile> Files()
    {
        using var c = _db.CreateCommand();
        c.CommandText = "SELECT hash, name, length, \"values\", ingested_at, error, superseded_at FROM files ORDER BY ingested_at, name";
        using var r = c.ExecuteReader();
        var list = new List<StoredFile>();
        DateTimeOffset Time(int i) => DateTimeOffset.Parse(r.GetString(i), System.Globalization.CultureInfo.InvariantCulture);
        while (r.Read())
            list.Add(new StoredFile(r.GetString(0), r.GetString(1), r.GetInt64(2), r.GetInt64(3), Time(4), r.IsDBNull(5) ? null : r.GetString(5),
                r.IsDBNull(6) ? null : Time(6)));
        return list;
    }

    /// <summary>What one file changed in the store: values newly stored and stored values it replaced, per tag.</summary>
    public sealed record IngestOutcome(Dictionary<string, long> Inserted, Dictionary<string, long> Replaced);

    /// <summary>
    /// Stores one ingested file in one transaction: its values, its counts (per file and in the running ledger) and its
    /// hash. Files it <paramref name="supersedes"/> (earlier versions under its name) are marked so and their counts taken
    /// out of the ledger, so a correction does not count its rows twice.
    /// </summary>
    public IngestOutcome Ingest(StoredFile file, IReadOnlyList<(string Tag, long UtcTicks, double Value)> values,
        IReadOnlyDictionary<string, TagLedger> ledgers, StoreMode mode = StoreMode.Add, IReadOnlyList<StoredFile>? supersedes = null)
    {
        using var tx = _db.BeginTransaction();
        var (inserted, replaced) = StoreValues(values, mode, tx);
        var totals = new Dictionary<string, TagLedger>(StringComparer.Ordinal);
        TagLedger Total(string tag) => totals.TryGetValue(tag, out var t) ? t : totals[tag] = Ledger(tag, tx) ?? new TagLedger(tag);
        foreach (var old in supersedes ?? [])
        {
            foreach (var (tag, counts) in FileLedgers(old.Hash, tx)) Total(tag).Subtract(counts);
            using var c = _db.CreateCommand();
            c.Transaction = tx;
            c.CommandText = "UPDATE files SET superseded_at = $t WHERE hash = $h";
            c.Parameters.AddWithValue("$t", file.IngestedAt.ToString("O", System.Globalization.CultureInfo.InvariantCulture));
            c.Parameters.AddWithValue("$h", old.Hash);
            c.ExecuteNonQuery();
        }
        foreach (var (tagName, ledger) in ledgers)
        {
            var own = new TagLedger(tagName);
            own.Merge(ledger);
            // Adding: values the store already holds (an overlapping or repeated export) count as duplicates.
            if (mode == StoreMode.Add) own.Reclassify(values.Count(v => v.Tag == tagName) - inserted.GetValueOrDefault(tagName), RejectReason.Duplicate);
            WriteLedger("file_ledgers", file.Hash, own, tx);
            Total(tagName).Merge(own);
        }
        foreach (var total in totals.Values) WriteLedger("ledger", null, total, tx);
        AddFile(file with { Values = inserted.Values.Sum() + replaced.Values.Sum() }, tx);
        tx.Commit();
        return new IngestOutcome(inserted, replaced);
    }

    private (Dictionary<string, long> Inserted, Dictionary<string, long> Replaced) StoreValues(
        IReadOnlyList<(string Tag, long UtcTicks, double Value)> values, StoreMode mode, SqliteTransaction tx)
    {
        var inserted = new Dictionary<string, long>(StringComparer.Ordinal);
        var replaced = new Dictionary<string, long>(StringComparer.Ordinal);
        using var insert = _db.CreateCommand();
        insert.Transaction = tx;
        insert.CommandText = "INSERT OR IGNORE INTO raw_values (tag, ts, value) VALUES ($tag, $ts, $value)";
        using var update = _db.CreateCommand();
        update.Transaction = tx;
        update.CommandText = "UPDATE raw_values SET value = $value WHERE tag = $tag AND ts = $ts AND value <> $value";
        var p = new[] { insert, update }.Select(c => (Tag: c.Parameters.Add("$tag", SqliteType.Text), Ts: c.Parameters.Add("$ts", SqliteType.Integer),
            Value: c.Parameters.Add("$value", SqliteType.Real))).ToArray();
        insert.Prepare();
        update.Prepare();
        foreach (var v in values)
        {
            foreach (var q in p) { q.Tag.Value = v.Tag; q.Ts.Value = v.UtcTicks; q.Value.Value = v.Value; }
            if (mode == StoreMode.Replace && update.ExecuteNonQuery() > 0) replaced[v.Tag] = replaced.GetValueOrDefault(v.Tag) + 1;
            else inserted[v.Tag] = inserted.GetValueOrDefault(v.Tag) + insert.ExecuteNonQuery();
        }
        return (inserted, replaced);
    }

    private void WriteLedger(string table, string? hash, TagLedger l, SqliteTransaction tx)
    {
        using var c = _db.CreateCommand();
        c.Transaction = tx;
        c.CommandText = hash is null
            ? "INSERT OR REPLACE INTO ledger (tag, read, used, rejected, markers) VALUES ($tag, $read, $used, $rejected, $markers)"
            : $"INSERT OR REPLACE INTO {table} (hash, tag, read, used, rejected, markers) VALUES ($hash, $tag, $read, $used, $rejected, $markers)";
        if (hash is not null) c.Parameters.AddWithValue("$hash", hash);
        c.Parameters.AddWithValue("$tag", l.Tag);
        c.Parameters.AddWithValue("$read", l.Read);
        c.Parameters.AddWithValue("$used", l.Used);
        c.Parameters.AddWithValue("$rejected", JsonSerializer.Serialize(l.Rejected));
        c.Parameters.AddWithValue("$markers", JsonSerializer.Serialize(l.Markers));
        c.ExecuteNonQuery();
    }

    private List<(string Tag, TagLedger Counts)> FileLedgers(string hash, SqliteTransaction tx)
    {
        using var c = _db.CreateCommand();
        c.Transaction = tx;
        c.CommandText = "SELECT tag, read, used, rejected, markers FROM file_ledgers WHERE hash = $hash";
        c.Parameters.AddWithValue("$hash", hash);
        using var r = c.ExecuteReader();
        var list = new List<(string, TagLedger)>();
        while (r.Read()) list.Add((r.GetString(0), ReadLedger(r.GetString(0), r, 1)));
        return list;
    }

    private static TagLedger ReadLedger(string tag, SqliteDataReader r, int first)
    {
        var l = new TagLedger(tag);
        l.Restore(r.GetInt64(first), r.GetInt64(first + 1), JsonSerializer.Deserialize<long[]>(r.GetString(first + 2))!,
            JsonSerializer.Deserialize<Dictionary<string, long>>(r.GetString(first + 3))!);
        return l;
    }

    /// <summary>Records a file that could not be ingested, so that it is not retried until its content changes.</summary>
    public void RecordFailure(StoredFile file)
    {
        using var tx = _db.BeginTransaction();
        AddFile(file, tx);
        tx.Commit();
    }

    private void AddFile(StoredFile f, SqliteTransaction tx)
    {
        using var c = _db.CreateCommand();
        c.Transaction = tx;
        c.CommandText = "INSERT OR REPLACE INTO files (hash, name, length, \"values\", ingested_at, error) VALUES ($h, $n, $l, $v, $t, $e)";
        c.Parameters.AddWithValue("$h", f.Hash);
        c.Parameters.AddWithValue("$n", f.Name);
        c.Parameters.AddWithValue("$l", f.Length);
        c.Parameters.AddWithValue("$v", f.Values);
        c.Parameters.AddWithValue("$t", f.IngestedAt.ToString("O", System.Globalization.CultureInfo.InvariantCulture));
        c.Parameters.AddWithValue("$e", (object?)f.Error ?? DBNull.Value);
        c.ExecuteNonQuery();
    }

    public TagLedger? Ledger(string tag) => Ledger(tag, null);

    private TagLedger? Ledger(string tag, SqliteTransaction? tx)
    {
        using var c = _db.CreateCommand();
        c.Transaction = tx;
        c.CommandText = "SELECT read, used, rejected, markers FROM ledger WHERE tag = $tag";
        c.Parameters.AddWithValue("$tag", tag);
        using var r = c.ExecuteReader();
        return r.Read() ? ReadLedger(tag, r, 0) : null;
    }

    public Dictionary<string, TagLedger> Ledgers()
    {
        using var c = _db.CreateCommand();
        c.CommandText = "SELECT tag FROM ledger ORDER BY tag";
        using var r = c.ExecuteReader();
        var tags = new List<string>();
        while (r.Read()) tags.Add(r.GetString(0));
        return tags.ToDictionary(t => t, t => Ledger(t)!, StringComparer.Ordinal);
    }

    public IEnumerable<(string Tag, long UtcTicks, double Value)> Values()
    {
        using var c = _db.CreateCommand();
        c.CommandText = "SELECT tag, ts, value FROM raw_values ORDER BY tag, ts";
        using var r = c.ExecuteReader();
        while (r.Read()) yield return (r.GetString(0), r.GetInt64(1), r.GetDouble(2));
    }

    public long ValueCount() => Convert.ToInt64(Scalar("SELECT COUNT(*) FROM raw_values"));
    public long? LastTimestamp() => Scalar("SELECT MAX(ts) FROM raw_values") is long t ? t : null;

    /// <summary>A digest of every stored value: equal stores have equal digests.</summary>
    public string ContentDigest()
    {
        using var sha = System.Security.Cryptography.IncrementalHash.CreateHash(System.Security.Cryptography.HashAlgorithmName.SHA256);
        foreach (var (tag, ts, value) in Values())
            sha.AppendData(System.Text.Encoding.UTF8.GetBytes(FormattableString.Invariant($"{tag}|{ts}|{value:R}\n")));
        return Convert.ToHexString(sha.GetHashAndReset());
    }

    public void SaveAnalysis(DateTimeOffset at, string summaryJson, IEnumerable<(string Exchanger, long Ts, string Status, double Rf, double Sigma, double U, double Uc, double Lost)> samples)
    {
        using var tx = _db.BeginTransaction();
        Execute("DELETE FROM sample_results", tx);
        using (var c = _db.CreateCommand())
        {
            c.Transaction = tx;
            c.CommandText = "INSERT INTO sample_results VALUES ($x, $t, $s, $rf, $sg, $u, $uc, $l)";
            var p = new[] { "$x", "$t", "$s", "$rf", "$sg", "$u", "$uc", "$l" }.Select(n => c.Parameters.Add(n, SqliteType.Text)).ToArray();
            object N(double v) => double.IsFinite(v) ? v : DBNull.Value;
            foreach (var s in samples)
            {
                p[0].Value = s.Exchanger; p[1].Value = s.Ts; p[2].Value = s.Status; p[3].Value = N(s.Rf); p[4].Value = N(s.Sigma);
                p[5].Value = N(s.U); p[6].Value = N(s.Uc); p[7].Value = N(s.Lost);
                c.ExecuteNonQuery();
            }
        }
        using (var c = _db.CreateCommand())
        {
            c.Transaction = tx;
            c.CommandText = "INSERT OR REPLACE INTO analyses (id, analysed_at, summary) VALUES (1, $t, $s)";
            c.Parameters.AddWithValue("$t", at.ToString("O", System.Globalization.CultureInfo.InvariantCulture));
            c.Parameters.AddWithValue("$s", summaryJson);
            c.ExecuteNonQuery();
        }
        tx.Commit();
    }

    public (DateTimeOffset At, string Summary)? LastAnalysis()
    {
        using var c = _db.CreateCommand();
        c.CommandText = "SELECT analysed_at, summary FROM analyses WHERE id = 1";
        using var r = c.ExecuteReader();
        return r.Read() ? (DateTimeOffset.Parse(r.GetString(0), System.Globalization.CultureInfo.InvariantCulture), r.GetString(1)) : null;
    }

    public IReadOnlyList<StoredAlert> Alerts(bool activeOnly)
    {
        using var c = _db.CreateCommand();
        c.CommandText = "SELECT id, exchanger, kind, message, raised_at, cleared_at FROM alerts" + (activeOnly ? " WHERE cleared_at IS NULL" : "") + " ORDER BY id";
        using var r = c.ExecuteReader();
        var list = new List<StoredAlert>();
        while (r.Read())
            list.Add(new StoredAlert(r.GetInt64(0), r.GetString(1), r.GetString(2), r.GetString(3), DateTimeOffset.Parse(r.GetString(4), System.Globalization.CultureInfo.InvariantCulture),
                r.IsDBNull(5) ? null : DateTimeOffset.Parse(r.GetString(5), System.Globalization.CultureInfo.InvariantCulture)));
        return list;
    }

    public StoredAlert RaiseAlert(string exchanger, string kind, string message, DateTimeOffset at)
    {
        using var c = _db.CreateCommand();
        c.CommandText = "INSERT INTO alerts (exchanger, kind, message, raised_at) VALUES ($x, $k, $m, $t); SELECT last_insert_rowid();";
        c.Parameters.AddWithValue("$x", exchanger);
        c.Parameters.AddWithValue("$k", kind);
        c.Parameters.AddWithValue("$m", message);
        c.Parameters.AddWithValue("$t", at.ToString("O", System.Globalization.CultureInfo.InvariantCulture));
        return new StoredAlert((long)c.ExecuteScalar()!, exchanger, kind, message, at, null);
    }

    public void ClearAlert(long id, DateTimeOffset at)
    {
        using var c = _db.CreateCommand();
        c.CommandText = "UPDATE alerts SET cleared_at = $t WHERE id = $id";
        c.Parameters.AddWithValue("$t", at.ToString("O", System.Globalization.CultureInfo.InvariantCulture));
        c.Parameters.AddWithValue("$id", id);
        c.ExecuteNonQuery();
    }

    /// <summary>Replaces the text of an active alert whose facts changed (same episode, new wording).</summary>
    public void UpdateAlertMessage(long id, string message)
    {
        using var c = _db.CreateCommand();
        c.CommandText = "UPDATE alerts SET message = $m WHERE id = $id";
        c.Parameters.AddWithValue("$m", message);
        c.Parameters.AddWithValue("$id", id);
        c.ExecuteNonQuery();
    }

    public void Dispose() => _db.Dispose();
}
