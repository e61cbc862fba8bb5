using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.Exchangers;

public class LmtdTests
{
    [Fact]
    public void Lmtd_with_equal_terminal_differences_equals_that_difference()
    {
        Assert.Equal(20.0, Lmtd.FromTerminalDifferences(20, 20), 12);
        Assert.Equal(20.0, Lmtd.FromTerminalDifferences(20.0000001, 19.9999999), 9);
    }

    // Analytic: (60 − 30)/ln 2.
    [Fact]
    public void Lmtd_of_sixty_and_thirty_is_thirty_over_ln_two()
        => Assert.Equal(30 / Math.Log(2), Lmtd.FromTerminalDifferences(60, 30), 12);

    // Common practice (a property of the logarithmic mean): min(ΔT₁, ΔT₂) < LMTD < max(ΔT₁, ΔT₂), and LMTD ≤ arithmetic mean.
    [Fact]
    public void Lmtd_lies_between_the_terminal_differences()
    {
        var rng = new Random(20261201);
        for (var i = 0; i < 2000; i++)
        {
            var a = 0.01 + rng.NextDouble() * 200;
            var b = 0.01 + rng.NextDouble() * 200;
            var l = Lmtd.FromTerminalDifferences(a, b);
            Assert.InRange(l, Math.Min(a, b) * (1 - 1e-12), Math.Max(a, b) * (1 + 1e-12));
            Assert.True(l <= (a + b) / 2 * (1 + 1e-12));
        }
    }

    [Fact]
    public void A_non_positive_terminal_difference_has_no_lmtd()
    {
        Assert.False(Lmtd.TryFromTerminalDifferences(10, 0, out _));
        Assert.False(Lmtd.TryFromTerminalDifferences(-3, 10, out _));
        Assert.Throws<QuantityOutOfRangeException>(() => Lmtd.FromTerminalDifferences(5, -1));
    }

    // Common practice: for the same terminal temperatures and duty, counterflow never needs more area than parallel
    // flow (its LMTD is never smaller).
    [Fact]
    public void Counterflow_never_needs_more_area_than_parallel_flow()
    {
        var rng = new Random(7);
        var checkedCases = 0;
        for (var i = 0; i < 5000; i++)
        {
            var thi = 100 + rng.NextDouble() * 150;
            var tci = 10 + rng.NextDouble() * 60;
            var tho = tci + rng.NextDouble() * (thi - tci);
            var tco = tci + rng.NextDouble() * (thi - tci);
            var h = (T: Temperature.FromCelsius(thi), O: Temperature.FromCelsius(tho));
            var c = (T: Temperature.FromCelsius(tci), O: Temperature.FromCelsius(tco));
            if (!Lmtd.TryParallel(h.T, h.O, c.T, c.O, out var lp)) continue;
            Assert.True(Lmtd.TryCounterflow(h.T, h.O, c.T, c.O, out var lc));
            Assert.True(lc >= lp * (1 - 1e-12), $"counterflow LMTD {lc} < parallel {lp}");
            checkedCases++;
        }
        Assert.True(checkedCases > 500);
    }

    // Source: Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer, Example 11.1 (from memory):
    // counterflow concentric tube, oil 0.1 kg/s, cp 2131 J/kgK, 100 → 60 °C; water 0.2 kg/s, cp 4178 J/kgK, in at 30 °C;
    // U = 38.1 W/m²K... the book gets q = 8524 W, t_c,o = 40.2 °C, ΔT_lm = 43.2 °C and L = 66.5 m for D_i = 25 mm with
    // h_i = 2250 and h_o = 38.4 W/m²K (U ≈ 37.8 W/m²K). Run backwards: given the outlets, recover U to 0.5 %.
    [Fact]
    public void Textbook_oil_cooler_run_backwards_recovers_its_U()
    {
        var q = 0.1 * 2131 * (100 - 60);
        Assert.Equal(8524, q, 1);
        var tco = 30 + q / (0.2 * 4178);
        Assert.Equal(40.2, tco, 0.05);
        Assert.True(Lmtd.TryCounterflow(Temperature.FromCelsius(100), Temperature.FromCelsius(60), Temperature.FromCelsius(30), Temperature.FromCelsius(tco), out var lmtd));
        Assert.Equal(43.2, lmtd, 0.05);
        var u = ThermalResistance.FlatWallOverallCoefficient(2250, 38.4, 0, 1);
        var area = Math.PI * 0.025 * 66.5;
        Assert.Equal(u, q / (area * lmtd), u * 0.005);
    }
}
