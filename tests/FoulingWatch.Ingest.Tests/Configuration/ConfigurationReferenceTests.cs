using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using JsonNode = System.Text.Json.Nodes.JsonNode;

namespace FoulingWatch.Ingest.Tests.Configuration;

/// <summary>docs/configuration.md is generated from the schema: every key with its meaning, unit and default. It is
/// rewritten with FOULINGWATCH_REGENERATE_DOCS=1; otherwise this test fails when it no longer matches the schema.</summary>
public class ConfigurationReferenceTests
{
    [Fact]
    public void The_configuration_reference_is_generated_from_the_schema()
    {
        var root = SchemaFile.Repository();
        var schema = JsonNode.Parse(File.ReadAllText(SchemaFile.Location))!;
        var expected = Generate(schema);
        var page = Path.Combine(root, "docs", "configuration.md");
        if (Environment.GetEnvironmentVariable("FOULINGWATCH_REGENERATE_DOCS") == "1")
        {
            Directory.CreateDirectory(Path.GetDirectoryName(page)!);
            File.WriteAllText(page, expected);
        }
        Assert.True(File.Exists(page), "docs/configuration.md is missing; write it with FOULINGWATCH_REGENERATE_DOCS=1");
        Assert.Equal(expected, File.ReadAllText(page));
        // the keys people asked about are explained there
        foreach (var key in new[] { "`tubeShare`", "`coefficients`", "`goodQuality`", "`tagColumn`", "`timeZone`" }) Assert.Contains(key, expected);
    }

    private const string Preface = """
        # Plant configuration reference

        Generated from `schema/plant.schema.json` by the test suite (`FOULINGWATCH_REGENERATE_DOCS=1 dotnet test
        tests/FoulingWatch.Ingest.Tests --filter ConfigurationReference` rewrites it). Every quantity is a text with its
        unit ("180 m2", "10 min", "0.0008 m2K/W", "88 %") or an object { "value": 180, "unit": "m2" }. Paths are relative
        to the configuration file. Comments and trailing commas are allowed. The annotated sample is
        `sample-data/plant.json`; every key, once, is in `tests/data/config/every-key.json`. A section named in
        parentheses, such as `(tag)` or `(stream)`, describes an object used in several places (each `exchangers[]`
        entry is an `(exchanger)`; its `hot` and `cold` are `(stream)`s; their `flow`, `inlet` and `outlet` are `(tag)`s).

        ## Time zones

        `site.timeZone` is an IANA zone name; it fixes both the offset and the daylight-saving rule. Common cases:

        | historian's local time | zone name |
        |---|---|
        | UTC, no daylight saving | `UTC` |
        | UTC+00:00, EU summer time (UK, Ireland, Portugal) | `Europe/London`, `Europe/Dublin`, `Europe/Lisbon` |
        | UTC+01:00, EU summer time (most of western and central Europe) | `Europe/Amsterdam`, `Europe/Berlin`, `Europe/Paris`, `Europe/Oslo` |
        | UTC+02:00, EU summer time | `Europe/Athens`, `Europe/Helsinki`, `Europe/Bucharest` |
        | UTC+03:00, no daylight saving | `Europe/Istanbul`, `Asia/Riyadh` |
        | UTC+04:00, no daylight saving | `Asia/Dubai` |
        | UTC+05:30, no daylight saving | `Asia/Kolkata` |
        | UTC+08:00, no daylight saving | `Asia/Singapore`, `Asia/Shanghai` |
        | UTC+09:00, no daylight saving | `Asia/Tokyo` |
        | UTC−05:00, US daylight saving | `America/New_York` |
        | UTC−06:00, US daylight saving | `America/Chicago` (Houston is in it) |
        | UTC−07:00, US daylight saving / none | `America/Denver` / `America/Phoenix` |
        | UTC−08:00, US daylight saving | `America/Los_Angeles` |
        | UTC−03:00, no daylight saving | `America/Sao_Paulo` |
        | UTC+10:00, Australian daylight saving / none | `Australia/Sydney` / `Australia/Brisbane` |

        A fixed offset without any daylight saving can also be written `Etc/GMT-1` for UTC+01:00 (the sign is inverted in
        these names).

        """;

    private static string Generate(JsonNode schema)
    {
        var sb = new StringBuilder(Preface.Replace("\r\n", "\n"));
        var sections = new List<(string Path, JsonObject Properties, string? Description)>();
        Collect(schema, schema, "", sections, 0);
        foreach (var (path, props, description) in sections)
        {
            sb.Append($"## `{(path.Length == 0 ? "(top level)" : path)}`\n\n");
            if (description is not null) sb.Append(description).Append("\n\n");
            sb.Append("| key | value | meaning, unit and default |\n|---|---|---|\n");
            foreach (var (name, child) in props)
            {
                var resolved = SchemaFile.Resolve(schema, child);
                sb.Append($"| `{name}` | {Kind(schema, child)} | {Cell(child?["description"]?.GetValue<string>() ?? resolved?["description"]?.GetValue<string>() ?? "")} |\n");
            }
            sb.Append('\n');
        }
        return sb.ToString();
    }

    private static string Cell(string text) => text.Replace("|", "\\|").Replace("\n", " ");

    private static string Kind(JsonNode root, JsonNode? node)
    {
        if (node?["$ref"] is JsonValue r) return r.GetValue<string>()["#/$defs/".Length..] switch
        {
            "quantity" => "quantity", "date" => "date", "money" => "amount", var other => $"see `({other})`",
        };
        if (node?["enum"] is JsonArray e) return string.Join(", ", e.Select(v => $"`{v!.ToJsonString()}`")).Replace("|", "\\|");
        if (node?["oneOf"] is JsonArray o) return string.Join(" or ", o.Select(a => Kind(root, a)));
        var type = node?["type"];
        if (type is JsonArray types) return string.Join(" or ", types.Select(t => t!.GetValue<string>()));
        if (type?.GetValue<string>() == "array") return $"list of {Kind(root, node!["items"])}";
        return type?.GetValue<string>() ?? "";
    }

    private static string? TypeOf(JsonNode? node) => node?["type"] is JsonValue v ? v.GetValue<string>() : null;

    private static JsonNode? AsObject(JsonNode root, JsonNode? node)
    {
        node = SchemaFile.Resolve(root, node);
        if (node?["properties"] is not null) return node;
        if (node?["oneOf"] is JsonArray a) return a.Select(x => SchemaFile.Resolve(root, x)).FirstOrDefault(x => x?["properties"] is not null && x["properties"]!["value"] is null);
        if (TypeOf(node) == "array") return AsObject(root, node!["items"]);
        return null;
    }

    private static void Collect(JsonNode root, JsonNode? node, string path, List<(string, JsonObject, string?)> sections, int depth)
    {
        var o = AsObject(root, node);
        if (o?["properties"] is not JsonObject props || depth > 8) return;
        if (sections.Any(s => s.Item1 == path)) return;
        sections.Add((path, props, depth == 0 ? null : o["description"]?.GetValue<string>()));
        foreach (var (name, child) in props)
        {
            if (child?["$ref"] is JsonValue r && r.GetValue<string>() == "#/$defs/quantity") continue;
            // a shared definition (tag, fluid, stream, …) is described once, under its own name
            var reference = (child?["$ref"] ?? child?["items"]?["$ref"]) is JsonValue d ? d.GetValue<string>()["#/$defs/".Length..] : null;
            if (reference is not null) { Collect(root, child, $"({reference})", sections, depth + 1); continue; }
            var isArray = TypeOf(SchemaFile.Resolve(root, child)) == "array";
            Collect(root, child, path.Length == 0 ? name + (isArray ? "[]" : "") : $"{path}.{name}{(isArray ? "[]" : "")}", sections, depth + 1);
        }
    }
}
