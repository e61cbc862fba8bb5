using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.Trends;

/// <summary>A fouling-growth law Rf(t), t in days since the cycle start.</summary>
public abstract class FoulingModel
{
    public abstract string Key { get; }
    public abstract string Formula { get; }
    public abstract string Source { get; }
    public abstract string[] ParameterNames { get; }
    public abstract double Value(ReadOnlySpan<double> p, double t);
    /// <summary>∂Rf/∂p at t.</summary>
    public abstract void Gradient(ReadOnlySpan<double> p, double t, Span<double> g);
    /// <summary>dRf/dt at t.</summary>
    public abstract double Rate(ReadOnlySpan<double> p, double t);
    /// <summary>Starting points for the least-squares fit, from the data.</summary>
    public abstract IEnumerable<double[]> StartingPoints(double[] t, double[] y);
    public virtual double[]? LowerBounds(double[] t, double[] y) => null;
    /// <summary>Days t at which Rf(t) reaches the limit; +∞ when it never does; NaN for parameters outside the model's domain.</summary>
    public abstract double CrossingTime(ReadOnlySpan<double> p, double limit);
    public virtual double[]? UpperBounds(double[] t, double[] y) => null;

    /// <summary>Rf(a) − offset at every whole day a = 0 … into.Length − 1: the same numbers as <see cref="Value"/> day by
    /// day, in one call per path (the economics price a thousand five-year paths per exchanger).</summary>
    /// <summary><see cref="Value"/> and <see cref="Gradient"/> at t in one call (the same numbers; a law may share the
    /// work of the two, as the fits ask for both at every point of every iteration).</summary>
    public virtual double ValueAndGradient(ReadOnlySpan<double> p, double t, Span<double> g)
    {
        Gradient(p, t, g);
        return Value(p, t);
    }

    public virtual void DailyPath(ReadOnlySpan<double> p, double offset, Span<double> into)
    {
        for (var a = 0; a < into.Length; a++) into[a] = Value(p, a) - offset;
    }
}

/// <summary>Linear fouling Rf = R0 + a·t (constant deposition rate; e.g. Epstein's classification of fouling curves, 1983).</summary>
public sealed class LinearFouling : FoulingModel
{
    public override string Key => "linear";
    public override string Formula => "Rf = R0 + a·t";
    public override string Source => "linear growth (constant net deposition rate)";
    public override string[] ParameterNames => ["R0_m2K_per_W", "a_m2K_per_W_per_day"];
    public override double Value(ReadOnlySpan<double> p, double t) => p[0] + p[1] * t;
    public override void Gradient(ReadOnlySpan<double> p, double t, Span<double> g) { g[0] = 1; g[1] = t; }
    public override double Rate(ReadOnlySpan<double> p, double t) => p[1];
    public override double CrossingTime(ReadOnlySpan<double> p, double limit) => limit <= p[0] ? 0 : p[1] > 0 ? (limit - p[0]) / p[1] : double.PositiveInfinity;

    public override IEnumerable<double[]> StartingPoints(double[] t, double[] y)
    {
        double mt = t.Average(), my = y.Average(), sxy = 0, sxx = 0;
        for (var i = 0; i < t.Length; i++) { sxy += (t[i] - mt) * (y[i] - my); sxx += (t[i] - mt) * (t[i] - mt); }
        var a = sxx > 0 ? sxy / sxx : 0;
        yield return [my - a * mt, a];
    }
}

/// <summary>Asymptotic fouling Rf = R0 + R∞·(1 − e^(−t/τ)) (Kern &amp; Seaton, Br. Chem. Eng. 4 (1959) 258–262).</summary>
public sealed class AsymptoticFouling : FoulingModel
{
    public override string Key => "asymptotic";
    public override string Formula => "Rf = R0 + Rinf·(1 − exp(−t/tau))";
    public override string Source => "Kern & Seaton (1959)";
    public override string[] ParameterNames => ["R0_m2K_per_W", "Rinf_m2K_per_W", "tau_days"];
    public override double Value(ReadOnlySpan<double> p, double t) => p[0] + p[1] * (1 - Math.Exp(-t / p[2]));

    public override void Gradient(ReadOnlySpan<double> p, double t, Span<double> g)
    {
        var e = Math.Exp(-t / p[2]);
        g[0] = 1;
        g[1] = 1 - e;
        g[2] = -p[1] * t / (p[2] * p[2]) * e;
    }

    public override double ValueAndGradient(ReadOnlySpan<double> p, double t, Span<double> g)
    {
        var e = Math.Exp(-t / p[2]);
        g[0] = 1;
        g[1] = 1 - e;
        g[2] = -p[1] * t / (p[2] * p[2]) * e;
        return p[0] + p[1] * (1 - e);
    }

    public override double Rate(ReadOnlySpan<double> p, double t) => p[1] / p[2] * Math.Exp(-t / p[2]);
    public override double CrossingTime(ReadOnlySpan<double> p, double limit) =>
        !(p[2] > 0) || p[1] < 0 ? double.NaN : limit <= p[0] ? 0 : limit - p[0] >= p[1] ? double.PositiveInfinity : -p[2] * Math.Log(1 - (limit - p[0]) / p[1]);

    public override IEnumerable<double[]> StartingPoints(double[] t, double[] y)
    {
        var span = Math.Max(1, t.Max() - t.Min());
        var rise = Math.Max(Math.Abs(y[^1] - y[0]), 1e-6);
        foreach (var f in new[] { 0.2, 0.5, 1.0, 3.0 })
            yield return [y[0], rise * (1 + f), span * f];
    }

    // MathNet's bounded LM needs finite bounds: ±1 m2K/W is far beyond any real fouling resistance.
    public override double[] LowerBounds(double[] t, double[] y) => [-1.0, 0, 0.05];
    public override double[] UpperBounds(double[] t, double[] y) => [1.0, 1.0, 1e5];
}

/// <summary>Power-law fouling Rf = R0 + a·(t/s)ⁿ with the exponent in a band and a fixed time scale s (days): the shared
/// form of the falling-rate and accelerating laws.</summary>
/// <remarks>The time scale keeps a of the order of Rf itself, which the bounded Levenberg–Marquardt search needs: with
/// s = 1 day and n near 2, a would be ~1e-8 and lie at the bottom of its bound's resolution.</remarks>
public abstract class PowerLawFouling(double nLow, double nHigh, double[] startExponents, double scaleDays) : FoulingModel
{
    private double S(double t) => Math.Max(t, 0) / scaleDays;

    public override double Value(ReadOnlySpan<double> p, double t) => p[0] + p[1] * Math.Pow(S(t), p[2]);

    public override void DailyPath(ReadOnlySpan<double> p, double offset, Span<double> into)
    {
        double r0 = p[0], a1 = p[1], n = p[2];
        for (var a = 0; a < into.Length; a++) into[a] = r0 + a1 * Math.Pow(S(a), n) - offset;
    }

    public override void Gradient(ReadOnlySpan<double> p, double t, Span<double> g)
    {
        var tn = Math.Pow(S(t), p[2]);
        g[0] = 1;
        g[1] = tn;
        g[2] = t > 0 ? p[1] * tn * Math.Log(S(t)) : 0;
    }

    public override double ValueAndGradient(ReadOnlySpan<double> p, double t, Span<double> g)
    {
        var tn = Math.Pow(S(t), p[2]);
        g[0] = 1;
        g[1] = tn;
        g[2] = t > 0 ? p[1] * tn * Math.Log(S(t)) : 0;
        return p[0] + p[1] * tn;
    }

    public override double Rate(ReadOnlySpan<double> p, double t) =>
        t > 0 ? p[1] * p[2] * Math.Pow(S(t), p[2] - 1) / scaleDays : p[2] < 1 ? double.PositiveInfinity : p[2] == 1 ? p[1] / scaleDays : 0;

    /// <summary>NaN for an exponent outside the law's domain (a draw well beyond its band).</summary>
    protected abstract bool InDomain(double n);

    public override double CrossingTime(ReadOnlySpan<double> p, double limit) =>
        !InDomain(p[2]) ? double.NaN : limit <= p[0] ? 0 : p[1] > 0 ? scaleDays * Math.Pow((limit - p[0]) / p[1], 1 / p[2]) : double.PositiveInfinity;

    public override IEnumerable<double[]> StartingPoints(double[] t, double[] y)
    {
        foreach (var n in startExponents)
        {
            var x = t.Select(v => Math.Pow(S(v), n)).ToArray();
            double mx = x.Average(), my = y.Average(), sxy = 0, sxx = 0;
            for (var i = 0; i < x.Length; i++) { sxy += (x[i] - mx) * (y[i] - my); sxx += (x[i] - mx) * (x[i] - mx); }
            var a = sxx > 0 ? Math.Max(sxy / sxx, 1e-12) : 1e-9;
            yield return [my - a * mx, a, n];
        }
    }

    public override double[] LowerBounds(double[] t, double[] y) => [-1.0, 0, nLow];
    public override double[] UpperBounds(double[] t, double[] y) => [1.0, 1.0, nHigh];
}

/// <summary>Falling-rate fouling Rf = R0 + a·tⁿ with 0 &lt; n &lt; 1 (power-law growth whose rate falls with time).</summary>
public sealed class FallingRateFouling() : PowerLawFouling(0.02, 0.999, [0.3, 0.5, 0.8], 1)
{
    public override string Key => "falling-rate";
    public override string Formula => "Rf = R0 + a·t^n, 0 < n < 1";
    public override string Source => "falling-rate (power-law) fouling";
    public override string[] ParameterNames => ["R0_m2K_per_W", "a_m2K_per_W_per_day_n", "n"];
    protected override bool InDomain(double n) => n > 0 && n <= 1.5;
}

/// <summary>Accelerating fouling Rf = R0 + a·(t/100 d)ⁿ with 1 &lt; n ≤ 3: a rate that grows with time, as after an induction
/// period or when the deposit's roughness speeds deposition (one of the classic shapes of fouling curves, e.g. Epstein,
/// Heat Transfer Eng. 4 (1983) 43; from memory). The most urgent shape to forecast well: a line through it is late.</summary>
public sealed class AcceleratingFouling() : PowerLawFouling(1.001, 3.0, [1.3, 1.7, 2.3], 100)
{
    public override string Key => "accelerating";
    public override string Formula => "Rf = R0 + a·(t/100 d)^n, 1 < n ≤ 3";
    public override string Source => "accelerating (power-law) fouling";
    public override string[] ParameterNames => ["R0_m2K_per_W", "a_m2K_per_W_at_100_days", "n"];
    protected override bool InDomain(double n) => n > 0.5 && n <= 4;
}

/// <summary>A least-squares fit of a model: parameters, covariance s²(JᵀWJ)⁻¹, weighted residual sum of squares.</summary>
/// <param name="Autocorrelation">φ, the AR(1) coefficient of the standardised residuals per day (0: independent errors);
/// with φ &gt; 0 the residual sum of squares and covariance are those of the whitened problem (see <see cref="Whitening"/>).</param>
/// <param name="LogDeterminantTerm">ln det Σ of the standardised errors' correlation matrix, the whitening's contribution to
/// −2 ln L (0 for φ = 0).</param>
/// <param name="AutocorrelatedShare">c, the AR(1) part's share of the error variance (the rest white noise).</param>
public sealed record FitResult(double[] Parameters, double[] StandardErrors, Matrix<double> Covariance, double WeightedResidualSumOfSquares,
    int Observations, double Autocorrelation = 0, double LogDeterminantTerm = 0, double AutocorrelatedShare = 1)
{
    public int DegreesOfFreedom => Observations - Parameters.Length;
    public double ResidualStandardDeviation => Math.Sqrt(WeightedResidualSumOfSquares / Math.Max(1, DegreesOfFreedom));
}

/// <summary>Weighted nonlinear least squares by Levenberg–Marquardt (<see cref="LevenbergMarquardt"/>), best of several
/// starting points.</summary>
public static partial class LeastSquares
{
    public static FitResult? Fit(FoulingModel model, double[] t, double[] y, double[] weights, IEnumerable<double[]>? starts = null) =>
        Fit(model, t, y, weights, Whitening.None, starts);

    private static FitResult? Fit(FoulingModel model, double[] t, double[] y, double[] weights, Whitening whitening,
        IEnumerable<double[]>? starts = null)
    {
        var n = t.Length;
        var obs = whitening.Apply(y, weights);
        if (ReferenceEquals(obs, y)) obs = (double[])y.Clone();
        var w = whitening.IsNone ? weights : Enumerable.Repeat(1.0, n).ToArray();
        var k = model.ParameterNames.Length;
        void Evaluate(ReadOnlySpan<double> p, Span<double> values, Span<double> jacobian)
        {
            for (var i = 0; i < n; i++)
            {
                values[i] = model.ValueAndGradient(p, t[i], jacobian.Slice(i * k, k));
            }
            whitening.ApplyInPlace(values, jacobian, k, weights);
        }
        var lower = model.LowerBounds(t, y);
        var upper = model.UpperBounds(t, y);
        FitResult? best = null;
        foreach (var start in starts ?? model.StartingPoints(t, y))
        {
            if (lower is not null) for (var j = 0; j < k; j++) start[j] = Math.Max(start[j], lower[j] + 1e-12 * Math.Max(1, Math.Abs(lower[j])));
            if (upper is not null) for (var j = 0; j < k; j++) start[j] = Math.Min(start[j], upper[j] - 1e-12 * Math.Max(1, Math.Abs(upper[j])));
            var p = (double[])start.Clone();
            var lm = new LevenbergMarquardt();
            try { if (!lm.Minimise(Evaluate, obs, w, p, lower, upper)) continue; }
            catch (Exception ex) when (ex is ArithmeticException or ArgumentException) { continue; }
            if (p.Any(v => !double.IsFinite(v))) continue;
            var fit = Finish(model, t, y, weights, p, whitening);
            if (fit is not null && (best is null || fit.WeightedResidualSumOfSquares < best.WeightedResidualSumOfSquares)) best = fit;
        }
        return best;
    }

    /// <summary>Covariance s²·(JᵀWJ)⁻¹ at the solution with s² = RSS_w/(n − k) (the usual estimate; as NIST StRD certifies);
    /// for a whitened fit the same on the whitened residuals and Jacobian.</summary>
    private static FitResult? Finish(FoulingModel model, double[] t, double[] y, double[] w, double[] p, Whitening whitening)
    {
        var n = t.Length;
        var k = p.Length;
        var residual = new double[n];
        var jacobian = Matrix<double>.Build.Dense(n, k);
        Span<double> g = stackalloc double[k];
        for (var i = 0; i < n; i++)
        {
            residual[i] = y[i] - model.Value(p, t[i]);
            model.Gradient(p, t[i], g);
            for (var a = 0; a < k; a++) jacobian[i, a] = g[a];
        }
        var z = whitening.Apply(residual, w);
        var jw = whitening.ApplyColumns(jacobian, w);
        var rss = 0.0;
        var jtj = Matrix<double>.Build.Dense(k, k);
        for (var i = 0; i < n; i++)
        {
            var wi = whitening.IsNone ? w[i] : 1.0;
            rss += wi * z[i] * z[i];
            for (var a = 0; a < k; a++)
            for (var b = 0; b < k; b++) jtj[a, b] += wi * jw[i, a] * jw[i, b];
        }
        if (n <= k) return null;
        Matrix<double> inverse;
        try { inverse = jtj.Inverse(); } catch (ArgumentException) { return null; }
        if (!inverse.Enumerate().All(double.IsFinite)) return null;
        var cov = inverse * (rss / (n - k));
        var se = Enumerable.Range(0, k).Select(i => Math.Sqrt(Math.Max(0, cov[i, i]))).ToArray();
        return new FitResult(p, se, cov, rss, n, whitening.Phi, whitening.LogDeterminantTerm, whitening.Share);
    }
}
