using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using FoulingWatch.Ingest.Configuration;
using Json.Schema;
using JsonNode = System.Text.Json.Nodes.JsonNode;

namespace FoulingWatch.Ingest.Tests.Configuration;

/// <summary>The JSON Schema (draft 2020-12) of the plant configuration against the reader and the repository's files.</summary>
public class PlantSchemaTests
{
    private static string SchemaPath => SchemaFile.Location;
    private static string EveryKey => Path.Combine(SchemaFile.Repository(), "tests", "data", "config", "every-key.json");
    private static string Sample => Path.Combine(SchemaFile.Repository(), "sample-data", "plant.json");

    private static readonly JsonDocumentOptions Relaxed = new() { CommentHandling = JsonCommentHandling.Skip, AllowTrailingCommas = true };

    private static JsonNode Parse(string file) => JsonNode.Parse(File.ReadAllText(file), documentOptions: Relaxed)!;

    private static EvaluationResults Validate(string file) =>
        JsonSchema.FromFile(SchemaPath).Evaluate(Parse(file), new EvaluationOptions { OutputFormat = OutputFormat.List });

    private static string Errors(EvaluationResults r) => string.Join("; ",
        (r.Details ?? []).Where(d => d.Errors is { Count: > 0 }).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}")));

    // The schema itself is valid draft 2020-12 (checked against the meta-schema the validator carries).
    [Fact]
    public void The_schema_is_a_valid_draft_2020_12_schema()
    {
        var meta = MetaSchemas.Draft202012.Evaluate(Parse(SchemaPath), new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(meta.IsValid, Errors(meta));
    }

    [Fact]
    public void The_sample_plant_and_the_every_key_example_are_valid_and_carry_the_schema()
    {
        foreach (var file in new[] { Sample, EveryKey })
        {
            var r = Validate(file);
            Assert.True(r.IsValid, $"{Path.GetFileName(file)}: {Errors(r)}");
            Assert.NotNull(Parse(file)["$schema"]);
        }
        PlantConfigurationReader.Load(EveryKey, requireFiles: false);
    }

    // The validator must be able to fail: an unknown key, a quantity without a number and a wrong enum are refused.
    [Fact]
    public void Mistakes_an_editor_should_flag_are_refused()
    {
        var node = Parse(Sample);
        node["exchangers"]![0]!["aera"] = "180 m2";
        node["exchangers"]![1]!["area"] = "large";
        node["exchangers"]![2]!["dutyBasis"] = "average";
        var r = JsonSchema.FromFile(SchemaPath).Evaluate(node, new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.False(r.IsValid);
        var errors = Errors(r);
        Assert.Contains("/exchangers/0", errors);
        Assert.Contains("/exchangers/1/area", errors);
        Assert.Contains("/exchangers/2/dutyBasis", errors);
    }

    // Same keys: every key the reader asks about (over the sample plant and the every-key example, which between them
    // take every branch) is a property of the schema at that place, and every property of the schema is a key the
    // reader asks about there. A key added to one but not the other fails here.
    [Fact]
    public void The_schema_and_the_reader_know_the_same_keys()
    {
        var read = PlantConfigurationReader.KeysRead(Sample);
        read.UnionWith(PlantConfigurationReader.KeysRead(EveryKey));
        var schema = Parse(SchemaPath);
        var missingInSchema = read.Where(k => !Properties(schema, k.Object).Contains(k.Key)).Select(k => $"{k.Object}.{k.Key}").ToList();
        Assert.True(missingInSchema.Count == 0, "keys the reader knows but the schema lacks: " + string.Join(", ", missingInSchema));
        var objects = read.Select(k => k.Object).Distinct().ToList();
        var missingInReader = objects.SelectMany(o => Properties(schema, o).Where(p => !read.Contains((o, p))).Select(p => $"{o}.{p}")).ToList();
        Assert.True(missingInReader.Count == 0, "keys the schema has but the reader never asks about: " + string.Join(", ", missingInReader));
        // every object the schema describes was visited, so the comparison above covered it
        var described = new List<string>();
        Walk(schema, schema, "", described, 0);
        var unvisited = described.Distinct().Where(o => !objects.Contains(o)).ToList();
        Assert.True(unvisited.Count == 0, "objects of the schema no configuration visited: " + string.Join(", ", unvisited));
    }

    /// <summary>The property names of the schema's object at a reader path such as "exchangers[].hot.flow".</summary>
    private static HashSet<string> Properties(JsonNode root, string path)
    {
        var node = ObjectSchema(root, SchemaFile.Resolve(root, root));
        foreach (var segment in path.Length == 0 ? [] : path.Split('.'))
        {
            var name = segment.TrimEnd('[', ']');
            node = ObjectSchema(root, SchemaFile.Resolve(root, node?["properties"]?[name]));
            for (var i = 0; i < (segment.Length - name.Length) / 2; i++) node = ObjectSchema(root, SchemaFile.Resolve(root, node?["items"]));
        }
        return node?["properties"] is JsonObject p ? p.Select(kv => kv.Key).ToHashSet() : [];
    }

    /// <summary>The alternative of a oneOf that describes an object, or the node itself.</summary>
    private static JsonNode? ObjectSchema(JsonNode root, JsonNode? node) =>
        node?["oneOf"] is JsonArray alternatives
            ? alternatives.Select(a => SchemaFile.Resolve(root, a)).FirstOrDefault(a => a?["properties"] is not null) ?? node
            : node;

    private static bool IsQuantity(JsonNode? node) =>
        node?["$ref"] is JsonValue r && r.GetValue<string>() == "#/$defs/quantity"
        || node?["oneOf"] is JsonArray a && a.Any(IsQuantity)
        || node?["items"] is { } items && IsQuantity(items);

    /// <summary>Every object path the schema describes, as the reader writes paths.</summary>
    private static void Walk(JsonNode root, JsonNode? node, string path, List<string> found, int depth)
    {
        node = ObjectSchema(root, SchemaFile.Resolve(root, node));
        if (node is null || depth > 8) return;
        if (node["properties"] is JsonObject props)
        {
            found.Add(path);
            foreach (var (name, child) in props)
            {
                if (IsQuantity(child) || IsQuantity(child?["items"])) continue; // a value, not an object of settings
                var c = ObjectSchema(root, SchemaFile.Resolve(root, child));
                var childPath = path.Length == 0 ? name : $"{path}.{name}";
                if (c?["properties"] is not null) Walk(root, c, childPath, found, depth + 1);
                else if (ObjectSchema(root, SchemaFile.Resolve(root, c?["items"])) is { } items && items["properties"] is not null)
                    Walk(root, items, childPath + "[]", found, depth + 1);
            }
        }
    }
}
