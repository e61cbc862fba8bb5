using System.CommandLine;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Cli;

/// <summary>The <c>foulingwatch</c> command line: builds the command tree and maps outcomes to exit codes (0 ok, 1 usage or configuration, 2 data).</summary>
public static class FoulingWatchCommand
{
    public const int Success = 0;
    public const int UsageOrConfigurationError = 1;
    public const int DataError = 2;

    public static int Run(string[] args, TextWriter output, TextWriter error)
    {
        var root = new RootCommand("FoulingWatch: fouling monitoring of operating heat exchangers from historian exports.");

        var configOption = new Option<FileInfo>("--config", "-c") { Description = "The plant configuration (JSON).", Required = true };
        var jsonOption = new Option<bool>("--json") { Description = "Write machine-readable JSON to standard output instead of tables." };
        var verboseOption = new Option<bool>("--verbose") { Description = $"Print the details of an unexpected error (as {VerboseVariable}=1); for watch, log at debug level unless --log-level is given.", Recursive = true };
        root.Options.Add(verboseOption);

        var check = new Command("check", "Validate the configuration and the data and show the quality ledger, without analysing.");
        check.Options.Add(configOption);
        check.Options.Add(jsonOption);
        check.SetAction(p => Guard(error, () => CheckCommand.Run(p.GetValue(configOption)!.FullName, p.GetValue(jsonOption), output, error)));
        root.Subcommands.Add(check);

        var dataOption = new Option<FileInfo[]>("--data", "-d") { Description = "Historian CSV export(s) to take the tags from.", Required = true, AllowMultipleArgumentsPerToken = true };
        var initOut = new Option<FileInfo>("--out", "-o") { Description = "Where to write the starter configuration.", DefaultValueFactory = _ => new FileInfo("plant.json") };
        var init = new Command("init", "Write a starter plant configuration from the tags found in historian exports; every guess is marked CHECK.");
        init.Options.Add(dataOption);
        init.Options.Add(initOut);
        init.SetAction(p => Guard(error, () => InitCommand.Run(p.GetValue(dataOption)!.Select(f => f.FullName).ToList(), p.GetValue(initOut)!.FullName, output, error)));
        root.Subcommands.Add(init);

        var outOption = new Option<DirectoryInfo>("--out", "-o") { Description = "Folder for the results (created if needed).", Required = true };
        var quietOption = new Option<bool>("--quiet", "-q") { Description = "Print nothing but errors." };
        var analyze = new Command("analyze", "Run the whole job on a plant: ingest, back-calculate U and fouling resistance, write results.");
        analyze.Options.Add(configOption);
        analyze.Options.Add(outOption);
        analyze.Options.Add(jsonOption);
        analyze.Options.Add(quietOption);
        var auditFrom = new Option<DateTimeOffset?>("--audit-from") { Description = "Start of the energy-audit period (UTC date or time; default: 12 months before the end of the data).", CustomParser = r => DateArgument(r, "--audit-from") };
        var auditTo = new Option<DateTimeOffset?>("--audit-to") { Description = "End (exclusive) of the energy-audit period (default: the end of the data).", CustomParser = r => DateArgument(r, "--audit-to") };
        analyze.Options.Add(auditFrom);
        analyze.Options.Add(auditTo);
        analyze.SetAction(p => Guard(error, () => AnalyzeCommand.Run(p.GetValue(configOption)!.FullName, p.GetValue(outOption)!.FullName,
            p.GetValue(jsonOption), p.GetValue(quietOption), output, error, ToUtc(p.GetValue(auditFrom)), ToUtc(p.GetValue(auditTo)))));
        root.Subcommands.Add(analyze);

        var plan = new Command("plan", "Cost of fouling and the cleaning plan: which exchanger to clean in which shutdown window, and what it saves.");
        var planOut = new Option<DirectoryInfo>("--out", "-o") { Description = "Folder for the results (created if needed; default foulingwatch-plan).", DefaultValueFactory = _ => new DirectoryInfo("foulingwatch-plan") };
        plan.Options.Add(configOption);
        plan.Options.Add(planOut);
        plan.Options.Add(jsonOption);
        plan.Options.Add(quietOption);
        plan.SetAction(p => Guard(error, () => AnalyzeCommand.RunPlan(p.GetValue(configOption)!.FullName, p.GetValue(planOut)!.FullName,
            p.GetValue(jsonOption), p.GetValue(quietOption), output, error)));
        root.Subcommands.Add(plan);

        var dropOption = new Option<DirectoryInfo?>("--drop") { Description = "Drop folder to watch (overrides watch.dropFolder)." };
        var storeOption = new Option<FileInfo?>("--store") { Description = "SQLite store file (overrides watch.store)." };
        var watchOut = new Option<DirectoryInfo?>("--out", "-o") { Description = "Results folder (overrides watch.out)." };
        var pollOption = new Option<double?>("--poll-seconds") { Description = "Seconds between passes over the drop folder (overrides watch.pollInterval)." };
        var watch = new Command("watch", "Run as a monitoring service: ingest new exports from the drop folder, re-analyse, report and alert, until stopped.");
        watch.Options.Add(configOption);
        watch.Options.Add(dropOption);
        watch.Options.Add(storeOption);
        watch.Options.Add(watchOut);
        watch.Options.Add(pollOption);
        var logLevelOption = new Option<string?>("--log-level") { Description = "Least severe log events written (overrides watch.logLevel)." };
        logLevelOption.AcceptOnlyFromAmong(WatchSettings.LogLevels);
        watch.Options.Add(logLevelOption);
        watch.SetAction(p => Guard(error, () => Watch.WatchCommand.Run(p.GetValue(configOption)!.FullName, p.GetValue(dropOption)?.FullName, p.GetValue(storeOption)?.FullName,
            p.GetValue(watchOut)?.FullName, p.GetValue(pollOption) is { } s ? TimeSpan.FromSeconds(s) : null, error,
            p.GetValue(logLevelOption) ?? (p.GetValue(verboseOption) ? "debug" : null))));
        root.Subcommands.Add(watch);

        var status = new Command("status", "Show what the watch service's store holds and its active alerts.");
        status.Options.Add(configOption);
        status.Options.Add(storeOption);
        status.SetAction(p => Guard(error, () => Watch.WatchCommand.Status(p.GetValue(configOption)!.FullName, p.GetValue(storeOption)?.FullName, output, error)));
        root.Subcommands.Add(status);

        var demoOut = new Option<DirectoryInfo>("--out", "-o") { Description = "Folder for the demo results.", DefaultValueFactory = _ => new DirectoryInfo("foulingwatch-demo") };
        var demo = new Command("demo", "Run the whole job on the bundled sample plant (Kestrel Bay, invented) and say where the results are.");
        demo.Options.Add(demoOut);
        demo.SetAction(p => Guard(error, () =>
        {
            var plant = AnalyzeCommand.FindSamplePlant();
            if (plant is null)
            {
                error.WriteLine("The sample plant (sample-data/plant.json) was not found; run the demo from the FoulingWatch folder.");
                return UsageOrConfigurationError;
            }
            output.WriteLine($"FoulingWatch demo on {plant}");
            return AnalyzeCommand.Run(plant, p.GetValue(demoOut)!.FullName, json: false, quiet: false, output, error);
        }));
        root.Subcommands.Add(demo);

        var parsed = root.Parse(args);
        Verbose = parsed.GetValue(verboseOption);
        return parsed.Invoke(new InvocationConfiguration { Output = output, Error = error });
    }

    private static DateTimeOffset? ToUtc(DateTimeOffset? t) => t?.ToUniversalTime();

    /// <summary>A date or time option: ISO 8601, read as UTC when it has no offset; otherwise an error saying what to write.</summary>
    public static DateTimeOffset? DateArgument(System.CommandLine.Parsing.ArgumentResult result, string option)
    {
        var text = result.Tokens.Count > 0 ? result.Tokens[0].Value : "";
        if (DateTimeOffset.TryParse(text, System.Globalization.CultureInfo.InvariantCulture,
                System.Globalization.DateTimeStyles.AssumeUniversal | System.Globalization.DateTimeStyles.AdjustToUniversal, out var t))
            return t;
        result.AddError($"{option}: '{text}' is not a date; write it as yyyy-MM-dd (UTC midnight) or an ISO 8601 time such as 2026-01-01T06:00Z.");
        return null;
    }

    /// <summary>Runs a command body, turning known failures into a message on stderr and the documented exit code.</summary>
    public static int Guard(TextWriter error, Func<int> body)
    {
        try { return Unwrapped(body); }
        catch (ConfigurationException ex) { error.WriteLine(ex.Message); return UsageOrConfigurationError; }
        catch (IngestException ex) { error.WriteLine(ex.Message); return DataError; }
        catch (QuantityOutOfRangeException ex) { error.WriteLine(ex.Message); return DataError; }
        catch (IOException ex) { error.WriteLine($"cannot read or write a file: {ex.Message}"); return DataError; }
        catch (UnauthorizedAccessException ex) { error.WriteLine($"no permission: {ex.Message}"); return DataError; }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            // Anything else is a defect of ours, not of the input: say so in one line; the trace only on request.
            error.WriteLine($"FoulingWatch stopped on an unexpected error ({ex.GetType().Name}: {ex.Message}). Please report it with " +
                            $"the command and its input files{(ShowDetails ? "" : "; run it again with --verbose to print the details")}.");
            if (ShowDetails) error.WriteLine(ex);
            return DataError;
        }
    }

    /// <summary>Work done in parallel (exchangers, parts of a file) fails with an AggregateException: its first failure
    /// is the failure, reported as if it had happened alone (a file that cannot be written is named, not "unexpected").</summary>
    private static int Unwrapped(Func<int> body)
    {
        try { return body(); }
        catch (AggregateException ex) when (ex.Flatten().InnerExceptions.Count > 0)
        {
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Capture(ex.Flatten().InnerExceptions[0]).Throw();
            throw;
        }
    }

    /// <summary>Set to 1 to print the stack trace of an unexpected error (as --verbose does).</summary>
    public const string VerboseVariable = "FOULINGWATCH_VERBOSE";

    /// <summary>--verbose was given (read when the command line is parsed).</summary>
    [ThreadStatic] private static bool Verbose;

    private static bool ShowDetails => Verbose || Environment.GetEnvironmentVariable(VerboseVariable) == "1";
}
