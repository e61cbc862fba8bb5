using FoulingWatch.Analysis.Trends;

namespace FoulingWatch.Analysis.Tests.Trends;

public class OutagesTests
{
    // Synthetic: a cleaning outage from day 60 06:00 to day 62 08:00 (2-hour samples), fouling reset at the restart. The
    // detected cleaning must carry the outage's exact start and end, and the new cycle must start at the restart instead
    // of at the next daily point (the day after).
    [Fact]
    public void A_detected_cleaning_is_dated_by_its_outage_and_the_new_cycle_starts_at_the_restart()
    {
        var x = TestExchangers.Simple();
        const double from = 60 + 6 / 24.0, to = 62 + 8 / 24.0;
        double Rf(double d) => d < from ? 1e-4 + 8e-6 * d : 2e-5 + 8e-6 * (d - to);
        var h = TestExchangers.History(x, Rf, 120, 2e-5, seed: 5, down: d => d >= from && d < to);
        var trend = TrendAnalysis.Run(h);
        var c = Assert.Single(trend.Cleanings, e => e.Cleaning.Source == CleaningSource.Detected).Cleaning;
        Assert.Equal(TestExchangers.Start.AddDays(60).AddHours(6), c.OutageStart);
        Assert.Equal(TestExchangers.Start.AddDays(62).AddHours(8), c.OutageEnd);
        Assert.Equal(c.OutageEnd, c.Date);
        Assert.Equal(c.Date, trend.Cycles[^1].Start);
        // the restart day (62) holds only samples after the restart: it opens the new cycle
        Assert.Equal(TestExchangers.Start.AddDays(62), trend.Cycles[^1].Points[0].Day);
    }
}
