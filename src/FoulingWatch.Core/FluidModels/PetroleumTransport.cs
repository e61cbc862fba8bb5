using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.FluidModels;

/// <summary>A fluid whose viscosity and thermal conductivity are known, so that film coefficients can follow its
/// properties (Prandtl and Reynolds numbers at the bulk temperature).</summary>
public interface ITransportFluid : IFluidModel
{
    /// <summary>Dynamic viscosity in Pa·s.</summary>
    double Viscosity(Temperature temperature, Pressure pressure);

    /// <summary>Thermal conductivity in W/(m·K).</summary>
    double ThermalConductivity(Temperature temperature, Pressure pressure);
}

/// <summary>
/// Kinematic viscosity of a petroleum liquid between and near two measured points, by the Walther relation of
/// ASTM D341: log₁₀ log₁₀(ν + 0.7) = A − B·log₁₀ T, ν in mm²/s (cSt), T in K.
/// </summary>
/// <remarks>ASTM D341 states the relation with the constant 0.7 for ν from 2 mm²/s up; below that it underestimates
/// the curvature (the standard adds a correction term). Points must be at different temperatures with the viscosity
/// falling as temperature rises.</remarks>
public sealed class WaltherViscosity
{
    private readonly double _a, _b;

    public WaltherViscosity(double t1Kelvin, double nu1, double t2Kelvin, double nu2)
    {
        if (!(nu1 > 0 && nu2 > 0) || !(t1Kelvin > 0 && t2Kelvin > 0) || t1Kelvin == t2Kelvin || (nu1 - nu2) * (t1Kelvin - t2Kelvin) >= 0)
            throw new ArgumentException("two viscosities at two different temperatures, lower at the higher temperature, are needed");
        double W(double nuSi) => Math.Log10(Math.Log10(nuSi * 1e6 + 0.7));
        _b = (W(nu1) - W(nu2)) / (Math.Log10(t2Kelvin) - Math.Log10(t1Kelvin));
        _a = W(nu1) + _b * Math.Log10(t1Kelvin);
        Points = FormattableString.Invariant($"{nu1 * 1e6:0.###} cSt at {t1Kelvin - 273.15:0.#} °C, {nu2 * 1e6:0.###} cSt at {t2Kelvin - 273.15:0.#} °C");
    }

    /// <summary>The two points it was built from, in words.</summary>
    public string Points { get; }

    /// <summary>Walther constants A and B (ν in mm²/s, T in K).</summary>
    public (double A, double B) Constants => (_a, _b);

    /// <summary>Kinematic viscosity in m²/s.</summary>
    public double Kinematic(double kelvin) => (Math.Pow(10, Math.Pow(10, _a - _b * Math.Log10(kelvin))) - 0.7) * 1e-6;
}

/// <summary>
/// Transport properties of a petroleum liquid from what an assay gives: specific gravity (60/60 °F) and kinematic
/// viscosity at two temperatures. Density by the API volume-correction equation for crude oils, thermal conductivity
/// by Cragoe's correlation, viscosity by ASTM D341; cp and enthalpy from the wrapped liquid model.
/// </summary>
/// <remarks>
/// Density: ρ(T) = ρ₆₀·exp(−α·ΔT·(1 + 0.8·α·ΔT)), α = K₀/ρ₆₀², K₀ = 341.0957 for crude oils, ρ₆₀ in kg/m³, ΔT in °F from
/// 60 °F (API MPMS 11.1, the 1980 tables 6A/54A; from memory). Thermal conductivity: k = (0.1173/SG)·(1 − 0.00054·t),
/// t in °C (Cragoe 1929: 0.813/SG·(1 − 0.0003·(t − 32)) Btu·in/(h·ft²·°F), t in °F). Both are the usual ones in
/// petroleum-refining handbooks for liquids without better data.
/// </remarks>
public sealed class PetroleumLiquidTransport(IFluidModel liquid, double specificGravity, WaltherViscosity viscosity) : ITransportFluid
{
    private const double WaterAt60F = 999.016; // kg/m³, water at 60 °F (from memory; the SG 60/60 °F reference)

    public string Description { get; } = liquid.Description + "; viscosity by ASTM D341 from " + viscosity.Points;
    public TemperatureRange Validity => liquid.Validity;
    public double SpecificEnthalpy(Temperature temperature, Pressure pressure) => liquid.SpecificEnthalpy(temperature, pressure);
    public double SpecificHeat(Temperature temperature, Pressure pressure) => liquid.SpecificHeat(temperature, pressure);

    public double? Density(Temperature temperature, Pressure pressure) => DensityAt(temperature.Kelvin);

    private double DensityAt(double kelvin)
    {
        var rho60 = specificGravity * WaterAt60F;
        var alpha = 341.0957 / (rho60 * rho60);
        var dt = (kelvin - 273.15) * 1.8 + 32 - 60;
        return rho60 * Math.Exp(-alpha * dt * (1 + 0.8 * alpha * dt));
    }

    public double Viscosity(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        return viscosity.Kinematic(temperature.Kelvin) * DensityAt(temperature.Kelvin);
    }

    public double ThermalConductivity(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        // 0.813 Btu·in/(h·ft²·°F) = 0.813 × 0.144227888 W/(m·K); 0.0003 per °F = 0.00054 per °C from 0 °C
        return 0.813 * 0.144227888 / specificGravity * (1 - 0.00054 * (temperature.Kelvin - 273.15));
    }
}
