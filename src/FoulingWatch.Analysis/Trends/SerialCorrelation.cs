using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.Trends;

/// <summary>The Prais–Winsten transformation for AR(1) errors sampled at irregular times: it turns serially correlated
/// residuals into independent ones, so that least squares on the transformed problem is generalised least squares.</summary>
/// <remarks>
/// Errors e(t) follow a first-order autoregression in continuous time (an Ornstein–Uhlenbeck process), so two points Δt days
/// apart correlate as φ^Δt. With a = √w·e (standardised), z₀ = a₀ and zᵢ = (aᵢ − φ^Δtᵢ·aᵢ₋₁)/√(1 − φ^(2Δtᵢ)) are
/// independent with equal variance. Source: Prais &amp; Winsten (1954), Cowles Commission Discussion Paper 383; the
/// equivalence with GLS under Σᵢⱼ = φ^|tᵢ − tⱼ| is the textbook result (e.g. Greene, Econometric Analysis, ch. 20;
/// from memory) and is checked in the tests against the explicit GLS solution.
/// </remarks>
public sealed class Whitening
{
    public static Whitening None { get; } = new([], 0);

    private readonly double[] _t;

    public Whitening(double[] t, double phi)
    {
        _t = t;
        Phi = phi;
        for (var i = 1; i < t.Length && phi > 0; i++) LogDeterminantTerm += Math.Log(1 - Math.Pow(phi, 2 * (t[i] - t[i - 1])));
    }

    /// <summary>φ, the correlation of errors one day apart.</summary>
    public double Phi { get; }

    /// <summary>Σ ln(1 − φ^(2Δtᵢ)) = −2·ln|det L| of the transformation L.</summary>
    public double LogDeterminantTerm { get; }

    public bool IsNone => Phi == 0;

    /// <summary>L·√W·v; with φ = 0 the vector itself (the weights are then applied by the caller).</summary>
    public double[] Apply(double[] v, double[] weights)
    {
        if (IsNone) return v;
        var z = new double[v.Length];
        var previous = 0.0;
        for (var i = 0; i < v.Length; i++)
        {
            var a = Math.Sqrt(weights[i]) * v[i];
            if (i == 0) z[i] = a;
            else
            {
                var r = Math.Pow(Phi, _t[i] - _t[i - 1]);
                z[i] = (a - r * previous) / Math.Sqrt(1 - r * r);
            }
            previous = a;
        }
        return z;
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

    /// <summary>φ estimated from standardised residuals: the lag-one regression over pairs at most 1.5 days apart, clamped
    /// to [0, 0.98]; 0 with fewer than five pairs.</summary>
    public static double EstimatePhi(double[] t, double[] residual, double[] weights)
    {
        double num = 0, den = 0;
        var pairs = 0;
        for (var i = 1; i < t.Length; i++)
        {
            if (t[i] - t[i - 1] > 1.5) continue;
            var a = Math.Sqrt(weights[i]) * residual[i];
            var b = Math.Sqrt(weights[i - 1]) * residual[i - 1];
            num += a * b;
            den += b * b;
            pairs++;
        }
        return pairs < 5 || !(den > 0) ? 0 : Math.Clamp(num / den, 0, 0.98);
    }
}

public static partial class LeastSquares
{
    /// <summary>Weighted least squares with AR(1) errors (feasible GLS): a plain fit, φ from its residuals, a whitened fit,
    /// then φ once more from the whitened fit's residuals and the final whitened fit (Cochrane–Orcutt iteration; Cochrane
    /// &amp; Orcutt, JASA 44 (1949) 32). With <paramref name="fixedPhi"/> the given φ is used instead.</summary>
    public static FitResult? FitWithSerialCorrelation(FoulingModel model, double[] t, double[] y, double[] weights, double? fixedPhi = null)
    {
        if (fixedPhi is { } given) return Fit(model, t, y, weights, new Whitening(t, given));
        var fit = Fit(model, t, y, weights);
        for (var round = 0; round < 2 && fit is not null; round++)
        {
            var residual = t.Select((ti, i) => y[i] - model.Value(fit.Parameters, ti)).ToArray();
            var phi = Whitening.EstimatePhi(t, residual, weights);
            if (phi == 0) return fit;
            var next = Fit(model, t, y, weights, new Whitening(t, phi), [fit.Parameters.ToArray(), .. model.StartingPoints(t, y)]);
            if (next is null) return fit;
            fit = next;
        }
        return fit;
    }
}
