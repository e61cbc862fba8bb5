using System.Text;

namespace FoulingWatch.Cli;

/// <summary>A plain monospace table for the console: left-aligned first column, right-aligned numbers.</summary>
public sealed class TextTable(params string[] headers)
{
    private readonly List<string[]> _rows = [];

    public TextTable Add(params object[] cells)
    {
        _rows.Add(cells.Select(c => c switch
        {
            double d => d.ToString("0.###", System.Globalization.CultureInfo.InvariantCulture),
            IFormattable f => f.ToString(null, System.Globalization.CultureInfo.InvariantCulture),
            _ => c?.ToString() ?? "",
        }).ToArray());
        return this;
    }

    public override string ToString()
    {
        var widths = headers.Select((h, i) => Math.Max(h.Length, _rows.Count == 0 ? 0 : _rows.Max(r => i < r.Length ? r[i].Length : 0))).ToArray();
        var sb = new StringBuilder();
        void Line(string[] cells)
        {
            for (var i = 0; i < widths.Length; i++)
            {
                var c = i < cells.Length ? cells[i] : "";
                sb.Append(i == 0 ? c.PadRight(widths[i]) : c.PadLeft(widths[i]));
                sb.Append(i < widths.Length - 1 ? "  " : "");
            }
            sb.AppendLine();
        }
        Line(headers);
        sb.AppendLine(string.Join("  ", widths.Select(w => new string('-', w))));
        foreach (var r in _rows) Line(r);
        return sb.ToString();
    }
}
