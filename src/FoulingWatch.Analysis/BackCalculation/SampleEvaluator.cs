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
public sealed class SampleEvaluator
{
    private readonly ExchangerConfiguration _x;

    public SampleEvaluator(ExchangerConfiguration exchanger) => _x = exchanger;

    public ExchangerConfiguration Exchanger => _x;

    /// <summary>One-sigma accuracies of the six measurements at their values, from the configured sensor accuracies.</summary>
    public double[] Sigmas(ReadOnlySpan<double> m)
    {
        var s = new double[Measurement.Count];
        s[Measurement.HotFlow] = _x.Hot.Flow.Sigma(m[Measurement.HotFlow]);
        s[Measurement.HotInlet] = _x.Hot.Inlet.Sigma(m[Measurement.HotInlet]);
        s[Measurement.HotOutlet] = _x.Hot.Outlet.Sigma(m[Measurement.HotOutlet]);
        s[Measurement.ColdFlow] = _x.Cold.Flow.Sigma(m[Measurement.ColdFlow]);
        s[Measurement.ColdInlet] = _x.Cold.Inlet.Sigma(m[Measurement.ColdInlet]);
        s[Measurement.ColdOutlet] = _x.Cold.Outlet.Sigma(m[Measurement.ColdOutlet]);
        return s;
    }

    private static Temperature T(double k) => Temperature.FromKelvin(k);

    /// <summary>Hot- and cold-side duties in W, or null with the reason the fluid models cannot evaluate the streams.</summary>
    public (double Hot, double Cold)? Duties(ReadOnlySpan<double> m, double pHot, double pCold, out string? why)
    {
        var hp = new Pressure(pHot);
        var cp = new Pressure(pCold);
        why = _x.Hot.Fluid.WhyNotEvaluable(T(m[Measurement.HotInlet]), T(m[Measurement.HotOutlet]), hp)
              ?? _x.Cold.Fluid.WhyNotEvaluable(T(m[Measurement.ColdInlet]), T(m[Measurement.ColdOutlet]), cp);
        if (why is not null) return null;
        var qh = -m[Measurement.HotFlow] * _x.Hot.Fluid.EnthalpyChange(T(m[Measurement.HotInlet]), T(m[Measurement.HotOutlet]), hp);
        var qc = m[Measurement.ColdFlow] * _x.Cold.Fluid.EnthalpyChange(T(m[Measurement.ColdInlet]), T(m[Measurement.ColdOutlet]), cp);
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
    public SampleEvaluation Evaluate(double[] m, double pHot, double pCold, bool reconcile)
    {
        foreach (var v in m)
            if (!(v > 0) || double.IsInfinity(v)) return new SampleEvaluation { Status = SampleStatus.Missing, Measurements = m };
        double[] used = m;
        var duties = Duties(m, pHot, pCold, out var why);
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
                    var d = Duties(x, pHot, pCold, out _);
                    return d is null ? double.NaN : d.Value.Hot - d.Value.Cold;
                });
                var adjusted = Duties(rec.Adjusted, pHot, pCold, out _);
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

    /// <summary>Adds clean U, Rf = 1/U − 1/U_clean, cleanliness and lost duty (ε-NTU at U_clean and at U, today's inlets and capacity rates).</summary>
    public SampleEvaluation Complete(SampleEvaluation e, ICleanUModel clean, double[] used)
    {
        if (!(e.UActual > 0)) return e;
        var uc = clean.CleanU(e.TubeFlow, e.ShellFlow);
        var terminals = TerminalTemperatures(used);
        var thi = T(terminals.HotIn);
        var tci = T(terminals.ColdIn);
        var ratedClean = Rating.Rate(_x.Arrangement, uc * _x.Area, e.HotCapacityRate, e.ColdCapacityRate, thi, tci);
        var ratedNow = Rating.Rate(_x.Arrangement, e.UActual * _x.Area, e.HotCapacityRate, e.ColdCapacityRate, thi, tci);
        return e with
        {
            UClean = uc,
            FoulingResistance = 1 / e.UActual - 1 / uc,
            Cleanliness = e.UActual / uc,
            DutyClean = ratedClean.Duty,
            DutyRated = ratedNow.Duty,
            LostDuty = ratedClean.Duty - ratedNow.Duty,
            HotOutletClean = ratedClean.HotOutlet.Kelvin,
            ColdOutletClean = ratedClean.ColdOutlet.Kelvin,
        };
    }

    /// <summary>Rf in m²·K/W of a sample, or NaN when it cannot be evaluated (used for uncertainty propagation).</summary>
    public double FoulingResistanceOf(double[] m, double pHot, double pCold, ICleanUModel clean)
    {
        var e = Evaluate(m, pHot, pCold, reconcile: false);
        if (!(e.UActual > 0)) return double.NaN;
        var uc = clean.CleanU(e.TubeFlow, e.ShellFlow);
        return 1 / e.UActual - 1 / uc;
    }

    /// <summary>First-order (Taylor series) standard uncertainty of Rf from the sensor accuracies, σ² = Σ (∂Rf/∂xᵢ·σᵢ)², in the
    /// manner of ASME PTC 19.1 (<see cref="FirstOrderPropagation"/>). Sensor errors are taken as independent.</summary>
    public double FoulingResistanceSigma(double[] m, double pHot, double pCold, ICleanUModel clean) =>
        FirstOrderPropagation.StandardUncertainty(v => FoulingResistanceOf(v, pHot, pCold, clean), m, Sigmas(m));
}
