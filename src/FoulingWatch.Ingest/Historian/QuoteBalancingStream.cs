namespace FoulingWatch.Ingest.Historian;

/// <summary>
/// Passes an export through <see cref="HistorianIngest.BalanceQuotesPerLine"/> on its way to the CSV reader, so a
/// stray quote in a long export loses one value, as in a wide one, instead of swallowing every row up to the next
/// quote. Bytes are handed on only once their lines are decided (a quoted field may close up to
/// <see cref="HistorianIngest.MaxLineBreaksInField"/> lines later); memory stays one block and the undecided tail.
/// </summary>
internal sealed class QuoteBalancingStream(Stream inner, char delimiter) : Stream
{
    private const int Block = 1 << 16;
    private byte[] _buffer = new byte[2 * Block];
    private int _start, _decided, _filled;
    private bool _atEnd;

    public override int Read(Span<byte> destination)
    {
        while (_start == _decided && !(_atEnd && _decided == _filled))
        {
            // keep the undecided tail, read a block more, decide what can be decided
            var tail = _filled - _start;
            if (_buffer.Length - tail < Block) Array.Resize(ref _buffer, Math.Max(2 * _buffer.Length, tail + Block));
            Array.Copy(_buffer, _start, _buffer, 0, tail);
            (_start, _filled) = (0, tail);
            var n = inner.Read(_buffer, _filled, _buffer.Length - _filled);
            _filled += n;
            _atEnd = n == 0;
            _decided = HistorianIngest.BalanceQuotesPerLine(_buffer.AsSpan(0, _filled), _atEnd, (byte)delimiter);
            // hand on whole lines only: the next pass must see each line from its start
            if (!_atEnd) _decided = _buffer.AsSpan(0, _decided).LastIndexOfAny((byte)'\n', (byte)'\r') + 1;
        }
        var count = Math.Min(destination.Length, _decided - _start);
        _buffer.AsSpan(_start, count).CopyTo(destination);
        _start += count;
        return count;
    }

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    protected override void Dispose(bool disposing)
    {
        if (disposing) inner.Dispose();
        base.Dispose(disposing);
    }

    public override bool CanRead => true;
    public override bool CanSeek => false;
    public override bool CanWrite => false;
    public override long Length => throw new NotSupportedException();
    public override long Position { get => throw new NotSupportedException(); set => throw new NotSupportedException(); }
    public override void Flush() { }
    public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
    public override void SetLength(long value) => throw new NotSupportedException();
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
}
