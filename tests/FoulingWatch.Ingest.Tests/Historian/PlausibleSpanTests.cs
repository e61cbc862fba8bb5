using System.Text;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Ingest.Tests.Historian;

public class PlausibleSpanTests
{
    private static string Export(IEnumerable<string> strayTimestamps)
    {
        var sb = new StringBuilder("Timestamp,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202\n");
        var start = new DateTime(2025, 5, 1, 0, 0, 0);
        for (var k = 0; k < 20 * 144; k++)
            sb.Append(FormattableString.Invariant($"{start.AddMinutes(10 * k):yyyy-MM-dd HH:mm:ss},{120 + k % 7},250,180,90,40,95\n"));
        foreach (var t in strayTimestamps) sb.Append($"{t},121,251,181,91,41,96\n");
        return sb.ToString();
    }

    // A 20-day export with a row dated 9999 and one dated 0001 (local time): the grid follows the 20 days, each stray value
    // is counted as outside-plausible-span, and read = used + rejected holds for every tag.
    [Theory]
    [InlineData("UTC")]
    [InlineData("Europe/Amsterdam")]
    public void Stray_rows_dated_centuries_away_neither_stretch_the_grid_nor_vanish(string zone)
    {
        using var plant = new TestPlant().WithFile("stray.csv", Export(["9999-12-31 00:00:00", "0001-01-01 00:00:00"]))
            .WithConfig("{ \"files\": [\"stray.csv\"] }", timeZone: zone);
        var r = HistorianIngest.Run(PlantConfigurationReader.Load(plant.ConfigPath));
        Assert.InRange(r.IntervalCount, 20 * 144 - 6, 20 * 144 + 6);
        foreach (var l in r.TagLedgers.Values)
        {
            Assert.Equal(l.Read, l.Used + l.RejectedTotal);
            Assert.Equal(20 * 144, l.Used);
            Assert.Equal(2, l.Rejected[(int)RejectReason.OutsidePlausibleSpan] + l.Rejected[(int)RejectReason.BadTimestamp]);
        }
    }
}
