using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.Exchangers;

public class FilmCorrelationsTests
{
    // Petukhov (1970) at Re = 10⁴: (0.790·ln 10⁴ − 1.64)⁻² = 5.63618⁻² = 0.031480 (hand evaluation of the published
    // formula); Blasius' smooth-tube law 0.316·Re^−0.25 (textbook, Re < 10⁵) gives 0.03160, within 0.4 %.
    [Fact]
    public void Petukhov_friction_matches_its_formula_and_Blasius()
    {
        Assert.Equal(0.031480, FilmCorrelations.PetukhovFriction(1e4), 6);
        Assert.InRange(FilmCorrelations.PetukhovFriction(1e4) / (0.316 * Math.Pow(1e4, -0.25)), 0.99, 1.01);
    }

    // Gnielinski (1976), hand evaluation of the published formula: Re 10⁴, Pr 0.7 → f/8 = 0.0039350,
    // Nu = 0.0039350·9000·0.7 / (1 + 12.7·0.062729·(0.78837 − 1)) = 29.817. In air at Re 5·10⁴ it lies within 10 % of
    // Dittus–Boelter 0.023·Re^0.8·Pr^0.4 (104.2 against 114.5), as textbooks show the two agreeing for gases.
    [Fact]
    public void Gnielinski_matches_its_formula_and_Dittus_Boelter_for_gases()
    {
        Assert.Equal(29.817, FilmCorrelations.Gnielinski(1e4, 0.7), 3);
        var db = 0.023 * Math.Pow(5e4, 0.8) * Math.Pow(0.7, 0.4);
        Assert.InRange(FilmCorrelations.Gnielinski(5e4, 0.7) / db, 0.88, 0.95);
    }

    // Hausen (1943): 3.66 for a long tube (the textbook fully developed laminar value at constant wall temperature);
    // at Gz = 100: 3.66 + 6.68/(1 + 0.04·100^(2/3)) = 7.2480 (hand evaluation).
    [Fact]
    public void Hausen_tends_to_the_fully_developed_laminar_value()
    {
        Assert.Equal(3.66, FilmCorrelations.HausenLaminar(1000, 5, 1e-9), 4);
        Assert.Equal(7.2480, FilmCorrelations.HausenLaminar(1000, 1, 0.1), 4);
    }

    // Between Re 2300 and 3000 the tube side runs linearly from Hausen to Gnielinski (continuous at both ends).
    [Fact]
    public void The_tube_side_is_continuous_through_the_transition()
    {
        const double pr = 5, dl = 0.004;
        Assert.Equal(FilmCorrelations.HausenLaminar(2300, pr, dl), FilmCorrelations.TubeSide(2300, pr, dl), 12);
        Assert.Equal(FilmCorrelations.Gnielinski(3000, pr), FilmCorrelations.TubeSide(3000, pr, dl), 12);
        var mid = FilmCorrelations.TubeSide(2650, pr, dl);
        Assert.Equal(0.5 * (FilmCorrelations.HausenLaminar(2300, pr, dl) + FilmCorrelations.Gnielinski(3000, pr)), mid, 9);
    }

    // Kern (1950): 0.36·Re^0.55·Pr^(1/3) at Re 10⁴, Pr 10 = 0.36·158.489·2.15443 = 122.924 (hand evaluation).
    [Fact]
    public void Kern_matches_its_formula_and_refuses_outside_its_range()
    {
        Assert.Equal(122.924, FilmCorrelations.Kern(1e4, 10), 3);
        var ex = Assert.Throws<QuantityOutOfRangeException>(() => FilmCorrelations.Kern(500, 10));
        Assert.Contains("Reynolds number (Kern shell side) = 500", ex.Message);
        Assert.Throws<QuantityOutOfRangeException>(() => FilmCorrelations.Gnielinski(1e7, 1));
    }
}
