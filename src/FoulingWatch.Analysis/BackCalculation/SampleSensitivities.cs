using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>The sensitivity coefficients ∂Rf/∂xᵢ of one sample by the chain rule.</summary>
/// <remarks>
/// Rf = 1/U − 1/U_clean with 1/U = A·D/q, D = F·LMTD of the terminal temperatures and q the duty of the configured basis,
/// so ∂Rf/∂x = A·(q·∂D/∂x − D·∂q/∂x)/q² + (∂U_clean/∂x)/U_clean² (GUM, JCGM 100:2008, 5.1.3: sensitivity coefficients
/// as partial derivatives of the model). The duty's derivatives are analytic: q_h = −ṁ_h·Δh_h, so ∂q_h/∂ṁ_h = q_h/ṁ_h,
/// ∂q_h/∂T_h,in = ṁ_h·c_p(T_h,in) and ∂q_h/∂T_h,out = −ṁ_h·c_p(T_h,out) (c_p = ∂h/∂T at constant pressure, the fluid
/// model's own; likewise the cold side; a condensing or evaporating side gives its vapour's and liquid's c_p outside the
/// saturation band, 0 inside it). The driving force D and the clean U, which have no convenient closed form for every
/// arrangement and clean-U model, take central differences of those parts alone with the probe steps of the whole-model
/// differences (σᵢ/100; the bulk temperature moves by half a terminal temperature's step). The whole-model central
/// differences (<see cref="SampleEvaluator.FoulingResistanceSigmaByProbes"/>) evaluate every part twelve times, the fluid
/// properties eight; this evaluates no fluid beyond the sample's own states. The two agree within 3·10⁻⁸ of σ on every
/// usable interval of the sample plant (tested to 10⁻⁶).
/// </remarks>
public sealed partial class SampleEvaluator
{
    /// <summary>∂Rf/∂xᵢ of the six measurements (m²·K/W per kg/s or per K) into <paramref name="c"/>; false where Rf or
    /// a derivative is undefined. <paramref name="sigma"/> gives the probe steps (σᵢ/100) of the numeric parts.</summary>
    public bool FoulingResistanceSensitivities(double[] m, double pHot, double pCold, ICleanUModel clean, double[] sigma,
        double[] c, DutyMemo? memo = null)
    {
        foreach (var v in m)
            if (!(v > 0) || double.IsInfinity(v)) return false;
        if (Duties(m, pHot, pCold, out _, memo) is not var (qh, qc) || !(qh > 0) || !(qc > 0)) return false;
        if (!EndSlopes(_x.Hot.Fluid, m[Measurement.HotInlet], m[Measurement.HotOutlet], pHot, out var hotIn, out var hotOut)
            || !EndSlopes(_x.Cold.Fluid, m[Measurement.ColdInlet], m[Measurement.ColdOutlet], pCold, out var coldIn,
                out var coldOut))
            return false;
        Span<double> dqh = stackalloc double[Measurement.Count];
        Span<double> dqc = stackalloc double[Measurement.Count];
        dqh.Clear();
        dqc.Clear();
        dqh[Measurement.HotFlow] = qh / m[Measurement.HotFlow];
        dqh[Measurement.HotInlet] = -m[Measurement.HotFlow] * hotIn;
        dqh[Measurement.HotOutlet] = -m[Measurement.HotFlow] * hotOut;
        dqc[Measurement.ColdFlow] = qc / m[Measurement.ColdFlow];
        dqc[Measurement.ColdInlet] = m[Measurement.ColdFlow] * coldIn;
        dqc[Measurement.ColdOutlet] = m[Measurement.ColdFlow] * coldOut;
        var q = _x.DutyBasis switch { DutyBasis.Hot => qh, DutyBasis.Cold => qc, _ => 0.5 * (qh + qc) };

        var (thi, tho, tci, tco) = TerminalTemperatures(m);
        var (lmtd, f) = DrivingForce(thi, tho, tci, tco);
        var d = f * lmtd;
        if (!double.IsFinite(d) || !(d > 0)) return false;
        Span<double> dd = stackalloc double[Measurement.Count];
        dd.Clear();
        if (!_x.Hot.Fluid.IsPhaseChange)
        {
            dd[Measurement.HotInlet] = DrivingSlope(thi, tho, tci, tco, 0, sigma[Measurement.HotInlet] / 100);
            dd[Measurement.HotOutlet] = DrivingSlope(thi, tho, tci, tco, 1, sigma[Measurement.HotOutlet] / 100);
        }
        if (!_x.Cold.Fluid.IsPhaseChange)
        {
            dd[Measurement.ColdInlet] = DrivingSlope(thi, tho, tci, tco, 2, sigma[Measurement.ColdInlet] / 100);
            dd[Measurement.ColdOutlet] = DrivingSlope(thi, tho, tci, tco, 3, sigma[Measurement.ColdOutlet] / 100);
        }

        var hotTube = _x.Hot.Side == ExchangerSide.Tube;
        var (tubeFlow, shellFlow) = hotTube
            ? (Measurement.HotFlow, Measurement.ColdFlow)
            : (Measurement.ColdFlow, Measurement.HotFlow);
        var (tubeBulk, shellBulk) = BulkTemperatures(m);
        double mt = m[tubeFlow], ms = m[shellFlow];
        var uc = clean.CleanU(mt, ms, tubeBulk, shellBulk);
        if (!(uc > 0)) return false;
        Span<double> duc = stackalloc double[Measurement.Count];
        duc.Clear();
        // An infinite clean U (σ of 1/U alone, as the calibration asks) contributes nothing: 1/U_clean is 0 around it.
        var cleanTerm = !double.IsPositiveInfinity(uc);
        if (cleanTerm) CleanSlopes(clean, sigma, mt, ms, tubeBulk, shellBulk, tubeFlow, shellFlow, hotTube, duc);
        for (var i = 0; i < Measurement.Count; i++)
        {
            var dq = _x.DutyBasis switch { DutyBasis.Hot => dqh[i], DutyBasis.Cold => dqc[i], _ => 0.5 * (dqh[i] + dqc[i]) };
            c[i] = _x.Area * (q * dd[i] - d * dq) / (q * q) + (cleanTerm ? duc[i] / (uc * uc) : 0);
            if (!double.IsFinite(c[i])) return false;
        }
        return true;
    }

    /// <summary>∂U_clean/∂xᵢ by central differences in each side's flow and bulk temperature (a terminal temperature
    /// moves its side's bulk temperature by half its own change).</summary>
    private static void CleanSlopes(ICleanUModel clean, double[] sigma, double mt, double ms, double tubeBulk,
        double shellBulk, int tubeFlow, int shellFlow, bool hotTube, Span<double> duc)
    {
        var h = sigma[tubeFlow] / 100;
        duc[tubeFlow] = h > 0
            ? (clean.CleanU(mt + h, ms, tubeBulk, shellBulk) - clean.CleanU(mt - h, ms, tubeBulk, shellBulk)) / (2 * h) : 0;
        h = sigma[shellFlow] / 100;
        duc[shellFlow] = h > 0
            ? (clean.CleanU(mt, ms + h, tubeBulk, shellBulk) - clean.CleanU(mt, ms - h, tubeBulk, shellBulk)) / (2 * h) : 0;
        var hotBulkStep = Math.Max(sigma[Measurement.HotInlet], sigma[Measurement.HotOutlet]) / 200;
        var coldBulkStep = Math.Max(sigma[Measurement.ColdInlet], sigma[Measurement.ColdOutlet]) / 200;
        h = hotTube ? hotBulkStep : coldBulkStep;
        var tubeBulkSlope = h > 0
            ? (clean.CleanU(mt, ms, tubeBulk + h, shellBulk) - clean.CleanU(mt, ms, tubeBulk - h, shellBulk)) / (2 * h) : 0;
        h = hotTube ? coldBulkStep : hotBulkStep;
        var shellBulkSlope = h > 0
            ? (clean.CleanU(mt, ms, tubeBulk, shellBulk + h) - clean.CleanU(mt, ms, tubeBulk, shellBulk - h)) / (2 * h) : 0;
        var (hotBulkSlope, coldBulkSlope) = hotTube ? (tubeBulkSlope, shellBulkSlope) : (shellBulkSlope, tubeBulkSlope);
        duc[Measurement.HotInlet] = duc[Measurement.HotOutlet] = 0.5 * hotBulkSlope;
        duc[Measurement.ColdInlet] = duc[Measurement.ColdOutlet] = 0.5 * coldBulkSlope;
    }

    /// <summary>∂Δh/∂T_in and ∂Δh/∂T_out of Δh = h(T_out) − h(T_in), from the fluid model
    /// (<see cref="IFluidModel.EnthalpyChangeSlopes"/>).</summary>
    /// <remarks>The temperatures passed the model's validity check with the duties; a model that still refuses one (a
    /// state on a region boundary) leaves the sample's σ undefined rather than stopping the run.</remarks>
    private static bool EndSlopes(IFluidModel fluid, double tIn, double tOut, double p, out double slopeIn, out double slopeOut)
    {
        try
        {
            (slopeIn, slopeOut) =
                fluid.EnthalpyChangeSlopes(Temperature.FromKelvin(tIn), Temperature.FromKelvin(tOut), new Pressure(p));
        }
        catch (QuantityOutOfRangeException) // a property range or a quantity out of range
        {
            (slopeIn, slopeOut) = (double.NaN, double.NaN);
        }
        return double.IsFinite(slopeIn) && double.IsFinite(slopeOut);
    }

    /// <summary>∂(F·LMTD)/∂ of terminal temperature <paramref name="which"/> (0 hot in, 1 hot out, 2 cold in, 3 cold out)
    /// by central differences with step h; 0 for h = 0; NaN where the driving force is undefined at a probe.</summary>
    private double DrivingSlope(double thi, double tho, double tci, double tco, int which, double h)
    {
        if (!(h > 0)) return 0;
        double At(double delta)
        {
            var (l, f) = which switch
            {
                0 => DrivingForce(thi + delta, tho, tci, tco),
                1 => DrivingForce(thi, tho + delta, tci, tco),
                2 => DrivingForce(thi, tho, tci + delta, tco),
                _ => DrivingForce(thi, tho, tci, tco + delta),
            };
            return l * f;
        }
        return (At(h) - At(-h)) / (2 * h);
    }
}
