import { describe, expect, it } from 'vitest';
import { ByteRows } from '../../harness/results/fixedDecimal.js';
import { SeededRandom } from '../../harness/plant/random.js';

/** The bytes ByteRows writes for each value, one value per line, as text. */
function written(values: Float64Array, decimals: number, capacity = 256): string[] {
  const chunks: Buffer[] = [];
  const rows = new ByteRows(capacity, (bytes, length) => chunks.push(Buffer.from(bytes.subarray(0, length))));
  for (let k = 0; k < values.length; k++) {
    rows.writeFixed(values, k, decimals);
    rows.writeByte(10);
  }
  rows.flush();
  return Buffer.concat(chunks).toString('utf8').split('\n').slice(0, -1);
}

function expectToFixed(values: number[], decimals: number): void {
  const got = written(Float64Array.from(values), decimals);
  values.forEach((x, k) => {
    if (got[k] !== x.toFixed(decimals)) expect(`${x} → ${got[k]}`).toBe(`${x} → ${x.toFixed(decimals)}`);
  });
}

describe('ByteRows.writeFixed writes what toFixed gives, byte for byte', () => {
  it('on random doubles of every magnitude a trace meets, at 0 to 10 decimals', () => {
    const random = new SeededRandom(1234);
    const values: number[] = [];
    for (let k = 0; k < 20_000; k++) {
      const magnitude = 10 ** (-12 + 24 * random.uniform()); // 1e-12 … 1e12
      values.push((random.uniform() < 0.5 ? -1 : 1) * magnitude);
    }
    for (let decimals = 0; decimals <= 10; decimals++) expectToFixed(values, decimals);
  });

  it('on exact ties and near-ties (toFixed rounds halves away from zero, on the exact binary value)', () => {
    const ties: number[] = [];
    for (let n = 0; n < 2000; n++) {
      // n + 0.5 ulp-neighbours at 6 decimals: 1e-6·(n + 0.5) is not exact in binary, so which side
      // it lies on decides; k/8 values are exact binary ties at 1–3 decimals.
      const x = (n + 0.5) / 1e6;
      ties.push(x, -x, n / 8, -n / 8, (2 * n + 1) / 16, (n + 0.5) / 1e4);
    }
    for (const decimals of [0, 1, 2, 3, 4, 5, 6, 7]) expectToFixed(ties, decimals);
  });

  it('on signed zeros, values rounding to zero, the fast-path limit, large values, NaN and infinities', () => {
    expectToFixed([0, -0, -1e-9, 1e-9, -4e-7, 4e-7, -5e-7, 5e-7], 6);
    expectToFixed([999999999.9999995, 1e9 - 1e-7, 123456789.123456789, -987654321.987654321], 6);
    expectToFixed([1e14, 9.99999999999e14, 1e15, 1e16, 2 ** 53, 1e20, 1e21, -1e21, 1.5e300], 2);
    expectToFixed([Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY], 4);
  });

  it('flushes a full buffer and keeps the order of bytes across flushes', () => {
    const values = Float64Array.from({ length: 500 }, (_, k) => k * 1.25 - 300);
    const got = written(values, 4, 256); // ~10 bytes a line: many flushes of a 256-byte buffer
    expect(got).toEqual(Array.from(values, (x) => x.toFixed(4)));
  });

  it('writes text as UTF-8', () => {
    const chunks: Buffer[] = [];
    const rows = new ByteRows(256, (bytes, length) => chunks.push(Buffer.from(bytes.subarray(0, length))));
    rows.writeText('μs=0.5,ok');
    rows.flush();
    expect(Buffer.concat(chunks).toString('utf8')).toBe('μs=0.5,ok');
  });
});
