using FoulingWatch.Ingest.Configuration;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Serilog;

namespace FoulingWatch.Cli.Watch;

/// <summary>The long-running service on the .NET generic host: polls the drop folder until Ctrl-C, SIGTERM or a service stop.</summary>
public sealed class WatchService(PlantConfiguration config, WatchSettings settings, TimeProvider clock, ILogger<WatchService> log) : BackgroundService
{
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var store = new WatchStore(settings.Store);
        log.LogInformation("Watching {DropFolder} for {Site}; store {Store} (schema {Schema}); results in {Out}", settings.DropFolder, config.Site.Name, settings.Store, store.SchemaVersion, settings.Out);
        var loop = new WatchLoop(config, settings, store, clock, log);
        while (!stoppingToken.IsCancellationRequested)
        {
            try { loop.Poll(); }
            catch (Exception ex) when (ex is not OperationCanceledException)
            {
                // One bad pass is logged and counted; only cancellation ends the service.
                log.LogError(ex, "The watch pass failed; trying again in {Interval}", settings.PollInterval);
            }
            try { await Task.Delay(settings.PollInterval, clock, stoppingToken); }
            catch (OperationCanceledException) { break; }
        }
        log.LogInformation("Stopped watching {DropFolder}", settings.DropFolder);
    }
}

public static class WatchCommand
{
    /// <summary>Watch settings from the plant file, overridden by environment variables (FOULINGWATCH_WATCH__DROPFOLDER, __STORE, __OUT, __LOG, __POLLSECONDS) and then by command-line options.</summary>
    public static WatchSettings Settings(PlantConfiguration config, IConfiguration environment, string? drop, string? storePath, string? outDir, TimeSpan? poll,
        string? logLevel = null)
    {
        var w = config.Watch;
        var section = environment.GetSection("WATCH");
        string Pick(string? option, string key, string current) =>
            option is not null ? Path.GetFullPath(option) : section[key] is { Length: > 0 } fromEnvironment ? Path.GetFullPath(fromEnvironment) : current;
        return w with
        {
            DropFolder = Pick(drop, "DROPFOLDER", w.DropFolder),
            Store = Pick(storePath, "STORE", w.Store),
            Out = Pick(outDir, "OUT", w.Out),
            Log = Pick(null, "LOG", w.Log),
            PollInterval = poll ?? (double.TryParse(section["POLLSECONDS"], System.Globalization.CultureInfo.InvariantCulture, out var s) ? TimeSpan.FromSeconds(s) : w.PollInterval),
            LogLevel = logLevel ?? (section["LOGLEVEL"] is { Length: > 0 } fromEnvironment && WatchSettings.LogLevels.Contains(fromEnvironment.ToLowerInvariant())
                ? fromEnvironment.ToLowerInvariant() : w.LogLevel),
        };
    }

    public static int Run(string configPath, string? drop, string? storePath, string? outDir, TimeSpan? poll, TextWriter error,
        string? logLevel = null)
    {
        var config = PlantConfigurationReader.Load(configPath, requireFiles: false);
        var builder = Host.CreateApplicationBuilder();
        builder.Configuration.AddEnvironmentVariables("FOULINGWATCH_");
        var settings = Settings(config, builder.Configuration, drop, storePath, outDir, poll, logLevel);
        Directory.CreateDirectory(settings.Log);
        Log.Logger = new LoggerConfiguration()
            .MinimumLevel.Is(Enum.Parse<Serilog.Events.LogEventLevel>(settings.LogLevel, ignoreCase: true))
            .Enrich.FromLogContext()
            .WriteTo.Console(standardErrorFromLevel: Serilog.Events.LogEventLevel.Verbose)
            .WriteTo.File(Path.Combine(settings.Log, "foulingwatch-.log"), rollingInterval: RollingInterval.Day, retainedFileCountLimit: 31)
            .CreateLogger();
        try
        {
            builder.Services.AddSerilog();
            builder.Services.AddSystemd();
            builder.Services.AddWindowsService(o => o.ServiceName = "FoulingWatch");
            builder.Services.AddSingleton(config);
            builder.Services.AddSingleton(settings);
            builder.Services.AddSingleton(TimeProvider.System);
            builder.Services.AddHostedService<WatchService>();
            using var host = builder.Build();
            host.Run();
            return FoulingWatchCommand.Success;
        }
        finally
        {
            Log.CloseAndFlush();
        }
    }

    /// <summary><c>foulingwatch status</c>: what the store holds, the active alerts and the last analysis.</summary>
    public static int Status(string configPath, string? storePath, TextWriter output, TextWriter error)
    {
        var config = PlantConfigurationReader.Load(configPath, requireFiles: false);
        var path = storePath is null ? config.Watch.Store : Path.GetFullPath(storePath);
        if (!File.Exists(path)) { error.WriteLine($"no store at {path}; has 'foulingwatch watch' run with this configuration?"); return FoulingWatchCommand.UsageOrConfigurationError; }
        using var store = new WatchStore(path);
        var files = store.Files();
        output.WriteLine($"Store {path} (schema {store.SchemaVersion}): {files.Count(f => f.Error is null)} files ingested, {files.Count(f => f.Error is not null)} refused, {store.ValueCount():N0} values.");
        if (store.LastTimestamp() is { } t) output.WriteLine($"Latest data: {new DateTimeOffset(t, TimeSpan.Zero):yyyy-MM-dd HH:mm} UTC.");
        if (store.LastAnalysis() is { } a) output.WriteLine($"Last analysis: {a.At:yyyy-MM-dd HH:mm:ss} UTC.");
        foreach (var f in files.Where(f => f.Error is not null)) output.WriteLine($"  refused {f.Name}: {f.Error}");
        var alerts = store.Alerts(activeOnly: true);
        output.WriteLine(alerts.Count == 0 ? "No active alerts." : $"{alerts.Count} active alert(s):");
        foreach (var al in alerts) output.WriteLine($"  {al.RaisedAt:yyyy-MM-dd HH:mm} {al.Exchanger} {al.Kind}: {al.Message}");
        return FoulingWatchCommand.Success;
    }
}
