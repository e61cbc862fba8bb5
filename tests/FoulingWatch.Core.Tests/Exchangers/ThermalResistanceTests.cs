using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.Exchangers;

public class ThermalResistanceTests
{
    // Analytic: two equal films and nothing else in series give h/2.
    [Fact]
    public void Two_equal_films_give_half_the_film_coefficient()
        => Assert.Equal(500.0, ThermalResistance.FlatWallOverallCoefficient(1000, 1000, 0, 50), 12);

    // Source: cylindrical conduction R' = ln(r_o/r_i)/(2πk) per unit length (Incropera et al., eq. 3.28), referred to
    // the outside area π·d_o: R_wall = d_o·ln(d_o/d_i)/(2k). Check a 25.4/21.2 mm carbon-steel tube (k 45 W/mK) with fouling.
    [Fact]
    public void Tube_U_refers_every_resistance_to_the_outside_area()
    {
        double ho = 1200, hi = 2500, dout = 0.0254, din = 0.0212, k = 45, rfo = 2e-4, rfi = 3e-4;
        var perLength = 1 / (ho * Math.PI * dout) + rfo / (Math.PI * dout) + Math.Log(dout / din) / (2 * Math.PI * k)
                        + rfi / (Math.PI * din) + 1 / (hi * Math.PI * din);
        var expectedU = 1 / (perLength * Math.PI * dout);
        Assert.Equal(expectedU, ThermalResistance.TubeOverallCoefficient(ho, hi, dout, din, k, rfo, rfi), 1e-9);
    }

    [Fact]
    public void Tube_outside_diameter_below_inside_is_refused()
    {
        var ex = Assert.Throws<QuantityOutOfRangeException>(() => ThermalResistance.TubeOverallCoefficient(1000, 1000, 0.02, 0.025, 45));
        Assert.Contains("tube outside diameter", ex.Message);
    }

    [Fact]
    public void Negative_fouling_allowance_is_refused()
        => Assert.Throws<QuantityOutOfRangeException>(() => ThermalResistance.FlatWallOverallCoefficient(1000, 1000, 0.001, 16, -1e-4));
}
