namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>Whether an analysed instant was used, or why not.</summary>
public enum SampleStatus
{
    Ok,
    /// <summary>One of the six measurements is missing in the interval.</summary>
    Missing,
    /// <summary>A flow is below the configured fraction of design (or typical) flow.</summary>
    Downtime,
    /// <summary>Flows or inlet temperatures moved too much over the trailing steady-state window.</summary>
    Unsteady,
    /// <summary>Hot- and cold-side duties disagree beyond the configured tolerance.</summary>
    Balance,
    /// <summary>The terminal temperatures give no positive LMTD (a temperature cross or a cold side not warming).</summary>
    TemperatureCross,
    /// <summary>P lies beyond the arrangement's maximum: the LMTD correction factor is undefined.</summary>
    CorrectionUndefined,
    /// <summary>A fluid property model cannot evaluate the stream's temperatures or pressure.</summary>
    PropertyRange,
    /// <summary>A stream shows no heat transfer in the expected direction (hot side not cooling).</summary>
    NoDuty,
    /// <summary>A measurement held one value for longer than <c>data.frozenAfter</c> while the exchanger ran: a stuck
    /// transmitter or a historian repeating its last good value.</summary>
    Frozen,
    /// <summary>The sample lies after the onset of a lasting heat-balance change (an instrument drifting): its Rf would
    /// carry the drift, so it is not used for fouling.</summary>
    Drift,
    /// <summary>The measured U is far above the clean U (cleanliness above <see cref="SampleStatusText.MaxCleanliness"/>):
    /// no deposit explains it; a flow scale or unit, the area or the clean reference is wrong.</summary>
    Implausible,
}

public static class SampleStatusText
{
    public static string Key(this SampleStatus s) => s switch
    {
        SampleStatus.Ok => "ok",
        SampleStatus.Missing => "missing",
        SampleStatus.Downtime => "downtime",
        SampleStatus.Unsteady => "unsteady",
        SampleStatus.Balance => "balance",
        SampleStatus.TemperatureCross => "temperature-cross",
        SampleStatus.CorrectionUndefined => "correction-undefined",
        SampleStatus.PropertyRange => "property-range",
        SampleStatus.NoDuty => "no-duty",
        SampleStatus.Frozen => "frozen",
        SampleStatus.Drift => "drift",
        SampleStatus.Implausible => "implausible",
        _ => s.ToString().ToLowerInvariant(),
    };

    public static readonly SampleStatus[] All = Enum.GetValues<SampleStatus>();

    /// <summary>Highest cleanliness (U / U_clean) taken as a measurement (common practice: a clean reference is rarely
    /// more than 20–30 % off, and measurement scatter adds a few percent; 1.5 leaves room for both).</summary>
    public const double MaxCleanliness = 1.5;
}
