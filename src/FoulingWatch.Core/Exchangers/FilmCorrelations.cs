using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

/// <summary>Forced-convection Nusselt numbers for the two sides of a shell-and-tube exchanger, each with its source and
/// range; outside the range a <see cref="QuantityOutOfRangeException"/> names the number and the range.</summary>
/// <remarks>The viscosity-ratio correction (μ/μ_w)^0.14 is applied by the caller that knows the wall temperature
/// (<see cref="ShellAndTubeGeometry.CleanU(double, ITransportFluid, Temperature, Pressure, double, ITransportFluid, Temperature, Pressure)"/>).</remarks>
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

    /// <summary>Darcy friction factor of a chevron-plate channel, Martin (1999) in the Darcy basis (four times the Fanning
    /// form): 1/√ξ = cos φ/√(0.18·tan φ + 0.36·sin φ + ξ₀/cos φ) + (1 − cos φ)/√(3.8·ξ₁), ξ₀ = 64/Re and ξ₁ = 596/Re + 3.85
    /// below Re = 2000, ξ₀ = 4·(1.56·ln Re − 3)⁻² and ξ₁ = 39·Re^−0.289 above; φ the corrugation angle to the main flow
    /// direction (0° a straight channel, 90° across it). Martin, Chem. Eng. Process. 35 (1996) 301; constants of the 1999
    /// update (from memory).</summary>
    public static double MartinPlateFriction(double re, double chevronDegrees)
    {
        Check("Reynolds number (Martin chevron plate)", re, 100, 1e4);
        Check("chevron angle (Martin chevron plate)", chevronDegrees, 0, 80);
        var phi = chevronDegrees * Math.PI / 180;
        double f0, f1;
        if (re < 2000) { f0 = 64 / re; f1 = 596 / re + 3.85; }
        else
        {
            var a = 1.56 * Math.Log(re) - 3;
            f0 = 4 / (a * a);
            f1 = 39 / Math.Pow(re, 0.289);
        }
        var c = Math.Cos(phi);
        var inverseRoot = c / Math.Sqrt(0.18 * Math.Tan(phi) + 0.36 * Math.Sin(phi) + f0 / c) + (1 - c) / Math.Sqrt(3.8 * f1);
        return 1 / (inverseRoot * inverseRoot);
    }

    /// <summary>Chevron-plate channel: Martin's Lévêque analogy, Nu = 0.122·Pr^(1/3)·(μ/μ_w)^(1/6)·(ξ·Re²·sin 2φ)^0.374 on
    /// the hydraulic diameter (twice the plate gap), 100 ≤ Re ≤ 10⁴, 0° ≤ φ ≤ 80°, 0.5 ≤ Pr ≤ 1000.</summary>
    public static double MartinPlate(double re, double pr, double chevronDegrees, double viscosityRatio = 1)
    {
        Check("Prandtl number (Martin chevron plate)", pr, 0.5, 1000);
        var xi = MartinPlateFriction(re, chevronDegrees);
        var twoPhi = 2 * chevronDegrees * Math.PI / 180;
        return 0.122 * Math.Cbrt(pr) * Math.Pow(viscosityRatio, 1.0 / 6) * Math.Pow(xi * re * re * Math.Sin(twoPhi), 0.374);
    }

    /// <summary>The Sieder–Tate viscosity-ratio factor (μ/μ_w)^0.14 for a liquid heated (μ_w &lt; μ, factor above 1) or
    /// cooled at the wall (Sieder &amp; Tate, Ind. Eng. Chem. 28 (1936) 1429).</summary>
    public static double ViscosityRatioFactor(double bulkViscosity, double wallViscosity) =>
        double.IsFinite(wallViscosity) && wallViscosity > 0 ? Math.Pow(bulkViscosity / wallViscosity, 0.14) : 1;

    internal static void Check(string what, double value, double min, double max)
    {
        if (!(value >= min && value <= max))
            throw new QuantityOutOfRangeException(what, value, "", FormattableString.Invariant($"{min:G} to {max:G}"));
    }
}
