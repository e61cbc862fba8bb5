using System.Globalization;

namespace FoulingWatch.Core.Quantities;

/// <summary>A value outside its physical or model range; the message names the quantity, the value and the valid range.</summary>
public class QuantityOutOfRangeException : ArgumentOutOfRangeException
{
    public QuantityOutOfRangeException(string quantity, double value, string unit, string validRange)
        : base(quantity, value, null)
    {
        Text = string.Create(CultureInfo.InvariantCulture, $"{quantity} = {value:G6} {unit} is out of range; valid: {validRange}.");
        Quantity = quantity;
        Unit = unit;
        ValidRange = validRange;
    }

    /// <summary>Throws the exception: kept out of the quantities' constructors so that those stay small enough to be
    /// inlined (they run a few times per probe of every sample).</summary>
    [System.Diagnostics.CodeAnalysis.DoesNotReturn]
    public static void Throw(string quantity, double value, string unit, string validRange) =>
        throw new QuantityOutOfRangeException(quantity, value, unit, validRange);

    public string Quantity { get; }
    public string Unit { get; }
    public string ValidRange { get; }
    private string Text { get; }
    public override string Message => Text;
}

/// <summary>A property model was asked for a state outside its validity range.</summary>
public sealed class PropertyRangeException : QuantityOutOfRangeException
{
    public PropertyRangeException(string model, string quantity, double value, string unit, string validRange)
        : base($"{model}: {quantity}", value, unit, validRange)
    {
        Model = model;
    }

    public string Model { get; }
}
