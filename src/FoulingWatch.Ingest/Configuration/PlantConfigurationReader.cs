using System.Globalization;
using System.Text.Json;
using FoulingWatch.Core.Economics;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Core.Units;

namespace FoulingWatch.Ingest.Configuration;

/// <summary>Reads and validates a plant configuration file (JSON; comments and trailing commas allowed).</summary>
/// <remarks>All problems are collected and reported together in one <see cref="ConfigurationException"/>, each with its JSON path.</remarks>
public static partial class PlantConfigurationReader
{
    private static readonly JsonDocumentOptions JsonOptions = new()
    {
        CommentHandling = JsonCommentHandling.Skip,
        AllowTrailingCommas = true,
    };

    /// <param name="requireFiles">False for the watch service, whose exports arrive later in the drop folder.</param>
    public static PlantConfiguration Load(string file, bool requireFiles = true)
    {
        if (!System.IO.File.Exists(file))
            throw new ConfigurationException(file, [new ConfigurationError("(file)", $"'{file}' does not exist; give the path of the plant configuration JSON.")]);
        return Parse(System.IO.File.ReadAllText(file), file, requireFiles);
    }

    public static PlantConfiguration Parse(string json, string file, bool requireFiles = true)
    {
        JsonDocument doc;
        try { doc = JsonDocument.Parse(json, JsonOptions); }
        catch (JsonException ex)
        {
            throw new ConfigurationException(file, [new ConfigurationError(
                $"line {(ex.LineNumber ?? 0) + 1}, column {(ex.BytePositionInLine ?? 0) + 1}",
                $"not valid JSON: {ex.Message.Split(" LineNumber")[0].TrimEnd('.', ' ')}. Check commas, quotes and brackets there.")]);
        }
        using (doc)
        {
            var errors = new List<ConfigurationError>();
            var root = new JsonNode(doc.RootElement, "", errors);
            if (doc.RootElement.ValueKind != JsonValueKind.Object)
                throw new ConfigurationException(file, [new ConfigurationError("(top level)", "must be a JSON object { … }.")]);
            var baseDir = System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(file)) ?? ".";

            root.Allow("$schema"); // the editor's pointer to schema/plant.schema.json
            var site = ReadSite(root.Object("site", required: true));
            var economics = ReadEconomics(root.Object("economics"), null) ?? new EconomicsSettings("EUR", null, null, null, null, null, null);
            var data = ReadData(root.Object("data", required: true), baseDir, site, requireFiles);
            var watch = ReadWatch(root.Object("watch"), baseDir);
            var windows = root.Array("shutdownWindows").Select(w => ReadWindow(root, w.Element, w.Path, site)).OfType<ShutdownWindow>().ToList();
            var exchangers = new List<ExchangerConfiguration>();
            var ids = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
            var folders = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
            foreach (var (e, path) in root.Array("exchangers", required: true))
            {
                var node = root.AsObject(e, path);
                if (node is null) continue;
                var x = ReadExchanger(node, site, economics);
                if (x is null) continue;
                var folder = ExchangerConfiguration.FolderNameOf(x.Id);
                if (!ids.Add(x.Id)) node.Error("id", $"'{x.Id}' is used by another exchanger; ids must be unique.");
                else if (folders.TryGetValue(folder, out var other))
                    node.Error("id", $"'{x.Id}' and '{other}' would share the result folder '{folder}'; make the ids differ in letters or digits.");
                else
                {
                    folders[folder] = x.Id;
                    exchangers.Add(x);
                }
            }
            if (exchangers.Count == 0 && !errors.Any(er => er.Path.StartsWith("exchangers", StringComparison.Ordinal)))
                root.Error("exchangers", "is empty; describe at least one exchanger.");
            root.Done();
            if (errors.Count > 0) throw new ConfigurationException(file, errors);
            return new PlantConfiguration(System.IO.Path.GetFullPath(file), site!, data!, economics, windows, exchangers, watch);
        }
    }

    /// <summary>The keys the reader asks about while loading <paramref name="file"/> — (object path with [] for array items,
    /// key) — whether or not it is valid; the schema's tests compare them with the schema.</summary>
    public static HashSet<(string Object, string Key)> KeysRead(string file)
    {
        var keys = new HashSet<(string Object, string Key)>();
        JsonNode.KeyObserver = (o, k) => keys.Add((o, k));
        try { Load(file, requireFiles: false); }
        catch (ConfigurationException) { }
        finally { JsonNode.KeyObserver = null; }
        return keys;
    }

    private static SiteSettings? ReadSite(JsonNode? n)
    {
        if (n is null) return null;
        var name = n.String("name", required: true) ?? "";
        var zoneId = n.String("timeZone") ?? "UTC";
        TimeZoneInfo zone = TimeZoneInfo.Utc;
        try { zone = TimeZoneInfo.FindSystemTimeZoneById(zoneId); }
        catch (TimeZoneNotFoundException) { n.Error("timeZone", $"'{zoneId}' is not a known IANA time zone; use a name like \"Europe/Amsterdam\" or \"UTC\"."); }
        catch (InvalidTimeZoneException) { n.Error("timeZone", $"'{zoneId}' could not be loaded from the time-zone database."); }
        var atm = n.Has("atmosphere") ? n.Quantity("atmosphere", Dimension.Pressure, minSi: 50_000, maxSi: 110_000) : null;
        n.Done();
        return new SiteSettings(name, zone, atm ?? 101_325.0);
    }

    private static WatchSettings ReadWatch(JsonNode? n, string baseDir)
    {
        string P(string? path, string fallback) => System.IO.Path.GetFullPath(System.IO.Path.Combine(baseDir, path ?? fallback));
        var w = new WatchSettings(
            P(n?.String("dropFolder"), "drop"), P(n?.String("store"), "state/foulingwatch.db"), P(n?.String("out"), "results"), P(n?.String("log"), "logs"),
            TimeSpan.FromSeconds(n?.Quantity("pollInterval", Dimension.Duration, minSi: 0.05) ?? 30),
            TimeSpan.FromSeconds(n?.Quantity("settleTime", Dimension.Duration, minSi: 0) ?? 10),
            TimeSpan.FromSeconds(n?.Quantity("alertHorizon", Dimension.Duration, minSi: 0) ?? 30 * 86400.0),
            TimeSpan.FromSeconds(n?.Quantity("staleAfter", Dimension.Duration, minSi: 60) ?? 86400.0));
        var level = n?.String("logLevel")?.ToLowerInvariant();
        if (level is not null && !WatchSettings.LogLevels.Contains(level))
        {
            n!.Error("logLevel", $"'{level}' is not a log level; use {string.Join(", ", WatchSettings.LogLevels.Select(l => $"\"{l}\""))}.");
            level = null;
        }
        if (level is not null) w = w with { LogLevel = level };
        var corrections = n?.String("corrections")?.ToLowerInvariant();
        if (corrections is not null && !WatchSettings.CorrectionPolicies.Contains(corrections))
            n!.Error("corrections", $"'{corrections}' is not a correction policy; use \"latest\" (a re-export replaces what it holds) or \"first\" (stored values are kept).");
        else if (corrections is not null) w = w with { Corrections = corrections };
        n?.Done();
        return w;
    }

    private static DataSettings? ReadData(JsonNode? n, string baseDir, SiteSettings? site, bool requireFiles)
    {
        if (n is null) return null;
        var interval = n.Quantity("interval", Dimension.Duration, minSi: 1, maxSi: 86400 * 7) ?? 600;
        var maxGap = n.Quantity("maxGap", Dimension.Duration, minSi: 0) ?? Math.Max(3 * interval, 1800);
        var sources = new List<HistorianSource>();
        foreach (var (e, path) in n.Array("sources", required: true))
        {
            var s = n.AsObject(e, path);
            if (s is null) continue;
            var src = ReadSource(s, baseDir, requireFiles);
            if (src is not null) sources.Add(src);
        }
        DateTimeOffset? start = null, end = null;
        var w = n.Object("window");
        if (w is not null)
        {
            start = ReadDate(w, "start", site);
            end = ReadDate(w, "end", site);
            if (start is not null && end is not null && end <= start) w.Error("end", "must be after window.start.");
            w.Done();
        }
        var frozen = n.Quantity("frozenAfter", Dimension.Duration, minSi: 0, maxSi: 365 * 86400.0);
        n.Done();
        return new DataSettings(sources, TimeSpan.FromSeconds(interval), TimeSpan.FromSeconds(maxGap), start, end,
            frozen is { } f ? TimeSpan.FromSeconds(f) : null);
    }

    private static HistorianSource? ReadSource(JsonNode s, string baseDir, bool requireFiles)
    {
        var id = s.String("id") ?? "historian";
        var patterns = s.Array("files", required: true);
        var files = new List<string>();
        var names = new List<string>();
        foreach (var (e, path) in patterns)
        {
            if (e.ValueKind != JsonValueKind.String) { s.ErrorAt(path, "must be a file path or pattern in quotes, e.g. \"data/export-*.csv\"."); continue; }
            var pattern = e.GetString()!;
            var full = System.IO.Path.IsPathRooted(pattern) ? pattern : System.IO.Path.Combine(baseDir, pattern);
            var dir = System.IO.Path.GetDirectoryName(full)!;
            var namePattern = System.IO.Path.GetFileName(full);
            var found = Directory.Exists(dir) ? Directory.GetFiles(dir, namePattern).Order(StringComparer.Ordinal).ToList() : [];
            names.Add(namePattern);
            if (found.Count == 0 && requireFiles) s.ErrorAt(path, $"'{pattern}' matches no file (looked in {dir}); check the path, which is relative to the configuration file.");
            files.AddRange(found);
        }
        var layoutText = s.String("layout") ?? "wide";
        var layout = layoutText.ToLowerInvariant() switch
        {
            "wide" => HistorianLayout.Wide,
            "long" => HistorianLayout.Long,
            _ => (HistorianLayout?)null,
        };
        if (layout is null) s.Error("layout", $"'{layoutText}' is not a layout; use \"wide\" (a column per tag) or \"long\" (tag, timestamp, value rows).");
        var delimiter = ReadChar(s, "delimiter", [',', ';', '\t', '|'], "\",\", \";\", \"\\t\" or \"|\"");
        var decimalSep = ReadChar(s, "decimal", ['.', ','], "\".\" or \",\"");
        if (decimalSep == ',' && delimiter == ',')
            s.Error("decimal", "',' is also the delimiter; with a decimal comma the fields are split by \";\", \"\\t\" or \"|\": set delimiter to the one the export uses.");
        var encoding = s.String("encoding");
        if (encoding is not null && !new[] { "utf-8", "windows-1252", "auto" }.Contains(encoding.ToLowerInvariant()))
            s.Error("encoding", $"'{encoding}' is not supported; use \"utf-8\", \"windows-1252\" or \"auto\".");
        var headerLine = s.Integer("headerLine", min: 1);
        var metadataRows = s.Integer("metadataRows", min: 0, max: 20);
        var ts = s.Object("timestamp");
        var timestamp = new TimestampSettings(ts?.String("column"), ts?.String("format"), ts?.Boolean("utc") ?? false);
        if (timestamp.Format is { } f && f != "serial" && f != "iso")
        {
            try { _ = DateTime.Now.ToString(f, CultureInfo.InvariantCulture); }
            catch (FormatException) { ts!.Error("format", $"'{f}' is not a valid date format string; use e.g. \"dd.MM.yyyy HH:mm:ss\", \"iso\" or \"serial\"."); }
        }
        ts?.Done();
        var markers = s.Has("markers")
            ? s.Array("markers").Where(m => m.Element.ValueKind == JsonValueKind.String).Select(m => m.Element.GetString()!).ToList()
            : [];
        var tagColumn = s.String("tagColumn") ?? "Tag";
        var valueColumn = s.String("valueColumn") ?? "Value";
        var qualityColumn = s.String("qualityColumn");
        var good = s.Has("goodQuality")
            ? s.Array("goodQuality").Select(g => g.Element.ValueKind == JsonValueKind.Number ? g.Element.GetRawText() : g.Element.GetString() ?? "").ToList()
            : new List<string> { "Good", "G", "192", "0", "OK" };
        s.Done();
        return layout is null ? null : new HistorianSource(id, s.Path, names, files, layout.Value, delimiter, decimalSep, encoding?.ToLowerInvariant() is "auto" ? null : encoding,
            headerLine, metadataRows, timestamp, markers, tagColumn, valueColumn, qualityColumn, good);
    }

    private static char? ReadChar(JsonNode n, string key, char[] allowed, string words)
    {
        var text = n.String(key);
        if (text is null || text.Equals("auto", StringComparison.OrdinalIgnoreCase)) return null;
        var t = text == "\\t" || text.Equals("tab", StringComparison.OrdinalIgnoreCase) ? "\t" : text;
        if (t.Length == 1 && allowed.Contains(t[0])) return t[0];
        n.Error(key, $"'{text}' is not supported; use {words} or \"auto\".");
        return null;
    }

    /// <summary>Dates a configuration may name: years 1900 to 2199 (plant records and plans; anything else is a typing
    /// error, and years near 0001 or 9999 cannot be shifted by a time-zone offset).</summary>
    public const int FirstYear = 1900, LastYear = 2199;

    private static DateTimeOffset? ReadDate(JsonNode n, string key, SiteSettings? site, bool required = false)
    {
        var result = ReadAnyDate(n, key, site, required);
        if (result is { } d && (d.Year < FirstYear || d.Year > LastYear))
        {
            n.Error(key, $"'{n.String(key)}' is outside the years {FirstYear} to {LastYear}; check the date.");
            return null;
        }
        return result;
    }

    private static DateTimeOffset? ReadAnyDate(JsonNode n, string key, SiteSettings? site, bool required)
    {
        var text = n.String(key, required);
        if (text is null) return null;
        if (DateTime.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.None, out var probe) && (probe.Year < FirstYear || probe.Year > LastYear))
            return new DateTimeOffset(DateTime.SpecifyKind(probe, DateTimeKind.Unspecified), TimeSpan.Zero);
        if (DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal, out var dto) &&
            (text.Contains('+') || text.EndsWith('Z') || text.Count(c => c == '-') > 2))
            return dto.ToUniversalTime();
        if (DateTime.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.None, out var local))
        {
            var zone = site?.TimeZone ?? TimeZoneInfo.Utc;
            var unspecified = DateTime.SpecifyKind(local, DateTimeKind.Unspecified);
            if (zone.IsInvalidTime(unspecified)) { n.Error(key, $"'{text}' does not exist in {zone.Id} (daylight-saving gap)."); return null; }
            return new DateTimeOffset(unspecified, zone.GetUtcOffset(unspecified)).ToUniversalTime();
        }
        n.Error(key, $"'{text}' is not a date; use ISO 8601, e.g. \"2026-03-14\" or \"2026-03-14T06:00:00Z\" (local site time when no offset).");
        return null;
    }

    private static ShutdownWindow? ReadWindow(JsonNode root, JsonElement e, string path, SiteSettings? site)
    {
        var n = root.AsObject(e, path);
        if (n is null) return null;
        var name = n.String("name") ?? path;
        var start = ReadDate(n, "start", site, required: true);
        var end = ReadDate(n, "end", site, required: true);
        var capacity = n.Integer("capacity", min: 0) ?? 1;
        if (start is not null && end is not null && end <= start) n.Error("end", "must be after start.");
        n.Done();
        return start is null || end is null ? null : new ShutdownWindow(name, start.Value, end.Value, capacity);
    }

    private static EconomicsSettings? ReadEconomics(JsonNode? n, EconomicsSettings? inherited)
    {
        if (n is null) return null;
        var currency = n.String("currency") ?? inherited?.Currency ?? "EUR";
        var fuel = n.String("fuel") ?? inherited?.Fuel;
        FuelFactors.Fuel? fuelData = null;
        if (fuel is not null)
        {
            fuelData = FuelFactors.Find(fuel);
            if (fuelData is null) n.Error("fuel", $"'{fuel}' is not a known fuel; use {string.Join(" or ", FuelFactors.All.Select(f => $"\"{f.Key}\""))}, or give co2Factor.");
        }
        var fuelPrice = MoneyPer(n, "fuelPrice", currency, Dimension.Energy) ?? inherited?.FuelPricePerJoule;
        var efficiency = n.Fraction("heaterEfficiency", min: 0.3, max: 1.0) ?? inherited?.HeaterEfficiency;
        double? co2 = inherited?.Co2KilogramsPerJoule;
        if (n.Has("co2Factor")) co2 = Co2Factor(n, "co2Factor");
        else if (fuelData is not null) co2 = fuelData.Co2KilogramsPerJoule;
        var co2Price = MoneyPerMass(n, "co2Price", currency) ?? inherited?.Co2PricePerKilogram;
        var lostCooling = MoneyPer(n, "lostCoolingCost", currency, Dimension.Energy) ?? inherited?.LostCoolingCostPerJoule;
        var confidence = n.Fraction("decisionConfidence", min: 0.5, max: 0.99)
                         ?? inherited?.DecisionConfidence ?? EconomicsSettings.DefaultDecisionConfidence;
        n.Done();
        return new EconomicsSettings(currency, fuelData?.Key ?? fuel, fuelPrice, efficiency, co2, co2Price, lostCooling, confidence);
    }

    /// <summary>Reads "8.5 EUR/GJ": the amount and the unit after the slash, checking the currency; null after reporting the problem.</summary>
    private static (double Amount, string PerUnit)? CurrencyPer(JsonNode n, string key, string currency, string example)
    {
        var text = n.String(key);
        if (text is null) return null;
        var (amount, unit) = SplitMoney(n, key, text, example);
        if (unit is null) return null;
        var slash = unit.IndexOf('/');
        if (slash < 0) { n.Error(key, $"'{text}' needs a unit after the currency, e.g. {example}."); return null; }
        var cur = unit[..slash].Trim();
        if (!cur.Equals(currency, StringComparison.OrdinalIgnoreCase)) { n.Error(key, $"'{text}' is in {cur}, but the site currency is {currency}; convert it or change economics.currency."); return null; }
        return (amount, unit[(slash + 1)..].Trim());
    }

    /// <summary>Reads "8.5 EUR/GJ" as money per SI unit of the dimension.</summary>
    private static double? MoneyPer(JsonNode n, string key, string currency, Dimension per)
    {
        if (CurrencyPer(n, key, currency, $"\"8.5 {currency}/GJ\"") is not { } v) return null;
        if (!UnitCatalog.TryResolve(v.PerUnit, per, out var u)) { n.Error(key, $"'{v.PerUnit}' is not {UnknownUnitException.WithArticle(per)} unit; use {string.Join(", ", UnitCatalog.Accepted(per))}."); return null; }
        return v.Amount / u.Scale;
    }

    /// <summary>Reads "80 EUR/t" as money per kg.</summary>
    private static double? MoneyPerMass(JsonNode n, string key, string currency)
    {
        if (CurrencyPer(n, key, currency, $"\"80 {currency}/t\"") is not { } v) return null;
        double? kg = v.PerUnit.ToLowerInvariant() switch { "t" or "tonne" or "tco2" => 1000, "kg" or "kgco2" => 1, _ => null };
        if (kg is null) { n.Error(key, $"'{v.PerUnit}' is not a mass unit here; use t or kg."); return null; }
        return v.Amount / kg;
    }

    /// <summary>Reads "20000 EUR/d" as money per day.</summary>
    private static double? MoneyPerDay(JsonNode n, string key, string currency)
    {
        if (CurrencyPer(n, key, currency, $"\"20000 {currency}/d\"") is not { } v) return null;
        if (!UnitCatalog.TryResolve(v.PerUnit, Dimension.Duration, out var d)) { n.Error(key, $"'{v.PerUnit}' is not a duration unit; use {string.Join(", ", UnitCatalog.Accepted(Dimension.Duration))}."); return null; }
        return v.Amount / d.Scale * 86400;
    }

    private static double? Co2Factor(JsonNode n, string key)
    {
        var text = n.String(key);
        if (text is null) return null;
        var (amount, unit) = SplitMoney(n, key, text, "\"56100 kg/TJ\"");
        if (unit is null) return null;
        var parts = unit.Split('/');
        double? mass = parts.Length == 2 ? parts[0].Trim().ToLowerInvariant() switch { "kg" => 1, "t" => 1000, "g" => 0.001, _ => null } : null;
        if (mass is null || !UnitCatalog.TryResolve(parts[1], Dimension.Energy, out var e)) { n.Error(key, $"'{text}' must be a mass of CO2 per fuel energy, e.g. \"56100 kg/TJ\"."); return null; }
        return amount * mass / e.Scale;
    }

    private static (double Amount, string? Unit) SplitMoney(JsonNode n, string key, string text, string example)
    {
        var t = text.Trim();
        var i = 0;
        while (i < t.Length && (char.IsDigit(t[i]) || t[i] is '.' or '-' or '+' or 'e' or 'E')) i++;
        if (i == 0 || !double.TryParse(t[..i], NumberStyles.Float, CultureInfo.InvariantCulture, out var amount))
        {
            n.Error(key, $"'{text}' is not an amount with its unit; write it like {example}.");
            return (0, null);
        }
        var unit = t[i..].Trim();
        if (unit.Length == 0) { n.Error(key, $"'{text}' has no currency or unit; write it like {example}."); return (0, null); }
        return (amount, unit);
    }

    private static double? Money(JsonNode n, string key, string currency)
    {
        var text = n.String(key);
        if (text is null) return null;
        var (amount, unit) = SplitMoney(n, key, text, $"\"45000 {currency}\"");
        if (unit is null) return null;
        if (!unit.Equals(currency, StringComparison.OrdinalIgnoreCase)) { n.Error(key, $"'{text}' is in {unit}, but the site currency is {currency}."); return null; }
        if (amount < 0) { n.Error(key, $"'{text}' is negative; a cost is 0 or more."); return null; }
        return amount;
    }

    private static readonly string[] ArrangementNames =
        ["counterflow", "parallel", "plate", "shell-and-tube", "crossflow-unmixed", "crossflow-hot-mixed", "crossflow-cold-mixed"];

    private static FlowArrangement? ReadArrangement(JsonNode n)
    {
        if (!n.Has("arrangement")) { n.Error("arrangement", "is missing; use one of " + string.Join(", ", ArrangementNames.Select(a => $"\"{a}\"")) + "."); return null; }
        var e = n.Element.GetProperty("arrangement");
        string? type;
        int shells = 1, passes = 2;
        if (e.ValueKind == JsonValueKind.String) type = e.GetString();
        else
        {
            var o = n.Object("arrangement");
            if (o is null) return null;
            type = o.String("type", required: true);
            shells = o.Integer("shells", min: 1, max: 8) ?? 1;
            passes = o.Integer("tubePasses", min: 2, max: 16) ?? 2;
            if (passes % 2 != 0) o.Error("tubePasses", $"{passes} is odd; use an even number of tube passes (2, 4, …).");
            o.Done();
            if (passes % 2 != 0) return null;
        }
        switch (type?.ToLowerInvariant())
        {
            case "counterflow": return Counterflow.Instance;
            case "parallel": return new ParallelFlow();
            case "plate": return new PlateAsCounterflow();
            case "shell-and-tube": return shells == 1 ? new OneShellPassEvenTubePasses(passes) : new ShellsInSeries(shells, passes);
            case "crossflow-unmixed": return new CrossflowBothUnmixed();
            case "crossflow-hot-mixed": return new CrossflowOneMixed(Core.Exchangers.StreamSide.Hot);
            case "crossflow-cold-mixed": return new CrossflowOneMixed(Core.Exchangers.StreamSide.Cold);
            case null: return null;
            default:
                var near = Suggest.Closest(type, ArrangementNames);
                n.Error("arrangement", $"'{type}' is not an arrangement; " + (near is null ? "use one of " + string.Join(", ", ArrangementNames.Select(a => $"\"{a}\"")) : $"did you mean \"{near}\"?"));
                return null;
        }
    }

    private static ExchangerConfiguration? ReadExchanger(JsonNode n, SiteSettings? site, EconomicsSettings economics)
    {
        var id = n.String("id", required: true);
        var service = n.String("service") ?? "";
        var arrangement = ReadArrangement(n);
        // Physical ranges (common practice): the largest surface condensers have some 10^5 m2, clean U of liquids and
        // condensing steam stay below 2·10^4 W/m2K, and no single stream carries 10^5 kg/s (360,000 t/h).
        var area = n.Quantity("area", Dimension.Area, required: true, minSi: 0, exclusiveMin: true, maxSi: 1e5);
        var atm = site?.AtmospherePascals ?? 101_325.0;
        var hot = ReadStream(n.Object("hot", required: true), Core.Exchangers.StreamSide.Hot, atm);
        var cold = ReadStream(n.Object("cold", required: true), Core.Exchangers.StreamSide.Cold, atm);
        if (hot is not null && cold is not null && hot.Side == cold.Side)
            n.Error("cold.side", $"is \"{cold.Side.ToString().ToLowerInvariant()}\" like the hot stream; one stream is on the tube side and the other on the shell side.");
        if (hot?.Fluid.IsPhaseChange == true && cold?.Fluid.IsPhaseChange == true)
            n.ErrorHere("both streams change phase; at most one side may condense or evaporate.");
        var basisText = n.String("dutyBasis") ?? "mean";
        DutyBasis? basis = basisText.ToLowerInvariant() switch
        {
            "hot" => DutyBasis.Hot, "cold" => DutyBasis.Cold, "mean" => DutyBasis.Mean, "reconciled" => DutyBasis.Reconciled, _ => null,
        };
        if (basis is null) n.Error("dutyBasis", $"'{basisText}' is not a duty basis; use \"hot\", \"cold\", \"mean\" or \"reconciled\".");
        var balance = n.Fraction("balanceTolerance", min: 0.001, max: 1) ?? 0.10;
        var downtime = n.Fraction("downtimeFlowFraction", min: 0, max: 0.9) ?? 0.2;
        var clean = ReadClean(n.Object("clean", required: true), site, hot, cold, area, arrangement is PlateAsCounterflow);
        var limitsNode = n.Object("limits");
        var limits = new ExchangerLimits(
            limitsNode?.Quantity("foulingResistance", Dimension.FoulingResistance, minSi: 0, exclusiveMin: true),
            limitsNode?.Quantity("minimumDuty", Dimension.Power, minSi: 0, exclusiveMin: true),
            limitsNode?.Quantity("minimumColdOutlet", Dimension.Temperature, minSi: 0),
            limitsNode?.Quantity("maximumHotOutlet", Dimension.Temperature, minSi: 0));
        limitsNode?.Done();
        var exEconomics = ReadEconomics(n.Object("economics"), economics);
        var currency = (exEconomics ?? economics).Currency;
        var cleaningNode = n.Object("cleaning");
        var cleaning = new CleaningSettings(
            cleaningNode is null ? null : Money(cleaningNode, "cost", currency),
            cleaningNode?.Quantity("downtime", Dimension.Duration, minSi: 0) is { } dt ? TimeSpan.FromSeconds(dt) : null,
            cleaningNode is null ? null : MoneyPerDay(cleaningNode, "downtimeCost", currency),
            cleaningNode is null ? null : Money(cleaningNode, "unplannedStopCost", currency),
            Duration(cleaningNode, "unplannedDowntime"),
            Duration(cleaningNode, "leadTime"));
        cleaningNode?.Done();
        var maintenance = new List<MaintenanceEvent>();
        foreach (var (e, path) in n.Array("maintenance"))
        {
            var m = n.AsObject(e, path);
            if (m is null) continue;
            var date = ReadDate(m, "date", site, required: true);
            var action = m.String("action") ?? "cleaned";
            if (!new[] { "cleaned", "not-cleaned", "inspected", "repaired", "bypassed", "returned" }.Contains(action.ToLowerInvariant()))
                m.Error("action", $"'{action}' is not an action; use \"cleaned\", \"not-cleaned\" (suppresses a detected cleaning), \"inspected\", \"repaired\", \"bypassed\" or \"returned\".");
            var note = m.String("note");
            m.Done();
            if (date is not null) maintenance.Add(new MaintenanceEvent(date.Value, action, note));
        }
        maintenance.Sort((a, b) => a.Date.CompareTo(b.Date));
        var threshold = ReadThreshold(n.Object("threshold"));
        n.Done();
        if (id is null || arrangement is null || area is null || hot is null || cold is null || basis is null || clean is null) return null;
        return new ExchangerConfiguration(id, service, n.Path, arrangement, area.Value, hot, cold, basis.Value, balance, downtime,
            clean, limits, cleaning, maintenance, exEconomics, threshold);
    }

    private static TimeSpan? Duration(JsonNode? n, string key) =>
        n?.Quantity(key, Dimension.Duration, minSi: 0, maxSi: 3650 * 86400.0) is { } seconds ? TimeSpan.FromSeconds(seconds) : null;

    private static ThresholdSettings? ReadThreshold(JsonNode? n)
    {
        if (n is null) return null;
        var re = n.Number("reynoldsAtDesign", required: true, min: 100, max: 1e7);
        var pr = n.Number("prandtl", required: true, min: 0.5, max: 1e4);
        double? energy = null;
        var text = n.String("activationEnergy", required: true);
        if (text is not null)
        {
            var t = text.Trim();
            var scale = t.EndsWith("kJ/mol", StringComparison.OrdinalIgnoreCase) ? 1e3 : t.EndsWith("J/mol", StringComparison.OrdinalIgnoreCase) ? 1.0 : double.NaN;
            var number = t.Split(' ', StringSplitOptions.RemoveEmptyEntries)[0];
            if (double.IsNaN(scale) || !double.TryParse(number, NumberStyles.Float, CultureInfo.InvariantCulture, out var e) || e <= 0)
                n.Error("activationEnergy", $"'{text}' must be a positive energy per mole, e.g. \"48 kJ/mol\" or \"48000 J/mol\".");
            else energy = e * scale;
        }
        var rise = n.Quantity("filmTemperatureRise", Dimension.TemperatureDifference, minSi: 0) ?? 0;
        n.Done();
        return re is null || pr is null || energy is null ? null : new ThresholdSettings(re.Value, pr.Value, energy.Value, rise);
    }

    /// <summary>
    /// The tube share from the datasheet's film coefficients at design (hTube, hShell; a tube-side coefficient referred
    /// to the inside surface is referred to the exchanger area by tubeDiameterRatio = Do/Di): share = (Do/Di)/hTube over
    /// 1/hShell + (Do/Di)/hTube. The films must add up, with the wall, to the clean 1/U within 15 %, else the U or a
    /// coefficient is not the clean one (a service U with fouling allowance, say) and the values are refused.
    /// </summary>
    private static double? FilmShare(JsonNode n, double u, double wall)
    {
        if (!n.Has("hTube") && !n.Has("hShell")) return null;
        if (n.Has("tubeShare")) n.ErrorHere("give either tubeShare or the film coefficients hTube and hShell, not both.");
        var ht = n.Quantity("hTube", Dimension.HeatTransferCoefficient, required: true, minSi: 10, maxSi: 1e5);
        var hs = n.Quantity("hShell", Dimension.HeatTransferCoefficient, required: true, minSi: 10, maxSi: 1e5);
        var ratio = n.Number("tubeDiameterRatio", min: 1, max: 2) ?? 1;
        if (ht is null || hs is null) return null;
        var films = ratio / ht.Value + 1 / hs.Value;
        var clean = 1 / u - wall;
        if (Math.Abs(films - clean) > 0.15 * clean)
        {
            n.ErrorHere(FormattableString.Invariant(
                $"the film coefficients and the clean U disagree: 1/hShell + (Do/Di)/hTube = {films:G3} m2K/W but 1/U − wall = {clean:G3} m2K/W ") +
                "(more than 15 % apart); give the clean U (no fouling allowance) and coefficients referred as stated (tubeDiameterRatio for an inside hTube).");
            return null;
        }
        return ratio / ht.Value / films;
    }

    /// <summary>A side's design bulk temperature, for scaling its film with the fluid's properties: only fluids with
    /// viscosity and thermal conductivity (water, a petroleum liquid with its viscosity) can be scaled.</summary>
    private static double? BulkTemperature(JsonNode n, string key, StreamConfiguration? side)
    {
        if (!n.Has(key)) return null;
        var t = n.Quantity(key, Dimension.Temperature, minSi: 253.15, maxSi: 573.15);
        if (t is not null && side is not null && side.Fluid is not Core.FluidModels.ITransportFluid)
        {
            n.Error(key, $"scales the film with the fluid's viscosity and conductivity, which {side.Fluid.Description} does not have: use the \"water\" model, " +
                "give a petroleum liquid its viscosity at two temperatures, or leave this key out for this side.");
            return null;
        }
        return t;
    }

    private static CleanReference? ReadClean(JsonNode? n, SiteSettings? site, StreamConfiguration? hot, StreamConfiguration? cold, double? area,
        bool plate = false)
    {
        if (n is null) return null;
        var method = n.String("method", required: true);
        var tubeN = n.Number("tubeExponent", min: 0.3, max: 1.0) ?? 0.8;
        var shellN = n.Number("shellExponent", min: 0.3, max: 1.0) ?? 0.6;
        CleanReference? result = null;
        switch (method?.ToLowerInvariant())
        {
            case "datasheet":
                var u = n.Quantity("u", Dimension.HeatTransferCoefficient, required: true, minSi: 1, maxSi: 2e4);
                var share = n.Fraction("tubeShare", min: 0.05, max: 0.95) ?? 0.5;
                var wall = n.Quantity("wallResistance", Dimension.FoulingResistance, minSi: 0) ?? 0;
                var uncertainty = n.Fraction("uncertainty", min: 0, max: 0.5) ?? DatasheetCleanReference.DefaultUncertainty;
                var tube = hot?.Side == ExchangerSide.Tube ? hot : cold;
                var shell = hot?.Side == ExchangerSide.Shell ? hot : cold;
                if (tube?.DesignFlow is null) n.ErrorHere($"the datasheet method needs designFlow on the tube-side stream ({(tube == hot ? "hot" : "cold")}.designFlow).");
                if (shell?.DesignFlow is null) n.ErrorHere($"the datasheet method needs designFlow on the shell-side stream ({(shell == hot ? "hot" : "cold")}.designFlow).");
                if (u is not null && wall >= 1 / u.Value) n.Error("wallResistance", "is as large as the whole clean resistance 1/U; check the value.");
                else if (u is not null && FilmShare(n, u.Value, wall) is { } fromFilms) share = fromFilms;
                var tubeBulk = BulkTemperature(n, "tubeBulkTemperature", tube);
                var shellBulk = BulkTemperature(n, "shellBulkTemperature", shell);
                if (u is not null && tube?.DesignFlow is not null && shell?.DesignFlow is not null && wall < 1 / u.Value)
                    result = new DatasheetCleanReference(u.Value, tube.DesignFlow.Value, shell.DesignFlow.Value, share, wall, tubeN, shellN,
                        uncertainty, tubeBulk, shellBulk);
                break;
            case "baseline":
                var days = n.Quantity("duration", Dimension.Duration, minSi: 3600) ?? 14 * 86400.0;
                var start = ReadDate(n, "start", site);
                var corrected = n.Boolean("propertyCorrected") ?? false;
                if (corrected && !new[] { hot, cold }.Any(sd => sd?.Fluid is Core.FluidModels.ITransportFluid && !sd.Fluid.IsPhaseChange))
                    n.Error("propertyCorrected", "needs the viscosity and conductivity of at least one single-phase fluid: \"water\", or a " +
                        "petroleum liquid with its \"viscosity\" points.");
                result = new BaselineCleanReference(TimeSpan.FromSeconds(days), start, tubeN, shellN, corrected);
                break;
            case "geometry":
                result = plate ? ReadPlateGeometry(n, hot, cold, area) : ReadGeometry(n, hot, cold, area);
                break;
            case null: break;
            default:
                n.Error("method", $"'{method}' is not a clean-U method; use \"datasheet\" (clean U at design flows), \"geometry\" (from the bundle " +
                    "and the fluids' properties) or \"baseline\" (fitted after a cleaning).");
                break;
        }
        n.Done();
        return result;
    }

    private static StreamConfiguration? ReadStream(JsonNode? n, Core.Exchangers.StreamSide stream, double atmosphere)
    {
        if (n is null) return null;
        var sideText = n.String("side", required: true);
        ExchangerSide? side = sideText?.ToLowerInvariant() switch { "tube" => ExchangerSide.Tube, "shell" => ExchangerSide.Shell, _ => null };
        if (sideText is not null && side is null) n.Error("side", $"'{sideText}' is not a side; use \"tube\" or \"shell\" (for plates: \"tube\" for one channel, \"shell\" for the other).");
        var pressure = 0.0;
        TagReference? pressureTag = null;
        if (n.Has("pressure"))
        {
            var pe = n.Element.GetProperty("pressure");
            if (pe.ValueKind == JsonValueKind.Object && pe.TryGetProperty("tag", out _))
                pressureTag = ReadTag(n.Object("pressure")!, Dimension.Pressure, atmosphere, 1, 1e8);
            else pressure = ReadPressure(n, "pressure", atmosphere) ?? 0;
        }
        var fluid = ReadFluid(n.Object("fluid", required: true), atmosphere, ref pressure);
        if (pressure <= 0) pressure = atmosphere + 5e5; // common practice: liquids run a few bar above atmosphere; only IAPWS water uses it
        var flow = ReadTag(n.Object("flow", required: true), Dimension.MassFlow, atmosphere, 0, double.MaxValue);
        var inlet = ReadTag(n.Object("inlet", required: true), Dimension.Temperature, atmosphere, 213.15, 1173.15);
        var outlet = ReadTag(n.Object("outlet", required: true), Dimension.Temperature, atmosphere, 213.15, 1173.15);
        var design = n.Quantity("designFlow", Dimension.MassFlow, minSi: 0, exclusiveMin: true, maxSi: 1e5);
        // a pressure difference across the side: no gauge offset, so "barg" reads as "bar"; with the tube bore and the
        // deposit's conductivity, the drop's rise is turned into a deposit thickness to set beside Rf's
        var dpNode = n.Has("pressureDrop") ? n.Object("pressureDrop") : null;
        var bore = dpNode?.Quantity("tubeInnerDiameter", Dimension.Length, minSi: 0.002, maxSi: 0.1);
        var depositK = dpNode?.Quantity("depositConductivity", Dimension.ThermalConductivity, minSi: 0.01, maxSi: 10);
        if (dpNode is not null && side == ExchangerSide.Shell && bore is not null)
            dpNode.Error("tubeInnerDiameter", "applies to the tube side only; leave it out on the shell side.");
        var pressureDrop = dpNode is null ? null : ReadTag(dpNode, Dimension.Pressure, 0, 0, 1e7);
        n.Done();
        if (side is null || fluid is null || flow is null || inlet is null || outlet is null) return null;
        return new StreamConfiguration(stream, side.Value, fluid, flow, inlet, outlet, pressure, pressureTag, design, pressureDrop, bore, depositK);
    }

    private static double? ReadPressure(JsonNode n, string key, double atmosphere)
    {
        var text = n.String(key);
        if (text is null) return null;
        try
        {
            var (value, unit) = UnitCatalog.SplitNumberAndUnit(text, Dimension.Pressure);
            var si = UnitCatalog.ResolvePressure(unit, atmosphere).ToSi(value);
            if (si <= 0) { n.Error(key, $"'{text}' is not above absolute zero pressure."); return null; }
            return si;
        }
        catch (FormatException ex) { n.Error(key, ex.Message.Replace("use ", "use barg, psig, kPag, MPag, ")); return null; }
    }

    private static readonly string[] FluidModels = ["water", "constant-cp", "cp-polynomial", "cp-table", "petroleum", "condensing-steam", "evaporating-water"];

    private static IFluidModel? ReadFluid(JsonNode? n, double atmosphere, ref double pressure)
    {
        if (n is null) return null;
        var model = n.String("model", required: true);
        IFluidModel? result = null;
        var range = new TemperatureRange(
            n.Quantity("minimumTemperature", Dimension.Temperature, minSi: 0) ?? 233.15,
            n.Quantity("maximumTemperature", Dimension.Temperature, minSi: 0) ?? 773.15);
        try
        {
            switch (model?.ToLowerInvariant())
            {
                case "water":
                    result = new IapwsWater();
                    break;
                case "constant-cp":
                    var cp = n.Quantity("cp", Dimension.SpecificHeat, required: true, minSi: 100, maxSi: 20_000);
                    if (cp is not null) result = new ConstantSpecificHeat(cp.Value, range, n.String("name") ?? "constant cp");
                    break;
                case "cp-polynomial":
                {
                    var coeffs = n.Array("coefficients", required: true).Select(c => c.Element.ValueKind == JsonValueKind.Number ? c.Element.GetDouble() : double.NaN).ToList();
                    if (coeffs.Any(double.IsNaN)) n.Error("coefficients", "must be plain numbers a0, a1, … in the stated cpUnit and temperatureUnit.");
                    var cpUnitText = n.String("cpUnit") ?? "J/kgK";
                    var tUnitText = n.String("temperatureUnit") ?? "degC";
                    if (!UnitCatalog.TryResolve(cpUnitText, Dimension.SpecificHeat, out var cpUnit)) n.Error("cpUnit", new UnknownUnitException(cpUnitText, Dimension.SpecificHeat, UnitCatalog.Accepted(Dimension.SpecificHeat)).Message);
                    else if (!UnitCatalog.TryResolve(tUnitText, Dimension.Temperature, out var tUnit)) n.Error("temperatureUnit", new UnknownUnitException(tUnitText, Dimension.Temperature, UnitCatalog.Accepted(Dimension.Temperature)).Message);
                    else if (coeffs.Count > 0 && !coeffs.Any(double.IsNaN))
                    {
                        // cp = Σ aᵢ·xⁱ with x = (T − offset)/scale in the stated temperature unit; in kelvin: aᵢ/scaleⁱ.
                        var si = coeffs.Select((a, i) => a * cpUnit.Scale / Math.Pow(tUnit.Scale, i)).ToList();
                        result = new PolynomialSpecificHeat(si, tUnit.ToSi(0), range, n.String("name") ?? "cp(T) polynomial");
                    }
                    break;
                }
                case "cp-table":
                {
                    var points = new List<(double, double)>();
                    foreach (var (e, path) in n.Array("points", required: true))
                    {
                        if (e.ValueKind != JsonValueKind.Array || e.GetArrayLength() != 2) { n.ErrorAt(path, "must be a pair [\"50 degC\", \"2.05 kJ/kgK\"]."); continue; }
                        var t = n.ParseQuantity($"{path}[0]", e[0], Dimension.Temperature, minSi: 0);
                        var c = n.ParseQuantity($"{path}[1]", e[1], Dimension.SpecificHeat, minSi: 100, maxSi: 20_000);
                        if (t is not null && c is not null) points.Add((t.Value, c.Value));
                    }
                    if (points.Count >= 2) result = new TabulatedSpecificHeat(points, n.String("name") ?? "cp(T) table");
                    else n.Error("points", "needs at least two points.");
                    break;
                }
                case "petroleum":
                {
                    var api = n.Number("api", min: 0, max: 100);
                    var sg = n.Number("sg", min: 0.5, max: 1.2);
                    var k = n.Number("watsonK", required: true, min: 9, max: 14);
                    if (api is null == sg is null) n.ErrorHere("give either api (API gravity) or sg (specific gravity 60/60 °F), one of them.");
                    else if (k is not null) result = api is not null ? KeslerLeePetroleumLiquid.FromApiGravity(api.Value, k.Value) : new KeslerLeePetroleumLiquid(sg!.Value, k.Value);
                    if (n.Has("viscosity") && ReadViscosity(n) is { } walther && result is KeslerLeePetroleumLiquid liquid)
                        result = new PetroleumLiquidTransport(liquid, liquid.SpecificGravity, walther);
                    break;
                }
                case "condensing-steam":
                case "evaporating-water":
                {
                    var p = ReadPressure(n, "pressure", atmosphere);
                    if (p is null && !n.Has("pressure")) n.Error("pressure", "is missing; a phase-change side needs its saturation pressure, e.g. \"4 barg\".");
                    if (p is not null)
                    {
                        pressure = p.Value;
                        var band = n.Quantity("saturationBand", Dimension.TemperatureDifference, minSi: 0, maxSi: 10) ?? 0.5;
                        result = new SteamPhaseChange(new Pressure(p.Value), model!.StartsWith("condensing", StringComparison.OrdinalIgnoreCase) ? PhaseChangeDirection.Condensing : PhaseChangeDirection.Evaporating, band);
                    }
                    break;
                }
                case null: break;
                default:
                    var near = Suggest.Closest(model, FluidModels);
                    n.Error("model", $"'{model}' is not a fluid model; " + (near is null ? "use one of " + string.Join(", ", FluidModels.Select(f => $"\"{f}\"")) : $"did you mean \"{near}\"?"));
                    break;
            }
        }
        catch (QuantityOutOfRangeException ex) { n.ErrorHere(ex.Message); }
        catch (ArgumentException ex) { n.ErrorHere(ex.Message); }
        n.Allow("name", "pressure", "saturationBand", "api", "sg", "watsonK", "cp", "coefficients", "cpUnit", "temperatureUnit", "points", "viscosity");
        n.Done();
        return result;
    }

    /// <summary>A petroleum liquid's kinematic viscosity at two temperatures (an assay's, e.g. at 40 and 100 °C), for
    /// ASTM D341's Walther relation.</summary>
    private static WaltherViscosity? ReadViscosity(JsonNode n)
    {
        var points = new List<(double T, double Nu)>();
        foreach (var (e, path) in n.Array("viscosity"))
        {
            if (e.ValueKind != JsonValueKind.Array || e.GetArrayLength() != 2) { n.ErrorAt(path, "must be a pair [\"40 degC\", \"9.5 cSt\"]."); continue; }
            var t = n.ParseQuantity($"{path}[0]", e[0], Dimension.Temperature, minSi: 200, maxSi: 800);
            var nu = n.ParseQuantity($"{path}[1]", e[1], Dimension.KinematicViscosity, minSi: 1e-7, maxSi: 0.1);
            if (t is not null && nu is not null) points.Add((t.Value, nu.Value));
        }
        if (points.Count != 2) { n.Error("viscosity", "needs exactly two points [temperature, kinematic viscosity], e.g. at 40 and 100 °C."); return null; }
        try { return new WaltherViscosity(points[0].T, points[0].Nu, points[1].T, points[1].Nu); }
        catch (ArgumentException) { n.Error("viscosity", "needs two different temperatures with the lower viscosity at the higher one."); return null; }
    }

    private static TagReference? ReadTag(JsonNode? n, Dimension dimension, double atmosphere, double defaultMin, double defaultMax)
    {
        if (n is null) return null;
        var tag = n.String("tag", required: true);
        var unitText = n.String("unit", required: true);
        var source = n.String("source");
        LinearUnit unit = default;
        double? density = null;
        var ok = unitText is not null;
        if (unitText is not null)
        {
            if (dimension == Dimension.Pressure)
            {
                try { unit = UnitCatalog.ResolvePressure(unitText, atmosphere); }
                catch (UnknownUnitException ex) { n.Error("unit", ex.Message); ok = false; }
            }
            else if (UnitCatalog.TryResolve(unitText, dimension, out unit)) { }
            else if (dimension == Dimension.MassFlow && UnitCatalog.TryResolve(unitText, Dimension.VolumetricFlow, out unit))
            {
                density = n.Quantity("density", Dimension.Density, minSi: 1, maxSi: 2000);
                if (density is null && !n.Has("density")) { n.Error("density", $"is missing; a volumetric flow in '{unitText}' needs the fluid density, e.g. \"850 kg/m3\"."); ok = false; }
                if (density is null) ok = false;
            }
            else
            {
                var accepted = UnitCatalog.Accepted(dimension).Concat(dimension == Dimension.MassFlow ? UnitCatalog.Accepted(Dimension.VolumetricFlow).Select(v => v + " (with density)") : []);
                n.Error("unit", $"'{unitText}' is not {UnknownUnitException.WithArticle(dimension)} unit; use {string.Join(", ", accepted)}.");
                ok = false;
            }
        }
        n.Allow("density");
        double? absAcc = null, relAcc = null;
        if (n.Has("accuracy"))
        {
            var text = n.Element.GetProperty("accuracy").ValueKind == JsonValueKind.String ? n.Element.GetProperty("accuracy").GetString()!.Trim() : null;
            if (text is not null && text.EndsWith('%')) relAcc = n.Fraction("accuracy", min: 0, max: 0.5);
            else if (dimension == Dimension.Temperature) absAcc = n.Quantity("accuracy", Dimension.TemperatureDifference, minSi: 0);
            else if (dimension == Dimension.MassFlow && ok) absAcc = n.Quantity("accuracy", Dimension.MassFlow, minSi: 0);
            else absAcc = n.Quantity("accuracy", dimension, minSi: 0);
        }
        else if (dimension == Dimension.Temperature) absAcc = 0.5;       // common practice: installed RTD/thermocouple ±0.5 K
        else if (dimension == Dimension.MassFlow) relAcc = 0.02;          // common practice: ±2 % of reading for process flow meters
        var min = defaultMin;
        var max = defaultMax;
        var rangeItems = n.Array("range");
        if (rangeItems.Count == 2 && ok)
        {
            var lo = n.ParseQuantity(rangeItems[0].Path, rangeItems[0].Element, dimension == Dimension.MassFlow && density is not null ? Dimension.VolumetricFlow : dimension);
            var hi = n.ParseQuantity(rangeItems[1].Path, rangeItems[1].Element, dimension == Dimension.MassFlow && density is not null ? Dimension.VolumetricFlow : dimension);
            if (lo is not null) min = lo.Value * (density ?? 1);
            if (hi is not null) max = hi.Value * (density ?? 1);
        }
        else if (rangeItems.Count != 0) n.Error("range", "must be a pair [low, high] with units, e.g. [\"0 t/h\", \"400 t/h\"].");
        n.Done();
        if (tag is null || !ok) return null;
        return new TagReference(tag, source, unit, density, absAcc, relAcc, min, max, n.Path);
    }
}
