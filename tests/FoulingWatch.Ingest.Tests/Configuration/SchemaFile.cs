using System.Text.Json.Nodes;
using JsonNode = System.Text.Json.Nodes.JsonNode;

namespace FoulingWatch.Ingest.Tests.Configuration;

/// <summary>The repository's files the schema tests read, and how they follow the schema's references.</summary>
internal static class SchemaFile
{
    public static string Repository()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
            if (File.Exists(Path.Combine(d.FullName, "FoulingWatch.sln"))) return d.FullName;
        throw new InvalidOperationException("FoulingWatch.sln not found above the test folder");
    }

    public static string Location => Path.Combine(Repository(), "schema", "plant.schema.json");

    /// <summary>Follows "#/$defs/…" references to the definition they name.</summary>
    public static JsonNode? Resolve(JsonNode root, JsonNode? node)
    {
        while (node?["$ref"] is JsonValue r && r.GetValue<string>() is { } target && target.StartsWith("#/$defs/", StringComparison.Ordinal))
            node = root["$defs"]![target["#/$defs/".Length..]];
        return node;
    }
}
