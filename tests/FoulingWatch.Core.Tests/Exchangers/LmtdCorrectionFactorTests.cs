using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.Exchangers;

public class LmtdCorrectionFactorTests
{
    // Source: Bowman, Mueller & Nagle (1940), Trans. ASME 62, 283–294, 1-2N closed form (REFERENCES.md values, 6 decimals).
    [Theory]
    [InlineData(0.20, 1.0, 0.989495)]
    [InlineData(0.40, 1.0, 0.920937)]
    [InlineData(0.30, 2.0, 0.882889)]
    [InlineData(0.50, 0.5, 0.942046)]
    public void One_two_shell_F_matches_Bowman_Mueller_Nagle(double p, double r, double expected)
    {
        Assert.Equal(expected, new OneShellPassEvenTubePasses().LmtdCorrectionFactor(p, r), 6e-7);
        // The general route F = NTU_cf/NTU at equal ε and Cr must agree with the closed form (Shah & Sekulić §3.7).
        Assert.True(new ShellsInSeries(1).TryLmtdCorrectionFactor(p, r, out var viaNtu));
        Assert.Equal(expected, viaNtu, 6e-7);
    }

    // Source: Bowman, Mueller & Nagle: F → 0 as P → P_max = 2/(R + 1 + √(R² + 1)); beyond, F is undefined.
    [Fact]
    public void One_two_shell_F_is_undefined_beyond_the_maximum_P()
    {
        var a = new OneShellPassEvenTubePasses();
        var pmax = OneShellPassEvenTubePasses.MaximumP(1.0);
        Assert.Equal(2 / (2 + Math.Sqrt(2)), pmax, 12);
        Assert.True(a.TryLmtdCorrectionFactor(pmax * 0.999, 1.0, out var f) && f < 0.5);
        Assert.False(a.TryLmtdCorrectionFactor(pmax * 1.001, 1.0, out _));
        var ex = Assert.Throws<QuantityOutOfRangeException>(() => a.LmtdCorrectionFactor(0.6, 1.0));
        Assert.Contains("0 < P < P_max = 0.585786 (Bowman–Mueller–Nagle)", ex.Message);
    }

    // Identity (definition of F): Q = U·A·F·LMTD_counterflow must equal the ε-NTU duty for the same UA and inlets.
    [Theory]
    [MemberData(nameof(TestArrangements.Names), MemberType = typeof(TestArrangements))]
    public void F_times_LMTD_gives_the_effectiveness_NTU_duty(string name)
    {
        var a = TestArrangements.All[name];
        var hotIn = Temperature.FromCelsius(180);
        var coldIn = Temperature.FromCelsius(40);
        foreach (var (ua, ch, cc) in new[] { (8000.0, 10000.0, 14000.0), (5000.0, 20000.0, 9000.0), (12000.0, 10000.0, 10000.0), (3000.0, 6000.0, 25000.0) })
        {
            var r = Rating.Rate(a, ua, ch, cc, hotIn, coldIn);
            Assert.True(Lmtd.TryCounterflow(hotIn, r.HotOutlet, coldIn, r.ColdOutlet, out var lmtd));
            var pr = TemperatureEffectiveness.FromTemperatures(hotIn, r.HotOutlet, coldIn, r.ColdOutlet)!.Value;
            Assert.True(a.TryLmtdCorrectionFactor(pr.P, pr.R, out var f), $"{name}: F undefined at P={pr.P}, R={pr.R}");
            Assert.Equal(r.Duty, ua * f * lmtd, r.Duty * 1e-9);
        }
    }

    [Fact]
    public void Counterflow_F_is_one()
    {
        Assert.Equal(1.0, Counterflow.Instance.LmtdCorrectionFactor(0.5, 1.3));
        Assert.Equal(1.0, new PlateAsCounterflow().LmtdCorrectionFactor(0.3, 0.7));
    }

    // Common practice (and implied by BMN): with one side isothermal (R = 0) F = 1 for any arrangement.
    [Theory]
    [MemberData(nameof(TestArrangements.Names), MemberType = typeof(TestArrangements))]
    public void F_is_one_when_the_hot_side_is_isothermal(string name)
    {
        Assert.True(TestArrangements.All[name].TryLmtdCorrectionFactor(0.6, 0.0, out var f));
        Assert.Equal(1.0, f, 9);
    }
}
