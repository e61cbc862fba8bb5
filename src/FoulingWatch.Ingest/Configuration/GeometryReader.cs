using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Units;

namespace FoulingWatch.Ingest.Configuration;

public static partial class PlantConfigurationReader
{
    private static readonly string[] Layouts = ["triangular", "square", "rotated-square"];

    /// <summary>
    /// The geometry method's bundle, checked as a designer would: inner diameter below outer, pitch at least 1.2 tube
    /// diameters (TEMA's minimum is 1.25; a little room for rounding), baffle spacing between a fifth of the shell
    /// diameter and two diameters (TEMA's minimum and a generous maximum), the tube count within what the shell holds, and
    /// the tube surface within 15 % of the exchanger's area. Both fluids need transport properties.
    /// </summary>
    private static GeometryCleanReference? ReadGeometry(JsonNode n, StreamConfiguration? hot, StreamConfiguration? cold, double? area)
    {
        var ds = n.Quantity("shellDiameter", Dimension.Length, required: true, minSi: 0.05, maxSi: 5);
        var dout = n.Quantity("tubeOuterDiameter", Dimension.Length, required: true, minSi: 0.003, maxSi: 0.1);
        var din = n.Quantity("tubeInnerDiameter", Dimension.Length, required: true, minSi: 0.002, maxSi: 0.1);
        var length = n.Quantity("tubeLength", Dimension.Length, required: true, minSi: 0.2, maxSi: 30);
        var count = n.Integer("tubeCount", required: true, min: 1, max: 100_000);
        var pitch = n.Quantity("tubePitch", Dimension.Length, required: true, minSi: 0.004, maxSi: 0.2);
        var layoutText = n.String("layout") ?? "triangular";
        var passes = n.Integer("tubePasses", min: 1, max: 16) ?? 1;
        var baffles = n.Quantity("baffleSpacing", Dimension.Length, required: true, minSi: 0.02, maxSi: 10);
        var wall = n.Quantity("wallConductivity", Dimension.ThermalConductivity, minSi: 1, maxSi: 500) ?? 50;
        var uncertainty = n.Fraction("uncertainty", min: 0, max: 0.5) ?? GeometryCleanReference.DefaultUncertainty;
        var details = ReadBaffleDetails(n, ds);
        var layout = layoutText.ToLowerInvariant() switch
        {
            "triangular" => TubeLayout.Triangular, "square" => TubeLayout.Square, "rotated-square" => TubeLayout.RotatedSquare, _ => (TubeLayout?)null,
        };
        if (layout is null) n.Error("layout", $"'{layoutText}' is not a tube layout; use {string.Join(", ", Layouts.Select(l => $"\"{l}\""))}.");
        if (din >= dout) n.Error("tubeInnerDiameter", "must be smaller than tubeOuterDiameter.");
        if (pitch < 1.2 * dout) n.Error("tubePitch", "must be at least 1.2 tube outer diameters (TEMA: 1.25).");
        if (baffles < 0.2 * ds || baffles > 2 * ds) n.Error("baffleSpacing", "must lie between a fifth of the shell diameter and two shell diameters.");
        RequireTransportFluids(n, hot, cold);
        if (ds is null || dout is null || din is null || length is null || count is null || pitch is null || baffles is null || layout is null
            || din >= dout || pitch < 1.2 * dout)
            return null;
        var g = new ShellAndTubeGeometry(ds.Value, dout.Value, din.Value, length.Value, count.Value, pitch.Value, layout.Value, passes, baffles.Value, wall)
            { Baffles = details };
        if (g.BellDelaware is { } bd && !(double.IsFinite(bd.Fc) && bd.Fc > 0 && double.IsFinite(bd.WindowArea) && bd.WindowArea > 0))
            n.Error("baffleCut", "with this shell, bundle clearance and tube size the cut does not cross the bundle as the Bell–Delaware " +
                "method needs; check baffleCut, bundleShellClearance and the diameters.");
        if (count > 1.05 * g.TubeCapacity)
            n.Error("tubeCount", FormattableString.Invariant($"{count} tubes do not fit a {ds * 1000:0} mm shell at this pitch and pass count (about {g.TubeCapacity:0} do); check the values."));
        if (area is { } a && Math.Abs(g.OutsideArea - a) > 0.15 * a)
            n.ErrorHere(FormattableString.Invariant($"the tubes' outside surface N·π·Do·L = {g.OutsideArea:0.#} m2 differs from the exchanger's area {a:0.#} m2 by more than 15 %; check the geometry or the area."));
        return new GeometryCleanReference(g, uncertainty);
    }

    /// <summary>With a baffle cut the shell side is rated by Bell–Delaware: cut 15–45 % of the shell diameter, clearances
    /// up to 10 mm (tube and shell holes) and 100 mm (bundle to shell), sealing strips, end spacings; null without a cut.</summary>
    private static BaffleDetails? ReadBaffleDetails(JsonNode n, double? shellDiameter)
    {
        var cut = n.Fraction("baffleCut", min: 0.15, max: 0.45);
        var tubeHole = n.Quantity("tubeBaffleClearance", Dimension.Length, minSi: 0, maxSi: 0.01);
        var shellGap = n.Quantity("shellBaffleClearance", Dimension.Length, minSi: 0, maxSi: 0.01);
        var bundleGap = n.Quantity("bundleShellClearance", Dimension.Length, minSi: 0, maxSi: 0.1);
        var strips = n.Integer("sealingStripPairs", min: 0, max: 20);
        var inlet = n.Quantity("inletBaffleSpacing", Dimension.Length, minSi: 0.02, maxSi: 10);
        var outlet = n.Quantity("outletBaffleSpacing", Dimension.Length, minSi: 0.02, maxSi: 10);
        if (cut is null)
        {
            if (tubeHole is not null || shellGap is not null || bundleGap is not null || inlet is not null || outlet is not null || strips is not null)
                n.ErrorHere("clearances, sealing strips and end spacings are used by the Bell–Delaware shell side, which needs \"baffleCut\" (e.g. \"25 %\").");
            return null;
        }
        if (bundleGap is { } gap && shellDiameter is { } ds && gap >= 0.2 * ds)
            n.Error("bundleShellClearance", "must be well below the shell diameter (it is the gap between the outer tubes and the shell).");
        return new BaffleDetails(cut.Value, tubeHole, shellGap, bundleGap, strips ?? 0, inlet, outlet);
    }

    /// <summary>
    /// A plate exchanger's pack for the geometry method (arrangement "plate"): plate count 3–1000, width 0.05–5 m, port
    /// length 0.1–10 m, channel gap 1–10 mm, chevron angle 0–80° (Martin's range), enlargement factor 1–1.5 (default
    /// 1.17), plate thickness 0.2–3 mm (default 0.6 mm) and conductivity (default 16 W/mK, stainless steel); the thermal
    /// plates' surface (N − 2)·w·L·Φ within 15 % of the area. Both fluids need transport properties.
    /// </summary>
    private static PlateGeometryCleanReference? ReadPlateGeometry(JsonNode n, StreamConfiguration? hot, StreamConfiguration? cold, double? area)
    {
        var plates = n.Integer("plateCount", required: true, min: 3, max: 1000);
        var width = n.Quantity("plateWidth", Dimension.Length, required: true, minSi: 0.05, maxSi: 5);
        var length = n.Quantity("plateLength", Dimension.Length, required: true, minSi: 0.1, maxSi: 10);
        var gap = n.Quantity("channelGap", Dimension.Length, required: true, minSi: 0.001, maxSi: 0.01);
        var angle = n.Number("chevronAngle", required: true, min: 0, max: 80);
        var phi = n.Number("enlargementFactor", min: 1, max: 1.5) ?? 1.17;
        var thickness = n.Quantity("plateThickness", Dimension.Length, minSi: 2e-4, maxSi: 3e-3) ?? 6e-4;
        var wall = n.Quantity("wallConductivity", Dimension.ThermalConductivity, minSi: 1, maxSi: 500) ?? 16;
        var uncertainty = n.Fraction("uncertainty", min: 0, max: 0.5) ?? GeometryCleanReference.DefaultUncertainty;
        RequireTransportFluids(n, hot, cold);
        if (plates is null || width is null || length is null || gap is null || angle is null) return null;
        var g = new PlateGeometry(plates.Value, width.Value, length.Value, gap.Value, angle.Value, phi, thickness, wall);
        if (area is { } a && Math.Abs(g.Area - a) > 0.15 * a)
            n.ErrorHere(FormattableString.Invariant($"the thermal plates' surface (N − 2)·w·L·Φ = {g.Area:0.#} m2 differs from the exchanger's area {a:0.#} m2 by more than 15 %; check the plate pack or the area."));
        return new PlateGeometryCleanReference(g, uncertainty);
    }

    /// <summary>The geometry method rates films from properties: both fluids must be single-phase with transport
    /// properties.</summary>
    private static void RequireTransportFluids(JsonNode n, StreamConfiguration? hot, StreamConfiguration? cold)
    {
        foreach (var (side, key) in new[] { (hot, "hot"), (cold, "cold") })
            if (side?.Fluid is { } f && (f.IsPhaseChange || f is not ITransportFluid))
                n.ErrorHere($"the geometry method needs the viscosity and conductivity of both fluids; {key}.fluid ({f.Description}) has not: " +
                    "use \"water\" or a petroleum liquid with its viscosity, or the datasheet method.");
    }
}
