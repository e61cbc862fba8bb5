using FoulingWatch.Reporting.Charts;
using SkiaSharp;

namespace FoulingWatch.Cli.Tests;

/// <summary>Charts are encoded as PNG by our own call (faster compression); the pixels must be the plotting library's own
/// PNG export's, pixel for pixel, on a chart with lines, a band, text and a legend.</summary>
public sealed class ChartPngTests
{
    [Fact]
    public void Our_png_holds_the_pixels_of_the_library_export()
    {
        var plot = new ScottPlot.Plot();
        var xs = Enumerable.Range(0, 400).Select(i => (double)i).ToArray();
        var line = plot.Add.ScatterLine(xs, xs.Select(x => Math.Sin(x / 20) * 3 + x / 100).ToArray());
        line.LegendText = "Rf daily median";
        plot.Add.FillY(xs, xs.Select(x => Math.Sin(x / 20) * 3 - 1).ToArray(), xs.Select(x => Math.Sin(x / 20) * 3 + 1).ToArray());
        plot.Title("E-901 (fictional): fouling resistance");
        plot.ShowLegend();
        var library = plot.GetImageBytes(ReportCharts.Width, ReportCharts.Height, ScottPlot.ImageFormat.Png);
        var ours = ReportCharts.Png(plot);
        using var a = SKBitmap.Decode(library);
        using var b = SKBitmap.Decode(ours);
        Assert.Equal((a.Width, a.Height), (b.Width, b.Height));
        Assert.Equal((ReportCharts.Width, ReportCharts.Height), (b.Width, b.Height));
        var pa = a.Copy(SKColorType.Rgba8888).Bytes;
        var pb = b.Copy(SKColorType.Rgba8888).Bytes;
        Assert.True(pa.Length > 100_000);
        Assert.True(pa.AsSpan().SequenceEqual(pb), "the PNGs decode to different pixels");
        Assert.True(pa.Distinct().Count() > 10, "the chart is blank");
    }
}
