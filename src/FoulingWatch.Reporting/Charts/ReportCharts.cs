using FoulingWatch.Analysis;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Analysis.Economics;
using FoulingWatch.Analysis.Trends;
using ScottPlot;

namespace FoulingWatch.Reporting.Charts;

/// <summary>A rendered chart: PNG bytes (for the HTML report) and SVG text, at one size.</summary>
public sealed record Chart(string Name, string Title, byte[] Png, string Svg, int Width, int Height);

/// <summary>
/// The report's charts (ScottPlot 5): per exchanger Rf with σ band, fits, forecast band and limit; U actual against clean;
/// duty and lost duty; cumulative cost of fouling; for the site the cost ranking and the cleaning plan on the windows.
/// Colours are the Okabe–Ito colour-blind-safe palette (Okabe &amp; Ito, 2008); time axes show dates; units on every axis.
/// </summary>
public static class ReportCharts
{
    public const int Width = 960, Height = 420;

    // Okabe & Ito (2008) colour-universal-design palette.
    public static readonly Color Blue = Color.FromHex("#0072B2"), Orange = Color.FromHex("#E69F00"), Green = Color.FromHex("#009E73"),
        Vermillion = Color.FromHex("#D55E00"), Purple = Color.FromHex("#CC79A7"), Sky = Color.FromHex("#56B4E9"), Black = Color.FromHex("#000000"),
        Grey = Color.FromHex("#999999");

    private static Plot NewPlot(string title, string yLabel, bool dates = true)
    {
        var plot = new Plot();
        plot.Title(title);
        plot.YLabel(yLabel);
        if (dates)
        {
            plot.XLabel("date (UTC)");
            var ticks = plot.Axes.DateTimeTicksBottom();
            if (ticks.TickGenerator is ScottPlot.TickGenerators.DateTimeAutomatic automatic)
                automatic.LabelFormatter = d => d.ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture);
        }
        plot.Axes.Title.Label.FontSize = 18;
        plot.Axes.Left.Label.FontSize = 15;
        plot.Axes.Bottom.Label.FontSize = 15;
        plot.Axes.Left.TickLabelStyle.FontSize = 13;
        plot.Axes.Bottom.TickLabelStyle.FontSize = 13;
        return plot;
    }

    /// <summary>The report page's font, so charts and text match (installed with fonts-dejavu-core; elsewhere the
    /// renderer falls back to a system sans-serif).</summary>
    public const string FontName = "DejaVu Sans";

    private static Chart Render(Plot plot, string name, string title)
    {
        plot.Font.Set(FontName);
        HideEmptyLegend(plot);
        return new(name, title, Png(plot), StableIds(plot.GetSvgXml(Width, Height)), Width, Height);
    }

    /// <summary>The chart as PNG: drawn as the plotting library draws it (the same pixels as its own PNG export), each
    /// row filtered by "up" alone and compressed at zlib level 1, where the library's export tries every filter per row at
    /// level 6: the 82 charts of the benchmark plant 2.0 -> 1.5 s thread-summed, files about 4 % larger.</summary>
    public static byte[] Png(Plot plot, int width = Width, int height = Height)
    {
        using var surface = SkiaSharp.SKSurface.Create(new SkiaSharp.SKImageInfo(width, height, SkiaSharp.SKColorType.Rgba8888,
            SkiaSharp.SKAlphaType.Premul)) ?? throw new InvalidOperationException("no drawing surface for the chart");
        plot.Render(surface.Canvas, width, height);
        using var image = surface.Snapshot();
        using var pixels = image.PeekPixels();
        using var data = pixels.Encode(new SkiaSharp.SKPngEncoderOptions(SkiaSharp.SKPngEncoderFilterFlags.Up, 1))
            ?? throw new InvalidOperationException("the chart could not be encoded as PNG");
        return data.ToArray();
    }

    /// <summary>A legend lists only what is drawn: nothing drawn with a label, no legend.</summary>
    private static void HideEmptyLegend(Plot plot)
    {
        if (!plot.GetPlottables().Any(p => p.LegendItems.Any(i => !string.IsNullOrEmpty(i.LabelText)))) plot.HideLegend();
    }

    /// <summary>The SVG canvas numbers its clip paths with a process-wide counter; renumber them per file so identical inputs give identical files.</summary>
    private static string StableIds(string svg)
    {
        var map = new Dictionary<string, string>(StringComparer.Ordinal);
        return System.Text.RegularExpressions.Regex.Replace(svg, "cl_[0-9a-f]+\\b", m =>
            map.TryGetValue(m.Value, out var id) ? id : map[m.Value] = $"clip{map.Count}");
    }

    private static double X(DateTimeOffset t) => t.UtcDateTime.ToOADate();

    public static IReadOnlyList<Chart> ForExchanger(ExchangerResult x)
    {
        var id = x.History.Exchanger.Id;
        var okDays = OkDays(x);
        return new[] { FoulingChart(x), UChart(x, okDays), DutyChart(x, okDays), CostChart(x) }.Select(c => c with { Name = $"{Results.ResultWriter.SafeName(id)}-{c.Name}" }).ToList();
    }

    /// <summary>Rf: daily medians with ±σ band, the chosen fit of each cycle, the forecast band to the limit, cleanings marked.</summary>
    public static Chart FoulingChart(ExchangerResult x)
    {
        var plot = NewPlot($"{x.History.Exchanger.Id}: fouling resistance", "Rf (m²·K/W × 10⁻⁴)");
        const double scale = 1e4;
        var daily = x.Trend.Daily;
        if (daily.Count > 0)
        {
            var xs = daily.Select(d => X(d.Day.AddHours(12))).ToArray();
            var band = plot.Add.FillY(xs, daily.Select(d => (d.FoulingResistance - d.SigmaCombined) * scale).ToArray(),
                daily.Select(d => (d.FoulingResistance + d.SigmaCombined) * scale).ToArray());
            band.FillStyle.Color = Sky.WithAlpha(0.35);
            band.LineStyle.Width = 0;
            band.LegendText = "±σ of the daily median (systematic and random)";
            var points = plot.Add.ScatterPoints(xs, daily.Select(d => d.FoulingResistance * scale).ToArray());
            points.Color = Blue;
            points.MarkerSize = 4;
            points.LegendText = "daily median Rf";
        }
        var labelled = false;
        foreach (var c in x.Trend.Cycles)
        {
            if (c.Chosen?.Fit is not { } fit) continue;
            var days = Math.Max(1, (c.End - c.Start).TotalDays);
            var ts = Enumerable.Range(0, 200).Select(i => i * days / 199).ToArray();
            var line = plot.Add.ScatterLine(ts.Select(t => X(c.Start + TimeSpan.FromDays(t))).ToArray(), ts.Select(t => c.Chosen.Model.Value(fit.Parameters, t) * scale).ToArray());
            line.Color = Vermillion;
            line.LineWidth = 2.5f;
            if (!labelled) { line.LegendText = "fitted fouling law"; labelled = true; }
        }
        var cycle = x.Trend.Cycles.LastOrDefault();
        var forecastDrawn = false;
        if (x.Trend.Forecast is { } f && cycle?.Chosen?.Fit is { } cf && daily.Count > 0)
        {
            var now = daily[^1].Day.AddDays(1);
            var end = (f.High ?? f.Date ?? now + TimeSpan.FromDays(365)) + TimeSpan.FromDays(60);
            if (end > f.Horizon) end = f.Horizon;
            var steps = 120;
            var t0 = cycle.Days(now);
            var t1 = cycle.Days(end);
            if (t1 > t0)
            {
                var ts = Enumerable.Range(0, steps).Select(i => t0 + i * (t1 - t0) / (steps - 1)).ToArray();
                var lo = new double[steps];
                var hi = new double[steps];
                for (var i = 0; i < steps; i++)
                {
                    var (low, high) = x.Trend.Draws?.ValueQuantiles(ts[i], 0.05, 0.95) ?? (double.NaN, double.NaN);
                    (lo[i], hi[i]) = (low * scale, high * scale);
                }
                var xs = ts.Select(t => X(cycle.Start + TimeSpan.FromDays(t))).ToArray();
                if (lo.Zip(hi).Any(p => double.IsFinite(p.First) && double.IsFinite(p.Second) && p.Second > p.First))
                {
                    var fb = plot.Add.FillY(xs, lo, hi);
                    fb.FillStyle.Color = Orange.WithAlpha(0.3);
                    fb.LineStyle.Width = 0;
                    fb.LegendText = "forecast, 90 % band";
                    forecastDrawn = true;
                }
                var fl = plot.Add.ScatterLine(xs, ts.Select(t => cycle.Chosen.Model.Value(cf.Parameters, t) * scale).ToArray());
                fl.Color = Orange;
                fl.LineWidth = 2;
                fl.LinePattern = LinePattern.Dashed;
                fl.LegendText = "forecast (chosen law)";
                forecastDrawn = true;
            }
            var limit = plot.Add.HorizontalLine(f.Limit * scale);
            limit.Color = Black;
            limit.LinePattern = LinePattern.Dotted;
            limit.LineWidth = 1.5f;
            limit.LegendText = "limit";
        }
        // Cleanings before the first daily point lie outside the plotted data: not drawn, so not in the legend.
        foreach (var c in x.Trend.Cleanings.Where(c => daily.Count > 0 && c.Cleaning.Date >= daily[0].Day))
        {
            var v = plot.Add.VerticalLine(X(c.Cleaning.Date));
            v.Color = Green;
            v.LineWidth = 1.5f;
            v.LinePattern = c.Cleaning.Source == CleaningSource.Logged ? LinePattern.Solid : LinePattern.Dashed;
            v.LegendText = c.Cleaning.Source == CleaningSource.Logged ? "cleaning (logged)" : "cleaning (detected)";
        }
        if (x.History.Drift is { } drift)
        {
            var d = plot.Add.VerticalLine(X(drift.Onset));
            d.Color = Purple;
            d.LineWidth = 2f;
            d.LinePattern = LinePattern.DenselyDashed;
            d.LegendText = "instrument drift onset (later data not used)";
        }
        DedupLegend(plot);
        plot.ShowLegend(Alignment.UpperLeft);
        var title = "Fouling resistance" + (labelled ? forecastDrawn ? " with fit and forecast" : " with fit" : forecastDrawn ? " with forecast" : "");
        return Render(plot, "rf", title);
    }

    private static void DedupLegend(Plot plot)
    {
        var seen = new HashSet<string>();
        foreach (var p in plot.GetPlottables())
        {
            if (p is ScottPlot.Plottables.VerticalLine v && !string.IsNullOrEmpty(v.LegendText) && !seen.Add(v.LegendText)) v.LegendText = "";
        }
    }

    /// <summary>The usable (ok) samples grouped by UTC day: the groups every daily-median line of an exchanger filters.</summary>
    private static List<(DateTime Day, List<int> Samples)> OkDays(ExchangerResult x)
    {
        var c = x.History.Columns;
        return c.UtcDays(k => c.Status[k] == SampleStatus.Ok).ToList();
    }

    /// <summary>Daily medians of a column over the usable samples where it is finite (days without one left out).</summary>
    private static (double[] X, double[] Y) DailyMedian(ExchangerResult x, Func<SampleColumns, double[]> pick, double scale,
        List<(DateTime Day, List<int> Samples)> okDays)
    {
        var column = pick(x.History.Columns);
        var xs = new List<double>();
        var ys = new List<double>();
        foreach (var (day, samples) in okDays)
        {
            var finite = 0;
            foreach (var k in samples) if (double.IsFinite(column[k])) finite++;
            if (finite == 0) continue;
            var values = new double[finite];
            var i = 0;
            foreach (var k in samples) if (double.IsFinite(column[k])) values[i++] = column[k] * scale;
            xs.Add(day.AddHours(12).ToOADate());
            ys.Add(Median(values));
        }
        return (xs.ToArray(), ys.ToArray());
    }

    /// <summary><see cref="DailyFouling.Median"/> of finite values by selection of the middle order statistics: the
    /// same value as sorting them all (reorders the array).</summary>
    private static double Median(double[] values)
    {
        var n = values.Length;
        if (n == 0) return double.NaN;
        var upper = Sorting.Select(values, n / 2);
        return n % 2 == 1 ? upper : 0.5 * (Sorting.Select(values, n / 2 - 1) + upper);
    }

    private static void Line(Plot plot, double[] xs, double[] ys, Color color, string legend, bool dashed = false)
    {
        var line = plot.Add.ScatterLine(xs, ys);
        line.Color = color;
        line.LineWidth = 2;
        line.LegendText = legend;
        if (dashed) line.LinePattern = LinePattern.Dashed;
    }

    public static Chart UChart(ExchangerResult x) => UChart(x, OkDays(x));

    private static Chart UChart(ExchangerResult x, List<(DateTime Day, List<int> Samples)> okDays)
    {
        var plot = NewPlot($"{x.History.Exchanger.Id}: actual and clean U at today's flows", "U (W/m²·K)");
        var (xa, ya) = DailyMedian(x, c => c.UActual, 1, okDays);
        var (xc, yc) = DailyMedian(x, c => c.UClean, 1, okDays);
        Line(plot, xa, ya, Blue, "U actual (daily median)");
        Line(plot, xc, yc, Green, "U clean at the same flows", dashed: true);
        plot.ShowLegend(Alignment.LowerLeft);
        return Render(plot, "u", "U actual against clean U");
    }

    public static Chart DutyChart(ExchangerResult x) => DutyChart(x, OkDays(x));

    private static Chart DutyChart(ExchangerResult x, List<(DateTime Day, List<int> Samples)> okDays)
    {
        var plot = NewPlot($"{x.History.Exchanger.Id}: duty and lost duty", "duty (kW)");
        var (xd, yd) = DailyMedian(x, c => c.Duty, 1e-3, okDays);
        var (xl, yl) = DailyMedian(x, c => c.LostDuty, 1e-3, okDays);
        Line(plot, xd, yd, Blue, "duty (daily median)");
        Line(plot, xl, yl, Vermillion, "lost duty against clean");
        plot.ShowLegend(Alignment.UpperLeft);
        return Render(plot, "duty", "Duty and lost duty");
    }

    public static Chart CostChart(ExchangerResult x)
    {
        var currency = x.Economics.Pricing?.Currency ?? "";
        var plot = NewPlot($"{x.History.Exchanger.Id}: cumulative cost of fouling", $"cost ({currency} × 1000)");
        if (x.Economics.Pricing is { } p)
        {
            var c = x.History.Columns;
            var lost = FoulingEconomics.LostEnergyPerInterval(x.History, c.Count > 1 ? c.Timestamp(1) - c.Timestamp(0) : TimeSpan.FromMinutes(10));
            var xs = new List<double>();
            var ys = new List<double>();
            var sum = 0.0;
            for (var k = 0; k < lost.Length; k++)
            {
                sum += lost[k] * p.MoneyPerJoule;
                if (k % 36 == 0 || k == lost.Length - 1) { xs.Add(X(c.Timestamp(k))); ys.Add(sum / 1000); }
            }
            var line = plot.Add.ScatterLine(xs.ToArray(), ys.ToArray());
            line.Color = Purple;
            line.LineWidth = 2.5f;
            line.LegendText = p.Description;
            plot.ShowLegend(Alignment.UpperLeft);
        }
        return Render(plot, "cost", "Cumulative cost of fouling");
    }

    /// <summary>Site: cost of fouling over the last 12 months per exchanger, largest first.</summary>
    public static Chart CostRanking(PlantResult r)
    {
        var currency = r.Configuration.Economics.Currency;
        var plot = NewPlot("Cost of fouling, last 12 months", $"cost ({currency} × 1000)", dates: false);
        var rows = r.Exchangers.Select(x => (x.History.Exchanger.Id, Cost: x.Economics.LastYear?.Money ?? 0)).OrderByDescending(x => x.Cost).ToList();
        for (var i = 0; i < rows.Count; i++)
        {
            var bar = plot.Add.Bar(i, rows[i].Cost / 1000);
            bar.Bars[0].FillColor = i == 0 ? Vermillion : Blue;
        }
        plot.Axes.Bottom.SetTicks(Enumerable.Range(0, rows.Count).Select(i => (double)i).ToArray(), rows.Select(x => x.Id).ToArray());
        plot.XLabel("exchanger");
        plot.Axes.Margins(bottom: 0);
        return Render(plot, "site-cost-ranking", "Cost of fouling ranking");
    }

    /// <summary>Site: the shutdown windows on a time axis with the exchangers the plan puts in each.</summary>
    public static Chart PlanTimeline(PlantResult r)
    {
        var plot = NewPlot("Cleaning plan on the shutdown windows", "exchanger");
        plot.XLabel("date (site windows)");
        var ids = r.Exchangers.Select(x => x.History.Exchanger.Id).ToList();
        foreach (var w in r.Configuration.ShutdownWindows)
        {
            var span = plot.Add.HorizontalSpan(X(w.Start), X(w.End));
            span.FillStyle.Color = Grey.WithAlpha(0.25);
            span.LineStyle.Width = 0;
            var label = plot.Add.Text($"{w.Name} (≤ {w.Capacity})", X(w.Start) - 20, ids.Count - 0.3);
            label.LabelFontSize = 12;
        }
        for (var i = 0; i < ids.Count; i++)
        {
            var entry = r.Plan.Entries.First(e => e.ExchangerId == ids[i]);
            if (entry.Window is null) continue;
            var m = plot.Add.Marker(X(entry.Window.Start + (entry.Window.End - entry.Window.Start) / 2), i);
            m.Color = Vermillion;
            m.Size = 14;
            m.Shape = MarkerShape.FilledDiamond;
        }
        plot.Axes.Left.SetTicks(Enumerable.Range(0, ids.Count).Select(i => (double)i).ToArray(), ids.ToArray());
        var start = r.Configuration.ShutdownWindows.Count > 0 ? r.Configuration.ShutdownWindows.Min(w => w.Start) - TimeSpan.FromDays(30) : DateTimeOffset.UtcNow;
        var end = r.Configuration.ShutdownWindows.Count > 0 ? r.Configuration.ShutdownWindows.Max(w => w.End) + TimeSpan.FromDays(90) : start + TimeSpan.FromDays(365);
        plot.Axes.SetLimits(X(start), X(end), -0.7, ids.Count + 0.2);
        return Render(plot, "site-plan-timeline", "Cleaning plan timeline");
    }
}
