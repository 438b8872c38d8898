// Framing: how messages are delimited on the byte stream, kept apart from what a message says
// (codec.ts) so another encoding can be swapped in without touching the bridge. Version 1 of the
// protocol uses newline-delimited JSON: one UTF-8 JSON text per line, no raw newlines inside.

export interface FrameDecoder<F = string> {
  /**
   * Feeds one stdout chunk; calls onFrame for every complete frame in order. Returns null, or a
   * description of a framing error (the caller fails the run with it).
   */
  push(chunk: Buffer, onFrame: (frame: F) => void): string | null;
  /** Bytes received but not yet a complete frame (reported when the stream ends mid-frame). */
  pendingBytes(): number;
}

export interface Framing {
  readonly name: string;
  /** Wraps one encoded message for the wire. */
  frame(payload: string): string;
  createDecoder(maxFrame_bytes: number): FrameDecoder;
}

const NEWLINE = 0x0a;
const CARRIAGE_RETURN = 0x0d;

/** Newline-delimited frames; a trailing \r is dropped so builds on any platform work. */
export const newlineFraming: Framing = {
  name: 'ndjson',
  frame: (payload) => payload + '\n',
  createDecoder: (maxFrame_bytes) => new NewlineDecoder(maxFrame_bytes),
};

class NewlineDecoder implements FrameDecoder {
  /** Bytes of an unfinished frame carried over from earlier chunks (rare: pipes deliver whole lines). */
  private carry: Buffer | null = null;

  constructor(private readonly maxFrame_bytes: number) {}

  pendingBytes(): number {
    return this.carry === null ? 0 : this.carry.length;
  }

  push(chunk: Buffer, onFrame: (frame: string) => void): string | null {
    let start = 0;
    let newline = chunk.indexOf(NEWLINE, 0);
    if (this.carry !== null && newline >= 0) {
      const joined = Buffer.concat([this.carry, chunk.subarray(0, newline)]);
      this.carry = null;
      onFrame(lineText(joined, 0, joined.length));
      start = newline + 1;
      newline = chunk.indexOf(NEWLINE, start);
    }
    while (newline >= 0) {
      if (newline - start > this.maxFrame_bytes) return this.tooLong(newline - start);
      onFrame(lineText(chunk, start, newline));
      start = newline + 1;
      newline = chunk.indexOf(NEWLINE, start);
    }
    if (start < chunk.length) {
      const rest = chunk.subarray(start);
      this.carry = this.carry === null ? Buffer.from(rest) : Buffer.concat([this.carry, rest]);
      if (this.carry.length > this.maxFrame_bytes) return this.tooLong(this.carry.length);
    }
    return null;
  }

  private tooLong(length_bytes: number): string {
    return `a line of ${length_bytes} bytes exceeds the limit of ${this.maxFrame_bytes} bytes (is a newline missing?)`;
  }
}

function lineText(buffer: Buffer, start: number, end: number): string {
  if (end > start && buffer[end - 1] === CARRIAGE_RETURN) end--;
  return buffer.toString('utf8', start, end);
}
