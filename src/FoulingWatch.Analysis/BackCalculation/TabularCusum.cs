namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>The first alarm of a two-sided tabular CUSUM, or none.</summary>
/// <param name="AlarmIndex">Index of the first observation at which an upper or lower sum exceeds H; −1 when none does.</param>
/// <param name="OnsetIndex">First observation of the run that led to the alarm (alarm index − N + 1, with N the number of
/// consecutive non-zero sums), the usual estimate of where the shift began; −1 without an alarm.</param>
/// <param name="Upward">The upper sum alarmed (the mean moved up).</param>
public readonly record struct CusumAlarm(int AlarmIndex, int OnsetIndex, bool Upward)
{
    public bool Found => AlarmIndex >= 0;
}

/// <summary>Two-sided tabular (decision-interval) CUSUM of Page (1954).</summary>
/// <remarks>
/// Page, E. S. (1954), "Continuous inspection schemes", Biometrika 41, 100–115. Tabular form as in Montgomery,
/// Introduction to Statistical Quality Control, ch. 9 (from memory): C⁺ᵢ = max(0, xᵢ − (μ₀ + K) + C⁺ᵢ₋₁),
/// C⁻ᵢ = max(0, (μ₀ − K) − xᵢ + C⁻ᵢ₋₁), alarm when either exceeds H; with K = σ/2 and H = 5σ the in-control average run
/// length is about 465 for independent normal data. NaN observations are skipped (the sums hold).
/// </remarks>
public static class TabularCusum
{
    public static CusumAlarm FirstAlarm(ReadOnlySpan<double> x, double target, double k, double h)
    {
        double upper = 0, lower = 0;
        int runUp = 0, runDown = 0;
        for (var i = 0; i < x.Length; i++)
        {
            if (double.IsNaN(x[i])) continue;
            upper = Math.Max(0, x[i] - (target + k) + upper);
            lower = Math.Max(0, target - k - x[i] + lower);
            runUp = upper > 0 ? runUp + 1 : 0;
            runDown = lower > 0 ? runDown + 1 : 0;
            if (upper > h) return new CusumAlarm(i, i - runUp + 1, true);
            if (lower > h) return new CusumAlarm(i, i - runDown + 1, false);
        }
        return new CusumAlarm(-1, -1, false);
    }
}
