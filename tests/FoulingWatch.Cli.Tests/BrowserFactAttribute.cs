namespace FoulingWatch.Cli.Tests;

/// <summary>A test that needs Debian's Chromium: skipped with its reason on a machine without it, unless
/// <c>FOULINGWATCH_REQUIRE_BROWSER=1</c> (set by <c>.ci/run</c>, which installs Chromium) makes it run and fail there.</summary>
public sealed class BrowserFactAttribute : FactAttribute
{
    public const string Chromium = "/usr/bin/chromium";
    public const string RequireVariable = "FOULINGWATCH_REQUIRE_BROWSER";

    public static string? SkipReason(bool chromiumPresent, string? require) =>
        chromiumPresent || require == "1"
            ? null
            : $"the browser check needs Debian's chromium at {Chromium} (apt-get install -y chromium); skipped here, " +
              $"and run by .ci/run, which installs it and sets {RequireVariable}=1";

    public BrowserFactAttribute() => Skip = SkipReason(File.Exists(Chromium), Environment.GetEnvironmentVariable(RequireVariable));

    /// <summary>A further program the test needs (e.g. Debian's poppler-utils' /usr/bin/pdftotext), with its package.</summary>
    public string? Tool
    {
        get => _tool;
        set
        {
            _tool = value;
            if (Skip is null && value is not null && !File.Exists(value) && Environment.GetEnvironmentVariable(RequireVariable) != "1")
                Skip = $"the check needs {value} (apt-get install -y {Package}); skipped here, and run by .ci/run, which installs it " +
                       $"and sets {RequireVariable}=1";
        }
    }

    /// <summary>The Debian package of <see cref="Tool"/>.</summary>
    public string Package { get; set; } = "poppler-utils";

    private string? _tool;
}

public class BrowserFactAttributeTests
{
    [Fact]
    public void Without_chromium_the_browser_check_is_skipped_with_its_reason_unless_CI_requires_it()
    {
        Assert.Equal("the browser check needs Debian's chromium at /usr/bin/chromium (apt-get install -y chromium); skipped here, " +
                     "and run by .ci/run, which installs it and sets FOULINGWATCH_REQUIRE_BROWSER=1",
            BrowserFactAttribute.SkipReason(chromiumPresent: false, require: null));
        Assert.Null(BrowserFactAttribute.SkipReason(chromiumPresent: false, require: "1"));
        Assert.Null(BrowserFactAttribute.SkipReason(chromiumPresent: true, require: null));
    }
}
