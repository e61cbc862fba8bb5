using FoulingWatch.Cli;

namespace FoulingWatch.Cli.Tests;

public class DemoCommandTests
{
    [Fact]
    public void Unknown_command_is_a_usage_error()
    {
        var output = new StringWriter();
        var error = new StringWriter();
        var code = FoulingWatchCommand.Run(["no-such-command"], output, error);
        Assert.Equal(FoulingWatchCommand.UsageOrConfigurationError, code);
    }
}
