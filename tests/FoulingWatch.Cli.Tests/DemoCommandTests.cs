using System.Globalization;
using System.Text.Json;

namespace FoulingWatch.Cli.Tests;

public class CommandTests
{
    [Fact]
    public void A_date_option_that_is_not_a_date_says_how_to_write_one()
    {
        var (code, _, error) = SamplePlantCopy.Run("analyze", "--config", "plant.json", "--out", "o", "--audit-from", "notadate");
        Assert.NotEqual(0, code);
        Assert.Contains("--audit-from: 'notadate' is not a date; write it as yyyy-MM-dd (UTC midnight) or an ISO 8601 time such as 2026-01-01T06:00Z.", error);
        Assert.DoesNotContain("System.", error);
    }

    [Fact]
    public void Unknown_command_is_a_usage_error()
        => Assert.Equal(FoulingWatchCommand.UsageOrConfigurationError, SamplePlantCopy.Run("no-such-command").Code);

    [Fact]
    public void A_missing_configuration_file_is_a_configuration_error_naming_it()
    {
        var (code, _, error) = SamplePlantCopy.Run("check", "--config", "/nonexistent/plant.json");
        Assert.Equal(FoulingWatchCommand.UsageOrConfigurationError, code);
        Assert.Contains("'/nonexistent/plant.json' does not exist", error);
    }

    [Fact]
    public void A_results_folder_that_cannot_be_written_names_the_file_not_an_unexpected_error()
    {
        // the exchangers' files are written while others are still being analysed (in parallel): a failure there is
        // reported as itself
        using var plant = new SamplePlantCopy();
        var output = plant.Out("out");
        Directory.CreateDirectory(output);
        File.WriteAllText(Path.Combine(output, "E-101"), "a file where the exchanger's folder goes");
        var (code, _, error) = SamplePlantCopy.Run("analyze", "--config", plant.ConfigPath, "--out", output, "--quiet");
        Assert.Equal(FoulingWatchCommand.DataError, code);
        Assert.Contains("cannot read or write a file:", error);
        Assert.Contains("E-101", error);
        Assert.DoesNotContain("unexpected", error);
        Assert.DoesNotContain("AggregateException", error);
    }

    [Fact]
    public void A_configuration_mistake_exits_with_1_and_names_the_key()
    {
        using var plant = new SamplePlantCopy();
        File.WriteAllText(plant.ConfigPath, File.ReadAllText(plant.ConfigPath).Replace("\"180 m2\"", "\"180 m3\""));
        var (code, _, error) = SamplePlantCopy.Run("analyze", "--config", plant.ConfigPath, "--out", plant.Out("out"));
        Assert.Equal(FoulingWatchCommand.UsageOrConfigurationError, code);
        Assert.Contains("plant.json: exchangers[0].area: 'm3' is not an area unit; use m2, ft2.", error);
    }

    [Fact]
    public void A_data_file_that_is_not_an_export_exits_with_2_and_names_the_file()
    {
        using var plant = new SamplePlantCopy();
        File.WriteAllBytes(Path.Combine(plant.Directory, "kestrel-area1-2025-12_2026-05.csv.gz"), []);
        var (code, _, error) = SamplePlantCopy.Run("check", "--config", plant.ConfigPath);
        Assert.Equal(FoulingWatchCommand.DataError, code);
        Assert.Contains("kestrel-area1-2025-12_2026-05.csv.gz", error);
    }

    [Fact]
    public void Check_prints_the_ledger_and_its_json_balances()
    {
        using var plant = new SamplePlantCopy();
        var (code, output, _) = SamplePlantCopy.Run("check", "--config", plant.ConfigPath, "--json");
        Assert.Equal(0, code);
        using var doc = JsonDocument.Parse(output);
        foreach (var x in doc.RootElement.GetProperty("exchangers").EnumerateArray())
        {
            var v = x.GetProperty("values");
            var rejected = v.GetProperty("rejected").EnumerateObject().Sum(p => p.Value.GetInt64());
            Assert.Equal(v.GetProperty("read").GetInt64(), v.GetProperty("used").GetInt64() + rejected);
        }
    }

    [Fact]
    public void Analyze_writes_the_contract_columns_and_identical_inputs_give_identical_files()
    {
        using var plant = new SamplePlantCopy();
        Assert.Equal(0, SamplePlantCopy.Run("analyze", "--config", plant.ConfigPath, "--out", plant.Out("a"), "--quiet").Code);
        Assert.Equal(0, SamplePlantCopy.Run("analyze", "--config", plant.ConfigPath, "--out", plant.Out("b"), "--quiet").Code);
        var header = File.ReadLines(Path.Combine(plant.Out("a"), "E-101", "timeseries.csv")).First();
        Assert.StartsWith("timestamp,status,duty_W,duty_hot_W,duty_cold_W,u_actual_W_per_m2K,u_clean_W_per_m2K,rf_m2K_per_W,rf_sigma_m2K_per_W,cleanliness,lost_duty_W", header);
        // the report's header says when it was run (to the minute): two runs may straddle a minute, so that one line is
        // taken out; every other byte of every file must be the same
        static byte[] Content(string file) => Path.GetFileName(file) == "report.html"
            ? System.Text.Encoding.UTF8.GetBytes(System.Text.RegularExpressions.Regex.Replace(File.ReadAllText(file),
                " · run \\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2} [+-]\\d{2}:\\d{2} · ", " · run … · "))
            : File.ReadAllBytes(file);
        foreach (var f in Directory.GetFiles(plant.Out("a"), "*", SearchOption.AllDirectories))
            Assert.True(Content(f).AsSpan().SequenceEqual(Content(f.Replace(plant.Out("a"), plant.Out("b")))), $"{Path.GetRelativePath(plant.Out("a"), f)} differs between two runs");
        Assert.Contains(" · run … · ", System.Text.Encoding.UTF8.GetString(Content(Path.Combine(plant.Out("a"), "report.html"))));
        var csv = File.ReadAllText(Path.Combine(plant.Out("a"), "E-101", "timeseries.csv"));
        Assert.DoesNotContain("NaN", csv);
        Assert.DoesNotContain("Infinity", csv);
    }
}

public class InitCommandTests
{
    [Fact]
    public void Init_writes_a_starter_configuration_that_check_accepts()
    {
        using var plant = new SamplePlantCopy();
        var export = Path.Combine(plant.Directory, "kestrel-utilities-2025-12_2026-11.csv.gz");
        var config = plant.Out("starter.json");
        var (code, output, _) = SamplePlantCopy.Run("init", "--data", export, "--out", config);
        Assert.Equal(0, code);
        Assert.Contains("3 candidate exchanger(s) from 18 tags", output);
        var text = File.ReadAllText(config);
        // the unit row of the export gives the units: no guess for temperatures there
        Assert.Contains("{ \"tag\": \"TI-2012\", \"unit\": \"degC\" }", text);
        Assert.DoesNotContain("unit guessed from values", text.Split('\n').First(l => l.Contains("\"TI-2012\"")));
        Assert.Contains("\"format\": \"dd.MM.yyyy HH:mm\"", text);
        // it points editors at the schema shipped beside the tool
        var schema = System.Text.RegularExpressions.Regex.Match(text, "\"\\$schema\": \"(file:[^\"]+)\"");
        Assert.True(schema.Success, "no $schema line");
        Assert.True(File.Exists(new Uri(schema.Groups[1].Value).LocalPath), schema.Groups[1].Value);
        Assert.Equal(0, SamplePlantCopy.Run("check", "--config", config).Code);
    }

    // A long export (one row per tag and time, sorted by tag) with a quality column: init reads the tag and value
    // columns instead of taking the header for tags, says which quality texts it saw, and guesses water for a stream
    // running at 25–35 °C.
    [Fact]
    public void Init_reads_a_long_export_and_guesses_cooling_water()
    {
        using var plant = new SamplePlantCopy();
        var csv = new System.Text.StringBuilder("Tagname,Timestamp,Value,Quality\n");
        (string Tag, double Value)[] tags = [("FI-5011", 80), ("TI-5011", 140), ("TI-5012", 90), ("FI-5013", 150), ("TI-5013", 25), ("TI-5014", 35)];
        foreach (var (tag, value) in tags)
            for (var m = 0; m < 400; m++)
            {
                var t = new DateTime(2026, 3, 1, 0, 0, 0, DateTimeKind.Utc).AddMinutes(10 * m).ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture);
                csv.Append(CultureInfo.InvariantCulture, $"{tag},{t},{value + 0.3 * Math.Sin(m / 5.0):0.00},{(m % 50 == 7 ? "Uncertain" : "Good")}\n");
            }
        var export = plant.Out("long.csv");
        File.WriteAllText(export, csv.ToString());
        var config = plant.Out("long.json");
        var (code, output, _) = SamplePlantCopy.Run("init", "--data", export, "--out", config);
        Assert.Equal(0, code);
        Assert.Contains("1 candidate exchanger(s) from 6 tags; 0 tag(s) left", output);
        var text = File.ReadAllText(config);
        Assert.Contains("\"layout\": \"long\", \"tagColumn\": \"Tagname\", \"valueColumn\": \"Value\"", text);
        Assert.Contains("\"qualityColumn\": \"Quality\", \"goodQuality\": [\"Good\"]", text);
        Assert.Contains("quality texts seen: Good 2352, Uncertain 48", text);
        var coldBlock = text[text.IndexOf("\"cold\"", StringComparison.Ordinal)..];
        Assert.Contains("\"fluid\": { \"model\": \"water\" },   // CHECK: guessed water from temperatures", coldBlock);
        Assert.DoesNotContain("Tagname", text[text.IndexOf("\"exchangers\"", StringComparison.Ordinal)..]);
        Assert.Equal(0, SamplePlantCopy.Run("check", "--config", config).Code);
    }

    // Tag styles from other sites (invented tags): the instrument code is found inside the name, and a flow is paired
    // with the temperatures of its own stream even when the temperatures come first in the header.
    [Theory]
    [InlineData("E101_FI_105", "E101_TI_106", "E101_TI_107", "E101_FI_108", "E101_TI_109", "E101_TI_110")]
    [InlineData("U7:FI7301.PV", "U7:TI7302.PV", "U7:TI7303.PV", "U7:FI7304.PV", "U7:TI7305.PV", "U7:TI7306.PV")]
    [InlineData("E-102.TUBE.TIN", "E-102.TUBE.TOUT", "E-102.TUBE.FLOW", "E-102.SHELL.TIN", "E-102.SHELL.TOUT", "E-102.SHELL.FLOW")]
    public void Init_groups_tags_of_other_naming_styles(string a, string b, string c, string d, string e, string f)
    {
        using var plant = new SamplePlantCopy();
        // hot stream: flow ≈ 100, 150 → 110 °C; cold stream: flow ≈ 120, 30 → 60 °C (columns a–c one stream, d–f the other)
        var header = new[] { a, b, c, d, e, f };
        var flowFirst = !c.EndsWith("FLOW");
        var csv = new System.Text.StringBuilder("Timestamp," + string.Join(",", header) + "\n");
        for (var m = 0; m < 300; m++)
        {
            var t = new DateTime(2026, 3, 1, 0, 0, 0, DateTimeKind.Utc).AddMinutes(10 * m).ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture);
            var w = 0.1 * Math.Sin(m / 7.0);
            string[] hot = flowFirst ? [$"{100 + w:0.00}", $"{150 + w:0.00}", $"{110 + w:0.00}"] : [$"{150 + w:0.00}", $"{110 + w:0.00}", $"{100 + w:0.00}"];
            string[] cold = flowFirst ? [$"{120 + w:0.00}", $"{30 + w:0.00}", $"{60 + w:0.00}"] : [$"{30 + w:0.00}", $"{60 + w:0.00}", $"{120 + w:0.00}"];
            csv.Append(t).Append(',').Append(string.Join(",", hot.Concat(cold))).Append('\n');
        }
        var export = plant.Out("styles.csv");
        File.WriteAllText(export, csv.ToString());
        var config = plant.Out("styles.json");
        var (code, output, _) = SamplePlantCopy.Run("init", "--data", export, "--out", config);
        Assert.Equal(0, code);
        Assert.Contains("1 candidate exchanger(s) from 6 tags; 0 tag(s) left", output);
        var text = File.ReadAllText(config);
        var hotFlow = flowFirst ? a : c;
        var coldFlow = flowFirst ? d : f;
        var hotBlock = text[text.IndexOf("\"hot\"", StringComparison.Ordinal)..text.IndexOf("\"cold\"", StringComparison.Ordinal)];
        Assert.Contains($"\"flow\": {{ \"tag\": \"{hotFlow}\"", hotBlock);
        Assert.Contains($"\"tag\": \"{(flowFirst ? b : a)}\"", hotBlock);   // the 150 °C inlet
        Assert.Contains($"\"flow\": {{ \"tag\": \"{coldFlow}\"", text[text.IndexOf("\"cold\"", StringComparison.Ordinal)..]);
    }

    [Fact]
    public void Init_never_overwrites_a_configuration()
    {
        using var plant = new SamplePlantCopy();
        var (code, _, error) = SamplePlantCopy.Run("init", "--data", Path.Combine(plant.Directory, "kestrel-utilities-2025-12_2026-11.csv.gz"), "--out", plant.ConfigPath);
        Assert.Equal(FoulingWatchCommand.UsageOrConfigurationError, code);
        Assert.Contains("exists already", error);
    }
}

public class PlanCommandTests
{
    [Fact]
    public void Plan_writes_plan_csv_and_prints_the_ranked_table()
    {
        using var plant = new SamplePlantCopy(windowStart: "2026-06-01T00:00:00Z", windowEnd: "2026-09-01T00:00:00Z");
        var (code, output, _) = SamplePlantCopy.Run("plan", "--config", plant.ConfigPath, "--out", plant.Out("p"));
        Assert.Equal(0, code);
        Assert.Contains("Cleaning plan: cleanings placed in the shutdown windows to give the largest total expected saving", output);
        Assert.Contains("Caution: advice only; results depend on instrument quality.", output);
        var lines = File.ReadAllLines(Path.Combine(plant.Out("p"), "plan.csv"));
        Assert.Equal("rank,exchanger,service,action,window,date,net_saving,net_saving_90_low,net_saving_90_high,probability_saving," +
                     "probability_best,payback_days,energy_avoided_GJ,co2_avoided_t,probability_unplanned_stop,cost_per_day_now,currency,warning,note",
            lines[0]);
        Assert.Equal(7, lines.Length); // header + six exchangers
        var json = SamplePlantCopy.Run("plan", "--config", plant.ConfigPath, "--out", plant.Out("q"), "--json");
        using var doc = System.Text.Json.JsonDocument.Parse(json.Output);
        Assert.Equal(6, doc.RootElement.GetProperty("entries").GetArrayLength());
    }
}

public class ReadmeTests
{
    // The README's configuration example must be a valid configuration for the sample data.
    [Fact]
    public void The_readme_configuration_example_is_valid()
    {
        var readme = File.ReadAllText(Path.Combine(SamplePlantCopy.FindSampleData(), "..", "README.md"));
        var start = readme.IndexOf("```jsonc\n{", StringComparison.Ordinal) + "```jsonc".Length;
        var end = readme.IndexOf("```", start, StringComparison.Ordinal);
        using var plant = new SamplePlantCopy(windowStart: null);
        var path = plant.Out("readme.json");
        File.WriteAllText(path, readme[start..end]);
        var (code, output, error) = SamplePlantCopy.Run("check", "--config", path);
        Assert.True(code == 0, error);
        Assert.Contains("valid; site Kestrel Bay refinery (fictional), 1 exchanger(s)", output);
    }
}

public class AuditTests
{
    // The audit over a chosen period equals the sum of the audits of its parts (energy is additive).
    [Fact]
    public void The_energy_audit_over_a_period_adds_up_from_its_parts()
    {
        using var plant = new SamplePlantCopy();
        double Gj(string from, string to, string name)
        {
            Assert.Equal(0, SamplePlantCopy.Run("analyze", "--config", plant.ConfigPath, "--out", plant.Out(name), "--quiet", "--audit-from", from, "--audit-to", to).Code);
            using var doc = System.Text.Json.JsonDocument.Parse(File.ReadAllText(Path.Combine(plant.Out(name), "summary.json")));
            var audit = doc.RootElement.GetProperty("energy_audit");
            Assert.Equal(from, audit.GetProperty("period").GetProperty("from").GetString()![..10]);
            return audit.GetProperty("site").GetProperty("lost_heat_GJ").GetDouble();
        }
        var whole = Gj("2025-12-01", "2025-12-21", "w");
        var first = Gj("2025-12-01", "2025-12-11", "a");
        var second = Gj("2025-12-11", "2025-12-21", "b");
        Assert.True(whole > 0);
        Assert.Equal(whole, first + second, whole * 1e-6);
    }
}

public class ProgressLineTests
{
    [Fact]
    public void The_progress_bar_fills_with_the_fraction()
    {
        Assert.StartsWith("[############............]  50 %  reading x.csv", AnalyzeCommand.ProgressLine("reading x.csv", 0.5));
        Assert.StartsWith("[........................]   0 %", AnalyzeCommand.ProgressLine("start", 0));
        Assert.Equal(90, AnalyzeCommand.ProgressLine(new string('x', 200), 1).Length);
    }
}

public class PlanWriterTests
{
    // OWASP, "CSV Injection": a text cell beginning with '=', '+', '-' or '@' is written so that a spreadsheet shows it
    // instead of evaluating it; quoting follows RFC 4180.
    [Theory]
    [InlineData("=HYPERLINK(\"x\")", "\"'=HYPERLINK(\"\"x\"\")\"")]
    [InlineData("+1", "'+1")]
    [InlineData("-cleaning", "'-cleaning")]
    [InlineData("@SUM(A1)", "'@SUM(A1)")]
    [InlineData("E-101, crude", "\"E-101, crude\"")]
    [InlineData("plain", "plain")]
    public void Text_cells_cannot_become_spreadsheet_formulas(string text, string cell) =>
        Assert.Equal(cell, Reporting.Results.PlanWriter.Quote(text));
}

public class DamagedInputTests
{
    // A truncated gzip export (the copy stopped halfway) is a data error naming the file and what to do: exit 2, one line,
    // no stack trace.
    [Fact]
    public void A_truncated_compressed_export_is_a_clear_data_error()
    {
        using var plant = new SamplePlantCopy();
        var gz = Path.Combine(plant.Directory, "kestrel-utilities-2025-12_2026-11.csv.gz");
        var bytes = File.ReadAllBytes(gz);
        File.WriteAllBytes(gz, bytes[..(bytes.Length / 2)]);
        var (code, _, error) = SamplePlantCopy.Run("check", "--config", plant.ConfigPath);
        Assert.Equal(2, code);
        Assert.StartsWith("kestrel-utilities-2025-12_2026-11.csv.gz: the compressed stream is damaged or incomplete", error);
        Assert.Contains("copy or export the file again, or unpack it and point the source at the CSV.", error);
        Assert.DoesNotContain("   at ", error);
    }

    // Not a gzip at all behind a .gz name.
    [Fact]
    public void A_file_that_is_not_really_compressed_is_a_clear_data_error()
    {
        using var plant = new SamplePlantCopy();
        File.WriteAllText(Path.Combine(plant.Directory, "kestrel-area1-2026-06_2026-11.csv.gz"), "Timestamp,FI-1011\n2026-06-01 00:00,1\n");
        var (code, _, error) = SamplePlantCopy.Run("check", "--config", plant.ConfigPath);
        Assert.Equal(2, code);
        Assert.Contains("kestrel-area1-2026-06_2026-11.csv.gz", error);
        Assert.DoesNotContain("   at ", error);
    }
}

public class CheckWarningTests
{
    // check says, with the key, what the configuration still lacks for the whole job.
    [Fact]
    public void Check_warns_of_open_marks_and_missing_limits_and_cleaning_costs()
    {
        using var plant = new SamplePlantCopy();
        var text = File.ReadAllText(plant.ConfigPath)
            .Replace("\"limits\": { \"foulingResistance\": \"0.00076 m2K/W\" },", "")
            .Replace("\"cleaning\": { \"cost\": \"38000 EUR\", \"downtime\": \"4 d\" },", "// CHECK: cleaning cost to come")
            .Replace("\"fuelPrice\": \"9.5 EUR/GJ\",", "");
        File.WriteAllText(plant.ConfigPath, text);
        var line = Array.FindIndex(File.ReadAllLines(plant.ConfigPath), l => l.Contains("CHECK", StringComparison.Ordinal)) + 1;
        var (code, output, _) = SamplePlantCopy.Run("check", "--config", plant.ConfigPath);
        Assert.Equal(0, code);
        var warnings = output.Split('\n').Where(l => l.StartsWith("warning: ", StringComparison.Ordinal)).Select(l => l.TrimEnd('\r')).ToList();
        Assert.Equal($"warning: plant.json: 1 open CHECK mark(s) (line {line}); confirm each guess and remove its mark.", warnings[0]);
        Assert.Contains("warning: exchangers[0].limits: E-101 has no limit; the forecast and the cleaning plan need limits.foulingResistance, minimumDuty or minimumColdOutlet.", warnings);
        Assert.Contains("warning: exchangers[0].cleaning.cost: E-101 has no cleaning cost; the cleaning plan needs it (and cleaning.downtime).", warnings);
        Assert.Contains("warning: economics.fuelPrice: E-102 is not priced; give economics.fuelPrice and economics.heaterEfficiency (or lostCoolingCost for a cooler).", warnings);
    }
}

public class CheckUnusableDataTests
{
    // An analysis window beside the data left every value outside it, and check still said "valid" with exit 0.
    [Fact]
    public void A_window_outside_the_data_is_a_data_error_naming_the_window()
    {
        using var plant = new SamplePlantCopy();
        var text = File.ReadAllText(plant.ConfigPath).Replace("\"maxGap\": \"30 min\",",
            "\"maxGap\": \"30 min\", \"window\": { \"start\": \"2030-01-01\", \"end\": \"2030-06-01\" },");
        File.WriteAllText(plant.ConfigPath, text);
        var (code, output, _) = SamplePlantCopy.Run("check", "--config", plant.ConfigPath);
        Assert.Equal(2, code);
        var error = Assert.Single(output.Split('\n'), l => l.StartsWith("error: ", StringComparison.Ordinal)).TrimEnd('\r');
        Assert.EndsWith("(37 tags): every value lies outside data.window (2030-01-01 to 2030-06-01); move or remove the window.", error);
    }
}

public class ConsoleWidthTests
{
    // The console summary and plan fit a 120-column terminal: no line longer than 120 characters.
    [Fact]
    public void Analyze_output_fits_120_columns()
    {
        using var plant = new SamplePlantCopy();
        var (code, output, _) = SamplePlantCopy.Run("analyze", "--config", plant.ConfigPath, "--out", plant.Out("w"));
        Assert.Equal(0, code);
        var lines = output.Split('\n').Select(l => l.TrimEnd('\r')).Where(l => !l.StartsWith("Results: ", StringComparison.Ordinal)
            && !l.StartsWith("Report: ", StringComparison.Ordinal)).ToList();
        Assert.Contains(lines, l => l.StartsWith("exchanger  usable", StringComparison.Ordinal));
        Assert.All(lines, l => Assert.True(l.Length <= 120, $"{l.Length} columns: {l}"));
    }
}

public class VerboseOptionTests
{
    // --verbose is accepted by every command (an unknown option would be a usage error, exit 1).
    [Fact]
    public void Verbose_is_accepted_by_every_command()
    {
        using var plant = new SamplePlantCopy();
        var (code, output, error) = SamplePlantCopy.Run("check", "--config", plant.ConfigPath, "--verbose");
        Assert.True(code == 0, error);
        Assert.Contains("Configuration plant.json: valid", output);
        Assert.Equal(1, SamplePlantCopy.Run("check", "--config", plant.ConfigPath, "--verbosity").Code);
    }
}
