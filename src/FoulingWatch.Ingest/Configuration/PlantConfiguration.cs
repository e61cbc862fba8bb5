using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Units;

namespace FoulingWatch.Ingest.Configuration;

/// <summary>A validated plant configuration, SI inside. Made only by <see cref="PlantConfigurationReader"/>.</summary>
public sealed record PlantConfiguration(
    string File,
    SiteSettings Site,
    DataSettings Data,
    EconomicsSettings Economics,
    IReadOnlyList<ShutdownWindow> ShutdownWindows,
    IReadOnlyList<ExchangerConfiguration> Exchangers,
    WatchSettings Watch);

/// <summary>Settings of the monitoring service (<c>foulingwatch watch</c>); paths absolute.</summary>
/// <param name="AlertHorizon">A limit forecast inside this horizon raises an alert.</param>
/// <param name="StaleAfter">No new data for this long raises a "data stopped" alert.</param>
/// <param name="LogLevel">Least severe log events written: verbose, debug, information, warning, error or fatal.</param>
/// <param name="Corrections">A dropped file with the name of one already read but other content (not just grown):
/// "latest" (default) reads it as a correction whose values replace the stored ones and whose counts replace the earlier
/// file's; "first" keeps the stored values and reads it as another export (values already held count as duplicates).</param>
public sealed record WatchSettings(string DropFolder, string Store, string Out, string Log, TimeSpan PollInterval, TimeSpan SettleTime,
    TimeSpan AlertHorizon, TimeSpan StaleAfter, string LogLevel = "information", string Corrections = "latest")
{
    public static readonly string[] LogLevels = ["verbose", "debug", "information", "warning", "error", "fatal"];
    public static readonly string[] CorrectionPolicies = ["latest", "first"];
}

/// <summary>Site name, its time zone (for historian local times) and the atmosphere used for gauge pressures in Pa.</summary>
public sealed record SiteSettings(string Name, TimeZoneInfo TimeZone, double AtmospherePascals);

/// <summary>Where the historian exports are and how they are aligned: grid interval, longest gap bridged, analysis window [start, end).</summary>
/// <param name="FrozenAfter">A measurement holding one value this long while the exchanger runs is taken as frozen
/// (default 2 h); zero turns the check off.</param>
public sealed record DataSettings(
    IReadOnlyList<HistorianSource> Sources,
    TimeSpan Interval,
    TimeSpan MaxGap,
    DateTimeOffset? WindowStart,
    DateTimeOffset? WindowEnd,
    TimeSpan? FrozenAfter = null)
{
    public static readonly TimeSpan DefaultFrozenAfter = TimeSpan.FromHours(2);
}

public enum HistorianLayout { Wide, Long }

/// <summary>How the timestamp column is read. Format null: ISO 8601 and common variants, detected; "serial": spreadsheet serial days.</summary>
public sealed record TimestampSettings(string? Column, string? Format, bool AssumeUtc);

/// <summary>One historian export source: a set of files of one layout and dialect, merged in time.</summary>
public sealed record HistorianSource(
    string Id,
    string Path,
    IReadOnlyList<string> Patterns,
    IReadOnlyList<string> Files,
    HistorianLayout Layout,
    char? Delimiter,
    char? DecimalSeparator,
    string? Encoding,
    int? HeaderLine,
    int? MetadataRows,
    TimestampSettings Timestamp,
    IReadOnlyList<string> Markers,
    string TagColumn,
    string ValueColumn,
    string? QualityColumn,
    IReadOnlyList<string> GoodQuality);

/// <summary>A historian tag as a measurement: its unit resolved to SI once, accuracy and plausible range in SI.</summary>
/// <param name="Path">The configuration path of this tag, for messages.</param>
/// <param name="Density">kg/m³, for a volumetric flow tag converted to mass flow; else null.</param>
/// <param name="AccuracyAbsolute">One-sigma accuracy in SI (K or kg/s), or null.</param>
/// <param name="AccuracyRelative">One-sigma accuracy as a fraction of reading, or null.</param>
public sealed record TagReference(
    string Tag,
    string? Source,
    LinearUnit Unit,
    double? Density,
    double? AccuracyAbsolute,
    double? AccuracyRelative,
    double RangeMinimum,
    double RangeMaximum,
    string Path)
{
    /// <summary>SI value of a reading in the tag's unit (mass flow for a volumetric tag with its density).</summary>
    public double ToSi(double reading) => Density is { } rho ? Unit.ToSi(reading) * rho : Unit.ToSi(reading);

    /// <summary>One-sigma uncertainty in SI of an SI value.</summary>
    public double Sigma(double si) => Math.Sqrt(Math.Pow(AccuracyAbsolute ?? 0, 2) + Math.Pow((AccuracyRelative ?? 0) * si, 2));
}

/// <summary>Which side of a shell-and-tube the stream is on; plates and double-pipes use tube/shell for "channel 1/2".</summary>
public enum ExchangerSide { Tube, Shell }

/// <summary>A stream through the exchanger: fluid model, pressure (Pa, absolute) and tags.</summary>
public sealed record StreamConfiguration(
    StreamSide Stream,
    ExchangerSide Side,
    IFluidModel Fluid,
    TagReference Flow,
    TagReference Inlet,
    TagReference Outlet,
    double PressurePascals,
    TagReference? PressureTag,
    double? DesignFlow,
    TagReference? PressureDropTag = null,
    double? TubeInnerDiameter = null,
    double? DepositConductivity = null);

public enum DutyBasis { Hot, Cold, Mean, Reconciled }

/// <summary>How the clean U at today's conditions is obtained.</summary>
public abstract record CleanReference(double TubeExponent, double ShellExponent);

/// <summary>Clean U from the datasheet at design flows, each side's film scaled as h ∝ ṁⁿ.</summary>
/// <param name="CleanU">Clean U at design flows, W/(m²·K), referred to the exchanger area.</param>
/// <param name="TubeShare">Fraction of the clean film resistance (1/U − wall) on the tube side, 0–1.</param>
/// <param name="WallResistance">Wall resistance referred to the area, m²·K/W.</param>
/// <param name="RelativeUncertainty">Standard uncertainty of the datasheet clean U as a fraction of it (default 5 %).</param>
/// <param name="TubeBulkTemperature">Design bulk temperature of the tube side (K): when given, the tube film is scaled with
/// the fluid's properties at today's bulk temperature as well as with flow; null: flow only.</param>
public sealed record DatasheetCleanReference(
    double CleanU, double DesignTubeFlow, double DesignShellFlow, double TubeShare, double WallResistance,
    double TubeExponent, double ShellExponent, double RelativeUncertainty = DatasheetCleanReference.DefaultUncertainty,
    double? TubeBulkTemperature = null, double? ShellBulkTemperature = null)
    : CleanReference(TubeExponent, ShellExponent)
{
    /// <summary>Default standard uncertainty of a datasheet clean U: 5 % (from memory: film-coefficient correlations
    /// behind a rating are quoted to ±10–20 % at about 95 %, and the clean U inherits a share of it).</summary>
    public const double DefaultUncertainty = 0.05;
}

/// <summary>Clean U from the exchanger's geometry and both fluids' properties at each interval's flows and bulk
/// temperatures: tube side Gnielinski (Hausen when laminar), shell side Kern, tube-wall conduction.</summary>
/// <param name="RelativeUncertainty">Standard uncertainty of 1/U_clean as a fraction of it (default 15 %).</param>
public sealed record GeometryCleanReference(Core.Exchangers.ShellAndTubeGeometry Geometry, double RelativeUncertainty = GeometryCleanReference.DefaultUncertainty)
    : CleanReference(0.8, 0.55)
{
    /// <summary>Default standard uncertainty of a clean U from correlations: 15 % (common practice, from memory:
    /// Gnielinski is quoted within about ±10 % in its range, Kern's shell side within ±20–30 %).</summary>
    public const double DefaultUncertainty = 0.15;
}

/// <summary>Clean U of a chevron-plate exchanger from its plate pack and both fluids' properties (Martin's correlation
/// on each side, plate conduction).</summary>
public sealed record PlateGeometryCleanReference(Core.Exchangers.PlateGeometry Geometry, double RelativeUncertainty = GeometryCleanReference.DefaultUncertainty)
    : CleanReference(0.75, 0.75);

/// <summary>Clean U fitted (Wilson plot) from the first days of operation after a cleaning.</summary>
/// <param name="Start">Start of the calibration period; null: the last logged cleaning, else the first data.</param>
/// <param name="PropertyCorrected">Each side's film term also follows its fluid's viscosity, conductivity and cp at the
/// interval's bulk temperature (Dittus–Boelter form), relative to the calibration window's median bulk temperature.</param>
public sealed record BaselineCleanReference(TimeSpan Duration, DateTimeOffset? Start, double TubeExponent, double ShellExponent,
    bool PropertyCorrected = false)
    : CleanReference(TubeExponent, ShellExponent);

/// <summary>Limits that define "must clean": fouling resistance (m²·K/W), minimum duty (W), minimum cold outlet (K).</summary>
public sealed record ExchangerLimits(double? FoulingResistance, double? MinimumDuty, double? MinimumColdOutlet, double? MaximumHotOutlet);

/// <summary>A past maintenance event. Cleanings start a new fouling cycle.</summary>
public sealed record MaintenanceEvent(DateTimeOffset Date, string Action, string? Note)
{
    public bool IsCleaning => Action.Equals("cleaned", StringComparison.OrdinalIgnoreCase);
}

/// <summary>What the threshold fouling model needs: the tube-side Reynolds number at design flow, the Prandtl number,
/// the deposition activation energy (J/mol) and how far the film temperature lies above the tube-side bulk mean (K).</summary>
public sealed record ThresholdSettings(double ReynoldsAtDesign, double Prandtl, double ActivationEnergy, double FilmTemperatureRise);

/// <summary>Cost of one cleaning (in the site currency), its downtime, and what an unplanned stop at the limit adds.</summary>
/// <param name="DowntimeCostPerDay">Money per day out of service; null: the exchanger's whole duty priced as lost.</param>
/// <param name="UnplannedStopCost">Extra money of an unplanned stop beyond a planned cleaning; null: the cleaning cost again.</param>
/// <param name="UnplannedDowntime">Downtime of an unplanned stop; null: the planned downtime.</param>
/// <param name="LeadTime">Earliest a cleaning outside a window can be done from the end of the data; null: 14 days.</param>
public sealed record CleaningSettings(double? Cost, TimeSpan? Downtime, double? DowntimeCostPerDay, double? UnplannedStopCost = null,
    TimeSpan? UnplannedDowntime = null, TimeSpan? LeadTime = null);

public sealed record ExchangerConfiguration(
    string Id,
    string Service,
    string Path,
    FlowArrangement Arrangement,
    double Area,
    StreamConfiguration Hot,
    StreamConfiguration Cold,
    DutyBasis DutyBasis,
    double BalanceTolerance,
    double DowntimeFlowFraction,
    CleanReference Clean,
    ExchangerLimits Limits,
    CleaningSettings Cleaning,
    IReadOnlyList<MaintenanceEvent> Maintenance,
    EconomicsSettings? Economics,
    ThresholdSettings? Threshold = null)
{
    /// <summary>The exchanger's result folder name: letters, digits, '-', '_' and '.' kept, anything else '_'; a name that
    /// starts with '.' (such as "..") gets a leading '_', so no id can point outside the results folder.</summary>
    public static string FolderNameOf(string id)
    {
        var name = string.Concat(id.Select(c => char.IsLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '_'));
        return name.Length == 0 || name[0] == '.' ? "_" + name : name;
    }

    public StreamConfiguration Tube => Hot.Side == ExchangerSide.Tube ? Hot : Cold;
    public StreamConfiguration Shell => Hot.Side == ExchangerSide.Shell ? Hot : Cold;
    public IEnumerable<TagReference> Tags()
    {
        foreach (var s in new[] { Hot, Cold })
        {
            yield return s.Flow;
            yield return s.Inlet;
            yield return s.Outlet;
            if (s.PressureTag is not null) yield return s.PressureTag;
            if (s.PressureDropTag is not null) yield return s.PressureDropTag;
        }
    }
}

/// <summary>Site economics, SI energy inside: prices per J, CO2 in kg per J of fuel.</summary>
public sealed record EconomicsSettings(
    string Currency,
    string? Fuel,
    double? FuelPricePerJoule,
    double? HeaterEfficiency,
    double? Co2KilogramsPerJoule,
    double? Co2PricePerKilogram,
    double? LostCoolingCostPerJoule,
    double DecisionConfidence = EconomicsSettings.DefaultDecisionConfidence)
{
    /// <summary>A recommendation right with a lower probability than this is labelled "uncertain" (default 80 %).</summary>
    public const double DefaultDecisionConfidence = 0.8;
}

/// <summary>A planned shutdown window [Start, End) that can take up to Capacity cleanings.</summary>
public sealed record ShutdownWindow(string Name, DateTimeOffset Start, DateTimeOffset End, int Capacity);
