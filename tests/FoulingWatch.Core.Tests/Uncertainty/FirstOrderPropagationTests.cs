using FoulingWatch.Core.Uncertainty;

namespace FoulingWatch.Core.Tests.Uncertainty;

public class FirstOrderPropagationTests
{
    // Source: JCGM 100:2008 (GUM), Annex H.2, simultaneous measurement of resistance and reactance. Inputs: V = 4.9990 V,
    // u = 3.2e-3 V; I = 19.661 mA, u = 9.5e-3 mA; φ = 1.04446 rad, u = 7.5e-4 rad; r(V,I) = −0.36, r(V,φ) = 0.86,
    // r(I,φ) = −0.65. Results: R = V·cos φ/I = 127.732 Ω, u = 0.071 Ω; X = V·sin φ/I = 219.847 Ω, u = 0.295 Ω;
    // Z = V/I = 254.260 Ω, u = 0.236 Ω. (The GUM's own rounding puts u(R) at 0.071 where exact arithmetic gives 0.070, as
    // the GTC library's documentation of this example notes; tolerance ±0.0012 Ω accordingly.)
    [Theory]
    [InlineData("R", 127.732, 0.071)]
    [InlineData("X", 219.847, 0.295)]
    [InlineData("Z", 254.260, 0.236)]
    public void Correlated_inputs_reproduce_the_GUM_resistance_and_reactance_example(string quantity, double value, double uncertainty)
    {
        Func<double[], double> f = quantity switch
        {
            "R" => v => v[0] * Math.Cos(v[2]) / v[1],
            "X" => v => v[0] * Math.Sin(v[2]) / v[1],
            _ => v => v[0] / v[1],
        };
        double[] x = [4.9990, 19.661e-3, 1.04446];
        double[] u = [3.2e-3, 9.5e-6, 7.5e-4];
        var r = new double[3, 3];
        (r[0, 1], r[0, 2], r[1, 2]) = (-0.36, 0.86, -0.65);
        (r[1, 0], r[2, 0], r[2, 1]) = (r[0, 1], r[0, 2], r[1, 2]);
        Assert.Equal(value, f(x), 0.0015);
        Assert.Equal(uncertainty, FirstOrderPropagation.StandardUncertainty(f, x, u, r), 0.0012);
    }

    // Source: GUM 5.1.6: for y = c·x₁^p₁·x₂^p₂ with independent inputs, (u_c(y)/y)² = Σ (pᵢ·u(xᵢ)/xᵢ)². Here y = x₁/x₂² with
    // 1 % and 2 % relative uncertainties: u_c/y = √(0.01² + (2·0.02)²) = 0.041231 (analytic), to 1e-6.
    [Fact]
    public void A_power_law_product_has_the_GUM_relative_uncertainty()
    {
        var y = FirstOrderPropagation.StandardUncertainty(v => v[0] / (v[1] * v[1]), [5.0, 2.0], [0.05, 0.04]);
        Assert.Equal(Math.Sqrt(0.01 * 0.01 + 0.04 * 0.04), y / (5.0 / 4.0), 6);
    }
}
