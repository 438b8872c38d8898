// round() gives exactly Number(value.toPrecision(digits)) — the series files' numbers, which
// compareResults and the byte-identical series checks rely on — on values across magnitudes,
// signs and digit counts, including decimal ties and values next to powers of ten.

import { describe, expect, it } from 'vitest';
import { round } from '../../../harness/score/series/buckets.js';

/** A small seeded generator (xorshift32), so a failure names a reproducible value. */
function uniforms(seed: number): () => number {
  let state = seed >>> 0 || 1;
  return () => {
    state ^= state << 13;
    state ^= state >>> 17;
    state ^= state << 5;
    return (state >>> 0) / 4294967296;
  };
}

describe('series rounding', () => {
  it('equals Number(toPrecision) on 10^6 values from 1e-12 to 1e12, both signs, 3 to 7 digits', () => {
    const next = uniforms(20261202);
    let mismatches = 0;
    let first = '';
    for (let j = 0; j < 1_000_000; j++) {
      const digits = 3 + (j % 5);
      const value = (next() < 0.5 ? -1 : 1) * 10 ** (24 * next() - 12) * (1 + next());
      const want = Number(value.toPrecision(digits));
      const got = round(value, digits);
      if (!Object.is(got, want)) {
        mismatches++;
        first ||= `${value} at ${digits} digits: ${got} vs ${want}`;
      }
    }
    expect(first).toBe('');
    expect(mismatches).toBe(0);
  });

  it('equals it on decimal ties, powers of ten and their neighbours, and the special values', () => {
    const values: number[] = [0, -0, Number.NaN, Infinity, -Infinity, Number.MIN_VALUE, Number.MAX_VALUE, 1e-300, 1e300];
    for (let e = -15; e <= 15; e++) {
      const p = 10 ** e;
      values.push(p, p * (1 + 2 ** -52), p * (1 - 2 ** -53), 1.5 * p, 2.5 * p, 1.25 * p, 1.0005 * p, 9.9995 * p, 0.5 * p, 1.00005 * p);
    }
    for (let n = 0; n < 2000; n++) values.push(n / 1000 + 0.0005, n / 8, (n + 0.5) / 1e4);
    for (const v of [...values, ...values.map((x) => -x)]) {
      for (const digits of [1, 3, 5, 6, 7, 15, 16, 17]) {
        expect(Object.is(round(v, digits), v === 0 || !Number.isFinite(v) ? v : Number(v.toPrecision(digits))), `${v} at ${digits}`).toBe(true);
      }
    }
  });
});
