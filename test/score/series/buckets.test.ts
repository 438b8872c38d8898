import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decimateMinMax, MinMaxBuckets, rebucket, ticksPerBucket } from '../../../harness/score/series/buckets.js';
import { envelopePath, linePath } from '../../../harness/report/plot/path.js';
import { escapeXml, num } from '../../../harness/report/plot/svg.js';
import { niceTicks } from '../../../harness/report/plot/scale.js';

describe('min/max decimation', () => {
  it('keeps at most 2 × maxBuckets points for any length', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 50_000 }), fc.integer({ min: 1, max: 1000 }), (length, maxBuckets) => {
        const { min, max } = decimateMinMax(new Float64Array(length), maxBuckets);
        expect(min.length).toBe(max.length);
        expect(min.length).toBeLessThanOrEqual(maxBuckets);
      }),
    );
  });

  it('keeps a one-sample spike and a one-sample dip of a long signal at full height', () => {
    const values = new Float64Array(200_000).map((_, i) => Math.sin(i / 500));
    values[123_457] = 9; // spike
    values[77_001] = -7; // dip
    const { min, max } = decimateMinMax(values, 1000);
    expect(Math.max(...(max as number[]))).toBe(9);
    expect(Math.min(...(min as number[]))).toBe(-7);
  });

  it('gives every bucket the exact min and max of its samples (checked against a direct scan)', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 1, maxLength: 3000 }), fc.integer({ min: 1, max: 64 }), (values, maxBuckets) => {
        const { min, max, bucketSize } = decimateMinMax(values, maxBuckets);
        min.forEach((lo, b) => {
          const slice = values.slice(b * bucketSize, (b + 1) * bucketSize);
          expect(lo).toBe(Math.min(...slice));
          expect(max[b]).toBe(Math.max(...slice));
        });
      }),
    );
  });

  it('leaves a bucket empty (null) when all its samples are NaN (a foot in swing)', () => {
    const buckets = new MinMaxBuckets(3);
    buckets.add(0, 1);
    buckets.add(1, Number.NaN);
    buckets.add(2, 2);
    expect(buckets.toSeries(3, 6)).toEqual({ min: [1, null, 2], max: [1, null, 2] });
  });

  it('re-bucketing to a plot width keeps the extremes of the stored series', () => {
    const values = Array.from({ length: 1000 }, (_, k) => (k === 613 ? 5 : k === 42 ? -5 : 0));
    const merged = rebucket({ min: values, max: values }, 37);
    expect(merged.min.length).toBeLessThanOrEqual(37);
    expect(Math.max(...(merged.max as number[]))).toBe(5);
    expect(Math.min(...(merged.min as number[]))).toBe(-5);
  });

  it('sizes buckets so the expected ticks fit (8 s at 1 kHz in 1000 buckets: 9 ticks each)', () => {
    // 8001 ticks / 1000 buckets, rounded up.
    expect(ticksPerBucket(8001, 1000)).toBe(9);
    expect(ticksPerBucket(10, 1000)).toBe(1);
  });
});

describe('path builders', () => {
  it('break a line at gaps into separate sub-paths', () => {
    const d = linePath([0, 1, 2, 3], [0, 1, null, 3]);
    expect(d).toBe('M0 0l1 1M3 3');
  });

  it('draw an envelope bucket as a vertical step from min to max', () => {
    expect(envelopePath([10, 20], [1, 2], [5, 2])).toBe('M10 1v4l10 -3');
  });

  it('give a lone point a visible tick', () => {
    expect(envelopePath([10], [1], [1])).toBe('M10 1h1');
  });

  it('accumulate no rounding error over long relative paths', () => {
    const xs = Array.from({ length: 5000 }, (_, k) => k * 0.3333);
    const ys = xs.map(() => 0);
    const d = linePath(xs, ys);
    // Sum the relative x offsets: they must land on the last point rounded to 0.1.
    const offsets = [...d.matchAll(/l(-?[\d.]+) /g)].map((m) => Number(m[1]));
    const end = offsets.reduce((a, b) => a + b, 0);
    expect(end).toBeCloseTo(Math.round(xs[xs.length - 1] * 10) / 10, 6);
  });

  it('format coordinates without exponents or negative zero', () => {
    expect(num(-0.04)).toBe('0');
    expect(num(1e-9)).toBe('0');
    expect(num(1234.56)).toBe('1234.6');
  });

  it('nice ticks fall on 1-2-5 steps inside the range', () => {
    expect(niceTicks(0, 8, 6)).toEqual([0, 2, 4, 6, 8]);
    expect(niceTicks(0, 0.4, 6)).toEqual([0, 0.1, 0.2, 0.3, 0.4]);
  });

  it('escape markup for SVG text', () => {
    expect(escapeXml(`<b a="1">'&'</b>`)).toBe('&lt;b a=&quot;1&quot;&gt;&#39;&amp;&#39;&lt;/b&gt;');
  });
});
