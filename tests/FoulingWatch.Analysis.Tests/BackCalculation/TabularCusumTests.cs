using FoulingWatch.Analysis.BackCalculation;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

public class TabularCusumTests
{
    // Montgomery, Introduction to Statistical Quality Control, Example 9.1 (tabular CUSUM; data and results from memory):
    // 30 observations, the first 20 from N(10, 1) and the last 10 from N(11, 1); μ0 = 10, K = 0.5, H = 5. The upper CUSUM
    // first exceeds H at observation 29 (C⁺ = 5.28) with N⁺ = 7 consecutive non-zero sums, so the shift is placed after
    // observation 22.
    private static readonly double[] Example =
    [
        9.45, 7.99, 9.29, 11.66, 12.16, 10.18, 8.04, 11.46, 9.20, 10.34, 9.03, 11.47, 10.51, 9.40, 10.08,
        9.37, 10.62, 10.31, 8.52, 10.84, 10.90, 9.33, 12.29, 11.50, 10.60, 11.08, 10.38, 11.62, 11.31, 10.52,
    ];

    [Fact]
    public void The_textbook_example_alarms_at_observation_29_with_the_shift_after_observation_22()
    {
        var alarm = TabularCusum.FirstAlarm(Example, 10, 0.5, 5);
        Assert.True(alarm.Found);
        Assert.True(alarm.Upward);
        Assert.Equal(29, alarm.AlarmIndex + 1);   // 1-based observation number as in the book
        Assert.Equal(23, alarm.OnsetIndex + 1);   // first observation of the run: the shift lies between 22 and 23
    }

    [Fact]
    public void A_downward_shift_alarms_on_the_lower_sum_and_an_unshifted_series_not_at_all()
    {
        // Analytic: the mirror image of the example about μ0 alarms at the same observation on the lower sum.
        var mirrored = Example.Select(v => 20 - v).ToArray();
        var alarm = TabularCusum.FirstAlarm(mirrored, 10, 0.5, 5);
        Assert.False(alarm.Upward);
        Assert.Equal(28, alarm.AlarmIndex);
        // The first 20 (in control) raise no alarm.
        Assert.False(TabularCusum.FirstAlarm(Example.AsSpan(0, 20), 10, 0.5, 5).Found);
    }
}
