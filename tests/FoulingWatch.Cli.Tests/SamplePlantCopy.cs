namespace FoulingWatch.Cli.Tests;

/// <summary>The bundled Kestrel Bay sample plant (invented), copied to a temporary folder with an optional analysis window.</summary>
public sealed class SamplePlantCopy : IDisposable
{
    public SamplePlantCopy(string? windowStart = "2025-12-01T00:00:00Z", string? windowEnd = "2025-12-21T00:00:00Z")
    {
        Directory = Path.Combine(Path.GetTempPath(), "fw-cli-tests", Guid.NewGuid().ToString("N"));
        System.IO.Directory.CreateDirectory(Directory);
        var source = FindSampleData();
        foreach (var f in System.IO.Directory.GetFiles(source)) File.Copy(f, Path.Combine(Directory, Path.GetFileName(f)));
        if (windowStart is not null)
        {
            var text = File.ReadAllText(ConfigPath).Replace("\"interval\": \"10 min\",",
                $"\"interval\": \"10 min\", \"window\": {{ \"start\": \"{windowStart}\", \"end\": \"{windowEnd}\" }},");
            File.WriteAllText(ConfigPath, text);
        }
    }

    public string Directory { get; }
    public string ConfigPath => Path.Combine(Directory, "plant.json");
    public string Out(string name) => Path.Combine(Directory, name);

    public static string FindSampleData()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
            // the repository's copy (beside the solution), not the one the tool carries into bin folders
            if (File.Exists(Path.Combine(d.FullName, "sample-data", "plant.json")) && File.Exists(Path.Combine(d.FullName, "FoulingWatch.sln")))
                return Path.Combine(d.FullName, "sample-data");
        throw new InvalidOperationException("sample-data/plant.json not found beside FoulingWatch.sln above the test folder");
    }

    public static (int Code, string Output, string Error) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        var code = FoulingWatchCommand.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    public void Dispose()
    {
        try { System.IO.Directory.Delete(Directory, recursive: true); } catch (IOException) { }
    }
}
