using System.Globalization;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>The clean U learned after one cleaning, at the exchanger's reference flows, or why it could not be.</summary>
public sealed record CycleBaseline(DateTimeOffset Start, int Samples, double? CleanU, double? Sigma, string? Refusal);

/// <summary>Refits the Wilson-plot baseline (with its fouling term) after every logged cleaning in the data, and compares
/// the clean U from cycle to cycle and with the datasheet.</summary>
/// <remarks>
/// Each fit uses the window [cleaning, cleaning + duration) (the baseline's duration, or <see cref="DefaultWindow"/> under
/// the datasheet method) and the configured flow exponents. The clean U is compared at reference flows (design flows when
/// configured, else the median flows of the usable samples). A clean U that falls from one cleaning to the next by more
/// than twice the combined uncertainty and <see cref="Notable"/> means deposits the cleanings no longer remove (or a
/// change to the exchanger); a learned clean U that differs from the datasheet's as much says one of them is wrong
/// (common practice: the clean U is tracked after each cleaning as a health indicator).
/// </remarks>
public static class CycleBaselines
{
    public static readonly TimeSpan DefaultWindow = TimeSpan.FromDays(20);
    public const double Notable = 0.10;

    public static (IReadOnlyList<CycleBaseline>? Cycles, string? Statement) Fit(ExchangerConfiguration x, IngestResult data,
        SampleColumns evaluations, SampleEvaluator evaluator, ICleanUModel? reference, TimeZoneInfo zone)
    {
        var gridEnd = data.IntervalStart(data.IntervalCount);
        var window = x.Clean is BaselineCleanReference b ? b.Duration : DefaultWindow;
        var starts = x.Maintenance.Where(m => m.IsCleaning && m.Date >= data.GridStart - window && m.Date < gridEnd)
            .Select(m => m.Date).Order().ToList();
        if (starts.Count == 0) return (null, null);
        var nt = x.Tube.Fluid.IsPhaseChange ? 0 : x.Clean.TubeExponent;
        var ns = x.Shell.Fluid.IsPhaseChange ? 0 : x.Clean.ShellExponent;
        var (tubeRef, shellRef) = ReferenceFlows(x, evaluations);
        var list = new List<CycleBaseline>();
        foreach (var start in starts)
        {
            var rows = BackCalculator.CalibrationRows(data, evaluations, evaluator, start, start + window, nt, ns);
            var (model, report) = WilsonPlot.Fit(rows, nt, ns, start, start + window);
            if (model is null || report.Method != "baseline")
            {
                list.Add(new CycleBaseline(start, rows.Count, null, null, report.Refusal ?? "the sides could not be separated"));
                continue;
            }
            var u = model.CleanU(tubeRef, shellRef);
            list.Add(new CycleBaseline(start, rows.Count, u, model.InverseSigma(tubeRef, shellRef) * u * u, null));
        }
        return (list, Statement(list, x.Clean is BaselineCleanReference ? null : reference, tubeRef, shellRef, zone));
    }

    private static (double Tube, double Shell) ReferenceFlows(ExchangerConfiguration x, SampleColumns evaluations)
    {
        double Median(double[] column)
        {
            var v = Enumerable.Range(0, evaluations.Count).Where(k => evaluations.Status[k] == SampleStatus.Ok).Select(k => column[k])
                .Where(double.IsFinite).Sorted();
            return v.Length == 0 ? double.NaN : v[v.Length / 2];
        }
        return (x.Tube.DesignFlow ?? Median(evaluations.TubeFlow), x.Shell.DesignFlow ?? Median(evaluations.ShellFlow));
    }

    private static string? Statement(List<CycleBaseline> list, ICleanUModel? datasheet, double tubeRef, double shellRef, TimeZoneInfo zone)
    {
        var fitted = list.Where(c => c.CleanU is not null).ToList();
        if (fitted.Count == 0) return null;
        var inv = CultureInfo.InvariantCulture;
        var parts = fitted.Select(c => string.Create(inv, $"{SiteCalendar.Date(c.Start, zone)} {c.CleanU:0} ± {c.Sigma:0.#}"));
        var text = string.Create(inv, $"clean U learned after each cleaning at reference flows (W/m2K): {string.Join("; ", parts)}");
        for (var i = 1; i < fitted.Count; i++)
        {
            var (a, b) = (fitted[i - 1], fitted[i]);
            var change = b.CleanU!.Value / a.CleanU!.Value - 1;
            var sigma = Math.Sqrt(a.Sigma!.Value * a.Sigma.Value + b.Sigma!.Value * b.Sigma.Value);
            if (change < -Notable && a.CleanU.Value - b.CleanU.Value > 2 * sigma)
                text += string.Create(inv, $". The clean U fell {-change:P0} from the cleaning of {SiteCalendar.Date(a.Start, zone)} to that of {SiteCalendar.Date(b.Start, zone)}: deposits the cleaning did not remove, or a change to the exchanger");
        }
        // (a reference that needs temperatures, the geometry method, gives no value at flows alone: no comparison)
        if (datasheet is not null && datasheet.CleanU(tubeRef, shellRef) > 0)
        {
            var u = datasheet.CleanU(tubeRef, shellRef);
            var sheetSigma = datasheet.InverseSigma(tubeRef, shellRef) * u * u;
            var last = fitted[^1];
            var diff = last.CleanU!.Value / u - 1;
            var sigma = Math.Sqrt(sheetSigma * sheetSigma + last.Sigma!.Value * last.Sigma.Value);
            text += Math.Abs(diff) > Notable && Math.Abs(last.CleanU.Value - u) > 2 * sigma
                ? string.Create(inv, $". The datasheet gives {u:0} W/m2K there, {diff:+0%;-0%} off the learned value: check the datasheet U and tube share, or the cleaning")
                : string.Create(inv, $". The datasheet gives {u:0} W/m2K there, in agreement");
        }
        return text;
    }
}
