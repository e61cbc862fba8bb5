namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>Outcome of reconciling measurements to one constraint.</summary>
/// <param name="Adjusted">The reconciled measurements.</param>
/// <param name="NormalisedAdjustments">Each adjustment divided by its standard deviation, (x̂ᵢ − xᵢ)/√Vᵢᵢ with V the covariance of the adjustments.</param>
/// <param name="GlobalTest">γ = r²/(J Σ Jᵀ), χ² with one degree of freedom under no gross error.</param>
/// <param name="GrossError">γ exceeds the 95 % χ²(1) critical value 3.841.</param>
public sealed record ReconciliationResult(double[] Adjusted, double[] NormalisedAdjustments, double GlobalTest, bool GrossError, double[] Sensitivities);

/// <summary>
/// Weighted least-squares data reconciliation of measurements subject to one (possibly nonlinear) constraint f(x) = 0,
/// by successive linearisation.
/// </summary>
/// <remarks>
/// Source: Narasimhan &amp; Jordache, Data Reconciliation and Gross Error Detection (2000), ch. 3 (linear
/// reconciliation x̂ = x − ΣJᵀ(JΣJᵀ)⁻¹(Jx − c)) and ch. 5 (nonlinear, successive linearisation); global test
/// γ = rᵀ(JΣJᵀ)⁻¹r ~ χ²(m) with m = 1 constraint here, ch. 7. The χ²(1) 95 % point 3.841 is from the χ² table.
/// </remarks>
public static class Reconciliation
{
    public const double ChiSquare1At95 = 3.841;

    public static ReconciliationResult Reconcile(double[] measured, double[] sigma, Func<double[], double> constraint, int iterations = 5)
    {
        var n = measured.Length;
        var x = (double[])measured.Clone();
        var j = new double[n];
        double jsj = 0, r = 0;
        for (var it = 0; it < iterations; it++)
        {
            Jacobian(constraint, x, sigma, j);
            jsj = 0;
            for (var i = 0; i < n; i++) jsj += j[i] * j[i] * sigma[i] * sigma[i];
            if (!(jsj > 0)) break;
            // Linearise at x: f(x) + J(ξ − x) = 0; the correction is applied to the measurements.
            var fx = constraint(x);
            var lin = fx;
            for (var i = 0; i < n; i++) lin += j[i] * (measured[i] - x[i]);
            r = lin;
            for (var i = 0; i < n; i++) x[i] = measured[i] - sigma[i] * sigma[i] * j[i] * lin / jsj;
            if (Math.Abs(fx) < 1e-12 * (1 + Math.Abs(lin))) break;
        }
        var normalised = new double[n];
        for (var i = 0; i < n; i++)
        {
            // Var(aᵢ) = (ΣJᵀ(JΣJᵀ)⁻¹JΣ)ᵢᵢ = σᵢ⁴Jᵢ²/(JΣJᵀ)
            var v = Math.Pow(sigma[i], 4) * j[i] * j[i] / jsj;
            normalised[i] = v > 0 ? (x[i] - measured[i]) / Math.Sqrt(v) : 0;
        }
        var gamma = jsj > 0 ? r * r / jsj : 0;
        return new ReconciliationResult(x, normalised, gamma, gamma > ChiSquare1At95, (double[])j.Clone());
    }

    private static void Jacobian(Func<double[], double> f, double[] x, double[] sigma, double[] j)
    {
        var probe = (double[])x.Clone();
        for (var i = 0; i < x.Length; i++)
        {
            var h = Math.Max(1e-6 * Math.Abs(x[i]), 1e-3 * sigma[i]);
            probe[i] = x[i] + h;
            var up = f(probe);
            probe[i] = x[i] - h;
            var down = f(probe);
            probe[i] = x[i];
            j[i] = (up - down) / (2 * h);
        }
    }
}
