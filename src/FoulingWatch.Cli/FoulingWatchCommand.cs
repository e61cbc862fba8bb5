using System.CommandLine;

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
        var demo = new Command("demo", "Run the whole job on the bundled sample plant and say where the results are.");
        demo.SetAction(_ =>
        {
            output.WriteLine("FoulingWatch demo");
            output.WriteLine("  physics core ............ ready");
            output.WriteLine("  ingest .................. not yet");
            output.WriteLine("  back-calculation ........ not yet");
            return Success;
        });
        root.Subcommands.Add(demo);
        var parsed = root.Parse(args);
        return parsed.Invoke(new InvocationConfiguration { Output = output, Error = error });
    }
}
