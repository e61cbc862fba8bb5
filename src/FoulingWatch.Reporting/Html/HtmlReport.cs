using System.Globalization;
using System.Net;
using System.Text;
using FoulingWatch.Analysis;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Ingest.Historian;
using FoulingWatch.Reporting.Charts;
using FoulingWatch.Reporting.Results;

namespace FoulingWatch.Reporting.Html;

/// <summary>
/// The self-contained HTML report (report.html): charts inline as data URIs, no scripts or styles from the network
/// (a Content-Security-Policy forbids any), readable on screen and when printed.
/// </summary>
public static class HtmlReport
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The tool's version as built (informational version, with the source revision when the build knew it).</summary>
    public static string Version { get; } =
        typeof(HtmlReport).Assembly.GetCustomAttributes(typeof(System.Reflection.AssemblyInformationalVersionAttribute), false)
            .OfType<System.Reflection.AssemblyInformationalVersionAttribute>().FirstOrDefault()?.InformationalVersion is { } v
            ? v.Length > v.IndexOf('+') + 8 && v.Contains('+') ? v[..(v.IndexOf('+') + 8)] : v
            : "unknown";

    public static string Build(PlantResult r, IReadOnlyDictionary<string, IReadOnlyList<Chart>> exchangerCharts, IReadOnlyList<Chart> siteCharts,
        DateTimeOffset? runTime = null)
    {
        var sb = new StringBuilder();
        var cfg = r.Configuration;
        var zone = cfg.Site.TimeZone;
        var currency = cfg.Economics.Currency;
        string D(DateTimeOffset? t) => t is { } v ? TimeZoneInfo.ConvertTime(v, zone).ToString("yyyy-MM-dd", Inv) : "—";
        string Instant(DateTimeOffset t) => TimeZoneInfo.ConvertTime(t, zone).ToString("yyyy-MM-dd HH:mm", Inv);
        string N(double v, string f = "N0") => double.IsFinite(v) ? v.ToString(f, Inv) : "—";
        string H(string? s) => WebUtility.HtmlEncode(s ?? "");

        sb.Append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
        sb.Append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; img-src data:; style-src 'unsafe-inline'; script-src 'unsafe-inline'\">\n");
        sb.Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n");
        sb.Append($"<title>FoulingWatch report — {H(cfg.Site.Name)}</title>\n<style>\n{Css}\n</style>\n</head>\n<body>\n");
        var last = r.Ingest.GridStart + r.Ingest.Interval * r.Ingest.IntervalCount;
        var run = TimeZoneInfo.ConvertTime(runTime ?? DateTimeOffset.UtcNow, zone);
        sb.Append($"<header><h1>Fouling report — {H(cfg.Site.Name)}</h1><p class=\"meta\">Data {D(r.Ingest.GridStart)} to {D(last)} · {r.Ingest.IntervalCount:N0} intervals of {r.Ingest.Interval.TotalMinutes:0} min · {r.Exchangers.Count} exchangers · money in {H(currency)}</p>");
        sb.Append($"<p class=\"meta\" id=\"provenance\">FoulingWatch {H(Version)} · configuration {H(Path.GetFileName(cfg.File))} · run {run.ToString("yyyy-MM-dd HH:mm zzz", Inv)} · dates are site-local calendar dates ({H(zone.Id)}), chart axes in UTC</p></header>\n");
        sb.Append($"<aside class=\"caution\" id=\"caution\"><strong>Caution.</strong> {H(ResultWriter.Caution)}</aside>\n");

        // Site summary: the energy audit of the last 12 months.
        var audit = r.Exchangers.Where(x => x.Economics.LastYear is not null).ToList();
        double Sum(Func<Analysis.Economics.CostTotals, double> f) => audit.Sum(x => f(x.Economics.LastYear!));
        sb.Append("<section id=\"site\"><h2>Site summary — last 12 months</h2>\n<div class=\"cards\">");
        sb.Append(Card("lost heat recovery", $"{N(Sum(t => t.LostEnergy) / 1e9)} GJ", $"{N(Sum(t => t.LostEnergy) / 3.6e9)} MWh"));
        sb.Append(Card("extra fuel", $"{N(Sum(t => t.Fuel) / 1e9)} GJ", "at the configured heater efficiencies"));
        sb.Append(Card("CO2", $"{N(Sum(t => t.Co2) / 1000)} t", "IPCC 2006 default factors unless configured"));
        sb.Append(Card("cost of fouling", $"{N(Sum(t => t.Money))} {H(currency)}", "fuel, CO2 and lost cooling"));
        sb.Append("</div>\n");
        foreach (var c in siteCharts.Where(c => c.Name == "site-cost-ranking")) sb.Append(Figure(c));
        sb.Append("</section>\n");

        // The ranked plan.
        sb.Append($"<section id=\"plan\"><h2>Cleaning plan</h2><p>{H(r.Plan.Method)}. Net saving is the expected saving over three years against running the exchanger to its limit (or never cleaning where no limit applies); the interval and probabilities come from joint draws of the fouling law, its parameters and the systematic uncertainty of Rf. Total expected saving of the plan: <strong>{N(r.Plan.TotalSaving)} {H(currency)}</strong>.</p>\n");
        sb.Append($"<table class=\"plan\" id=\"plan-table\"><thead><tr><th>rank</th><th>exchanger</th><th>action</th><th>date</th><th class=\"n\">net saving ({H(currency)})</th><th class=\"n\">90 % interval</th><th class=\"n\">P(saves)</th><th class=\"n\">P(best)</th><th class=\"n\">CO2 avoided (t)</th><th class=\"n\">fouling cost now (/day)</th><th>note</th></tr></thead><tbody>\n");
        foreach (var e in r.Plan.Entries)
        {
            var econ = r.Exchangers.First(x => x.History.Exchanger.Id == e.ExchangerId).Economics;
            var action = e.Option is null ? "—" : e.Option.Kind == "window" ? e.Option.Label : e.Option.Kind;
            sb.Append($"<tr><td>{e.Rank}</td><td><a href=\"#x-{ResultWriter.SafeName(e.ExchangerId)}\">{H(e.ExchangerId)}</a></td><td>{H(action)}</td><td>{D(e.Option?.Date)}</td>");
            sb.Append(e.Option is { } o
                ? $"<td class=\"n\">{N(o.Saving)}</td><td class=\"n\">{N(o.SavingLow)} … {N(o.SavingHigh)}</td><td class=\"n\">{N(o.ProbabilitySaving * 100)} %</td><td class=\"n\">{N(e.ProbabilityBest * 100)} %</td><td class=\"n\">{N(o.Co2Avoided / 1000)}</td>"
                : "<td class=\"n\">—</td><td class=\"n\">—</td><td class=\"n\">—</td><td class=\"n\">—</td><td class=\"n\">—</td>");
            var note = string.Join(" ", new[] { e.Warning, e.Note }.Where(t => !string.IsNullOrEmpty(t)));
            sb.Append($"<td class=\"n\">{N(econ.CostPerDayNow)}</td><td{(e.Warning is null ? "" : " class=\"warn\"")}>{H(note)}</td></tr>\n");
        }
        sb.Append("</tbody></table>\n");
        foreach (var c in siteCharts.Where(c => c.Name == "site-plan-timeline")) sb.Append(Figure(c));
        sb.Append("</section>\n");

        // One section per exchanger.
        foreach (var x in r.Exchangers)
        {
            var xc = x.History.Exchanger;
            var cur = x.Current;
            sb.Append($"<section class=\"exchanger\" id=\"x-{ResultWriter.SafeName(xc.Id)}\"><h2>{H(xc.Id)} — {H(xc.Service)}</h2>\n");
            sb.Append($"<p class=\"meta\">{H(xc.Arrangement.Name)} · {N(xc.Area, "0.#")} m² · hot: {H(xc.Hot.Fluid.Description)} ({xc.Hot.Side.ToString().ToLowerInvariant()} side) · cold: {H(xc.Cold.Fluid.Description)} ({xc.Cold.Side.ToString().ToLowerInvariant()} side) · duty basis {xc.DutyBasis.ToString().ToLowerInvariant()} · clean U: {H(x.History.CleanReference.Description)}</p>\n");
            if (x.History.Refusal is not null) sb.Append($"<p class=\"warn\">{H(x.History.Refusal)}</p>\n");
            sb.Append("<table class=\"state\"><tbody>");
            sb.Append($"<tr><th>state on</th><td>{D(cur.LastUsable)} (median of the last day's {cur.Samples} usable samples)</td></tr>");
            if (PlantAnalysis.DaysStale(x, r.Ingest) is { } stale)
                sb.Append($"<tr><th>stale</th><td class=\"warn\">STALE: the latest usable data are from {D(cur.LastUsable)}, {stale:0} days before the end of the data; the state and forecast describe that day, not today</td></tr>");
            sb.Append($"<tr><th>U actual / clean</th><td>{N(cur.UActual)} / {N(cur.UClean)} W/m²·K · cleanliness {N(cur.Cleanliness, "0.00")}</td></tr>");
            sb.Append($"<tr><th>fouling resistance</th><td>{N(cur.FoulingResistance * 1e4, "0.00")} ± {N(cur.FoulingResistanceSigma * 1e4, "0.00")} × 10⁻⁴ m²·K/W</td></tr>");
            sb.Append($"<tr><th>duty / lost duty</th><td>{N(cur.Duty / 1000)} kW / {N(cur.LostDuty / 1000)} kW</td></tr>");
            sb.Append($"<tr><th>trend</th><td>{H(x.Trend.Rate?.Statement ?? x.Trend.Cycles.LastOrDefault()?.Refusal ?? "no usable days")}</td></tr>");
            sb.Append($"<tr><th>forecast</th><td>{H(x.Trend.Forecast?.Statement ?? "no forecast (no fouling limit configured, or no fitted law)")}</td></tr>");
            sb.Append($"<tr><th>economics</th><td>{H(x.Economics.Statement)}</td></tr>");
            sb.Append($"<tr><th>sensors</th><td class=\"{(x.History.SensorCheck.LikelyFault ? "warn" : "")}\">{H(x.History.SensorCheck.Statement)}</td></tr>");
            if (x.History.CleanReference.CycleStatement is { } cycleText)
                sb.Append($"<tr><th>clean U by cycle</th><td class=\"{(cycleText.Contains("fell") || cycleText.Contains(" off the learned") ? "warn" : "")}\">{H(cycleText)}</td></tr>");
            if (x.History.Drift is { } drift)
                sb.Append($"<tr><th>instrument drift</th><td class=\"warn\">{H(drift.Statement)}</td></tr>");
            if (x.WhatIf.Count > 0)
                sb.Append($"<tr><th>what-if (latest usable interval)</th><td>{H(string.Join("; ", x.WhatIf.Select(w =>
                    FormattableString.Invariant($"{w.Arrangement}{(w.Actual ? " (as built)" : "")}: {w.CleanDuty / 1e3:N0} kW clean, {w.DutyNow / 1e3:N0} kW at today's U"))))}</td></tr>");
            foreach (var dp in x.PressureDrops)
                sb.Append($"<tr><th>pressure drop</th><td class=\"{(dp.Change > 0.15 ? "warn" : "")}\">{H(dp.Statement)}</td></tr>");
            sb.Append("</tbody></table>\n");
            if (exchangerCharts.TryGetValue(xc.Id, out var charts))
                foreach (var c in charts) sb.Append(Figure(c));
            sb.Append("<h3>Cycles and fitted laws</h3><table><thead><tr><th>cycle</th><th>start from</th><th class=\"n\">days</th><th>chosen</th><th>AICc and Akaike weight by law</th><th>note</th></tr></thead><tbody>");
            foreach (var c in x.Trend.Cycles)
            {
                var aicc = string.Join(" · ", c.Candidates.Select(m => $"{H(m.Model.Key)} {N(m.Aicc, "0.0")} ({N(m.AkaikeWeight * 100, "0")} %)"));
                sb.Append($"<tr><td>{D(c.Start)} – {D(c.End)}</td><td>{(c.StartSource?.ToString().ToLowerInvariant() ?? "data start")}</td><td class=\"n\">{c.Points.Count}</td><td>{H(c.Chosen?.Model.Formula ?? "—")}</td><td>{aicc}</td><td>{H(c.Refusal ?? (c.OutliersRejected > 0 ? $"{c.OutliersRejected} outlier days rejected" : ""))}</td></tr>");
            }
            sb.Append("</tbody></table>\n");
            if (x.Trend.Cleanings.Count > 0)
            {
                sb.Append("<h3>Cleanings</h3><table><thead><tr><th>date</th><th>outage</th><th>source</th><th class=\"n\">Rf before</th><th class=\"n\">Rf after (×10⁻⁴ m²·K/W)</th><th class=\"n\">removed</th><th class=\"n\">rate after / before</th></tr></thead><tbody>");
                foreach (var c in x.Trend.Cleanings)
                    sb.Append($"<tr><td>{D(c.Cleaning.Date)}</td><td>{(c.Cleaning.OutageStart is { } os && c.Cleaning.OutageEnd is { } oe ? H(Instant(os) + " to " + Instant(oe)) : "—")}</td><td>{c.Cleaning.Source.ToString().ToLowerInvariant()}</td><td class=\"n\">{(c.RfBefore is { } b ? N(b * 1e4, "0.00") : "—")}</td><td class=\"n\">{(c.RfAfter is { } a ? N(a * 1e4, "0.00") : "—")}</td><td class=\"n\">{(c.FractionRemoved is { } f ? N(f * 100, "0") + " %" : "—")}</td><td class=\"n\">{(c.RateAfter is { } ra && c.RateBefore is { } rb && rb != 0 ? N(ra / rb, "0.00") : "—")}</td></tr>");
                sb.Append("</tbody></table>\n");
            }
            sb.Append("<h3>Data quality</h3>");
            var counts = x.StatusCounts.Where(kv => kv.Value > 0).Select(kv => $"{H(kv.Key)} {kv.Value:N0}");
            sb.Append($"<p>Analysed intervals by status: {string.Join(" · ", counts)}.</p>");
            sb.Append(LedgerTable(xc.Tags().Select(t => t.Tag).Distinct().Select(t => r.Ingest.TagLedgers[t]).ToList()));
            sb.Append("</section>\n");
        }

        sb.Append("<section id=\"ledger\"><h2>Data-quality ledger</h2><table><thead><tr><th>file</th><th>encoding</th><th>delimiter</th><th>decimal</th><th class=\"n\">header line</th><th class=\"n\">unit rows</th><th class=\"n\">data rows</th><th class=\"n\">repeated-hour rows (daylight+standard)</th></tr></thead><tbody>");
        foreach (var f in r.Ingest.Files)
            sb.Append($"<tr><td>{H(Path.GetFileName(f.File))}</td><td>{H(f.Encoding)}</td><td>{(f.Delimiter == '\t' ? "tab" : H(f.Delimiter.ToString()))}</td><td>{H(f.DecimalSeparator.ToString())}</td><td class=\"n\">{f.HeaderLine}</td><td class=\"n\">{f.MetadataRows}</td><td class=\"n\">{f.DataRows:N0}</td><td class=\"n\">{f.AmbiguousLocalTimesAsDaylight}+{f.AmbiguousLocalTimesAsStandard}</td></tr>");
        sb.Append("</tbody></table>\n<p>Every value read is either used or counted as rejected with its reason: read = used + rejected, for every tag.</p></section>\n");

        sb.Append("<section id=\"methods\"><h2>Methods and sources</h2><ul>");
        foreach (var m in Methods) sb.Append($"<li>{H(m)}</li>");
        sb.Append("</ul></section>\n");
        sb.Append($"<footer><p>{H(ResultWriter.Caution)}</p><p>Written by FoulingWatch from the plant configuration {H(Path.GetFileName(cfg.File))}.</p></footer>\n");
        sb.Append("<script>window.addEventListener('load',function(){var im=document.images,ok=0;for(var i=0;i<im.length;i++){if(im[i].complete&&im[i].naturalWidth>0)ok++;}document.body.setAttribute('data-images',ok+'/'+im.length);document.body.setAttribute('data-page-width',document.documentElement.scrollWidth+'/'+window.innerWidth);});</script>\n");
        sb.Append("</body>\n</html>\n");
        // Every table scrolls in its own box on screen (the page never grows wider than the window) and wraps in print.
        return sb.Replace("<table", "<div class=\"scroll\"><table").Replace("</table>", "</table></div>").ToString();
    }

    private static string Card(string title, string value, string note) =>
        $"<div class=\"card\"><div class=\"t\">{WebUtility.HtmlEncode(title)}</div><div class=\"v\">{WebUtility.HtmlEncode(value)}</div><div class=\"s\">{WebUtility.HtmlEncode(note)}</div></div>";

    private static string Figure(Chart c) =>
        $"<figure><img alt=\"{WebUtility.HtmlEncode(c.Title)}\" width=\"{c.Width}\" height=\"{c.Height}\" src=\"data:image/png;base64,{Convert.ToBase64String(c.Png)}\"><figcaption>{WebUtility.HtmlEncode(c.Title)}</figcaption></figure>\n";

    private static string LedgerTable(IReadOnlyList<TagLedger> ledgers)
    {
        var sb = new StringBuilder("<table class=\"ledger\"><thead><tr><th>tag</th><th class=\"n\">read</th><th class=\"n\">used</th>");
        foreach (var r in RejectReasons.All) sb.Append($"<th class=\"n\">{r.Key()}</th>");
        sb.Append("<th class=\"n\">intervals ok / bridged / missing</th></tr></thead><tbody>");
        foreach (var l in ledgers)
        {
            sb.Append($"<tr><td><span class=\"tag\">{WebUtility.HtmlEncode(l.Tag)}</span></td><td class=\"n\">{l.Read:N0}</td><td class=\"n\">{l.Used:N0}</td>");
            foreach (var v in l.Rejected) sb.Append($"<td class=\"n\">{v:N0}</td>");
            sb.Append($"<td class=\"n\">{l.IntervalsWithData:N0} / {l.IntervalsBridged:N0} / {l.IntervalsMissing:N0}</td></tr>");
        }
        return sb.Append("</tbody></table>\n").ToString();
    }

    public static readonly string[] Methods =
    [
        "Water and steam: IAPWS-IF97 (IAPWS R7-97(2012)), regions 1, 2 and 4; a condensing or evaporating side is isothermal at its saturation temperature for the LMTD, with superheat and subcooling counted in the duty.",
        "Petroleum liquids: heat capacity by Kesler & Lee (Hydrocarbon Processing 55(3), 1976), as in the API Technical Data Book procedure 7D2.2, from API gravity or specific gravity and Watson K.",
        "Duty Q = ṁ·Δh per stream; the balance mismatch between hot and cold duties flags the sample beyond the configured tolerance. Optional data reconciliation by weighted least squares subject to the energy balance (Narasimhan & Jordache, 2000), with the χ² global test.",
        "Actual U = Q/(A·F·LMTD); F by Bowman, Mueller & Nagle (1940) for 1-2N shells, and from the effectiveness-NTU relations (Kays & London) for the other arrangements.",
        "Clean U at today's flows: from the datasheet with each film scaled as h ∝ ṁⁿ (tube 0.8, Dittus–Boelter; shell 0.6, common practice), or fitted after a cleaning by the Wilson-plot method (Wilson, 1915) with a fouling term for the deposits growing meanwhile and the intercept held at its physical minimum; refitted after every logged cleaning as a health indicator.",
        "Instrument drift: two-sided tabular CUSUM (Page, 1954) on the daily heat-balance mismatch over the whole record, the onset dated by two-phase least squares, the sensor by the bias that best explains the mismatch; data after the onset are not used for fouling.",
        "Fouling resistance Rf = 1/U − 1/U_clean; its uncertainty by first-order propagation of the sensor accuracies (in the manner of ASME PTC 19.1); lost duty by effectiveness-NTU at U_clean and at U with today's inlets and flows.",
        "Trends: daily medians; cleanings from the maintenance log and detected as sustained falls; per cycle linear, asymptotic (Kern & Seaton, 1959) and falling-rate laws fitted by Levenberg–Marquardt, chosen by AICc; limit dates with a 90 % interval by parametric bootstrap of the parameter covariance.",
        "Economics: lost duty made up by heater fuel (÷ efficiency), CO2 by IPCC 2006 default factors; cost-optimal cleaning interval minimising the average cost rate (C + ∫c dt)/(t + τ), t* = √(2C/β) for linear cost growth; windows assigned by an exact min-cost-flow solution of the capacity-constrained assignment.",
    ];

    private const string Css = """
        body{font-family:"DejaVu Sans",Arial,sans-serif;color:#1a1a1a;margin:0 auto;max-width:1060px;padding:0 18px;line-height:1.45}
        h1{font-size:1.7em;margin:.6em 0 .2em} h2{font-size:1.3em;border-bottom:2px solid #0072B2;padding-bottom:.15em;margin-top:1.6em} h3{font-size:1.05em;margin-top:1.2em}
        .meta{color:#555;font-size:.92em} .warn{color:#a33c00;font-weight:bold}
        .caution{background:#fff5e0;border-left:5px solid #E69F00;padding:.6em .9em;margin:1em 0;font-size:.93em}
        .cards{display:flex;flex-wrap:wrap;gap:12px;margin:.6em 0}
        .card{flex:1 1 200px;border:1px solid #ccd;border-radius:6px;padding:.6em .8em;background:#f7f9fc}
        .card .t{font-size:.85em;color:#555}.card .v{font-size:1.45em;font-weight:bold;color:#0072B2}.card .s{font-size:.8em;color:#666}
        table{border-collapse:collapse;width:100%;margin:.6em 0;font-size:.88em} th,td{border-bottom:1px solid #dde;padding:.28em .45em;text-align:left;vertical-align:top}
        th{background:#eef2f7} td.n,th.n{text-align:right;white-space:nowrap} table.state th{width:170px;background:#f7f9fc}
        figure{margin:.8em 0;page-break-inside:avoid} figure img{max-width:100%;height:auto;border:1px solid #e3e6ea} figcaption{font-size:.85em;color:#555}
        footer{margin:2em 0;font-size:.85em;color:#555;border-top:1px solid #ccd}
        a{color:#0072B2} table.plan td:last-child{min-width:280px} table.plan td:nth-child(3),table.plan td:nth-child(4){white-space:nowrap}
        .scroll{overflow-x:auto;max-width:100%} .tag{white-space:nowrap}
        @media print{body{max-width:none;font-size:9pt;padding:0} section.exchanger{page-break-before:always} .caution{border:1px solid #E69F00} a{color:inherit;text-decoration:none}
          .scroll{overflow:visible} table{font-size:7.5pt} th,td{padding:.2em .3em} td{overflow-wrap:break-word} table.plan td:last-child{min-width:0}
          th.n{white-space:normal} .tag{white-space:nowrap} tr{break-inside:avoid;page-break-inside:avoid}}
        @page{size:A4;margin:12mm}
        """;
}
