using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

/// <summary>Overall heat-transfer coefficient from its series resistances, referred to the tube outside area (the convention of shell-and-tube datasheets).</summary>
/// <remarks>
/// 1/U_o = 1/h_o + R_f,o + R_wall + R_f,i·(A_o/A_i) + (1/h_i)·(A_o/A_i), with for a tube wall
/// R_wall = d_o·ln(d_o/d_i)/(2k) and A_o/A_i = d_o/d_i (cylindrical conduction; Incropera et al., eq. 11.5;
/// Kern, Process Heat Transfer, ch. 6). A thin flat wall (plates) has R_wall = t/k and A_o/A_i = 1.
/// </remarks>
public static class ThermalResistance
{
    /// <summary>U in W/(m²·K) referred to the outside area of a tube of outside/inside diameters d_o, d_i (m) and wall conductivity k (W/(m·K)).</summary>
    public static double TubeOverallCoefficient(double outsideFilm, double insideFilm, double outsideDiameter, double insideDiameter,
        double wallConductivity, double outsideFouling = 0, double insideFouling = 0)
    {
        Positive("outside film coefficient", outsideFilm, "W/m2K");
        Positive("inside film coefficient", insideFilm, "W/m2K");
        Positive("tube inside diameter", insideDiameter, "m");
        Positive("wall conductivity", wallConductivity, "W/mK");
        if (!(outsideDiameter > insideDiameter))
            throw new QuantityOutOfRangeException("tube outside diameter", outsideDiameter, "m", $"above the inside diameter {insideDiameter} m");
        NonNegative("outside fouling resistance", outsideFouling);
        NonNegative("inside fouling resistance", insideFouling);
        var ratio = outsideDiameter / insideDiameter;
        var wall = outsideDiameter * Math.Log(ratio) / (2 * wallConductivity);
        return 1 / (1 / outsideFilm + outsideFouling + wall + insideFouling * ratio + ratio / insideFilm);
    }

    /// <summary>U in W/(m²·K) across a thin flat wall of thickness t (m), e.g. a plate.</summary>
    public static double FlatWallOverallCoefficient(double film1, double film2, double wallThickness, double wallConductivity,
        double fouling1 = 0, double fouling2 = 0)
    {
        Positive("film coefficient (side 1)", film1, "W/m2K");
        Positive("film coefficient (side 2)", film2, "W/m2K");
        Positive("wall conductivity", wallConductivity, "W/mK");
        NonNegative("wall thickness", wallThickness, "m");
        NonNegative("fouling resistance (side 1)", fouling1);
        NonNegative("fouling resistance (side 2)", fouling2);
        return 1 / (1 / film1 + fouling1 + wallThickness / wallConductivity + fouling2 + 1 / film2);
    }

    private static void Positive(string name, double v, string unit)
    {
        if (!(v > 0) || double.IsInfinity(v)) throw new QuantityOutOfRangeException(name, v, unit, $"above 0 {unit}");
    }

    private static void NonNegative(string name, double v, string unit = "m2K/W")
    {
        if (!(v >= 0) || double.IsInfinity(v)) throw new QuantityOutOfRangeException(name, v, unit, $"0 {unit} or above");
    }
}
