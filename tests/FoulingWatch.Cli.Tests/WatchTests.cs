using System.Diagnostics;
using System.Globalization;
using System.Text;
using FoulingWatch.Cli.Watch;
using FoulingWatch.Ingest.Configuration;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.Logging.Abstractions;

namespace FoulingWatch.Cli.Tests;

/// <summary>A clock the test moves by hand.</summary>
public sealed class ManualClock(DateTimeOffset start) : TimeProvider
{
    public DateTimeOffset Now { get; set; } = start;
    public override DateTimeOffset GetUtcNow() => Now;
    public void Advance(TimeSpan by) => Now += by;
}

/// <summary>An invented plant ("Sandpiper Works") for the watch tests: one exchanger, exports of one-minute data.</summary>
public sealed class WatchPlant : IDisposable
{
    public WatchPlant(string extraWatch = "", string files = "\"export-*.csv\"")
    {
        Directory = Path.Combine(Path.GetTempPath(), "fw-watch-tests", Guid.NewGuid().ToString("N"));
        System.IO.Directory.CreateDirectory(Path.Combine(Directory, "drop"));
        File.WriteAllText(ConfigPath, $$"""
            {
              "site": { "name": "Sandpiper Works (fictional)" },
              "watch": { "dropFolder": "drop", "store": "state/store.db", "out": "results", "pollInterval": "0.2 s", "settleTime": "2 s" {{extraWatch}} },
              "data": { "interval": "10 min", "frozenAfter": "0 h", "sources": [ { "files": [{{files}}] } ] },
              "exchangers": [ {
                "id": "S-1", "arrangement": "counterflow", "area": "120 m2",
                "hot":  { "side": "shell", "fluid": { "model": "constant-cp", "cp": "2300 J/kgK" }, "flow": { "tag": "FH", "unit": "kg/s" },
                          "inlet": { "tag": "TH1", "unit": "degC" }, "outlet": { "tag": "TH2", "unit": "degC" }, "designFlow": "25 kg/s" },
                "cold": { "side": "tube", "fluid": { "model": "constant-cp", "cp": "4100 J/kgK" }, "flow": { "tag": "FC", "unit": "kg/s" },
                          "inlet": { "tag": "TC1", "unit": "degC" }, "outlet": { "tag": "TC2", "unit": "degC" }, "designFlow": "30 kg/s" },
                "clean": { "method": "datasheet", "u": "500 W/m2K" },
                "limits": { "foulingResistance": "0.0002 m2K/W" },
                "maintenance": [ { "date": "2026-01-01T00:00:00Z", "action": "cleaned" } ]
              } ]
            }
            """);
    }

    public string Directory { get; }
    public string ConfigPath => Path.Combine(Directory, "plant.json");
    public string Drop => Path.Combine(Directory, "drop");

    public static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);

    /// <summary>Rows of one-minute data from day <paramref name="from"/> to <paramref name="to"/> of a counterflow exchanger fouling at 5e-6 m²K/W per day.
    /// The inlets are held exactly (noise-free), which the frozen-value check would flag: the plant turns it off.</summary>
    public static string Rows(double from, double to)
    {
        var sb = new StringBuilder();
        for (var m = (int)(from * 1440); m < (int)(to * 1440); m++)
        {
            var d = m / 1440.0;
            var mh = 25 * (1 + 0.2 * Math.Sin(d * 2));
            var mc = 30 * (1 + 0.2 * Math.Cos(d * 3));
            var uc = 1 / (0.5 / 500 * Math.Pow(30 / mc, 0.8) + 0.5 / 500 * Math.Pow(25 / mh, 0.6));
            var u = 1 / (1 / uc + 5e-6 * d);
            var r = Core.Exchangers.Rating.Rate(Core.Exchangers.Counterflow.Instance, u * 120, mh * 2300, mc * 4100, Core.Quantities.Temperature.FromCelsius(150), Core.Quantities.Temperature.FromCelsius(30));
            sb.Append(CultureInfo.InvariantCulture, $"{Start.AddMinutes(m):yyyy-MM-ddTHH:mm:ssZ},{mh:0.0000},150,{r.HotOutlet.Celsius:0.0000},{mc:0.0000},30,{r.ColdOutlet.Celsius:0.0000}\n");
        }
        return sb.ToString();
    }

    public const string Header = "Timestamp,FH,TH1,TH2,FC,TC1,TC2\n";

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        try { System.IO.Directory.Delete(Directory, recursive: true); } catch (IOException) { }
    }
}

public class WatchTests
{
    private static (WatchLoop Loop, WatchStore Store, WatchSettings Settings) Start(WatchPlant plant, ManualClock clock)
    {
        var config = PlantConfigurationReader.Load(plant.ConfigPath, requireFiles: false);
        var store = new WatchStore(config.Watch.Store);
        return (new WatchLoop(config, config.Watch, store, clock, NullLogger.Instance), store, config.Watch);
    }

    [Fact]
    public void Files_dropped_in_stages_are_ingested_once_each_and_a_slowly_written_one_is_waited_for()
    {
        using var plant = new WatchPlant();
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 20, 0, 0, 0, TimeSpan.Zero));
        var (loop, store, settings) = Start(plant, clock);
        using (store)
        {
            File.WriteAllText(Path.Combine(plant.Drop, "export-01.csv"), WatchPlant.Header + WatchPlant.Rows(0, 5));
            Assert.Equal(0, loop.Poll());                       // first sight: not yet settled
            clock.Advance(TimeSpan.FromSeconds(3));
            Assert.Equal(1, loop.Poll());
            Assert.Equal(5 * 1440 * 6, store.ValueCount());
            Assert.True(File.Exists(Path.Combine(settings.Out, "report.html")));
            Assert.True(File.Exists(Path.Combine(settings.Out, "S-1", "timeseries.csv")));

            // a file being written slowly: it changes between passes and is taken only after it has settled
            var slow = Path.Combine(plant.Drop, "export-02.csv");
            File.WriteAllText(slow, WatchPlant.Header + WatchPlant.Rows(5, 6));
            Assert.Equal(0, loop.Poll());
            clock.Advance(TimeSpan.FromSeconds(1));
            File.AppendAllText(slow, WatchPlant.Rows(6, 7));
            File.SetLastWriteTimeUtc(slow, DateTime.UtcNow.AddSeconds(1));
            Assert.Equal(0, loop.Poll());
            clock.Advance(TimeSpan.FromSeconds(1));
            Assert.Equal(0, loop.Poll());
            clock.Advance(TimeSpan.FromSeconds(2));
            Assert.Equal(1, loop.Poll());
            Assert.Equal(7 * 1440 * 6, store.ValueCount());

            // the same content under another name is recognised by its hash
            File.Copy(slow, Path.Combine(plant.Drop, "export-02-copy.csv"));
            loop.Poll();
            clock.Advance(TimeSpan.FromSeconds(3));
            Assert.Equal(0, loop.Poll());

            // a grown file: only its new rows are read
            File.AppendAllText(slow, WatchPlant.Rows(7, 8));
            loop.Poll();
            clock.Advance(TimeSpan.FromSeconds(3));
            Assert.Equal(1, loop.Poll());
            Assert.Equal(8 * 1440 * 6, store.ValueCount());
            var ledger = store.Ledger("FH")!;
            Assert.Equal(8 * 1440, ledger.Used);
            Assert.Equal(0, ledger.Rejected[(int)Ingest.Historian.RejectReason.Duplicate]);
            Assert.Equal(ledger.Read, ledger.Used + ledger.RejectedTotal);
        }
    }

    [Fact]
    public void Alerts_are_raised_once_per_episode_and_cleared_when_the_condition_ends()
    {
        using var plant = new WatchPlant(", \"alertHorizon\": \"400 d\", \"staleAfter\": \"2 d\"");
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 11, 0, 0, 0, TimeSpan.Zero));
        var (loop, store, settings) = Start(plant, clock);
        using (store)
        {
            File.WriteAllText(Path.Combine(plant.Drop, "export-01.csv"), WatchPlant.Header + WatchPlant.Rows(0, 10));
            loop.Poll();
            clock.Advance(TimeSpan.FromSeconds(3));
            loop.Poll();
            // fouling 5e-6 per day reaches 2e-4 after 40 days: within the 400-day horizon
            var limit = Assert.Single(store.Alerts(activeOnly: true), a => a.Kind == "limit");
            loop.Analyse();
            loop.Poll();
            Assert.Single(store.Alerts(activeOnly: false), a => a.Kind == "limit");

            // no data for more than two days: data-stopped, raised once, cleared by new data
            clock.Advance(TimeSpan.FromDays(3));
            loop.Poll();
            loop.Poll();
            Assert.Single(store.Alerts(activeOnly: true), a => a.Kind == "data-stopped");
            File.WriteAllText(Path.Combine(plant.Drop, "export-02.csv"), WatchPlant.Header + WatchPlant.Rows(10, 14));
            loop.Poll();
            clock.Advance(TimeSpan.FromSeconds(3));
            loop.Poll();
            Assert.DoesNotContain(store.Alerts(activeOnly: true), a => a.Kind == "data-stopped");
            var lines = File.ReadAllLines(loop.AlertsFile);
            Assert.Equal(1, lines.Count(l => l.Contains("\"kind\":\"data-stopped\"") && l.Contains("\"state\":\"raised\"")));
            Assert.Equal(1, lines.Count(l => l.Contains("\"kind\":\"data-stopped\"") && l.Contains("\"state\":\"cleared\"")));
            Assert.Equal(1, lines.Count(l => l.Contains("\"kind\":\"limit\"") && l.Contains("\"state\":\"raised\"")));
            Assert.NotNull(limit);
            // written for people: no \uXXXX escapes for +, <, >, & or non-ASCII letters
            Assert.DoesNotContain(lines, l => l.Contains("\\u"));
        }
    }

    [Fact]
    public void An_open_alert_follows_its_facts_and_a_stray_drop_file_is_ignored()
    {
        using var plant = new WatchPlant(", \"staleAfter\": \"2 d\"");
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 14, 0, 0, 0, TimeSpan.Zero));
        var (loop, store, _) = Start(plant, clock);
        using (store)
        {
            File.WriteAllText(Path.Combine(plant.Drop, "export-01.csv"), WatchPlant.Header + WatchPlant.Rows(0, 10));
            File.WriteAllText(Path.Combine(plant.Drop, "notes.txt"), "not an export");
            loop.Poll();
            clock.Advance(TimeSpan.FromSeconds(3));
            Assert.Equal(1, loop.Poll());                       // notes.txt matches no source: ignored
            var stale = Assert.Single(store.Alerts(activeOnly: true), a => a.Kind == "data-stopped");
            Assert.Contains("since 2026-01-10 23:59 UTC", stale.Message);

            // a day more of data, still more than two days old: the same episode, its text updated
            File.WriteAllText(Path.Combine(plant.Drop, "export-02.csv"), WatchPlant.Header + WatchPlant.Rows(10, 11));
            loop.Poll();
            clock.Advance(TimeSpan.FromSeconds(3));
            loop.Poll();
            var updated = Assert.Single(store.Alerts(activeOnly: true), a => a.Kind == "data-stopped");
            Assert.Equal(stale.Id, updated.Id);
            Assert.Contains("since 2026-01-11 23:59 UTC", updated.Message);
            Assert.Single(File.ReadAllLines(loop.AlertsFile), l => l.Contains("\"state\":\"updated\"") && l.Contains("2026-01-11 23:59"));
        }
    }

    [Fact]
    public void A_version_1_store_is_migrated_keeping_its_contents()
    {
        using var plant = new WatchPlant();
        var path = Path.Combine(plant.Directory, "old.db");
        using (var db = new SqliteConnection($"Data Source={path};Pooling=False"))
        {
            db.Open();
            using var c = db.CreateCommand();
            c.CommandText = WatchStore.Migrations[0] + "PRAGMA user_version = 1; INSERT INTO alerts (exchanger, kind, message, raised_at) VALUES ('S-1', 'limit', 'old', '2026-01-01T00:00:00.0000000+00:00'); INSERT INTO raw_values VALUES ('FH', 1, 2.5);";
            c.ExecuteNonQuery();
        }
        using var store = new WatchStore(path);
        Assert.Equal(WatchStore.CurrentVersion, store.SchemaVersion);
        var alert = Assert.Single(store.Alerts(activeOnly: true));
        Assert.Equal("old", alert.Message);
        Assert.Null(alert.ClearedAt);
        Assert.Equal(1, store.ValueCount());
        store.SaveAnalysis(DateTimeOffset.UnixEpoch, "{}", [("S-1", 1, "ok", 1e-4, 1e-5, 400, 450, 1000)]);
        Assert.NotNull(store.LastAnalysis());
    }

    [Fact]
    public void A_store_from_a_newer_version_is_refused()
    {
        using var plant = new WatchPlant();
        var path = Path.Combine(plant.Directory, "new.db");
        using (var db = new SqliteConnection($"Data Source={path};Pooling=False"))
        {
            db.Open();
            using var c = db.CreateCommand();
            c.CommandText = "PRAGMA user_version = 99;";
            c.ExecuteNonQuery();
        }
        var ex = Assert.Throws<InvalidOperationException>(() => new WatchStore(path));
        Assert.Contains("newer FoulingWatch (schema 99", ex.Message);
    }

    // Crash test: the service is killed (SIGKILL) 20 times at random moments while it ingests and analyses; after each
    // restart it goes on. At the end the store must hold exactly what an uninterrupted run stores, value by value and
    // count by count: nothing lost, nothing twice.
    [Fact]
    public void A_service_killed_at_random_moments_loses_and_duplicates_nothing()
    {
        using var plant = new WatchPlant();
        for (var f = 0; f < 3; f++)
            File.WriteAllText(Path.Combine(plant.Drop, $"export-{f:00}.csv"), WatchPlant.Header + WatchPlant.Rows(f * 25, f * 25 + 25));
        File.WriteAllText(Path.Combine(plant.Drop, "export-99.csv"), WatchPlant.Header + WatchPlant.Rows(10, 30)); // overlaps the others
        var config = PlantConfigurationReader.Load(plant.ConfigPath, requireFiles: false);

        // the reference: one uninterrupted run, in process
        var reference = config.Watch with { Store = Path.Combine(plant.Directory, "reference.db"), Out = Path.Combine(plant.Directory, "reference-out"), SettleTime = TimeSpan.Zero };
        string expected;
        Dictionary<string, Ingest.Historian.TagLedger> expectedLedgers;
        using (var store = new WatchStore(reference.Store))
        {
            var loop = new WatchLoop(config, reference, store, new ManualClock(DateTimeOffset.UtcNow), NullLogger.Instance);
            loop.Poll();
            Assert.Equal(4, store.Files().Count);
            expected = store.ContentDigest();
            expectedLedgers = store.Ledgers();
        }

        var cli = Path.Combine(AppContext.BaseDirectory, "foulingwatch.dll");
        var rng = new Random(20261201);
        var storePath = config.Watch.Store;
        for (var attempt = 0; attempt < 20; attempt++)
        {
            using var p = StartService(cli, plant.ConfigPath);
            Thread.Sleep(rng.Next(700, 2600));
            p.Kill();  // SIGKILL on Linux
            p.WaitForExit();
        }
        using (var p = StartService(cli, plant.ConfigPath))
        {
            var deadline = DateTime.UtcNow.AddSeconds(120);
            while (DateTime.UtcNow < deadline && FilesIn(storePath) < 4) Thread.Sleep(500);
            p.Kill();
            p.WaitForExit();
        }
        using var final = new WatchStore(storePath);
        Assert.Equal(4, final.Files().Count(f => f.Error is null));
        Assert.Equal(expected, final.ContentDigest());
        foreach (var (tag, want) in expectedLedgers)
        {
            var got = final.Ledger(tag)!;
            Assert.Equal((want.Read, want.Used, want.RejectedTotal), (got.Read, got.Used, got.RejectedTotal));
            Assert.Equal(got.Read, got.Used + got.RejectedTotal);
        }
    }

    private static int FilesIn(string store)
    {
        if (!File.Exists(store)) return 0;
        try
        {
            using var db = new SqliteConnection($"Data Source={store};Mode=ReadOnly;Pooling=False");
            db.Open();
            using var c = db.CreateCommand();
            c.CommandText = "SELECT COUNT(*) FROM files WHERE error IS NULL";
            return Convert.ToInt32(c.ExecuteScalar());
        }
        catch (SqliteException) { return 0; }
    }

    private static Process StartService(string cli, string config)
    {
        var psi = new ProcessStartInfo("dotnet") { UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { cli, "watch", "--config", config, "--poll-seconds", "0.2" }) psi.ArgumentList.Add(a);
        var p = Process.Start(psi)!;
        p.OutputDataReceived += (_, _) => { };
        p.ErrorDataReceived += (_, _) => { };
        p.BeginOutputReadLine();
        p.BeginErrorReadLine();
        return p;
    }
}
