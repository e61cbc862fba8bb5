namespace FoulingWatch.Ingest.Tests;

/// <summary>Small invented plants (fictional site "Kestrel Bay") written to a temporary folder with their data files.</summary>
public sealed class TestPlant : IDisposable
{
    public TestPlant()
    {
        Directory = Path.Combine(Path.GetTempPath(), "fw-tests", Guid.NewGuid().ToString("N"));
        System.IO.Directory.CreateDirectory(Directory);
    }

    public string Directory { get; }
    public string ConfigPath => Path.Combine(Directory, "plant.json");

    public static string Fixture(string name) => Path.Combine(AppContext.BaseDirectory, "data", "historian", name);

    public TestPlant WithFixture(string name)
    {
        File.Copy(Fixture(name), Path.Combine(Directory, name), overwrite: true);
        return this;
    }

    public TestPlant WithFile(string name, string content)
    {
        File.WriteAllText(Path.Combine(Directory, name), content);
        return this;
    }

    /// <summary>A crude/product interchanger on tags FI-101, TI-101, TI-102 (hot, shell) and FI-201, TI-201, TI-202 (cold, tube).</summary>
    public static string Interchanger(string id = "E-101", string flowUnit = "t/h", string extra = "") => $$"""
        {
          "id": "{{id}}",
          "service": "crude vs. product interchanger",
          "arrangement": { "type": "shell-and-tube", "shells": 1, "tubePasses": 2 },
          "area": "250 m2",
          "hot": {
            "side": "shell",
            "fluid": { "model": "petroleum", "api": 32, "watsonK": 11.9 },
            "flow": { "tag": "FI-101", "unit": "{{flowUnit}}" },
            "inlet": { "tag": "TI-101", "unit": "degC" },
            "outlet": { "tag": "TI-102", "unit": "degC" },
            "designFlow": "120 t/h"
          },
          "cold": {
            "side": "tube",
            "fluid": { "model": "constant-cp", "cp": "2.1 kJ/kgK" },
            "flow": { "tag": "FI-201", "unit": "t/h" },
            "inlet": { "tag": "TI-201", "unit": "degC" },
            "outlet": { "tag": "TI-202", "unit": "degC" },
            "designFlow": "90 t/h"
          },
          "clean": { "method": "datasheet", "u": "450 W/m2K" }{{extra}}
        }
        """;

    public TestPlant WithConfig(string sourceJson, string? exchangers = null, string timeZone = "UTC", string data = "\"interval\": \"10 min\"")
    {
        var json = $$"""
            // invented test plant
            {
              "site": { "name": "Kestrel Bay (fictional)", "timeZone": "{{timeZone}}" },
              "data": { {{data}}, "sources": [ {{sourceJson}} ] },
              "exchangers": [ {{exchangers ?? Interchanger()}} ],
            }
            """;
        File.WriteAllText(ConfigPath, json);
        return this;
    }

    public void Dispose()
    {
        try { System.IO.Directory.Delete(Directory, recursive: true); } catch (IOException) { }
    }
}
