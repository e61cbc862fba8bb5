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
        "recon_z_cold_flow", "recon_z_cold_inlet", "recon_z_cold_outlet", "dp_tube_ratio", "dp_shell_ratio", "detail",
    ];

    /// <param name="fitted">Fitted Rf per sample (same index), or null.</param>
    /// <param name="moneyPerJoule">Price of lost duty (currency per J), or null when the exchanger is not priced.</param>
    /// <param name="drops">Pressure-drop signals whose measured-over-clean ratios fill the dp_*_ratio columns.</param>
    /// <remarks>Formats each cell straight into UTF-8 bytes and streams them to the file in blocks: no string per cell and
    /// no whole-file text in memory (the same bytes as formatting each value with "G9").</remarks>
    public static void Write(string path, ExchangerHistory history, IReadOnlyList<double>? fitted = null, double? moneyPerJoule = null,
        IReadOnlyList<Analysis.PressureDropChange>? drops = null)
    {
        var tubeRatio = drops?.FirstOrDefault(d => d.Side == "tube")?.Ratio ?? [];
        var shellRatio = drops?.FirstOrDefault(d => d.Side == "shell")?.Ratio ?? [];
        AtomicFile.Write(path, stream =>
        {
            var row = new CsvRowWriter(stream);
            row.Text(string.Join(',', ContractColumns.Concat(ExtraColumns)));
            row.End();
            var c = history.Columns;
            for (var k = 0; k < c.Count; k++)
            {
                row.Utc(c.Timestamp(k));
                row.Text(c.Status[k].Key());
                foreach (var v in (ReadOnlySpan<double>)[c.Duty[k], c.DutyHot[k], c.DutyCold[k], c.UActual[k], c.UClean[k],
                             c.FoulingResistance[k], c.Sigma[k], c.Cleanliness[k], c.LostDuty[k], c.SigmaSystematic[k],
                             c.SigmaRandom[k], fitted is null ? double.NaN : fitted[k], c.BalanceMismatch[k], c.Lmtd[k],
                             c.CorrectionFactor[k], c.DutyClean[k], c.HotOutletClean[k], c.ColdOutletClean[k]])
                    row.Number(v);
                for (var i = 0; i < Measurement.Count; i++) row.Number(c.Measured[i][k]);
                row.Number(moneyPerJoule is { } price && c.Status[k] == SampleStatus.Ok
                    ? Math.Max(0, c.LostDuty[k]) * 86400 * price : double.NaN);
                var reconciled = c.Reconciled[k] != 0;
                row.Number(reconciled ? c.GlobalTest[k] : double.NaN);
                row.Text(reconciled ? c.Reconciled[k] == 2 ? "1" : "0" : "");
                for (var i = 0; i < Measurement.Count; i++) row.Number(reconciled ? c.NormalisedAdjustments[i][k] : double.NaN);
                row.Number(k < tubeRatio.Length ? tubeRatio[k] : double.NaN);
                row.Number(k < shellRatio.Length ? shellRatio[k] : double.NaN);
                row.Text(Quote(c.Detail[k]));
                row.End();
            }
            row.Flush();
        });
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

    /// <summary>Writes through a stream to a temporary file in the same folder, then renames it over the path.</summary>
    public static void Write(string path, Action<Stream> write)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        var temp = path + ".tmp";
        using (var stream = new FileStream(temp, FileMode.Create, FileAccess.Write, FileShare.None, 1 << 16)) write(stream);
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

/// <summary>One CSV row at a time as UTF-8 bytes into a reused block: numbers as "G9" (empty when not finite), cells
/// separated by commas, rows ended by LF.</summary>
internal sealed class CsvRowWriter(Stream stream)
{
    private readonly byte[] _block = new byte[1 << 16];
    private int _used;
    private bool _first = true;

    public void Number(double v)
    {
        Separate();
        if (!double.IsFinite(v)) return;
        Room(32);
        _used += NineDigits.Write(v, _block.AsSpan(_used));
    }

    /// <summary>A UTC timestamp as <see cref="NumberText.Utc"/> writes it, formatted straight into the block.</summary>
    public void Utc(DateTimeOffset t)
    {
        Separate();
        Room(32);
        var invariant = System.Globalization.CultureInfo.InvariantCulture;
        if (!t.UtcDateTime.TryFormat(_block.AsSpan(_used), out var written, "yyyy-MM-ddTHH:mm:ssZ", invariant))
            throw new InvalidOperationException("a timestamp did not fit its cell buffer");
        _used += written;
    }

    public void Text(string text)
    {
        Separate();
        Append(text);
    }

    public void End()
    {
        Room(1);
        _block[_used++] = (byte)'\n';
        _first = true;
    }

    public void Flush()
    {
        stream.Write(_block, 0, _used);
        _used = 0;
    }

    private void Separate()
    {
        if (!_first)
        {
            Room(1);
            _block[_used++] = (byte)',';
        }
        _first = false;
    }

    private void Append(string text)
    {
        var need = Encoding.UTF8.GetMaxByteCount(text.Length);
        if (need > _block.Length)
        {
            Flush();
            var bytes = Encoding.UTF8.GetBytes(text);
            stream.Write(bytes);
            return;
        }
        Room(need);
        _used += Encoding.UTF8.GetBytes(text, _block.AsSpan(_used));
    }

    private void Room(int bytes)
    {
        if (_used + bytes > _block.Length) Flush();
    }
}
