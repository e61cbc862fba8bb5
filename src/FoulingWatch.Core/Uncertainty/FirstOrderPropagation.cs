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
    /// <summary>A function evaluated at probe points (a struct, so that a caller probing millions of points allocates
    /// nothing per call).</summary>
    public interface IFunction
    {
        double At(double[] x);
    }

    private readonly struct Delegated(Func<double[], double> f) : IFunction
    {
        public double At(double[] x) => f(x);
    }

    /// <param name="correlation">r(xᵢ, xⱼ), or null for independent inputs.</param>
    public static double StandardUncertainty(Func<double[], double> f, double[] x, double[] u, double[,]? correlation = null) =>
        StandardUncertainty(new Delegated(f), x, u, new double[x.Length], new double[x.Length], correlation);

    /// <summary>As above, with the probe point and the sensitivities in caller-owned buffers (length n; overwritten).</summary>
    public static double StandardUncertainty<TFunction>(TFunction f, double[] x, double[] u, double[] probe, double[] c,
        double[,]? correlation = null) where TFunction : IFunction
    {
        var n = x.Length;
        if (u.Length != n || probe.Length != n || c.Length != n)
            throw new ArgumentException("x, u and the buffers differ in length");
        Array.Copy(x, probe, n);
        for (var i = 0; i < n; i++)
        {
            c[i] = 0;
            if (!(u[i] > 0)) continue;
            var h = u[i] / 100;
            probe[i] = x[i] + h;
            var up = f.At(probe);
            probe[i] = x[i] - h;
            var down = f.At(probe);
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
