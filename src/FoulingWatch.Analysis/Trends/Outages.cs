using FoulingWatch.Analysis.BackCalculation;

namespace FoulingWatch.Analysis.Trends;

/// <summary>Locates the outage of a cleaning in the samples: the longest run of downtime near a date.</summary>
/// <remarks>
/// A cleaning takes the exchanger out of service: its flows fall below the downtime fraction. The outage is the longest
/// run of downtime samples within <see cref="Reach"/> of the date (gaps of missing samples up to <see cref="Bridge"/>
/// inside a run are bridged, a historian often stops recording a unit that is down); the new fouling cycle starts when
/// flow returns at its end (common practice: deposits grow from the restart).
/// </remarks>
public static class Outages
{
    public static readonly TimeSpan Reach = TimeSpan.FromDays(4), Bridge = TimeSpan.FromHours(6);

    /// <summary>Start of the first and end of the last downtime interval of the outage, or null when none is near.</summary>
    public static (DateTimeOffset Start, DateTimeOffset End)? Near(SampleColumns samples, DateTimeOffset date, TimeSpan interval)
    {
        (DateTimeOffset Start, DateTimeOffset End)? best = null;
        DateTimeOffset? runStart = null, runEnd = null;
        void Close()
        {
            if (runStart is { } s && runEnd is { } e && (best is null || e - s > best.Value.End - best.Value.Start)) best = (s, e);
            runStart = runEnd = null;
        }
        for (var k = 0; k < samples.Count; k++)
        {
            var t = samples.Timestamp(k);
            if (t < date - Reach) continue;
            if (t > date + Reach) break;
            var status = samples.Status[k];
            if (status == SampleStatus.Downtime)
            {
                runStart ??= t;
                runEnd = t + interval;
            }
            else if (status != SampleStatus.Missing || (runEnd is { } e && t - e >= Bridge)) Close();
        }
        Close();
        return best;
    }
}
