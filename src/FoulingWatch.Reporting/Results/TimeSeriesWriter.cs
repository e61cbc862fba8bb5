using System.Text;
using FoulingWatch.Analysis.BackCalculation;

namespace FoulingWatch.Reporting.Results;

/// <summary>Writes &lt;out&gt;/&lt;exchanger-id&gt;/timeseries.csv: the columns of the data contract first, SI units in the names, then extras.</summary>
public static class TimeSeriesWriter
{
    public static readonly string[] ContractColumns =
    [
        "timestamp", "status", "duty_W", "duty_hot_W", "duty_cold_W", "u_actual_W_per_m2K", "u_clean_W_per_m2K",
        "rf_m2K_per_W", "rf_sigma_m2K_per_W", "cleanliness", "lost_duty_W",
    ];

    public static readonly string[] ExtraColumns =
    [
        "rf_sigma_systematic_m2K_per_W", "rf_sigma_random_m2K_per_W", "rf_fit_m2K_per_W", "balance_mismatch", "lmtd_K", "f_correction", "duty_clean_W", "hot_outlet_clean_K", "cold_outlet_clean_K",
        "hot_flow_kg_per_s", "hot_inlet_K", "hot_outlet_K", "cold_flow_kg_per_s", "cold_inlet_K", "cold_outlet_K",
        "fouling_cost_per_day", "recon_global_test", "recon_gross_error", "recon_z_hot_flow", "recon_z_hot_inlet", "recon_z_hot_outlet",
        "recon_z_cold_flow", "recon_z_cold_inlet", "recon_z_cold_outlet", "detail",
    ];

    /// <param name="fitted">Fitted Rf per sample (same index), or null.</param>
    /// <param name="moneyPerJoule">Price of lost duty (currency per J), or null when the exchanger is not priced.</param>
    public static void Write(string path, ExchangerHistory history, IReadOnlyList<double>? fitted = null, double? moneyPerJoule = null)
    {
        var sb = new StringBuilder(history.Samples.Count * 200);
        sb.AppendJoin(',', ContractColumns.Concat(ExtraColumns)).Append('\n');
        for (var k = 0; k < history.Samples.Count; k++)
        {
            var s = history.Samples[k];
            var e = s.Evaluation;
            var m = e.Measurements.Length == Measurement.Count ? e.Measurements : new double[Measurement.Count].Select(_ => double.NaN).ToArray();
            string[] cells =
            [
                NumberText.Utc(s.Timestamp), s.Status.Key(), NumberText.Csv(e.Duty), NumberText.Csv(e.DutyHot), NumberText.Csv(e.DutyCold),
                NumberText.Csv(e.UActual), NumberText.Csv(e.UClean), NumberText.Csv(e.FoulingResistance), NumberText.Csv(s.FoulingResistanceSigma),
                NumberText.Csv(e.Cleanliness), NumberText.Csv(e.LostDuty),
                NumberText.Csv(s.SigmaSystematic), NumberText.Csv(s.SigmaRandom),
                NumberText.Csv(fitted is null ? double.NaN : fitted[k]), NumberText.Csv(e.BalanceMismatch), NumberText.Csv(e.Lmtd), NumberText.Csv(e.CorrectionFactor),
                NumberText.Csv(e.DutyClean), NumberText.Csv(e.HotOutletClean), NumberText.Csv(e.ColdOutletClean),
                .. m.Select(NumberText.Csv),
                NumberText.Csv(moneyPerJoule is { } price && s.Status == SampleStatus.Ok ? Math.Max(0, e.LostDuty) * 86400 * price : double.NaN),
                NumberText.Csv(e.Reconciliation?.GlobalTest ?? double.NaN),
                e.Reconciliation is null ? "" : e.Reconciliation.GrossError ? "1" : "0",
                .. (e.Reconciliation?.NormalisedAdjustments ?? new double[Measurement.Count].Select(_ => double.NaN).ToArray()).Select(NumberText.Csv),
                Quote(e.Detail),
            ];
            sb.AppendJoin(',', cells).Append('\n');
        }
        AtomicFile.WriteAllText(path, sb.ToString());
    }

    private static string Quote(string? text) =>
        string.IsNullOrEmpty(text) ? "" : text.Contains(',') || text.Contains('"') ? $"\"{text.Replace("\"", "\"\"")}\"" : text;
}

/// <summary>Writes files so that a reader never sees a half-written one: a temporary file in the same folder, then a rename.</summary>
public static class AtomicFile
{
    public static void WriteAllText(string path, string text)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        var temp = path + ".tmp";
        File.WriteAllText(temp, text, new UTF8Encoding(false));
        File.Move(temp, path, overwrite: true);
    }

    public static void WriteAllBytes(string path, byte[] bytes)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        var temp = path + ".tmp";
        File.WriteAllBytes(temp, bytes);
        File.Move(temp, path, overwrite: true);
    }
}
