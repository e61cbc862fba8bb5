using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.Exchangers;

public class EffectivenessTests
{
    // Source: the standard ε-NTU relations (Kays & London, Compact Heat Exchangers, 3rd ed.; Incropera et al.,
    // Table 11.3; Shah & Sekulić 2003), points as tabulated in REFERENCES.md to 6 decimals; tolerance 6e-7.
    // "crossflow hot mixed" with the hot stream as Cmax is the Cmax-mixed case; with the hot stream as Cmin the Cmin-mixed case.
    [Theory]
    [InlineData(0.5, 0.5, 0.362266, 0.351756, 0.356912, 0.360911, 0.351948, 0.357183, 0.357506)]
    [InlineData(1.0, 0.5, 0.564733, 0.517913, 0.539940, 0.558304, 0.544764, 0.541969, 0.544764)]
    [InlineData(2.0, 0.5, 0.774600, 0.633475, 0.693092, 0.752227, 0.738758, 0.702013, 0.717546)]
    [InlineData(1.0, 1.0, 0.500000, 0.432332, 0.462671, 0.489878, 0.468536, 0.468536, 0.468536)]
    public void Effectiveness_matches_the_textbook_relations(double ntu, double cr, double counter, double parallel,
        double shell12, double shells2x4, double unmixed, double cmaxMixed, double cminMixed)
    {
        const double tol = 6e-7;
        Assert.Equal(counter, Counterflow.Instance.Effectiveness(ntu, cr), tol);
        Assert.Equal(parallel, new ParallelFlow().Effectiveness(ntu, cr), tol);
        Assert.Equal(shell12, new OneShellPassEvenTubePasses(2).Effectiveness(ntu, cr), tol);
        Assert.Equal(shells2x4, new ShellsInSeries(2, 4).Effectiveness(ntu, cr), tol);
        Assert.Equal(unmixed, new CrossflowBothUnmixed().Effectiveness(ntu, cr), tol);
        Assert.Equal(cmaxMixed, new CrossflowOneMixed(StreamSide.Hot).Effectiveness(ntu, cr, minSide: StreamSide.Cold), tol);
        Assert.Equal(cminMixed, new CrossflowOneMixed(StreamSide.Hot).Effectiveness(ntu, cr, minSide: StreamSide.Hot), tol);
    }

    // Source: Kays & London: with Cr = 0 every arrangement reduces to ε = 1 − exp(−NTU).
    [Theory]
    [MemberData(nameof(TestArrangements.Names), MemberType = typeof(TestArrangements))]
    public void With_one_side_isothermal_every_arrangement_gives_one_minus_exp_minus_ntu(string name)
    {
        var a = TestArrangements.All[name];
        foreach (var ntu in new[] { 0.1, 0.7, 2.0, 5.0 })
        {
            Assert.Equal(1 - Math.Exp(-ntu), a.Effectiveness(ntu, 0.0), 12);
            // approaching 0 continuously, not only at the special case
            Assert.Equal(1 - Math.Exp(-ntu), a.Effectiveness(ntu, 1e-9, StreamSide.Hot), 7);
            Assert.Equal(1 - Math.Exp(-ntu), a.Effectiveness(ntu, 1e-9, StreamSide.Cold), 7);
        }
    }

    // Source: Kays & London, counterflow ε–NTU relation; for Cr = 1 it reduces analytically to ε = NTU/(1 + NTU).
    [Theory]
    [InlineData(0.5, 1.0 / 3.0)]
    [InlineData(2.0, 2.0 / 3.0)]
    [InlineData(9.0, 0.9)]
    public void Counterflow_effectiveness_with_equal_capacity_rates_matches_the_analytic_limit(double ntu, double expected)
    {
        Assert.Equal(expected, Counterflow.Instance.Effectiveness(ntu, cr: 1.0), 12);
        // and continuously from below
        Assert.Equal(expected, Counterflow.Instance.Effectiveness(ntu, 1.0 - 1e-7), 6);
    }

    // Round trip (complements the external checks): NTU from ε returns the NTU that gave ε.
    [Theory]
    [MemberData(nameof(TestArrangements.Names), MemberType = typeof(TestArrangements))]
    public void Ntu_from_effectiveness_inverts_effectiveness(string name)
    {
        var a = TestArrangements.All[name];
        foreach (var cr in new[] { 0.0, 0.2, 0.5, 0.8, 1.0 })
        foreach (var side in new[] { StreamSide.Hot, StreamSide.Cold })
        foreach (var ntu in new[] { 0.05, 0.4, 1.0, 2.5 })
        {
            var eps = a.Effectiveness(ntu, cr, side);
            Assert.True(a.TryNtu(eps, cr, out var back, side), $"{name}: no NTU for ε = {eps} at Cr = {cr}");
            Assert.Equal(ntu, back, 1e-7 * Math.Max(1, ntu));
        }
    }

    [Fact]
    public void Effectiveness_beyond_the_maximum_has_no_ntu()
    {
        var parallel = new ParallelFlow();
        Assert.False(parallel.TryNtu(0.7, 0.5, out _)); // max 1/1.5 = 0.667
        var ex = Assert.Throws<QuantityOutOfRangeException>(() => parallel.Ntu(0.7, 0.5));
        Assert.Contains("effectiveness (parallel flow) = 0.7  is out of range; valid: 0 to below 0.666667 at Cr = 0.5", ex.Message);
        Assert.False(new OneShellPassEvenTubePasses().TryNtu(0.60, 1.0, out _)); // max 2/(2+√2) = 0.5858
    }

    [Fact]
    public void Capacity_rate_ratio_above_one_is_refused()
        => Assert.Throws<QuantityOutOfRangeException>(() => Counterflow.Instance.Effectiveness(1, 1.5));
}
