namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>Finds measurements that hold one value too long: runs of identical interval values.</summary>
/// <remarks>
/// A live transmitter's reading moves with process noise from one interval to the next; a run of exactly equal values
/// (the historian repeating the last good value, a stuck or out-of-service transmitter) that lasts at least the frozen-value
/// time is marked (common practice in data validation; "flat-line" check). Missing intervals end a run.
/// </remarks>
public static class FrozenValues
{
    /// <summary>For each interval, the index of the first measurement frozen there, or −1.</summary>
    public static int[] Mark(double[][] series, int intervals, int minimumRun)
    {
        var frozen = new int[intervals];
        Array.Fill(frozen, -1);
        if (minimumRun < 2) return frozen;
        for (var m = 0; m < series.Length; m++)
        {
            var s = series[m];
            var start = 0;
            for (var k = 1; k <= intervals; k++)
            {
                if (k < intervals && !double.IsNaN(s[k]) && s[k] == s[k - 1]) continue;
                if (k - start >= minimumRun && !double.IsNaN(s[start]))
                    for (var i = start; i < k; i++) if (frozen[i] < 0) frozen[i] = m;
                start = k;
            }
        }
        return frozen;
    }
}
