using FoulingWatch.Core.Uncertainty;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>Indexes of the six measurements of a sample, SI: kg/s and K.</summary>
public static class Measurement
{
    public const int HotFlow = 0, HotInlet = 1, HotOutlet = 2, ColdFlow = 3, ColdInlet = 4, ColdOutlet = 5, Count = 6;
    public static readonly string[] Names = ["hot flow", "hot inlet", "hot outlet", "cold flow", "cold inlet", "cold outlet"];
}

/// <summary>The thermal state of one sample, back-calculated; clean-U dependent values are filled by <see cref="SampleEvaluator.Complete"/>.</summary>
public sealed record SampleEvaluation
{
    public SampleStatus Status { get; init; }
    public string? Detail { get; init; }
    public double DutyHot { get; init; } = double.NaN;
    public double DutyCold { get; init; } = double.NaN;
    public double Duty { get; init; } = double.NaN;
    public double BalanceMismatch { get; init; } = double.NaN;
    public double Lmtd { get; init; } = double.NaN;
    public double CorrectionFactor { get; init; } = double.NaN;
    public double UActual { get; init; } = double.NaN;
    public double HotCapacityRate { get; init; } = double.NaN;
    public double ColdCapacityRate { get; init; } = double.NaN;
    public double TubeFlow { get; init; } = double.NaN;
    public double ShellFlow { get; init; } = double.NaN;
    public double UClean { get; init; } = double.NaN;
    public double FoulingResistance { get; init; } = double.NaN;
    public double Cleanliness { get; init; } = double.NaN;
    public double DutyClean { get; init; } = double.NaN;
    public double DutyRated { get; init; } = double.NaN;
    public double LostDuty { get; init; } = double.NaN;
    public double HotOutletClean { get; init; } = double.NaN;
    public double ColdOutletClean { get; init; } = double.NaN;
    public ReconciliationResult? Reconciliation { get; init; }
    public double[] Measurements { get; init; } = [];
}

/// <summary>Back-calculates duty, LMTD·F and actual U of one sample, then clean U, Rf and lost duty at the sample's conditions.</summary>
public sealed partial class SampleEvaluator
{
    private readonly ExchangerConfiguration _x;

    public SampleEvaluator(ExchangerConfiguration exchanger) => _x = exchanger;

    public ExchangerConfiguration Exchanger => _x;

    /// <summary>One-sigma accuracies of the six measurements at their values, from the configured sensor accuracies.</summary>
    public double[] Sigmas(ReadOnlySpan<double> m)
    {
        var s = new double[Measurement.Count];
        SigmasInto(m, s);
        return s;
    }

    private void SigmasInto(ReadOnlySpan<double> m, double[] s)
    {
        s[Measurement.HotFlow] = _x.Hot.Flow.Sigma(m[Measurement.HotFlow]);
        s[Measurement.HotInlet] = _x.Hot.Inlet.Sigma(m[Measurement.HotInlet]);
        s[Measurement.HotOutlet] = _x.Hot.Outlet.Sigma(m[Measurement.HotOutlet]);
        s[Measurement.ColdFlow] = _x.Cold.Flow.Sigma(m[Measurement.ColdFlow]);
        s[Measurement.ColdInlet] = _x.Cold.Inlet.Sigma(m[Measurement.ColdInlet]);
        s[Measurement.ColdOutlet] = _x.Cold.Outlet.Sigma(m[Measurement.ColdOutlet]);
    }

    private static Temperature T(double k) => Temperature.FromKelvin(k);

    /// <summary>Hot- and cold-side duties in W, or null with the reason the fluid models cannot evaluate the streams.</summary>
    /// <param name="memo">Remembers each side's last enthalpy change: probes that move a flow, or one side's temperatures,
    /// re-evaluate no fluid, or one (same values, fewer property calls).</param>
    public (double Hot, double Cold)? Duties(ReadOnlySpan<double> m, double pHot, double pCold, out string? why, DutyMemo? memo = null)
    {
        memo ??= new DutyMemo();
        var dhh = memo.Hot.Change(_x.Hot.Fluid, m[Measurement.HotInlet], m[Measurement.HotOutlet], pHot, out why);
        if (why is not null) return null;
        var dhc = memo.Cold.Change(_x.Cold.Fluid, m[Measurement.ColdInlet], m[Measurement.ColdOutlet], pCold, out why);
        if (why is not null) return null;
        var qh = -m[Measurement.HotFlow] * dhh;
        var qc = m[Measurement.ColdFlow] * dhc;
        return (qh, qc);
    }

    /// <summary>": hot outlet TI-2 reads 4.1 K above hot inlet TI-1; swapped or mislabelled sensors?" when an outlet is on
    /// the impossible side of its inlet, else empty.</summary>
    private static string Crossed(double[] m, int outlet, int inlet, string outletTag, string inletTag, string side)
    {
        var d = m[outlet] - m[inlet];
        if (side == "below") d = -d;
        return d > 0
            ? FormattableString.Invariant($": {Measurement.Names[outlet]} {outletTag} reads {d:0.0} K {side} {Measurement.Names[inlet]} {inletTag}; swapped or mislabelled sensors?")
            : "";
    }

    /// <summary>Evaluates a sample up to actual U. Measurements in SI (kg/s, K); pressures in Pa absolute.</summary>
    public SampleEvaluation Evaluate(double[] m, double pHot, double pCold, bool reconcile, DutyMemo? memo = null)
    {
        memo ??= new DutyMemo();
        foreach (var v in m)
            if (!(v > 0) || double.IsInfinity(v)) return new SampleEvaluation { Status = SampleStatus.Missing, Measurements = m };
        double[] used = m;
        var duties = Duties(m, pHot, pCold, out var why, memo);
        if (duties is null) return new SampleEvaluation { Status = SampleStatus.PropertyRange, Detail = why, Measurements = m };
        var (qh, qc) = duties.Value;
        if (!(qh > 0) || !(qc > 0))
            return new SampleEvaluation { Status = SampleStatus.NoDuty, DutyHot = qh, DutyCold = qc, Measurements = m,
                Detail = qh <= 0 ? "the hot stream is not cooling" + Crossed(m, Measurement.HotOutlet, Measurement.HotInlet, _x.Hot.Outlet.Tag, _x.Hot.Inlet.Tag, "above")
                    : "the cold stream is not warming" + Crossed(m, Measurement.ColdOutlet, Measurement.ColdInlet, _x.Cold.Outlet.Tag, _x.Cold.Inlet.Tag, "below") };
        var mismatch = (qh - qc) / (0.5 * (qh + qc));
        double q;
        ReconciliationResult? rec = null;
        // Inside uncertainty propagation the reconciled basis is replaced by the mean of the two duties (a documented approximation).
        var basis = reconcile || _x.DutyBasis != DutyBasis.Reconciled ? _x.DutyBasis : DutyBasis.Mean;
        switch (basis)
        {
            case DutyBasis.Hot: q = qh; break;
            case DutyBasis.Cold: q = qc; break;
            case DutyBasis.Mean: q = 0.5 * (qh + qc); break;
            default:
                rec = Reconciliation.Reconcile(m, Sigmas(m), x =>
                {
                    var d = Duties(x, pHot, pCold, out _, memo);
                    return d is null ? double.NaN : d.Value.Hot - d.Value.Cold;
                });
                var adjusted = Duties(rec.Adjusted, pHot, pCold, out _, memo);
                if (adjusted is null || rec.Adjusted.Any(v => !(v > 0)))
                    return new SampleEvaluation { Status = SampleStatus.PropertyRange, Detail = "reconciliation moved a measurement outside the property range", Measurements = m };
                used = rec.Adjusted;
                q = 0.5 * (adjusted.Value.Hot + adjusted.Value.Cold);
                break;
        }
        var baseResult = new SampleEvaluation
        {
            Status = SampleStatus.Ok, DutyHot = qh, DutyCold = qc, Duty = q, BalanceMismatch = mismatch, Reconciliation = rec, Measurements = m,
            TubeFlow = _x.Hot.Side == ExchangerSide.Tube ? used[Measurement.HotFlow] : used[Measurement.ColdFlow],
            ShellFlow = _x.Hot.Side == ExchangerSide.Shell ? used[Measurement.HotFlow] : used[Measurement.ColdFlow],
        };
        var (thi, tho, tci, tco) = TerminalTemperatures(used);
        if (!Core.Exchangers.Lmtd.TryFromTerminalDifferences(thi - tco, tho - tci, out var lmtd))
            return baseResult with { Status = SampleStatus.TemperatureCross, Detail = "a terminal temperature difference is not positive" };
        double f;
        if (_x.Hot.Fluid.IsPhaseChange || _x.Cold.Fluid.IsPhaseChange) f = 1.0; // one side isothermal: F = 1 for every arrangement
        else
        {
            var pr = TemperatureEffectiveness.FromTemperatures(T(thi), T(tho), T(tci), T(tco));
            if (pr is null) return baseResult with { Status = SampleStatus.TemperatureCross, Detail = "the cold stream is not warming" };
            if (!_x.Arrangement.TryLmtdCorrectionFactor(pr.Value.P, pr.Value.R, out f))
                return baseResult with { Status = SampleStatus.CorrectionUndefined, Lmtd = lmtd,
                    Detail = FormattableString.Invariant($"P = {pr.Value.P:0.###} is beyond the maximum for R = {pr.Value.R:0.###} ({_x.Arrangement.Name})") };
            f = Math.Min(f, 1.0);
        }
        var ch = _x.Hot.Fluid.IsPhaseChange ? double.PositiveInfinity : q / (thi - tho);
        var cc = _x.Cold.Fluid.IsPhaseChange ? double.PositiveInfinity : q / (tco - tci);
        return baseResult with
        {
            Lmtd = lmtd,
            CorrectionFactor = f,
            UActual = q / (_x.Area * f * lmtd),
            HotCapacityRate = ch,
            ColdCapacityRate = cc,
        };
    }

    /// <summary>
    /// Terminal temperatures for LMTD and rating: measured, except that a condensing or evaporating side is taken as
    /// isothermal at its saturation temperature (common practice: desuperheating and subcooling zones are small; their
    /// enthalpy still counts in the duty).
    /// </summary>
    public (double HotIn, double HotOut, double ColdIn, double ColdOut) TerminalTemperatures(double[] used)
    {
        double thi = used[Measurement.HotInlet], tho = used[Measurement.HotOutlet], tci = used[Measurement.ColdInlet], tco = used[Measurement.ColdOutlet];
        if (_x.Hot.Fluid is SteamPhaseChange hs) thi = tho = hs.SaturationTemperature.Kelvin;
        if (_x.Cold.Fluid is SteamPhaseChange cs) tci = tco = cs.SaturationTemperature.Kelvin;
        return (thi, tho, tci, tco);
    }

    /// <summary>Bulk (mean of inlet and outlet) temperatures of the tube and shell sides, K.</summary>
    public (double Tube, double Shell) BulkTemperatures(double[] m)
    {
        var hot = 0.5 * (m[Measurement.HotInlet] + m[Measurement.HotOutlet]);
        var cold = 0.5 * (m[Measurement.ColdInlet] + m[Measurement.ColdOutlet]);
        return _x.Hot.Side == ExchangerSide.Tube ? (hot, cold) : (cold, hot);
    }

    /// <summary>Why a sample has no clean U (its status becomes property-range).</summary>
    public const string CleanUUndefined =
        "the clean U is undefined at these flows and temperatures (a Reynolds or Prandtl number outside the film correlations' ranges)";

    /// <summary>Adds clean U, Rf = 1/U − 1/U_clean, cleanliness and lost duty (ε-NTU at U_clean and at U, today's inlets and capacity rates).</summary>
    public SampleEvaluation Complete(SampleEvaluation e, ICleanUModel clean, double[] used)
    {
        if (!(e.UActual > 0)) return e;
        if (CleanValues(e.UActual, e.TubeFlow, e.ShellFlow, e.HotCapacityRate, e.ColdCapacityRate, used, clean) is not { } v)
            return e with { Status = SampleStatus.PropertyRange, Detail = CleanUUndefined };
        return e with
        {
            UClean = v.UClean,
            FoulingResistance = v.FoulingResistance,
            Cleanliness = v.Cleanliness,
            DutyClean = v.DutyClean,
            DutyRated = v.DutyRated,
            LostDuty = v.LostDuty,
            HotOutletClean = v.HotOutletClean,
            ColdOutletClean = v.ColdOutletClean,
        };
    }

    /// <summary>The clean-U dependent values of a sample with actual U <paramref name="uActual"/> (&gt; 0) evaluated on
    /// the measurements <paramref name="used"/>; null when the clean U is undefined there. What <see cref="Complete"/>
    /// adds, without a record (the back-calculation writes them straight into its columns).</summary>
    public CleanValues? CleanValues(double uActual, double tubeFlow, double shellFlow, double hotCapacityRate,
        double coldCapacityRate, double[] used, ICleanUModel clean)
    {
        var (tubeBulk, shellBulk) = BulkTemperatures(used);
        var uc = clean.CleanU(tubeFlow, shellFlow, tubeBulk, shellBulk);
        if (!(uc > 0)) return null;
        var terminals = TerminalTemperatures(used);
        var thi = T(terminals.HotIn);
        var tci = T(terminals.ColdIn);
        var ratedClean = Rating.Rate(_x.Arrangement, uc * _x.Area, hotCapacityRate, coldCapacityRate, thi, tci);
        var ratedNow = Rating.Rate(_x.Arrangement, uActual * _x.Area, hotCapacityRate, coldCapacityRate, thi, tci);
        return new CleanValues(uc, 1 / uActual - 1 / uc, uActual / uc, ratedClean.Duty, ratedNow.Duty,
            ratedClean.Duty - ratedNow.Duty, ratedClean.HotOutlet.Kelvin, ratedClean.ColdOutlet.Kelvin);
    }

    /// <summary>Rf in m²·K/W of a sample, or NaN when it cannot be evaluated (used for uncertainty propagation).</summary>
    /// <remarks>The arithmetic of <see cref="Evaluate"/> without reconciliation (a reconciled basis counts as the mean of
    /// the two duties) and <see cref="Complete"/>'s Rf, without building the evaluation records: it runs a dozen times
    /// per sample.</remarks>
    public double FoulingResistanceOf(double[] m, double pHot, double pCold, ICleanUModel clean, DutyMemo? memo = null)
    {
        foreach (var v in m)
            if (!(v > 0) || double.IsInfinity(v)) return double.NaN;
        var duties = Duties(m, pHot, pCold, out _, memo);
        if (duties is null) return double.NaN;
        var (qh, qc) = duties.Value;
        if (!(qh > 0) || !(qc > 0)) return double.NaN;
        var q = _x.DutyBasis switch { DutyBasis.Hot => qh, DutyBasis.Cold => qc, _ => 0.5 * (qh + qc) };
        var (thi, tho, tci, tco) = TerminalTemperatures(m);
        var (lmtd, f) = DrivingForce(thi, tho, tci, tco);
        if (double.IsNaN(lmtd)) return double.NaN;
        var u = q / (_x.Area * f * lmtd);
        if (!(u > 0)) return double.NaN;
        var tube = _x.Hot.Side == ExchangerSide.Tube ? m[Measurement.HotFlow] : m[Measurement.ColdFlow];
        var shell = _x.Hot.Side == ExchangerSide.Shell ? m[Measurement.HotFlow] : m[Measurement.ColdFlow];
        var (tubeBulk, shellBulk) = BulkTemperatures(m);
        return 1 / u - 1 / clean.CleanU(tube, shell, tubeBulk, shellBulk);
    }

    /// <summary>LMTD and F (capped at 1; 1 with a phase change) of the terminal temperatures, NaN when undefined.</summary>
    private (double Lmtd, double F) DrivingForce(double thi, double tho, double tci, double tco)
    {
        if (!Core.Exchangers.Lmtd.TryFromTerminalDifferences(thi - tco, tho - tci, out var lmtd))
            return (double.NaN, double.NaN);
        if (_x.Hot.Fluid.IsPhaseChange || _x.Cold.Fluid.IsPhaseChange) return (lmtd, 1.0);
        var pr = TemperatureEffectiveness.FromTemperatures(T(thi), T(tho), T(tci), T(tco));
        if (pr is null || !_x.Arrangement.TryLmtdCorrectionFactor(pr.Value.P, pr.Value.R, out var f))
            return (double.NaN, double.NaN);
        return (lmtd, Math.Min(f, 1.0));
    }

    /// <summary>First-order (Taylor series) standard uncertainty of Rf from the sensor accuracies, σ² = Σ (∂Rf/∂xᵢ·σᵢ)², in the
    /// manner of ASME PTC 19.1 (GUM 5.1.2). Sensor errors are taken as independent. The sensitivities are
    /// <see cref="FoulingResistanceSensitivities"/>; NaN where they are undefined.</summary>
    /// <param name="memo">One per worker, reused sample after sample, or null for a fresh one.</param>
    public double FoulingResistanceSigma(double[] m, double pHot, double pCold, ICleanUModel clean, DutyMemo? memo = null)
    {
        memo ??= new DutyMemo();
        var (sigma, _, sensitivity) = memo.Workspace;
        SigmasInto(m, sigma);
        if (!FoulingResistanceSensitivities(m, pHot, pCold, clean, sigma, sensitivity, memo)) return double.NaN;
        var variance = 0.0;
        for (var i = 0; i < sigma.Length; i++) variance += sensitivity[i] * sensitivity[i] * sigma[i] * sigma[i];
        return Math.Sqrt(Math.Max(0, variance));
    }

    /// <summary>The same σ by central differences of the whole model (<see cref="FirstOrderPropagation.StandardUncertainty"/>
    /// on <see cref="FoulingResistanceOf"/>, step σᵢ/100): twelve evaluations of every part, eight of the fluids. The
    /// reference the chain-rule sensitivities are tested against.</summary>
    public double FoulingResistanceSigmaByProbes(double[] m, double pHot, double pCold, ICleanUModel clean, DutyMemo? memo = null)
    {
        memo ??= new DutyMemo();
        var (sigma, probe, sensitivity) = memo.Workspace;
        SigmasInto(m, sigma);
        return FirstOrderPropagation.StandardUncertainty(new RfAt(this, pHot, pCold, clean, memo), m, sigma, probe, sensitivity);
    }

    private readonly struct RfAt(SampleEvaluator evaluator, double pHot, double pCold, ICleanUModel clean, DutyMemo memo)
        : FirstOrderPropagation.IFunction
    {
        public double At(double[] x) => evaluator.FoulingResistanceOf(x, pHot, pCold, clean, memo);
    }
}

/// <summary>What the clean U adds to a sample: U_clean, Rf, cleanliness, the duties rated at U_clean and at U and their
/// difference (lost duty), and the outlets the clean exchanger would reach.</summary>
public readonly record struct CleanValues(double UClean, double FoulingResistance, double Cleanliness, double DutyClean,
    double DutyRated, double LostDuty, double HotOutletClean, double ColdOutletClean);

/// <summary>The last enthalpy change of each side (fixed pressures), with its validity verdict, and the propagation's
/// buffers: one per worker, reused sample after sample (it matches exact arguments, so a value is never stale).</summary>
public sealed class DutyMemo
{
    internal SideMemo Hot { get; } = new();
    internal SideMemo Cold { get; } = new();
    private (double[], double[], double[])? _workspace;

    /// <summary>Buffers for the propagation: the sensor sigmas, the probe point and the sensitivities.</summary>
    internal (double[] Sigma, double[] Probe, double[] Sensitivity) Workspace =>
        _workspace ??= (new double[Measurement.Count], new double[Measurement.Count], new double[Measurement.Count]);

    internal sealed class SideMemo
    {
        private double _in = double.NaN, _out = double.NaN, _p = double.NaN, _dh;
        private string? _why;

        public double Change(IFluidModel fluid, double tIn, double tOut, double p, out string? why)
        {
            if (tIn.Equals(_in) && tOut.Equals(_out) && p.Equals(_p)) { why = _why; return _dh; }
            var pressure = new Pressure(p);
            why = fluid.WhyNotEvaluable(Temperature.FromKelvin(tIn), Temperature.FromKelvin(tOut), pressure);
            var dh = why is null ? fluid.EnthalpyChange(Temperature.FromKelvin(tIn), Temperature.FromKelvin(tOut), pressure) : double.NaN;
            (_in, _out, _p, _dh, _why) = (tIn, tOut, p, dh, why);
            return dh;
        }
    }
}
