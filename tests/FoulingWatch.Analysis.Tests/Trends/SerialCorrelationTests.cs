using FoulingWatch.Analysis.Trends;
using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.Tests.Trends;

public class SerialCorrelationTests
{
    private static readonly double[] Days =
    [
        0.5, 1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5, 8.5, 9.5, 11.5, 12.5, 13.5, 14.5, 15.5, 16.5, 17.5, 18.5, 19.5, 20.5, 23.5, 24.5,
        25.5, 26.5, 27.5, 28.5, 29.5, 30.5, 31.5, 32.5, 33.5, 34.5, 35.5, 36.5, 37.5, 38.5,
    ];

    private static double[] NorrisY() =>
        File.ReadLines(Path.Combine(AppContext.BaseDirectory, "data", "nist", "Norris.txt"))
            .Where(l => l.Length > 0 && l[0] != '#')
            .Select(l => double.Parse(l.Split(' ', StringSplitOptions.RemoveEmptyEntries)[0], System.Globalization.CultureInfo.InvariantCulture))
            .ToArray();

    // Reference implementation: statsmodels 0.13.5 (Debian python3-statsmodels), sm.GLS(y, [1, t], sigma=φ^|tᵢ−tⱼ|).fit() on
    // the NIST StRD Norris y values placed on the irregular day grid above (gaps of 2 and 3 days). Printed values:
    // φ = 0.6: params [402.40463042897795, -0.015336289680376286], bse [273.0312525888339, 11.874668096294984]
    // φ = 0.9: params [298.43899224963593, -0.008134289918943483], bse [870.2435354851601, 34.371785517796546]
    // Tolerance 1e-6 relative: the fit is found by Levenberg–Marquardt, not by a closed form.
    [Theory]
    [InlineData(0.6, 402.40463042897795, -0.015336289680376286, 273.0312525888339, 11.874668096294984)]
    [InlineData(0.9, 298.43899224963593, -0.008134289918943483, 870.2435354851601, 34.371785517796546)]
    public void The_AR1_fit_equals_generalised_least_squares_of_a_reference_implementation(double phi, double b0, double b1, double se0, double se1)
    {
        var y = NorrisY();
        var fit = LeastSquares.FitWithSerialCorrelation(new LinearFouling(), Days, y, Days.Select(_ => 1.0).ToArray(), phi)!;
        Assert.Equal(b0, fit.Parameters[0], Math.Abs(b0) * 1e-6);
        Assert.Equal(b1, fit.Parameters[1], Math.Abs(b1) * 1e-6);
        Assert.Equal(se0, fit.StandardErrors[0], se0 * 1e-6);
        Assert.Equal(se1, fit.StandardErrors[1], se1 * 1e-6);
    }

    // Reference implementation as above, for AR(1) plus white noise: Σ = c·φ^|tᵢ−tⱼ| + (1 − c)·I with φ = 0.8, c = 0.6.
    // statsmodels printed params [379.0799654432995, 0.654224579301467], bse [282.79536503744106, 12.031275897825116] and
    // numpy's slogdet(Σ) = −10.46380916021057 (the whitening's log-determinant term).
    [Fact]
    public void The_AR1_plus_white_noise_fit_equals_generalised_least_squares_of_a_reference_implementation()
    {
        var fit = LeastSquares.FitWithSerialCorrelation(new LinearFouling(), Days, NorrisY(), Days.Select(_ => 1.0).ToArray(), 0.8, 0.6)!;
        Assert.Equal(379.0799654432995, fit.Parameters[0], 379.08 * 1e-6);
        Assert.Equal(0.654224579301467, fit.Parameters[1], 0.6542 * 1e-6);
        Assert.Equal(282.79536503744106, fit.StandardErrors[0], 282.8 * 1e-6);
        Assert.Equal(12.031275897825116, fit.StandardErrors[1], 12.03 * 1e-6);
        Assert.Equal(-10.46380916021057, fit.LogDeterminantTerm, 1e-9);
    }

    // Analytic: the Prais–Winsten transformation L satisfies LᵀL = Σ⁻¹ for Σᵢⱼ = φ^|tᵢ−tⱼ| (the whitening identity behind GLS),
    // checked against MathNet's inverse of the explicit matrix on the irregular grid, to 1e-9.
    [Fact]
    public void The_whitening_matrix_inverts_the_AR1_correlation_matrix()
    {
        const double phi = 0.75;
        var n = Days.Length;
        var w = new Whitening(Days, phi);
        var l = Matrix<double>.Build.Dense(n, n);
        for (var j = 0; j < n; j++)
        {
            var e = new double[n];
            e[j] = 1;
            var z = w.Apply(e, Enumerable.Repeat(1.0, n).ToArray());
            for (var i = 0; i < n; i++) l[i, j] = z[i];
        }
        var sigma = Matrix<double>.Build.Dense(n, n, (i, j) => Math.Pow(phi, Math.Abs(Days[i] - Days[j])));
        var difference = l.TransposeThisAndMultiply(l) - sigma.Inverse();
        Assert.True(difference.Enumerate().All(v => Math.Abs(v) < 1e-9), $"largest difference {difference.Enumerate().Max(Math.Abs)}");
    }

    // Synthetic: φ is recovered from residuals of a known AR(1) series (φ = 0.8, 2000 days) within ±0.05.
    [Fact]
    public void The_autocorrelation_of_an_AR1_series_is_recovered()
    {
        var rng = new Random(7);
        var t = Enumerable.Range(0, 2000).Select(i => i + 0.5).ToArray();
        var e = 0.0;
        var r = t.Select(_ => e = 0.8 * e + JointDraws.Gaussian(rng)).ToArray();
        var (phi, share) = Whitening.Estimate(t, r, t.Select(_ => 1.0).ToArray());
        Assert.InRange(phi, 0.75, 0.85);
        Assert.InRange(share, 0.9, 1.0);
    }

    // Source: Burnham & Anderson (2002), §2.9: wᵢ = exp(−Δᵢ/2)/Σ exp(−Δⱼ/2). For ΔAICc = 0, 2, 4 the weights are
    // 1 : e⁻¹ : e⁻² normalised = 0.6652, 0.2447, 0.0900 (analytic).
    [Fact]
    public void Akaike_weights_follow_the_published_formula()
    {
        var w = JointDraws.AkaikeWeights([10.0, 12.0, 14.0]);
        var sum = 1 + Math.Exp(-1) + Math.Exp(-2);
        Assert.Equal(1 / sum, w[0], 12);
        Assert.Equal(Math.Exp(-1) / sum, w[1], 12);
        Assert.Equal(0.6652, w[0], 4);
        Assert.Equal(0.0900, w[2], 4);
    }

    // Self-consistency (not an external check): the fits' fused paths give the same bits as the separate ones: the
    // whitening of values and Jacobian in one pass against column by column, and each law's value-and-gradient against
    // Value and Gradient (the external checks of the fits, GLS and NIST StRD above, run through the fused paths).
    [Fact]
    public void The_fused_whitening_and_value_gradient_paths_equal_the_separate_ones_bit_for_bit()
    {
        var rng = new Random(20261203);
        var t = Enumerable.Range(0, 300).Select(i => i + 0.3 * rng.NextDouble() + (i > 150 ? 4 : 0)).ToArray();
        var weights = t.Select(_ => 0.2 + rng.NextDouble()).ToArray();
        foreach (var (phi, share) in new[] { (0.8, 1.0), (0.55, 0.7), (0.95, 0.4) })
        {
            var whitening = new Whitening(t, phi, share);
            foreach (var k in new[] { 2, 3, 4 })
            {
                var values = t.Select(_ => rng.NextDouble() - 0.5).ToArray();
                var jacobian = Enumerable.Range(0, t.Length * k).Select(_ => rng.NextDouble()).ToArray();
                var (v2, j2) = ((double[])values.Clone(), (double[])jacobian.Clone());
                whitening.ApplyInPlace(values, jacobian, k, weights);
                whitening.ApplyInPlace(v2, weights);
                for (var j = 0; j < k; j++) whitening.ApplyInPlace(j2, weights, k, j);
                Assert.Equal(v2, values);
                Assert.Equal(j2, jacobian);
                Assert.NotEqual(0, values.Sum()); // the filter did run
            }
        }
        FoulingModel[] models = [new LinearFouling(), new AsymptoticFouling(), new FallingRateFouling(), new AcceleratingFouling()];
        double[][] parameters = [[1e-5, 2e-6], [2e-5, 4e-4, 120], [-1e-5, 3e-5, 0.55], [0, 1e-4, 1.8]];
        for (var m = 0; m < models.Length; m++)
            foreach (var time in new[] { 0.0, 0.5, 1, 17.25, 300, 1800 })
            {
                var p = parameters[m];
                var fused = new double[p.Length];
                var separate = new double[p.Length];
                var value = models[m].ValueAndGradient(p, time, fused);
                models[m].Gradient(p, time, separate);
                Assert.Equal(models[m].Value(p, time), value);
                Assert.Equal(separate, fused);
            }
    }
}
