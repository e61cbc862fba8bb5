using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

/// <summary>Forced-convection Nusselt numbers for the two sides of a shell-and-tube exchanger, each with its source and
/// range; outside the range a <see cref="QuantityOutOfRangeException"/> names the number and the range.</summary>
/// <remarks>The viscosity-ratio correction (μ/μ_w)^0.14 is not applied: the wall temperature is not measured, and for a
/// clean reference the ratio moves h by a few percent at most for water and light oils (common practice).</remarks>
public static class FilmCorrelations
{
    /// <summary>Darcy friction factor of a smooth tube, Petukhov (1970): f = (0.790·ln Re − 1.64)⁻², 3000 ≤ Re ≤ 5·10⁶.</summary>
    public static double PetukhovFriction(double re)
    {
        Check("Reynolds number (Petukhov friction)", re, 3000, 5e6);
        var a = 0.790 * Math.Log(re) - 1.64;
        return 1 / (a * a);
    }

    /// <summary>Tube side, turbulent and transitional: Gnielinski (1976),
    /// Nu = (f/8)(Re − 1000)Pr / (1 + 12.7·√(f/8)·(Pr^(2/3) − 1)), 3000 ≤ Re ≤ 5·10⁶, 0.5 ≤ Pr ≤ 2000.</summary>
    public static double Gnielinski(double re, double pr)
    {
        Check("Prandtl number (Gnielinski)", pr, 0.5, 2000);
        var f8 = PetukhovFriction(re) / 8;
        return f8 * (re - 1000) * pr / (1 + 12.7 * Math.Sqrt(f8) * (Math.Pow(pr, 2.0 / 3) - 1));
    }

    /// <summary>Tube side, laminar, developing temperature profile at constant wall temperature: Hausen (1943),
    /// Nu = 3.66 + 0.0668·Gz / (1 + 0.04·Gz^(2/3)), Gz = Re·Pr·D/L; tends to 3.66 for a long tube.</summary>
    public static double HausenLaminar(double re, double pr, double diameterOverLength)
    {
        Check("Reynolds number (laminar)", re, 1, 2300);
        var gz = re * pr * diameterOverLength;
        return 3.66 + 0.0668 * gz / (1 + 0.04 * Math.Pow(gz, 2.0 / 3));
    }

    /// <summary>Tube side at any Reynolds number up to 5·10⁶: Hausen below 2300, Gnielinski from 3000, and between them
    /// linear in Re from the one to the other (the interpolation Gnielinski (1995) recommends for the transition).</summary>
    public static double TubeSide(double re, double pr, double diameterOverLength)
    {
        if (re <= 2300) return HausenLaminar(re, pr, diameterOverLength);
        if (re >= 3000) return Gnielinski(re, pr);
        var w = (re - 2300) / 700;
        return (1 - w) * HausenLaminar(2300, pr, diameterOverLength) + w * Gnielinski(3000, pr);
    }

    /// <summary>Shell side, segmentally baffled bundle: Kern (1950), Nu = 0.36·Re^0.55·Pr^(1/3) on the equivalent
    /// diameter and the cross-flow area at the bundle's centre line, 2000 ≤ Re ≤ 10⁶.</summary>
    public static double Kern(double re, double pr)
    {
        Check("Reynolds number (Kern shell side)", re, 2000, 1e6);
        Check("Prandtl number (Kern shell side)", pr, 0.5, 5000);
        return 0.36 * Math.Pow(re, 0.55) * Math.Cbrt(pr);
    }

    private static void Check(string what, double value, double min, double max)
    {
        if (!(value >= min && value <= max))
            throw new QuantityOutOfRangeException(what, value, "", FormattableString.Invariant($"{min:G} to {max:G}"));
    }
}
