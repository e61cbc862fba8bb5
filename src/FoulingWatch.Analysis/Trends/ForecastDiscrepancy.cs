namespace FoulingWatch.Analysis.Trends;

/// <summary>How well the cycle's candidate laws extrapolate, checked on the cycle itself: a widening factor k ≥ 1 for the
/// forecast's parameter spread when the law family cannot follow the data (model-form error).</summary>
/// <remarks>
/// Rolling-origin evaluation (Tashman, Int. J. Forecasting 16 (2000) 437; from memory): the laws are refitted on the first
/// 50, 60 and 70 % of the cycle's days and the AICc-best one predicts the mean Rf of the last 20 % of days. Each error is
/// standardised by its predicted standard deviation (the fit's parameter covariance by the delta method, plus the AR(1)
/// plus white-noise error of the observed mean); k = √max(1, mean z²). When a law outside the family (an accelerating
/// cycle, a change of crude) drives the data, the early fits miss the late days by many standard deviations and the
/// forecast widens accordingly; when the family fits, z² averages about one and k stays near one.
/// </remarks>
public static class ForecastDiscrepancy
{
    public static readonly double[] Origins = [0.5, 0.6, 0.7];
    public const double TestShare = 0.2;
    public const int MinimumTraining = 20, MinimumTest = 5;

    /// <param name="fit">Fits the candidate laws to a subset of the cycle's days.</param>
    public static double Factor(Func<DailyPoint, double> time, IReadOnlyList<DailyPoint> points, Func<List<DailyPoint>, List<ModelCandidate>> fit)
    {
        var n = points.Count;
        var testStart = n - Math.Max(MinimumTest, (int)Math.Round(TestShare * n));
        var test = points.Skip(testStart).ToList();
        var z2 = new List<double>();
        foreach (var origin in Origins)
        {
            var trainCount = Math.Min(testStart, (int)Math.Round(origin * n));
            if (trainCount < MinimumTraining || test.Count < MinimumTest) continue;
            var best = fit(points.Take(trainCount).ToList()).Where(c => c.Fit is not null).MinBy(c => c.Aicc);
            if (best?.Fit is not { } f) continue;
            var z = Standardised(best.Model, f, test, time);
            if (double.IsFinite(z)) z2.Add(z * z);
        }
        return z2.Count < 2 ? 1 : Math.Sqrt(Math.Max(1, z2.Average()));
    }

    private static double Standardised(FoulingModel model, FitResult f, List<DailyPoint> test, Func<DailyPoint, double> time)
    {
        var k = f.Parameters.Length;
        var m = test.Count;
        var g = new double[k];
        Span<double> gi = stackalloc double[k];
        double predicted = 0, observed = 0;
        foreach (var p in test)
        {
            var t = time(p);
            predicted += model.Value(f.Parameters, t) / m;
            observed += p.FoulingResistance / m;
            model.Gradient(f.Parameters, t, gi);
            for (var j = 0; j < k; j++) g[j] += gi[j] / m;
        }
        var parameter = 0.0;
        for (var a = 0; a < k; a++)
        for (var b = 0; b < k; b++) parameter += g[a] * f.Covariance[a, b] * g[b];
        // Residual variance per day in Rf units: s² = whitened RSS/(n − k) scaled by each day's weight 1/σ².
        var s2 = f.WeightedResidualSumOfSquares / Math.Max(1, f.DegreesOfFreedom);
        var noise = 0.0;
        for (var i = 0; i < m; i++)
        for (var l = 0; l < m; l++)
        {
            var rho = i == l ? 1 : f.AutocorrelatedShare * Math.Pow(f.Autocorrelation, Math.Abs(time(test[i]) - time(test[l])));
            noise += rho * Math.Sqrt(s2) * Sigma(test[i]) * Math.Sqrt(s2) * Sigma(test[l]);
        }
        noise /= (double)m * m;
        return (observed - predicted) / Math.Sqrt(parameter + noise);
    }

    private static double Sigma(DailyPoint p) => Math.Max(p.Sigma, 1e-7);
}
