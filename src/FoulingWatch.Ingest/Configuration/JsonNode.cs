using System.Globalization;
using System.Text.Json;
using FoulingWatch.Core.Units;

namespace FoulingWatch.Ingest.Configuration;

/// <summary>
/// A JSON object being read for configuration: remembers its path, the keys read, and reports problems to a
/// shared list instead of stopping, so that validation reports everything at once.
/// </summary>
internal sealed class JsonNode
{
    private readonly JsonElement _element;
    private readonly HashSet<string> _known = new(StringComparer.Ordinal);
    private readonly List<ConfigurationError> _errors;

    public JsonNode(JsonElement element, string path, List<ConfigurationError> errors)
    {
        _element = element;
        Path = path;
        _errors = errors;
    }

    public string Path { get; }
    public JsonElement Element => _element;

    public string Child(string key) => Path.Length == 0 ? key : $"{Path}.{key}";

    public void Error(string key, string message) => _errors.Add(new ConfigurationError(Child(key), message));
    public void ErrorHere(string message) => _errors.Add(new ConfigurationError(Path.Length == 0 ? "(top level)" : Path, message));

    /// <summary>When set (the schema's tests), every key the reader asks about is reported with its object's path,
    /// array indexes written as [] ("exchangers[].hot.flow").</summary>
    [ThreadStatic] internal static Action<string, string>? KeyObserver;

    private void Know(string key)
    {
        _known.Add(key);
        KeyObserver?.Invoke(System.Text.RegularExpressions.Regex.Replace(Path, "\\[\\d+\\]", "[]"), key);
    }

    /// <summary>Declares keys this object may have without reading them here.</summary>
    public void Allow(params string[] keys)
    {
        foreach (var k in keys) Know(k);
    }

    public bool Has(string key)
    {
        Know(key);
        return _element.ValueKind == JsonValueKind.Object && _element.TryGetProperty(key, out var v) && v.ValueKind != JsonValueKind.Null;
    }

    private JsonElement? Get(string key, bool required)
    {
        Know(key);
        if (_element.ValueKind == JsonValueKind.Object && _element.TryGetProperty(key, out var v) && v.ValueKind != JsonValueKind.Null) return v;
        if (required) Error(key, "is missing; it is required here.");
        return null;
    }

    public string? String(string key, bool required = false)
    {
        var v = Get(key, required);
        if (v is null) return null;
        if (v.Value.ValueKind != JsonValueKind.String) { Error(key, $"must be a text value in quotes, not {Describe(v.Value)}."); return null; }
        var s = v.Value.GetString()!;
        if (required && string.IsNullOrWhiteSpace(s)) { Error(key, "is empty; it is required here."); return null; }
        return s;
    }

    public double? Number(string key, bool required = false, double? min = null, double? max = null)
    {
        var v = Get(key, required);
        if (v is null) return null;
        if (v.Value.ValueKind != JsonValueKind.Number) { Error(key, $"must be a plain number, not {Describe(v.Value)}."); return null; }
        var d = v.Value.GetDouble();
        if ((min is not null && d < min) || (max is not null && d > max))
        {
            Error(key, string.Create(CultureInfo.InvariantCulture, $"{d} is out of range; use a number from {min?.ToString(CultureInfo.InvariantCulture) ?? "-∞"} to {max?.ToString(CultureInfo.InvariantCulture) ?? "∞"}."));
            return null;
        }
        return d;
    }

    public int? Integer(string key, bool required = false, int? min = null, int? max = null)
    {
        var d = Number(key, required, min, max);
        if (d is null) return null;
        if (d != Math.Floor(d.Value)) { Error(key, $"must be a whole number, not {d.Value.ToString(CultureInfo.InvariantCulture)}."); return null; }
        return (int)d.Value;
    }

    public bool? Boolean(string key)
    {
        var v = Get(key, false);
        if (v is null) return null;
        if (v.Value.ValueKind is JsonValueKind.True or JsonValueKind.False) return v.Value.GetBoolean();
        Error(key, $"must be true or false, not {Describe(v.Value)}.");
        return null;
    }

    /// <summary>A quantity written "250 m2" or { "value": 250, "unit": "m2" }, returned in SI.</summary>
    public double? Quantity(string key, Dimension dimension, bool required = false, double? minSi = null, double? maxSi = null, bool exclusiveMin = false)
    {
        var v = Get(key, required);
        if (v is null) return null;
        return ParseQuantity(Child(key), v.Value, dimension, minSi, maxSi, exclusiveMin);
    }

    public double? ParseQuantity(string path, JsonElement v, Dimension dimension, double? minSi = null, double? maxSi = null, bool exclusiveMin = false)
    {
        double value;
        string unit;
        string unitPath = path;
        if (v.ValueKind == JsonValueKind.String)
        {
            try { (value, unit) = UnitCatalog.SplitNumberAndUnit(v.GetString()!, dimension); }
            catch (FormatException ex) { _errors.Add(new ConfigurationError(path, ex.Message)); return null; }
        }
        else if (v.ValueKind == JsonValueKind.Object)
        {
            var o = new JsonNode(v, path, _errors);
            var n = o.Number("value", required: true);
            var u = o.String("unit", required: true);
            o.Done();
            if (n is null || u is null) return null;
            (value, unit, unitPath) = (n.Value, u, $"{path}.unit");
        }
        else if (v.ValueKind == JsonValueKind.Number)
        {
            _errors.Add(new ConfigurationError(path, $"{v.GetRawText()} has no unit; every number carries its unit, e.g. \"{v.GetRawText()} {UnitCatalog.Accepted(dimension)[0]}\"."));
            return null;
        }
        else
        {
            _errors.Add(new ConfigurationError(path, $"must be a number with its unit, not {Describe(v)}."));
            return null;
        }

        if (!UnitCatalog.TryResolve(unit, dimension, out var resolved))
        {
            _errors.Add(new ConfigurationError(unitPath, new UnknownUnitException(unit, dimension, UnitCatalog.Accepted(dimension)).Message));
            return null;
        }
        var si = resolved.ToSi(value);
        if (!double.IsFinite(si))
        {
            _errors.Add(new ConfigurationError(path, string.Create(CultureInfo.InvariantCulture, $"'{v.GetRawText().Trim('"')}' is not a finite number; check the value.")));
            return null;
        }
        var belowMin = minSi is not null && (exclusiveMin ? si <= minSi : si < minSi);
        if (belowMin || (maxSi is not null && si > maxSi))
        {
            var bound = belowMin ? $"{(exclusiveMin ? "above" : "at least")} {Format(minSi!.Value, resolved)}" : $"at most {Format(maxSi!.Value, resolved)}";
            _errors.Add(new ConfigurationError(path, string.Create(CultureInfo.InvariantCulture, $"{value} {unit} is out of range; it must be {bound}.")));
            return null;
        }
        return si;
    }

    private static string Format(double si, LinearUnit unit) =>
        string.Create(CultureInfo.InvariantCulture, $"{unit.FromSi(si):G6} {unit.Symbol}");

    /// <summary>A fraction written "85 %" or as a plain number from 0 to 1.</summary>
    public double? Fraction(string key, bool required = false, double min = 0, double max = 1)
    {
        var v = Get(key, required);
        if (v is null) return null;
        double f;
        if (v.Value.ValueKind == JsonValueKind.String && v.Value.GetString()!.Trim().EndsWith('%')
            && double.TryParse(v.Value.GetString()!.Trim().TrimEnd('%'), NumberStyles.Float, CultureInfo.InvariantCulture, out var pct))
            f = pct / 100;
        else if (v.Value.ValueKind == JsonValueKind.Number) f = v.Value.GetDouble();
        else { Error(key, $"must be a percentage like \"85 %\" or a fraction like 0.85, not {Describe(v.Value)}."); return null; }
        if (f < min || f > max)
        {
            Error(key, string.Create(CultureInfo.InvariantCulture, $"{f * 100:G4} % is out of range; use {min * 100:G4} % to {max * 100:G4} %."));
            return null;
        }
        return f;
    }

    public JsonNode? Object(string key, bool required = false)
    {
        var v = Get(key, required);
        if (v is null) return null;
        if (v.Value.ValueKind != JsonValueKind.Object) { Error(key, $"must be an object {{ … }}, not {Describe(v.Value)}."); return null; }
        return new JsonNode(v.Value, Child(key), _errors);
    }

    public IReadOnlyList<(JsonElement Element, string Path)> Array(string key, bool required = false)
    {
        var v = Get(key, required);
        if (v is null) return [];
        if (v.Value.ValueKind != JsonValueKind.Array) { Error(key, $"must be a list [ … ], not {Describe(v.Value)}."); return []; }
        return v.Value.EnumerateArray().Select((e, i) => (e, $"{Child(key)}[{i}]")).ToList();
    }

    public JsonNode? AsObject(JsonElement e, string path)
    {
        if (e.ValueKind == JsonValueKind.Object) return new JsonNode(e, path, _errors);
        _errors.Add(new ConfigurationError(path, $"must be an object {{ … }}, not {Describe(e)}."));
        return null;
    }

    public void ErrorAt(string path, string message) => _errors.Add(new ConfigurationError(path, message));

    /// <summary>Reports keys present in the object that were never read or allowed, with a suggestion.</summary>
    public void Done()
    {
        if (_element.ValueKind != JsonValueKind.Object) return;
        foreach (var p in _element.EnumerateObject())
        {
            if (_known.Contains(p.Name)) continue;
            var near = Suggest.Closest(p.Name, _known);
            Error(p.Name, near is null
                ? $"is not a known key here; known keys: {string.Join(", ", _known.Order(StringComparer.Ordinal))}."
                : $"is not a known key here; did you mean '{near}'?");
        }
    }

    public static string Describe(JsonElement e) => e.ValueKind switch
    {
        JsonValueKind.String => $"the text \"{e.GetString()}\"",
        JsonValueKind.Number => $"the number {e.GetRawText()}",
        JsonValueKind.True or JsonValueKind.False => $"the value {e.GetRawText()}",
        JsonValueKind.Array => "a list",
        JsonValueKind.Object => "an object",
        _ => "null",
    };
}
