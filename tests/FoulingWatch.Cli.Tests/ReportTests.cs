using System.Diagnostics;
using System.Text.RegularExpressions;
using System.Xml.Linq;

namespace FoulingWatch.Cli.Tests;

/// <summary>One analyse run of the sample plant (20-day window) shared by the report tests.</summary>
public sealed class SampleRun : IDisposable
{
    public SampleRun()
    {
        Plant = new SamplePlantCopy();
        Out = Plant.Out("results");
        var (code, _, error) = SamplePlantCopy.Run("analyze", "--config", Plant.ConfigPath, "--out", Out, "--quiet");
        if (code != 0) throw new InvalidOperationException(error);
    }

    public SamplePlantCopy Plant { get; }
    public string Out { get; }
    public void Dispose() => Plant.Dispose();
}

public class ReportTests(SampleRun run) : IClassFixture<SampleRun>
{
    private static string Chromium => BrowserFactAttribute.Chromium;

    private static (string Dom, string Log) Headless(string html, params string[] extra)
    {
        Assert.True(File.Exists(Chromium), "the browser check needs Debian's chromium (apt-get install -y chromium); .ci/run installs it");
        var profile = Path.Combine(Path.GetTempPath(), "fw-chromium-" + Guid.NewGuid().ToString("N"));
        var psi = new ProcessStartInfo(Chromium)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var a in new[] { "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
                     "--disable-component-update", "--disable-sync", $"--user-data-dir={profile}", "--enable-logging=stderr", "--v=0",
                     "--virtual-time-budget=5000" }.Concat(extra.Length > 0 ? extra : ["--dump-dom"]).Append(new Uri(html).AbsoluteUri))
            psi.ArgumentList.Add(a);
        using var p = Process.Start(psi)!;
        var dom = p.StandardOutput.ReadToEndAsync();
        var log = p.StandardError.ReadToEndAsync();
        Assert.True(p.WaitForExit(90_000), "chromium did not finish in 90 s");
        return (dom.Result, log.Result);
    }

    [BrowserFact]
    public void The_report_loads_in_a_headless_browser_with_every_chart_decoded_and_no_errors()
    {
        var html = Path.Combine(run.Out, "report.html");
        var (dom, log) = Headless(html);
        var images = Regex.Matches(File.ReadAllText(html), "<img ").Count;
        Assert.True(images >= 6 * 4 + 2, $"expected the charts in the report, found {images} images");
        Assert.Contains($"data-images=\"{images}/{images}\"", dom);
        // console errors, refused loads and CSP violations are logged by Chromium as CONSOLE lines
        Assert.DoesNotMatch("CONSOLE.*(Uncaught|Refused|Error)", log);
        Assert.DoesNotMatch("net::ERR_", log);
        var plan = Regex.Match(dom, "<table class=\"plan\" id=\"plan-table\">.*?</table>", RegexOptions.Singleline).Value;
        Assert.Equal(6, Regex.Matches(plan, "<tr><td>\\d+</td>").Count);
        Assert.Contains("id=\"caution\"", dom);
    }

    // Screen: in a 1400 px window the page is no wider than the window (wide tables scroll in their own box). Print: the
    // report printed to A4 keeps every plan note whole (its text, whitespace aside, is in the PDF's text), nothing cut.
    [BrowserFact(Tool = "/usr/bin/pdftotext")]
    public void The_report_fits_a_1400_px_window_and_prints_every_plan_note_whole()
    {
        var html = Path.Combine(run.Out, "report.html");
        var (dom, _) = Headless(html, "--window-size=1400,1000", "--dump-dom");
        var width = Regex.Match(dom, "data-page-width=\"(\\d+)/(\\d+)\"");
        Assert.True(width.Success, "the report's page-width probe did not run");
        Assert.True(int.Parse(width.Groups[1].Value) <= int.Parse(width.Groups[2].Value), $"page {width.Groups[1].Value} px wide in a {width.Groups[2].Value} px window");

        // whitespace and hyphens aside: pdftotext joins a word hyphenated at a line end ("2026-" + "04-13" → "202604-13")
        static string Squeeze(string s) => Regex.Replace(s, "[\\s\\-‐]+", "");
        var plan = Regex.Match(File.ReadAllText(html), "<table class=\"plan\" id=\"plan-table\">.*?</table>", RegexOptions.Singleline).Value;
        var notes = Regex.Matches(plan, "<td(?: class=\"warn\")?>([^<]*)</td></tr>").Select(m => System.Net.WebUtility.HtmlDecode(m.Groups[1].Value))
            .Where(n => n.Length > 0).ToList();
        Assert.NotEmpty(notes);
        // A4 portrait as the report asks, and A4 landscape (a copy whose page rule says so, as a user's print dialog would)
        var landscape = Path.Combine(run.Out, "report-landscape.html");
        File.WriteAllText(landscape, File.ReadAllText(html).Replace("@page{size:A4;", "@page{size:A4 landscape;"));
        Assert.Contains("@page{size:A4 landscape;", File.ReadAllText(landscape));
        foreach (var (page, name) in new[] { (html, "portrait"), (landscape, "landscape") })
        {
            var pdf = Path.Combine(run.Out, $"report-{name}.pdf");
            Headless(page, "--no-pdf-header-footer", $"--print-to-pdf={pdf}");
            Assert.True(File.Exists(pdf) && new FileInfo(pdf).Length > 10_000, $"chromium wrote no {name} PDF");
            var psi = new ProcessStartInfo("/usr/bin/pdftotext") { RedirectStandardOutput = true, UseShellExecute = false };
            psi.ArgumentList.Add(pdf);
            psi.ArgumentList.Add("-");
            using var p = Process.Start(psi)!;
            var printed = Squeeze(p.StandardOutput.ReadToEnd());
            p.WaitForExit();
            foreach (var note in notes) Assert.True(printed.Contains(Squeeze(note), StringComparison.Ordinal), $"{name}: a plan note is cut: {note}");
        }
    }

    [Fact]
    public void The_report_asks_for_nothing_from_the_network()
    {
        var text = File.ReadAllText(Path.Combine(run.Out, "report.html"));
        Assert.DoesNotMatch("(src|href)=\"(https?:)?//", text);
        Assert.Contains("default-src 'none'", text);
    }

    // PNG: the 8-byte signature and the IHDR chunk's width and height (ISO/IEC 15948 / W3C PNG specification §5, §11.2.2).
    [Fact]
    public void Chart_files_are_valid_png_and_svg_of_the_stated_size()
    {
        var pngs = Directory.GetFiles(Path.Combine(run.Out, "charts"), "*.png");
        Assert.Equal(6 * 4 + 2, pngs.Length);
        foreach (var f in pngs)
        {
            var b = File.ReadAllBytes(f);
            Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, b[..8]);
            Assert.Equal("IHDR", System.Text.Encoding.ASCII.GetString(b, 12, 4));
            Assert.Equal(960, (b[16] << 24) | (b[17] << 16) | (b[18] << 8) | b[19]);
            Assert.Equal(420, (b[20] << 24) | (b[21] << 16) | (b[22] << 8) | b[23]);
            var svg = XDocument.Load(Path.ChangeExtension(f, ".svg"));
            Assert.Equal("svg", svg.Root!.Name.LocalName);
            Assert.Equal("960", svg.Root.Attribute("width")!.Value.Replace("px", ""));
            Assert.Equal("420", svg.Root.Attribute("height")!.Value.Replace("px", ""));
        }
    }

    // Golden file of summary.json on the sample plant (20-day window). It changes only deliberately: set
    // FOULINGWATCH_REGENERATE_GOLDEN=1 to rewrite it, then review the diff before committing.
    [Fact]
    public void Summary_matches_the_golden_file()
    {
        var golden = Path.Combine(SamplePlantCopy.FindSampleData(), "..", "tests", "data", "golden", "summary-sample-20d.json");
        var actual = File.ReadAllText(Path.Combine(run.Out, "summary.json"));
        if (Environment.GetEnvironmentVariable("FOULINGWATCH_REGENERATE_GOLDEN") == "1")
        {
            Directory.CreateDirectory(Path.GetDirectoryName(golden)!);
            File.WriteAllText(golden, actual);
        }
        Assert.True(File.Exists(golden), $"no golden file at {golden}; create it deliberately with FOULINGWATCH_REGENERATE_GOLDEN=1");
        Assert.Equal(File.ReadAllText(golden), actual);
    }
}
