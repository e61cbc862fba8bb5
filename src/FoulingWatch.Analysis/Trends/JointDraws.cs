using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.Trends;

/// <summary>Joint draws of the current cycle's fouling path: which law (by its Akaike weight), its parameters (from the
/// serial-correlation-aware covariance) and the systematic offset of the measured Rf. Forecasts and cleaning decisions
/// are read from the same draws, so their probabilities agree.</summary>
/// <remarks>
/// Model averaging by Akaike weights wᵢ = exp(−Δᵢ/2)/Σ exp(−Δⱼ/2), Δᵢ = AICcᵢ − min AICc (Burnham &amp; Anderson, Model
/// Selection and Multimodel Inference, 2nd ed., 2002, §2.9 and §4.3). The measured Rf carries a systematic error b
/// (instrument calibration, clean reference) with standard uncertainty u_sys, common to the whole cycle: the true path is
/// f(t) − b, so each draw takes b ~ N(0, u_sys²). A law with parameters outside its domain is drawn again.
/// </remarks>
public sealed class JointDraws
{
    public const int Count = 1000;

    public JointDraws(IReadOnlyList<FoulingModel> models, int[] model, double[][] parameters, double[] offset, double systematicSigma,
        double spread = 1)
    {
        Spread = spread;
        Models = models;
        Model = model;
        Parameters = parameters;
        Offset = offset;
        SystematicSigma = systematicSigma;
    }

    public IReadOnlyList<FoulingModel> Models { get; }
    /// <summary>Index into <see cref="Models"/> of each draw.</summary>
    public int[] Model { get; }
    public double[][] Parameters { get; }
    /// <summary>Systematic error b of the measured Rf in each draw, m²·K/W (true = measured − b).</summary>
    public double[] Offset { get; }
    public double SystematicSigma { get; }
    /// <summary>Factor k ≥ 1 on the parameter spread from the extrapolation check (<see cref="ForecastDiscrepancy"/>).</summary>
    public double Spread { get; }
    public int Length => Model.Length;

    /// <summary>True Rf of draw j at t days since the cycle start.</summary>
    public double TrueValue(int j, double t) => Models[Model[j]].Value(Parameters[j], t) - Offset[j];

    /// <summary>True Rf of draw j at every whole day 0 … into.Length − 1 (<see cref="TrueValue"/> day by day).</summary>
    public void TrueDailyPath(int j, Span<double> into) => Models[Model[j]].DailyPath(Parameters[j], Offset[j], into);

    /// <summary>Days since the cycle start at which the true Rf of draw j reaches the limit (+∞: never).</summary>
    public double Crossing(int j, double limit) => Models[Model[j]].CrossingTime(Parameters[j], limit + Offset[j]);

    /// <summary>Draws the paths of a cycle's fitted candidates, parameter deviations widened by <paramref name="spread"/>;
    /// null when no candidate has a fit.</summary>
    public static JointDraws? Draw(IReadOnlyList<ModelCandidate> candidates, double systematicSigma, int seed, double spread = 1)
    {
        var fitted = candidates.Where(c => c.Fit is not null && double.IsFinite(c.Aicc)).ToList();
        if (fitted.Count == 0) return null;
        var weights = AkaikeWeights(fitted.Select(c => c.Aicc).ToArray());
        var rng = new Random(seed);
        var model = new int[Count];
        var parameters = new double[Count][];
        var offset = new double[Count];
        var factors = fitted.Select(c => CholeskyOf(c.Fit!) * spread).ToArray();
        for (var j = 0; j < Count; j++)
        {
            var u = rng.NextDouble();
            var m = 0;
            for (var acc = weights[0]; m < fitted.Count - 1 && u > acc; acc += weights[++m]) { }
            model[j] = m;
            parameters[j] = DrawParameters(fitted[m].Model, fitted[m].Fit!, factors[m], rng);
            offset[j] = systematicSigma * Gaussian(rng);
        }
        return new JointDraws(fitted.Select(c => c.Model).ToList(), model, parameters, offset, systematicSigma, spread);
    }

    public static double[] AkaikeWeights(double[] aicc)
    {
        var min = aicc.Min();
        var w = aicc.Select(a => Math.Exp(-(a - min) / 2)).ToArray();
        var sum = w.Sum();
        return w.Select(v => v / sum).ToArray();
    }

    public static double Gaussian(Random rng) =>
        Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());

    private static Matrix<double> CholeskyOf(FitResult fit)
    {
        try { return fit.Covariance.Cholesky().Factor; }
        catch (ArgumentException) { return Matrix<double>.Build.DenseDiagonal(fit.Parameters.Length, fit.Parameters.Length, i => fit.StandardErrors[i]); }
    }

    /// <summary>Parameters from N(p̂, Cov) by its Cholesky factor; outside the law's domain drawn again (the estimate itself
    /// after 50 tries).</summary>
    private static double[] DrawParameters(FoulingModel model, FitResult fit, Matrix<double> lower, Random rng)
    {
        var k = fit.Parameters.Length;
        var z = new double[k];
        for (var attempt = 0; attempt < 50; attempt++)
        {
            for (var i = 0; i < k; i++) z[i] = Gaussian(rng);
            var p = new double[k];
            for (var i = 0; i < k; i++)
            {
                p[i] = fit.Parameters[i];
                for (var j = 0; j <= i; j++) p[i] += lower[i, j] * z[j];
            }
            if (!double.IsNaN(model.CrossingTime(p, 1.0))) return p;
        }
        return (double[])fit.Parameters.Clone();
    }

    /// <summary>Two quantiles (low, high) of the true Rf over the draws at t days since the cycle start (a band's two
    /// edges).</summary>
    /// <remarks>The two order statistics by selection (the values <see cref="Quantile"/> takes from the sorted draws); a
    /// sort where a draw is NaN.</remarks>
    public (double Low, double High) ValueQuantiles(double t, double low, double high)
    {
        var v = new double[Length];
        var nan = false;
        for (var j = 0; j < Length; j++) nan |= double.IsNaN(v[j] = TrueValue(j, t));
        if (nan || v.Length == 0)
        {
            Array.Sort(v);
            return (Quantile(v, low), Quantile(v, high));
        }
        return (Sorting.Select(v, QuantileIndex(v.Length, low)), Sorting.Select(v, QuantileIndex(v.Length, high)));
    }

    private static int QuantileIndex(int n, double q) => (int)Math.Clamp(Math.Round(q * (n - 1)), 0, n - 1);

    public static double Quantile(double[] sorted, double q) =>
        sorted.Length == 0 ? double.NaN : sorted[QuantileIndex(sorted.Length, q)];
}
