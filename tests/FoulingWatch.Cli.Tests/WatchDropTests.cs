using System.IO.Compression;
using System.Text;
using FoulingWatch.Cli.Watch;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;
using Microsoft.Extensions.Logging.Abstractions;

namespace FoulingWatch.Cli.Tests;

/// <summary>
/// Odd drops for the monitoring service: a file without a final line break, a file that grows from an unfinished line,
/// a compressed file still being copied or damaged, a dangling link, and a corrected re-export under the same name.
/// The reference in each case is what one ingest of the finished file stores (values and counts).
/// </summary>
public class WatchDropTests
{
    private static (WatchLoop Loop, WatchStore Store) Start(WatchPlant plant, ManualClock clock)
    {
        var config = PlantConfigurationReader.Load(plant.ConfigPath, requireFiles: false);
        var store = new WatchStore(config.Watch.Store);
        return (new WatchLoop(config, config.Watch, store, clock, NullLogger.Instance), store);
    }

    /// <summary>Two passes with the settle time between them: the file is seen, then taken.</summary>
    private static int Settle(WatchLoop loop, ManualClock clock)
    {
        var n = loop.Poll();
        clock.Advance(TimeSpan.FromSeconds(3));
        return n + loop.Poll();
    }

    private static Dictionary<(string, long), double> Values(WatchStore store) => store.Values().ToDictionary(v => (v.Tag, v.UtcTicks), v => v.Value);

    [Fact]
    public void A_file_without_a_final_line_break_is_read_once_with_its_last_row()
    {
        using var plant = new WatchPlant();
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 3, 0, 0, 0, TimeSpan.Zero));
        var (loop, store) = Start(plant, clock);
        using (store)
        {
            File.WriteAllText(Path.Combine(plant.Drop, "export-01.csv"), WatchPlant.Header + WatchPlant.Rows(0, 1).TrimEnd('\n'));
            Assert.Equal(1, Settle(loop, clock));
            for (var i = 0; i < 5; i++) Assert.Equal(0, Settle(loop, clock));  // read once, not on every pass
            Assert.Equal(1440 * 6, store.ValueCount());                         // the last row too
            var ledger = store.Ledger("TH2")!;
            Assert.Equal(1440, ledger.Read);
            Assert.Equal(1440, ledger.Used);
            Assert.Single(store.Files());
        }
    }

    [Fact]
    public void A_file_that_grows_from_an_unfinished_line_gets_that_line_whole_and_counts_each_row_once()
    {
        using var plant = new WatchPlant();
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 3, 0, 0, 0, TimeSpan.Zero));
        var (loop, store) = Start(plant, clock);
        var full = WatchPlant.Header + WatchPlant.Rows(0, 2);
        var lines = full.Split('\n');
        // the writer stopped inside a row, after "…,89.2" of "…,89.2271" (as a copy paused mid-line would)
        var cut = full.Length - lines[^2].Length - 1 + lines[^2].LastIndexOf(',') + 4;
        var path = Path.Combine(plant.Drop, "export-01.csv");
        using (store)
        {
            File.WriteAllText(path, full[..cut]);
            Assert.Equal(1, Settle(loop, clock));
            File.WriteAllText(path, full);
            File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddSeconds(5));
            Assert.Equal(1, Settle(loop, clock));

            using var reference = new WatchPlant();
            var (refLoop, refStore) = Start(reference, clock);
            using (refStore)
            {
                File.WriteAllText(Path.Combine(reference.Drop, "export-01.csv"), full);
                Settle(refLoop, clock);
                Assert.Equal(Values(refStore), Values(store));        // the finished line's value, not the cut one
                foreach (var tag in new[] { "FH", "TH2", "TC2" })
                {
                    Assert.Equal(refStore.Ledger(tag)!.Read, store.Ledger(tag)!.Read);
                    Assert.Equal(refStore.Ledger(tag)!.Used, store.Ledger(tag)!.Used);
                }
            }
            Assert.Single(store.Files(), f => f.SupersededAt is not null);
        }
    }

    [Fact]
    public void A_damaged_compressed_file_and_a_dangling_link_are_refused_once_and_later_files_go_on()
    {
        using var plant = new WatchPlant(files: "\"export-*.csv\", \"export-*.csv.gz\"");
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 6, 0, 0, 0, TimeSpan.Zero));
        var (loop, store) = Start(plant, clock);
        using (store)
        {
            File.WriteAllBytes(Path.Combine(plant.Drop, "export-00.csv.gz"), Encoding.ASCII.GetBytes("this is not gzip at all, just text\n"));
            File.CreateSymbolicLink(Path.Combine(plant.Drop, "export-01.csv"), Path.Combine(plant.Directory, "gone.csv"));
            File.WriteAllText(Path.Combine(plant.Drop, "export-02.csv"), WatchPlant.Header + WatchPlant.Rows(0, 2));
            Assert.Equal(1, Settle(loop, clock));
            Assert.Equal(2 * 1440 * 6, store.ValueCount());
            var refused = store.Files().Where(f => f.Error is not null).OrderBy(f => f.Name).ToList();
            Assert.Equal(["export-00.csv.gz", "export-01.csv"], refused.Select(f => f.Name));
            Assert.Contains("compressed stream is damaged or incomplete", refused[0].Error);
            Assert.False(string.IsNullOrWhiteSpace(refused[1].Error));
            for (var i = 0; i < 3; i++) Settle(loop, clock);
            Assert.Equal(3, store.Files().Count);                            // refused once, not on every pass
        }
    }

    [Fact]
    public void A_compressed_file_still_being_copied_is_refused_until_complete_then_read_exactly()
    {
        using var plant = new WatchPlant(files: "\"export-*.csv.gz\"");
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 6, 0, 0, 0, TimeSpan.Zero));
        var (loop, store) = Start(plant, clock);
        var text = WatchPlant.Header + WatchPlant.Rows(0, 3);
        var gz = new MemoryStream();
        using (var z = new GZipStream(gz, CompressionLevel.Optimal, leaveOpen: true)) z.Write(Encoding.ASCII.GetBytes(text));
        var bytes = gz.ToArray();
        var path = Path.Combine(plant.Drop, "export-01.csv.gz");
        using (store)
        {
            foreach (var share in new[] { 0.3, 0.7, 0.999 })
            {
                File.WriteAllBytes(path, bytes[..(int)(bytes.Length * share)]);
                File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddSeconds(share * 100));
                Assert.Equal(0, Settle(loop, clock));
                Assert.Equal(0, store.ValueCount());                          // nothing of a partial copy is stored
            }
            File.WriteAllBytes(path, bytes);
            File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddSeconds(200));
            Assert.Equal(1, Settle(loop, clock));
            Assert.Equal(3 * 1440 * 6, store.ValueCount());
            // values exactly as written in the text (the sample rows carry four decimals; stored in kelvin)
            var row = text.Split('\n')[1].Split(',');
            var first = store.Values().First(v => v.Tag == "TH2");
            Assert.Equal(double.Parse(row[3], System.Globalization.CultureInfo.InvariantCulture) + 273.15, first.Value, 9);
        }
    }

    [Theory]
    [InlineData("latest")]
    [InlineData("first")]
    public void A_corrected_re_export_under_the_same_name_follows_the_stated_policy_without_counting_rows_twice(string policy)
    {
        using var plant = new WatchPlant($", \"corrections\": \"{policy}\"");
        var clock = new ManualClock(new DateTimeOffset(2026, 1, 6, 0, 0, 0, TimeSpan.Zero));
        var (loop, store) = Start(plant, clock);
        var original = WatchPlant.Header + WatchPlant.Rows(0, 2);
        var lines = original.Split('\n');
        var fields = lines[100].Split(',');
        fields[3] = "77.7777";                                               // one hot outlet reading corrected
        lines[100] = string.Join(',', fields);
        var corrected = string.Join('\n', lines);
        var path = Path.Combine(plant.Drop, "export-01.csv");
        var ts = DateTimeOffset.Parse(fields[0], System.Globalization.CultureInfo.InvariantCulture).UtcTicks;
        using (store)
        {
            File.WriteAllText(path, original);
            Settle(loop, clock);
            var before = Values(store)[("TH2", ts)];
            File.WriteAllText(path, corrected);
            File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddSeconds(5));
            Assert.Equal(1, Settle(loop, clock));
            var ledger = store.Ledger("TH2")!;
            Assert.Equal(ledger.Read, ledger.Used + ledger.RejectedTotal);
            if (policy == "latest")
            {
                Assert.Equal(77.7777 + 273.15, Values(store)[("TH2", ts)], 9);  // stored in kelvin
                Assert.Equal(2 * 1440, ledger.Read);                         // the correction's counts replace the original's
                Assert.Equal(2 * 1440, ledger.Used);
                Assert.Single(store.Files(), f => f.SupersededAt is not null);
            }
            else
            {
                Assert.Equal(before, Values(store)[("TH2", ts)]);
                Assert.Equal(2 * 2 * 1440, ledger.Read);                     // read as another export
                Assert.Equal(2 * 1440, ledger.Rejected[(int)RejectReason.Duplicate]);
                Assert.DoesNotContain(store.Files(), f => f.SupersededAt is not null);
            }
            Assert.Equal(2 * 1440 * 6, store.ValueCount());
        }
    }
}
