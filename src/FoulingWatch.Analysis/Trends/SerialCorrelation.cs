using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.Trends;

/// <summary>Turns serially correlated residuals into independent ones, so that least squares on the transformed problem is
/// generalised least squares: errors are a first-order autoregression (process wander) plus white noise (measurement
/// scatter), sampled at irregular times.</summary>
/// <remarks>
/// Standardised errors a = √w·e have correlation c·φ^|Δt| between points Δt days apart (c ≤ 1 the share of the AR(1)
/// part; 1 − c white noise). The whitened values are the Kalman filter's standardised innovations for the state-space form
/// x_i = φ^Δt·x_{i−1} + η, a_i = x_i + ε (Harvey, Forecasting, Structural Time Series Models and the Kalman Filter, 1989,
/// §3.4; from memory); the filter's gains do not depend on the data, so they are computed once. With c = 1 this is exactly
/// the Prais–Winsten transformation (Prais &amp; Winsten 1954, Cowles Commission Discussion Paper 383):
/// z₀ = a₀, zᵢ = (aᵢ − φ^Δtᵢ·aᵢ₋₁)/√(1 − φ^(2Δtᵢ)). Checked in the tests against a reference GLS implementation and the
/// identity LᵀL = Σ⁻¹. AR(1) plus white noise is an ARMA(1,1) process: a plain AR(1) fitted to it sees a lag-one
/// correlation c·φ and so forgets the slow wander that widens a trend's uncertainty.
/// </remarks>
public sealed class Whitening
{
    public static Whitening None { get; } = new([], 0);

    private readonly double[] _decay;  // φ^Δt to the previous point
    private readonly double[] _scale;  // 1/√S, S the innovation variance
    private readonly double[] _gain;   // Kalman gain K = P/S

    public Whitening(double[] t, double phi, double share = 1)
    {
        Phi = phi;
        Share = share;
        var n = t.Length;
        _decay = new double[n];
        _scale = new double[n];
        _gain = new double[n];
        if (phi == 0) return;
        var posterior = 0.0;
        for (var i = 0; i < n; i++)
        {
            var r = i == 0 ? 0 : Math.Pow(phi, t[i] - t[i - 1]);
            var prior = i == 0 ? share : r * r * posterior + share * (1 - r * r);
            var s = prior + (1 - share);
            _decay[i] = r;
            _scale[i] = 1 / Math.Sqrt(s);
            _gain[i] = prior / s;
            posterior = prior * (1 - share) / s;
            LogDeterminantTerm += Math.Log(s);
        }
    }

    /// <summary>φ, the correlation of the AR(1) part one day apart.</summary>
    public double Phi { get; }

    /// <summary>c, the AR(1) part's share of the standardised error variance (1: no white noise).</summary>
    public double Share { get; }

    /// <summary>ln det Σ = Σ ln Sᵢ of the standardised errors' correlation matrix (0 for independent errors).</summary>
    public double LogDeterminantTerm { get; }

    public bool IsNone => Phi == 0;

    /// <summary>L⁻¹·√W·v (LLᵀ = Σ); with φ = 0 the vector itself (the weights are then applied by the caller).</summary>
    public double[] Apply(double[] v, double[] weights)
    {
        if (IsNone) return v;
        var z = new double[v.Length];
        var state = 0.0;
        for (var i = 0; i < v.Length; i++)
        {
            var predicted = _decay[i] * state;
            var innovation = Math.Sqrt(weights[i]) * v[i] - predicted;
            z[i] = innovation * _scale[i];
            state = predicted + _gain[i] * innovation;
        }
        return z;
    }

    /// <summary>In place on every k-th element from <paramref name="offset"/> (one column of a row-major n × k matrix).</summary>
    public void ApplyInPlace(Span<double> v, double[] weights, int stride = 1, int offset = 0)
    {
        if (IsNone) return;
        var state = 0.0;
        for (var i = 0; i < weights.Length; i++)
        {
            ref var x = ref v[i * stride + offset];
            var predicted = _decay[i] * state;
            var innovation = Math.Sqrt(weights[i]) * x - predicted;
            x = innovation * _scale[i];
            state = predicted + _gain[i] * innovation;
        }
    }

    /// <summary><see cref="ApplyInPlace(Span{double}, double[], int, int)"/> on the values and on each column of the
    /// row-major n × k Jacobian, in one pass:
    /// the k + 1 filters are independent, so they run side by side instead of one after another (the same arithmetic
    /// for each; a filter's steps depend on each other, which makes one filter at a time wait on every step).</summary>
    public void ApplyInPlace(Span<double> values, Span<double> jacobian, int k, double[] weights)
    {
        if (IsNone) return;
        if (k == 3) { ApplyInPlace3(values, jacobian, weights); return; }
        ApplyInPlace(values, weights);
        for (var j = 0; j < k; j++) ApplyInPlace(jacobian, weights, k, j);
    }

    private void ApplyInPlace3(Span<double> values, Span<double> jacobian, double[] weights)
    {
        double s0 = 0, s1 = 0, s2 = 0, s3 = 0;
        for (var i = 0; i < weights.Length; i++)
        {
            var root = Math.Sqrt(weights[i]);
            double decay = _decay[i], scale = _scale[i], gain = _gain[i];
            ref var v = ref values[i];
            ref var j0 = ref jacobian[3 * i];
            ref var j1 = ref jacobian[3 * i + 1];
            ref var j2 = ref jacobian[3 * i + 2];
            double p0 = decay * s0, p1 = decay * s1, p2 = decay * s2, p3 = decay * s3;
            double n0 = root * v - p0, n1 = root * j0 - p1, n2 = root * j1 - p2, n3 = root * j2 - p3;
            (v, j0, j1, j2) = (n0 * scale, n1 * scale, n2 * scale, n3 * scale);
            (s0, s1, s2, s3) = (p0 + gain * n0, p1 + gain * n1, p2 + gain * n2, p3 + gain * n3);
        }
    }

    public Matrix<double> ApplyColumns(Matrix<double> m, double[] weights)
    {
        if (IsNone) return m;
        var result = Matrix<double>.Build.Dense(m.RowCount, m.ColumnCount);
        for (var j = 0; j < m.ColumnCount; j++)
        {
            var z = Apply(m.Column(j).ToArray(), weights);
            for (var i = 0; i < z.Length; i++) result[i, j] = z[i];
        }
        return result;
    }

    /// <summary>(φ, c) from standardised residuals: the autocorrelations ρ_k at lags of k = 1…4 days (pairs within a quarter
    /// day of the lag) follow ρ_k = c·φ^k, so ln ρ_k against k gives ln φ (slope) and ln c (intercept) over the leading
    /// positive lags; with only ρ₁ positive, φ = ρ₁ and c = 1. φ is clamped to [0, 0.98], c to (0, 1]; (0, 1) with fewer
    /// than five pairs at lag one.</summary>
    public static (double Phi, double Share) Estimate(double[] t, double[] residual, double[] weights)
    {
        var a = residual.Select((r, i) => Math.Sqrt(weights[i]) * r).ToArray();
        var variance = a.Sum(v => v * v) / Math.Max(1, a.Length);
        if (!(variance > 0)) return (0, 1);
        var rho = new List<double>();
        var lagOnePairs = 0;
        for (var k = 1; k <= 4; k++)
        {
            double sum = 0;
            var pairs = 0;
            for (var i = 0; i < t.Length; i++)
            for (var j = i + 1; j < t.Length && t[j] - t[i] <= k + 0.25; j++)
                if (t[j] - t[i] >= k - 0.25) { sum += a[i] * a[j]; pairs++; }
            if (k == 1 && pairs < 5) return (0, 1);
            var r = pairs > 0 ? sum / pairs / variance : 0;
            if (k == 1) lagOnePairs = pairs;
            if (!(r > 0.02)) break;
            rho.Add(r);
        }
        if (rho.Count == 0) return (0, 1);
        if (rho.Count == 1) return (Debiased(rho[0], lagOnePairs), 1);
        double mk = 0, ml = 0, skk = 0, skl = 0;
        for (var k = 0; k < rho.Count; k++) { mk += k + 1; ml += Math.Log(rho[k]); }
        mk /= rho.Count;
        ml /= rho.Count;
        for (var k = 0; k < rho.Count; k++)
        {
            skk += (k + 1 - mk) * (k + 1 - mk);
            skl += (k + 1 - mk) * (Math.Log(rho[k]) - ml);
        }
        var phi = Math.Clamp(Math.Exp(skl / skk), 0, 0.98);
        var share = phi > 0 ? Math.Clamp(Math.Exp(ml - mk * Math.Log(phi)), 1e-3, 1) : 1;
        return (Debiased(phi, lagOnePairs), share);
    }

    /// <summary>φ̂ + (1 + 3φ̂)/n, clamped to [0, 0.98]: residual autocorrelation underestimates φ in short series by about
    /// (1 + 3φ)/n (Kendall, Biometrika 41 (1954) 403; Marriott &amp; Pope, Biometrika 41 (1954) 390; from memory), which
    /// would make a trend's standard error too small.</summary>
    private static double Debiased(double phi, int n) => Math.Clamp(phi + (1 + 3 * phi) / Math.Max(1, n), 0, 0.98);
}

public static partial class LeastSquares
{
    /// <summary>Weighted least squares with AR(1)-plus-white-noise errors (feasible GLS): a plain fit, (φ, c) from its
    /// residuals, a whitened fit, then (φ, c) once more from the whitened fit's residuals and the final whitened fit
    /// (Cochrane–Orcutt iteration; Cochrane &amp; Orcutt, JASA 44 (1949) 32). With <paramref name="fixedPhi"/> the given φ
    /// (and <paramref name="fixedShare"/>) are used instead.</summary>
    public static FitResult? FitWithSerialCorrelation(FoulingModel model, double[] t, double[] y, double[] weights, double? fixedPhi = null,
        double fixedShare = 1)
    {
        if (fixedPhi is { } given) return Fit(model, t, y, weights, new Whitening(t, given, fixedShare));
        var fit = Fit(model, t, y, weights);
        for (var round = 0; round < 2 && fit is not null; round++)
        {
            var residual = t.Select((ti, i) => y[i] - model.Value(fit.Parameters, ti)).ToArray();
            var (phi, share) = Whitening.Estimate(t, residual, weights);
            if (phi == 0) return fit;
            var next = Fit(model, t, y, weights, new Whitening(t, phi, share), [fit.Parameters.ToArray(), .. model.StartingPoints(t, y)]);
            if (next is null) return fit;
            fit = next;
        }
        return fit;
    }
}
