namespace FoulingWatch.Core.Economics;

/// <summary>Default CO2 emission factors and net calorific values of heater fuels.</summary>
/// <remarks>Source: IPCC 2006 Guidelines for National Greenhouse Gas Inventories, Vol. 2 (Energy), ch. 1,
/// Tables 1.2 (net calorific values) and 1.4 (default CO2 emission factors, net calorific basis).</remarks>
public static class FuelFactors
{
    public sealed record Fuel(string Key, string Name, double Co2KilogramsPerTerajoule, double NetCalorificValueTerajoulesPerGigagram)
    {
        /// <summary>kg CO2 per J of fuel energy (net calorific basis).</summary>
        public double Co2KilogramsPerJoule => Co2KilogramsPerTerajoule / 1e12;
    }

    public static readonly Fuel NaturalGas = new("natural-gas", "natural gas", 56_100, 48.0);
    public static readonly Fuel ResidualFuelOil = new("fuel-oil", "residual fuel oil", 77_400, 40.4);

    public static IReadOnlyList<Fuel> All { get; } = [NaturalGas, ResidualFuelOil];

    public static Fuel? Find(string key) => All.FirstOrDefault(f => f.Key.Equals(key, StringComparison.OrdinalIgnoreCase));
}
