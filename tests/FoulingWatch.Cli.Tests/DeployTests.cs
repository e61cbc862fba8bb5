using FoulingWatch.Cli.Watch;
using FoulingWatch.Ingest.Configuration;
using Microsoft.Extensions.Configuration;

namespace FoulingWatch.Cli.Tests;

/// <summary>The files in deploy/ agree with what the program reads.</summary>
public class DeployTests
{
    private static string Deploy()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
            if (File.Exists(Path.Combine(d.FullName, "deploy", "foulingwatch.service"))) return Path.Combine(d.FullName, "deploy");
        throw new InvalidOperationException("deploy/foulingwatch.service not found above the test folder");
    }

    // The example environment file, read as systemd passes it (KEY=value lines) through the host's environment-variable
    // provider with the FOULINGWATCH_ prefix, must set every watch path, each absolute (relative paths would resolve
    // beside the plant file under /etc).
    [Fact]
    public void The_example_environment_file_sets_every_watch_path_absolutely()
    {
        var lines = File.ReadAllLines(Path.Combine(Deploy(), "foulingwatch.env"))
            .Where(l => l.Length > 0 && !l.StartsWith('#')).Select(l => l.Split('=', 2)).ToDictionary(p => p[0], p => p[1]);
        var environment = new ConfigurationBuilder().AddInMemoryCollection(lines
            .Where(kv => kv.Key.StartsWith("FOULINGWATCH_", StringComparison.Ordinal))
            .Select(kv => new KeyValuePair<string, string?>(kv.Key["FOULINGWATCH_".Length..].Replace("__", ":"), kv.Value))).Build();
        var config = PlantConfigurationReader.Load(Path.Combine(SamplePlantCopy.FindSampleData(), "plant.json"), requireFiles: false);
        var s = WatchCommand.Settings(config, environment, null, null, null, null);
        Assert.Equal("/var/lib/foulingwatch/drop", s.DropFolder);
        Assert.Equal("/var/lib/foulingwatch/state/foulingwatch.db", s.Store);
        Assert.Equal("/var/lib/foulingwatch/results", s.Out);
        Assert.Equal("/var/log/foulingwatch", s.Log);
        Assert.Equal(TimeSpan.FromSeconds(30), s.PollInterval);
        Assert.Equal("information", s.LogLevel);
        // the command line wins over the environment
        Assert.Equal("warning", WatchCommand.Settings(config, environment, null, null, null, null, "warning").LogLevel);
    }

    // The unit starts the installed tool's watch command with the environment file above, and its writable paths cover
    // every folder that file names.
    [Fact]
    public void The_unit_runs_the_watch_command_with_that_environment_and_may_write_its_folders()
    {
        var unit = File.ReadAllLines(Path.Combine(Deploy(), "foulingwatch.service"));
        string Value(string key) => Assert.Single(unit, l => l.StartsWith(key + "=", StringComparison.Ordinal))[(key.Length + 1)..];
        Assert.Equal("/etc/foulingwatch/foulingwatch.env", Value("EnvironmentFile"));
        Assert.StartsWith("/opt/foulingwatch/foulingwatch watch --config /", Value("ExecStart"));
        var writable = Value("ReadWritePaths").Split(' ');
        foreach (var line in File.ReadAllLines(Path.Combine(Deploy(), "foulingwatch.env")).Where(l => l.StartsWith("FOULINGWATCH_WATCH__", StringComparison.Ordinal)))
        {
            var path = line.Split('=', 2)[1];
            if (!path.StartsWith('/')) continue;
            Assert.Contains(writable, w => path.StartsWith(w, StringComparison.Ordinal));
        }
    }
}
