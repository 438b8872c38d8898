// Text rows written as bytes into one preallocated buffer: numbers in fixed-point, byte for byte
// what Number.prototype.toFixed gives (ECMA-262 §21.1.3.3: the integer n nearest x·10^d, the
// larger on a tie, i.e. halves away from zero, the sign kept for a negative x that rounds to
// zero), without building a string per value. The trace writer's per-tick cost was dominated by
// one toFixed string and one concatenation per value (docs/bench.md).
//
// Fast path: scaled = |x|·10^d in doubles. Its rounding error is at most half an ulp of scaled
// (≤ scaled·2^-53, IEEE 754 round-to-nearest); unless the fraction of scaled lies within that of
// one half, rounding it to the nearest integer picks the same n as exact decimal arithmetic, and
// n < 2^53 is then exact in a double, so its digits come from integer division. Every other
// value (near a tie, too large, NaN, ±Infinity) takes toFixed itself, so the text never differs.

const POWERS_OF_TEN = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10];
/** Largest scaled value of the fast path: below 2^53, so n and its digits are exact integers. */
const FAST_LIMIT = 1e15;
/** A bound on the relative error of one double product (2^-53), doubled for margin. */
const PRODUCT_ERROR = 2 ** -52;
const MINUS = 45;
const DOT = 46;
const ZERO = 48;
const INT32_LIMIT = 2 ** 31;

export class ByteRows {
  private readonly bytes: Uint8Array;
  private length = 0;
  /** Digits of the integer part, least significant first (scratch for writeFixed). */
  private readonly digits = new Uint8Array(24);

  /**
   * `capacity`: buffer size in bytes; `flush(bytes, length)` receives the filled part when a write
   * would not fit (and on flush()), and must be done with it before it returns.
   */
  constructor(
    capacity: number,
    private readonly onFlush: (bytes: Uint8Array, length: number) => void,
  ) {
    if (!(capacity >= 256)) throw new RangeError(`ByteRows: capacity ${capacity} must be ≥ 256 bytes`);
    this.bytes = new Uint8Array(capacity);
  }

  /** Hands the filled part to the flush callback and empties the buffer. */
  flush(): void {
    if (this.length === 0) return;
    this.onFlush(this.bytes, this.length);
    this.length = 0;
  }

  /** One ASCII byte (a comma, a newline, a digit). */
  writeByte(code: number): void {
    if (this.length >= this.bytes.length) this.flush();
    this.bytes[this.length++] = code;
  }

  /** A string of any characters, UTF-8 encoded (used for the rare values off the fast path). */
  writeText(text: string): void {
    for (let k = 0; k < text.length; k++) {
      const code = text.charCodeAt(k);
      if (code < 0x80) {
        this.writeByte(code);
      } else {
        const encoded = Buffer.from(text.slice(k), 'utf8');
        for (let b = 0; b < encoded.length; b++) this.writeByte(encoded[b]);
        return;
      }
    }
  }

  /** values[index].toFixed(decimals) as bytes, 0 ≤ decimals ≤ 10. */
  writeFixed(values: Float64Array, index: number, decimals: number): void {
    const x = values[index];
    const negative = x < 0;
    const magnitude = negative ? -x : x;
    const power = POWERS_OF_TEN[decimals];
    const scaled = magnitude * power;
    // NaN and ±Infinity fail the first test; large values have digits beyond exact integers.
    if (!(scaled < FAST_LIMIT)) {
      this.writeText(x.toFixed(decimals));
      return;
    }
    let n = Math.floor(scaled);
    const fraction = scaled - n; // exact: n and scaled share their leading bits
    const distance = fraction - 0.5;
    if ((distance < 0 ? -distance : distance) <= scaled * PRODUCT_ERROR) {
      this.writeText(x.toFixed(decimals)); // within rounding of a tie: let toFixed decide
      return;
    }
    if (fraction > 0.5) n += 1;
    if (this.length + 40 > this.bytes.length) this.flush();
    const out = this.bytes;
    let at = this.length;
    if (negative) out[at++] = MINUS;
    const whole = Math.floor(n / power);
    const part = n - whole * power;
    at = whole < INT32_LIMIT ? this.wholeDigits32(at, whole | 0) : this.wholeDigits(at, whole);
    if (decimals > 0) {
      out[at++] = DOT;
      // The fraction's digits, most significant first, zero-padded to `decimals`.
      if (part < INT32_LIMIT) {
        let rest = part | 0;
        for (let k = decimals - 1; k >= 0; k--) {
          const next = (rest / 10) | 0; // int32 division by a constant: a multiply and a shift
          out[at + k] = ZERO + (rest - next * 10);
          rest = next;
        }
      } else {
        let rest = part;
        for (let k = decimals - 1; k >= 0; k--) {
          const next = Math.floor(rest / 10);
          out[at + k] = ZERO + (rest - next * 10);
          rest = next;
        }
      }
      at += decimals;
    }
    this.length = at;
  }

  /** The digits of a whole number below 2^31 at out[at…]; returns the index after them. */
  private wholeDigits32(at: number, whole: number): number {
    let count = 0;
    let rest = whole;
    do {
      const next = (rest / 10) | 0;
      this.digits[count++] = rest - next * 10;
      rest = next;
    } while (rest > 0);
    while (count > 0) this.bytes[at++] = ZERO + this.digits[--count];
    return at;
  }

  /** wholeDigits32 for a whole number of up to 2^53 (exact in doubles). */
  private wholeDigits(at: number, whole: number): number {
    let count = 0;
    let rest = whole;
    do {
      const next = Math.floor(rest / 10);
      this.digits[count++] = rest - next * 10;
      rest = next;
    } while (rest > 0);
    while (count > 0) this.bytes[at++] = ZERO + this.digits[--count];
    return at;
  }
}
