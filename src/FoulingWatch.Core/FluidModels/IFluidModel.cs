using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.FluidModels;

/// <summary>A temperature interval [Minimum, Maximum] in which a property model may be used.</summary>
public readonly record struct TemperatureRange(double MinimumKelvin, double MaximumKelvin)
{
    public bool Contains(Temperature t) => t.Kelvin >= MinimumKelvin && t.Kelvin <= MaximumKelvin;
    public override string ToString() => FormattableString.Invariant($"{MinimumKelvin - 273.15:0.##} °C to {MaximumKelvin - 273.15:0.##} °C");
}

/// <summary>A fluid's thermal properties as used for stream duty.</summary>
/// <remarks>Enthalpies are relative to a model-specific reference: only differences have meaning.</remarks>
public interface IFluidModel
{
    /// <summary>Human-readable name with its source, e.g. "liquid water, IAPWS-IF97 region 1".</summary>
    string Description { get; }

    /// <summary>Temperatures in which the model may be used; outside it the model throws <see cref="PropertyRangeException"/>.</summary>
    TemperatureRange Validity { get; }

    /// <summary>True for a stream that changes phase at (nearly) constant temperature: its capacity rate is taken as infinite.</summary>
    bool IsPhaseChange => false;

    /// <summary>Specific enthalpy in J/kg at the state.</summary>
    double SpecificEnthalpy(Temperature temperature, Pressure pressure);

    /// <summary>Isobaric specific heat in J/(kg·K) at the state.</summary>
    double SpecificHeat(Temperature temperature, Pressure pressure);

    /// <summary>Density in kg/m³ where the model knows it, else null.</summary>
    double? Density(Temperature temperature, Pressure pressure) => null;

    /// <summary>Enthalpy change h(to) − h(from) in J/kg of a stream going from one temperature to another at one pressure.</summary>
    double EnthalpyChange(Temperature from, Temperature to, Pressure pressure) =>
        SpecificEnthalpy(to, pressure) - SpecificEnthalpy(from, pressure);

    /// <summary>∂Δh/∂T_from and ∂Δh/∂T_to in J/(kg·K) of <see cref="EnthalpyChange"/> at constant pressure: −c_p(from)
    /// and c_p(to), c_p being ∂h/∂T of the model's own enthalpy (a model whose change is not ∫c_p dT says so itself).</summary>
    (double From, double To) EnthalpyChangeSlopes(Temperature from, Temperature to, Pressure pressure) =>
        (-SpecificHeat(from, pressure), SpecificHeat(to, pressure));

    /// <summary>Why the model cannot evaluate a stream between these temperatures, or null when it can.</summary>
    string? WhyNotEvaluable(Temperature from, Temperature to, Pressure pressure) =>
        Validity.Contains(from) && Validity.Contains(to) ? null
            : $"{Description}: temperature outside the model's validity range {Validity}";

    /// <summary>Mean specific heat Δh/ΔT in J/(kg·K) between two temperatures; the local cp when they coincide.</summary>
    double MeanSpecificHeat(Temperature from, Temperature to, Pressure pressure)
    {
        var dt = to.Kelvin - from.Kelvin;
        return Math.Abs(dt) < 1e-6 ? SpecificHeat(from, pressure) : EnthalpyChange(from, to, pressure) / dt;
    }
}

internal static class FluidModelGuard
{
    public static void Check(IFluidModel model, Temperature t)
    {
        if (!model.Validity.Contains(t))
            throw new PropertyRangeException(model.Description, "temperature", t.Kelvin, "K",
                FormattableString.Invariant($"{model.Validity.MinimumKelvin:0.##} K to {model.Validity.MaximumKelvin:0.##} K ({model.Validity})"));
    }
}
