using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.FluidModels;

/// <summary>Viscosity and thermal conductivity of water and steam from temperature and density (IAPWS formulations).</summary>
/// <remarks>
/// Viscosity: IAPWS R12-08, "Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water Substance",
/// μ = μ* · μ̄0(T̄) · μ̄1(T̄, ρ̄), eqs. (11)–(12) with the coefficients of Tables 1 and 2; T* = 647.096 K,
/// ρ* = 322 kg/m³, μ* = 1 µPa·s. Thermal conductivity: IAPWS R15-11, "Release on the IAPWS Formulation 2011 for the
/// Thermal Conductivity of Ordinary Water Substance", λ = λ* · λ̄0(T̄) · λ̄1(T̄, ρ̄), eqs. (16)–(17) with Tables 1 and 2;
/// λ* = 1 mW/(m·K). The critical enhancements (μ̄2, λ̄2) are left out: they matter only near the critical point
/// (647 K, 322 kg/m³), so these functions refuse temperatures between <see cref="CriticalBandLow"/> and
/// <see cref="CriticalBandHigh"/> K when the density is between 200 and 450 kg/m³. Coefficients transcribed from the releases (from memory; the releases' check values
/// in the tests agree to the last printed digit).
/// </remarks>
public static class WaterTransport
{
    private const double TStar = 647.096, RhoStar = 322.0;

    /// <summary>Outside these temperatures the critical enhancements are negligible whatever the density.</summary>
    public const double CriticalBandLow = 620.0, CriticalBandHigh = 720.0;

    private static readonly double[] H0 = [1.67752, 2.20462, 0.6366564, -0.241605];

    private static readonly double[,] H1 =
    {
        { 5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0, 0 },
        { 8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0, 0, 0 },
        { -1.08374, 1.88797, -7.72479e-1, 0, 0, 0, 0 },
        { -2.89555e-1, 1.26613, -4.89837e-1, 0, 6.98452e-2, 0, -4.35673e-3 },
        { 0, 0, -2.57040e-1, 0, 0, 8.72102e-3, 0 },
        { 0, 1.20573e-1, 0, 0, 0, 0, -5.93264e-4 },
    };

    private static readonly double[] L0 = [2.443221e-3, 1.323095e-2, 6.770357e-3, -3.454586e-3, 4.096266e-4];

    private static readonly double[,] L1 =
    {
        { 1.60397357, -0.646013523, 0.111443906, 0.102997357, -0.0504123634, 0.00609859258 },
        { 2.33771842, -2.78843778, 1.53616167, -0.463045512, 0.0832827019, -0.00719201245 },
        { 2.19650529, -4.54580785, 3.55777244, -1.40944978, 0.275418278, -0.0205938816 },
        { -1.21051378, 1.60812989, -0.621178141, 0.0716373224, 0, 0 },
        { -2.7203370, 4.57586331, -3.18369245, 1.1168348, -0.19268305, 0.012913842 },
    };

    /// <summary>Dynamic viscosity in Pa·s at temperature (K) and density (kg/m³).</summary>
    public static double Viscosity(double temperature, double density)
    {
        Check(temperature, density);
        var t = temperature / TStar;
        var d = density / RhoStar;
        var mu0 = 100 * Math.Sqrt(t) / PowerSeries(H0, 1 / t);
        return 1e-6 * mu0 * Math.Exp(d * Series(H1, t, d));
    }

    /// <summary>Thermal conductivity in W/(m·K) at temperature (K) and density (kg/m³).</summary>
    public static double ThermalConductivity(double temperature, double density)
    {
        Check(temperature, density);
        var t = temperature / TStar;
        var d = density / RhoStar;
        var lambda0 = Math.Sqrt(t) / PowerSeries(L0, 1 / t);
        return 1e-3 * lambda0 * Math.Exp(d * Series(L1, t, d));
    }

    /// <summary>Σᵢ cᵢ xⁱ (the dilute-gas terms with x = 1/T̄).</summary>
    private static double PowerSeries(double[] c, double x)
    {
        double sum = 0, xi = 1;
        foreach (var ci in c) { sum += ci * xi; xi *= x; }
        return sum;
    }

    /// <summary>Σᵢ Σⱼ cᵢⱼ (1/T̄ − 1)ⁱ (ρ̄ − 1)ʲ.</summary>
    private static double Series(double[,] c, double t, double d)
    {
        var sum = 0.0;
        var a = 1 / t - 1;
        var ai = 1.0;
        for (var i = 0; i < c.GetLength(0); i++, ai *= a)
        {
            var bj = 1.0;
            for (var j = 0; j < c.GetLength(1); j++, bj *= d - 1) sum += c[i, j] * ai * bj;
        }
        return sum;
    }

    private static void Check(double temperature, double density)
    {
        const string model = "water transport properties (IAPWS R12-08, R15-11)";
        if (!(temperature >= 253.15 && temperature <= 1173.15))
            throw new PropertyRangeException(model, "temperature", temperature, "K", "253.15–1173.15 K");
        if (!(density >= 0 && density <= 1250))
            throw new PropertyRangeException(model, "density", density, "kg/m3", "0–1250 kg/m3");
        if (temperature is >= CriticalBandLow and <= CriticalBandHigh && density is > 200 and < 450)
            throw new PropertyRangeException(model, "density near the critical point", density, "kg/m3",
                $"below 200 or above 450 kg/m3 between {CriticalBandLow} and {CriticalBandHigh} K (the critical enhancement is not included)");
    }
}
