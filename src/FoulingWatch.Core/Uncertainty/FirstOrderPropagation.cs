namespace FoulingWatch.Core.Uncertainty;

/// <summary>Combined standard uncertainty of y = f(x₁…xₙ) by the law of propagation of uncertainty.</summary>
/// <remarks>
/// Source: JCGM 100:2008 (GUM), 5.1.2 (uncorrelated inputs) and 5.2.2 (correlated inputs):
/// u_c²(y) = Σᵢ Σⱼ cᵢ·cⱼ·u(xᵢ)·u(xⱼ)·r(xᵢ, xⱼ), with sensitivity coefficients cᵢ = ∂f/∂xᵢ; ASME PTC 19.1 uses the same
/// first-order (Taylor series) form. The partial derivatives are taken by central differences with steps of u(xᵢ)/100
/// (GUM 5.1.3 allows numerical derivatives). Returns NaN when f is not finite at a probe.
/// </remarks>
public static class FirstOrderPropagation
{
    /// <param name="correlation">r(xᵢ, xⱼ), or null for independent inputs.</param>
    public static double StandardUncertainty(Func<double[], double> f, double[] x, double[] u, double[,]? correlation = null)
    {
        var n = x.Length;
        var c = new double[n];
        var probe = (double[])x.Clone();
        for (var i = 0; i < n; i++)
        {
            if (!(u[i] > 0)) continue;
            var h = u[i] / 100;
            probe[i] = x[i] + h;
            var up = f(probe);
            probe[i] = x[i] - h;
            var down = f(probe);
            probe[i] = x[i];
            if (!double.IsFinite(up) || !double.IsFinite(down)) return double.NaN;
            c[i] = (up - down) / (2 * h);
        }
        var variance = 0.0;
        for (var i = 0; i < n; i++)
        {
            variance += c[i] * c[i] * u[i] * u[i];
            if (correlation is null) continue;
            for (var j = 0; j < n; j++)
                if (j != i) variance += c[i] * c[j] * u[i] * u[j] * correlation[i, j];
        }
        return Math.Sqrt(Math.Max(0, variance));
    }
}
