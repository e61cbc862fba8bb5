using System.Globalization;
using System.Text;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Cli;

/// <summary>
/// <c>foulingwatch init</c>: writes a starter plant configuration from the tags of historian exports. Tags are sorted
/// into flows and temperatures by their names (F…/T… instrument letters, or the words flow/temp) and units taken from a
/// unit row or guessed from values; a flow followed by two temperatures is taken as a stream, two streams as an
/// exchanger, the hotter one as hot. Every guess is marked "CHECK" for the user to confirm.
/// </summary>
public static class InitCommand
{
    private enum Role { Flow, Temperature, Pressure, Other }

    private sealed record TagInfo(string Tag, Role Role, string Unit, bool UnitGuessed, double Mean, double Min, double Max);

    public static int Run(IReadOnlyList<string> dataFiles, string outPath, TextWriter output, TextWriter error)
    {
        if (dataFiles.Count == 0) { error.WriteLine("init needs at least one export: foulingwatch init --data export.csv"); return FoulingWatchCommand.UsageOrConfigurationError; }
        foreach (var f in dataFiles)
            if (!File.Exists(f)) { error.WriteLine($"'{f}' does not exist; give the path of a historian CSV export."); return FoulingWatchCommand.UsageOrConfigurationError; }
        if (File.Exists(outPath)) { error.WriteLine($"'{outPath}' exists already; choose another --out or delete it (init never overwrites a configuration)."); return FoulingWatchCommand.UsageOrConfigurationError; }

        var source = new HistorianSource("historian", "data.sources[0]", ["*"], dataFiles, HistorianLayout.Wide, null, null, null, null, null,
            new TimestampSettings(null, null, false), [], "Tag", "Value", null, []);
        var dialect = FileDialectDetector.Detect(dataFiles[0], source);
        var tsColumn = FileDialectDetector.TimestampColumnIndex(dialect.Header, source);
        var rows = SampleRows(dataFiles[0], dialect, 2000);
        var unitRow = dialect.MetadataRows > 0 ? rows.FirstOrDefault() : null;
        var data = rows.Skip(dialect.MetadataRows).ToList();
        var firstTimestamp = data.Count > 0 && tsColumn >= 0 && tsColumn < data[0].Count ? data[0][tsColumn] : "";
        var isoTimes = TimestampParser.LooksLikeTimestamp(firstTimestamp, new TimestampSettings(null, null, false));
        string[] usualFormats = ["dd.MM.yyyy HH:mm", "dd.MM.yyyy HH:mm:ss", "dd/MM/yyyy HH:mm", "dd/MM/yyyy HH:mm:ss", "MM/dd/yyyy HH:mm", "MM/dd/yyyy HH:mm:ss", "M/d/yyyy h:mm:ss tt", "yyyyMMdd HHmmss"];
        var stamps = data.Take(300).Select(r => tsColumn >= 0 && tsColumn < r.Count ? r[tsColumn] : "").ToList();
        var formats = isoTimes ? [] : usualFormats.Where(f => stamps.All(t => TimestampParser.LooksLikeTimestamp(t, new TimestampSettings(null, f, false)))).ToList();
        var formatText = isoTimes ? "" : formats.Count > 0 ? $", \"format\": {Json(formats[0])}" : ", \"format\": \"dd.MM.yyyy HH:mm\"";
        var formatNote = isoTimes ? "" : formats.Count == 1 ? "   // CHECK: format recognised from the data" : formats.Count > 1 ? $"   // CHECK: the data fit {string.Join(" and ", formats.Select(Json))}; choose" : "   // CHECK: timestamps are not ISO 8601 nor a usual format; give their format";

        var tags = new List<TagInfo>();
        // A long export (one row per tag and time): its tag and value columns, read further so that an export sorted
        // by tag shows every tag.
        var (tagColumn, valueColumn, qualityColumn) = (Find(dialect.Header, TagColumnNames), Find(dialect.Header, ValueColumnNames), Find(dialect.Header, QualityColumnNames));
        var isLong = tagColumn >= 0 && valueColumn >= 0 && tsColumn >= 0;
        var qualities = new Dictionary<string, int>(StringComparer.Ordinal);
        if (isLong)
        {
            var byTag = new Dictionary<string, List<double>>(StringComparer.Ordinal);
            var order = new List<string>();
            foreach (var r in SampleRows(dataFiles[0], dialect, 200_000))
            {
                if (qualityColumn >= 0 && qualityColumn < r.Count && qualities.Count < 50)
                    qualities[r[qualityColumn].Trim()] = qualities.GetValueOrDefault(r[qualityColumn].Trim()) + 1;
                if (tagColumn >= r.Count || valueColumn >= r.Count) continue;
                var name = r[tagColumn].Trim();
                if (name.Length == 0) continue;
                if (!byTag.TryGetValue(name, out var list)) { byTag[name] = list = []; order.Add(name); }
                if (list.Count < 300 && Parse(r[valueColumn], dialect.DecimalSeparator) is var v && double.IsFinite(v)) list.Add(v);
            }
            foreach (var name in order) tags.Add(Info(name, "", byTag[name]));
        }
        else
            for (var i = 0; i < dialect.Header.Count; i++)
            {
                if (i == tsColumn) continue;
                var values = data.Select(r => i < r.Count ? Parse(r[i], dialect.DecimalSeparator) : double.NaN).Where(double.IsFinite).ToList();
                tags.Add(Info(dialect.Header[i], unitRow is not null && i < unitRow.Count ? unitRow[i].Trim() : "", values));
            }

        var streams = new List<(TagInfo Flow, TagInfo A, TagInfo B)>();
        // A flow's two temperatures: the two tags whose names place them on the same stream (same parts once the
        // instrument code is taken out), else the two temperatures after it in the header, before the next flow.
        var placed = new HashSet<TagInfo>();
        for (var i = 0; i < tags.Count; i++)
        {
            if (tags[i].Role != Role.Flow) continue;
            var key = StreamKey(tags[i].Tag);
            var sameStream = tags.Where(t => t.Role == Role.Temperature && !placed.Contains(t) && StreamKey(t.Tag) == key).ToList();
            var temps = sameStream.Count == 2 ? sameStream
                : tags.Skip(i + 1).TakeWhile(t => t.Role != Role.Flow).Where(t => t.Role == Role.Temperature && !placed.Contains(t)).Take(2).ToList();
            if (temps.Count != 2) continue;
            streams.Add((tags[i], temps[0], temps[1]));
            placed.UnionWith([tags[i], temps[0], temps[1]]);
        }
        var sb = new StringBuilder();
        sb.AppendLine("// Starter configuration written by 'foulingwatch init'. Lines marked CHECK are guesses: confirm or correct them,");
        sb.AppendLine("// then run 'foulingwatch check --config <this file>'. Every number carries its unit.");
        sb.AppendLine("{");
        // The schema shipped with the tool: editors complete and check the keys while the file is edited.
        var schema = Path.Combine(AppContext.BaseDirectory, "schema", "plant.schema.json");
        if (File.Exists(schema)) sb.AppendLine($"  \"$schema\": {Json(new Uri(schema).AbsoluteUri)},");
        sb.AppendLine("  \"site\": { \"name\": \"my site\", \"timeZone\": \"UTC\" },   // CHECK: IANA zone of the historian's local times");
        sb.AppendLine("  \"data\": {");
        sb.AppendLine("    \"interval\": \"10 min\",");
        sb.AppendLine("    \"sources\": [ {");
        sb.AppendLine($"      \"files\": [{string.Join(", ", dataFiles.Select(f => Json(Path.GetRelativePath(Path.GetDirectoryName(Path.GetFullPath(outPath))!, Path.GetFullPath(f)))))}],");
        if (isLong)
        {
            sb.AppendLine($"      \"layout\": \"long\", \"tagColumn\": {Json(dialect.Header[tagColumn])}, \"valueColumn\": {Json(dialect.Header[valueColumn])},   // CHECK: one row per tag and time");
            if (qualityColumn >= 0)
            {
                // the texts seen, and as good those the reader takes as good by default (Good, G, 192, 0, OK)
                string[] usual = ["Good", "G", "192", "0", "OK"];
                var good = qualities.Keys.Where(q => usual.Contains(q, StringComparer.OrdinalIgnoreCase)).ToList();
                var seen = string.Join(", ", qualities.OrderByDescending(q => q.Value).Take(6).Select(q => $"{q.Key} {q.Value}"));
                sb.AppendLine($"      \"qualityColumn\": {Json(dialect.Header[qualityColumn])}, \"goodQuality\": [{string.Join(", ", good.Select(Json))}],   " +
                    $"// CHECK: quality texts seen: {seen}; rows with any other text are counted as bad-quality");
            }
        }
        sb.AppendLine($"      \"timestamp\": {{ \"column\": {Json(tsColumn >= 0 ? dialect.Header[tsColumn] : "Timestamp")}{formatText} }}{formatNote}");
        sb.AppendLine("    } ]");
        sb.AppendLine("  },");
        sb.AppendLine("  \"exchangers\": [");
        var exchangers = new List<string>();
        for (var k = 0; k + 1 < streams.Count; k += 2)
        {
            var s1 = streams[k];
            var s2 = streams[k + 1];
            var hotFirst = s1.A.Mean + s1.B.Mean >= s2.A.Mean + s2.B.Mean;
            var (hot, cold) = hotFirst ? (s1, s2) : (s2, s1);
            var x = new StringBuilder();
            x.AppendLine("    {");
            x.AppendLine($"      \"id\": \"E-{k / 2 + 1}\",   // CHECK: grouped from tags {hot.Flow.Tag} … {cold.B.Tag}");
            x.AppendLine("      \"service\": \"\",");
            x.AppendLine("      \"arrangement\": { \"type\": \"shell-and-tube\", \"shells\": 1, \"tubePasses\": 2 },   // CHECK: from the datasheet");
            x.AppendLine("      \"area\": \"100 m2\",   // CHECK: from the datasheet");
            x.Append(Stream("hot", "shell", hot, inletIsHigher: true));
            x.Append(Stream("cold", "tube", cold, inletIsHigher: false));
            x.AppendLine("      \"clean\": { \"method\": \"baseline\", \"duration\": \"14 d\" },   // CHECK: or { \"method\": \"datasheet\", \"u\": \"… W/m2K\" } with designFlow on both streams");
            x.Append("      \"maintenance\": []   // add { \"date\": \"YYYY-MM-DD\", \"action\": \"cleaned\" } for past cleanings\n");
            x.Append("    }");
            exchangers.Add(x.ToString());
        }
        sb.AppendLine(string.Join(",\n", exchangers));
        sb.AppendLine("  ]");
        var unused = tags.Where(t => !streams.Take(streams.Count / 2 * 2).Any(s => s.Flow == t || s.A == t || s.B == t)).Select(t => t.Tag).ToList();
        if (unused.Count > 0) sb.AppendLine($"  // tags not placed in an exchanger: {string.Join(", ", unused)}");
        sb.AppendLine("}");
        File.WriteAllText(outPath, sb.ToString());
        output.WriteLine($"Wrote {outPath}: {exchangers.Count} candidate exchanger(s) from {tags.Count} tags; {unused.Count} tag(s) left for you to place. Confirm every line marked CHECK.");
        return FoulingWatchCommand.Success;
    }

    private static string Stream(string name, string side, (TagInfo Flow, TagInfo A, TagInfo B) s, bool inletIsHigher)
    {
        var (inlet, outlet) = (s.A.Mean >= s.B.Mean) == inletIsHigher ? (s.A, s.B) : (s.B, s.A);
        string Tag(TagInfo t) => $"{{ \"tag\": {Json(t.Tag)}, \"unit\": {Json(t.Unit)} }}";
        string Note(TagInfo t) => t.UnitGuessed ? $"   // CHECK: unit guessed from values {t.Min.ToString("0.#", CultureInfo.InvariantCulture)}…{t.Max.ToString("0.#", CultureInfo.InvariantCulture)}" : "";
        var sb = new StringBuilder();
        sb.AppendLine($"      \"{name}\": {{");
        sb.AppendLine($"        \"side\": \"{side}\",   // CHECK: tube or shell");
        sb.AppendLine(FluidGuess(s));
        sb.AppendLine($"        \"flow\": {Tag(s.Flow)},{Note(s.Flow)}");
        var inletNote = $"inlet taken as the {(inletIsHigher ? "hotter" : "colder")} of the two" + (inlet.UnitGuessed ? $"; unit guessed from values {inlet.Min.ToString("0.#", CultureInfo.InvariantCulture)}…{inlet.Max.ToString("0.#", CultureInfo.InvariantCulture)}" : "");
        sb.AppendLine($"        \"inlet\": {Tag(inlet)},   // CHECK: {inletNote}");
        sb.AppendLine($"        \"outlet\": {Tag(outlet)}{Note(outlet)}");
        sb.AppendLine("      },");
        return sb.ToString();
    }

    private static string Json(string s) => System.Text.Json.JsonSerializer.Serialize(s);

    private static readonly string[] TagColumnNames = ["tag", "tagname", "tag name", "tag_name", "point", "pointname", "point name", "signal", "name"];
    private static readonly string[] ValueColumnNames = ["value", "val", "reading"];
    private static readonly string[] QualityColumnNames = ["quality", "status", "q"];

    private static int Find(IReadOnlyList<string> header, string[] names)
    {
        foreach (var n in names)
            for (var i = 0; i < header.Count; i++)
                if (string.Equals(header[i].Trim(), n, StringComparison.OrdinalIgnoreCase)) return i;
        return -1;
    }

    private static TagInfo Info(string name, string statedUnit, List<double> values)
    {
        var role = RoleOf(name);
        var (unit, guessed) = UnitOf(role, statedUnit, values);
        return new TagInfo(name, role, unit, guessed, values.Count > 0 ? values.Average() : double.NaN,
            values.Count > 0 ? values.Min() : double.NaN, values.Count > 0 ? values.Max() : double.NaN);
    }

    /// <summary>The fluid line of a stream: water when its tags name cooling water or its temperatures stay within
    /// 5–50 °C (where a cooling-water circuit runs; common practice), else a constant cp to be replaced.</summary>
    private static string FluidGuess((TagInfo Flow, TagInfo A, TagInfo B) s)
    {
        var names = new[] { s.Flow.Tag, s.A.Tag, s.B.Tag }.SelectMany(Tokens).ToList();
        var named = names.Any(t => t is "CW" or "CWS" or "CWR" || t.Contains("WATER") || t.Contains("COOLING"));
        var celsius = s.A.Unit == "degC" && s.B.Unit == "degC";
        var mild = celsius && Math.Min(s.A.Min, s.B.Min) >= 5 && Math.Max(s.A.Max, s.B.Max) <= 50;
        if (named || mild)
            return FormattableString.Invariant($"        \"fluid\": {{ \"model\": \"water\" }},   // CHECK: guessed water from {(named ? "the tag names" : $"temperatures {Math.Min(s.A.Min, s.B.Min):0.#}…{Math.Max(s.A.Max, s.B.Max):0.#} °C")}");
        return "        \"fluid\": { \"model\": \"constant-cp\", \"cp\": \"2.2 kJ/kgK\" },   // CHECK: water, petroleum (api, watsonK), constant-cp, …";
    }

    private static readonly string[] Suffixes = ["PV", "SP", "OP", "MV", "CV", "VAL", "AVG", "VALUE"];

    /// <summary>The parts of a tag name: split at _ : . - / and spaces, upper case.</summary>
    private static string[] Tokens(string tag) =>
        System.Text.RegularExpressions.Regex.Split(tag.Trim().ToUpperInvariant(), "[_:.\\-/ ]+").Where(t => t.Length > 0).ToArray();

    /// <summary>The role of one part of a tag name, by the words flow/temp/press or an instrument code whose first letter
    /// is the measured variable and whose next letters are functions (ISA-5.1 style: FI, FT, FIC, TI, TT, TIN, PI, PDT…).</summary>
    private static Role? TokenRole(string t)
    {
        if (Suffixes.Contains(t) || t.All(char.IsDigit)) return null;
        if (t.Contains("FLOW")) return Role.Flow;
        if (t.Contains("TEMP")) return Role.Temperature;
        if (t.Contains("PRESS")) return Role.Pressure;
        if (System.Text.RegularExpressions.Regex.IsMatch(t, "^F[ICTREQYA]{1,3}\\d*$")) return Role.Flow;
        if (System.Text.RegularExpressions.Regex.IsMatch(t, "^T(IN|OUT|[ICTREQA]{1,3})\\d*$")) return Role.Temperature;
        if (System.Text.RegularExpressions.Regex.IsMatch(t, "^P[DICTRE]{1,3}\\d*$")) return Role.Pressure;
        return null;
    }

    /// <summary>Flow, temperature or pressure from the tag's name: the first part that names one (so "E101_FI_105",
    /// "U7:FI7301.PV" and "E-102.TUBE.TIN" are read by their instrument part), else the name's first letter.</summary>
    private static Role RoleOf(string tag)
    {
        foreach (var token in Tokens(tag))
            if (TokenRole(token) is { } r) return r;
        var t = tag.Trim().ToUpperInvariant();
        if (t.StartsWith('F')) return Role.Flow;
        if (t.StartsWith('T')) return Role.Temperature;
        if (t.StartsWith('P')) return Role.Pressure;
        return Role.Other;
    }

    /// <summary>What a tag says about where it sits: its parts less the instrument code, loop numbers and value suffixes
    /// ("E-102.TUBE.TIN" → "E-102.TUBE" style key "E.102.TUBE").</summary>
    private static string StreamKey(string tag) =>
        string.Join('.', Tokens(tag).Where(t => TokenRole(t) is null && !Suffixes.Contains(t) && !t.All(char.IsDigit)));

    private static (string Unit, bool Guessed) UnitOf(Role role, string stated, List<double> values)
    {
        var dimension = role switch
        {
            Role.Flow => Core.Units.Dimension.MassFlow,
            Role.Temperature => Core.Units.Dimension.Temperature,
            Role.Pressure => Core.Units.Dimension.Pressure,
            _ => (Core.Units.Dimension?)null,
        };
        if (dimension is { } d && stated.Length > 0 && Core.Units.UnitCatalog.TryResolve(stated, d, out var u)) return (u.Symbol, false);
        var max = values.Count > 0 ? values.Max() : 0;
        return role switch
        {
            Role.Temperature => (max > 450 ? "degF" : "degC", true),
            Role.Flow => ("t/h", true),
            Role.Pressure => ("barg", true),
            _ => ("", true),
        };
    }

    private static double Parse(string text, char decimalSeparator) =>
        double.TryParse(decimalSeparator == ',' ? text.Replace(',', '.') : text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) ? v : double.NaN;

    private static List<List<string>> SampleRows(string file, FileDialect dialect, int count)
    {
        using var stream = ExportStream.OpenAt(file, dialect.HeaderByteOffset);
        using var reader = new StreamReader(stream, dialect.Encoding);
        reader.ReadLine(); // header
        var rows = new List<List<string>>();
        string? line;
        while (rows.Count < count && (line = reader.ReadLine()) is not null)
            if (line.Length > 0) rows.Add(FileDialectDetector.SplitLine(line, dialect.Delimiter));
        return rows;
    }
}
