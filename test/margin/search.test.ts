import { describe, expect, it } from 'vitest';
import { bisectionCount, searchBoundary, type SearchOptions } from '../../harness/margin/search.js';
import type { ProbeStatus } from '../../harness/results/margin.js';

/** A synthetic probe counting its calls: no simulation. */
function synthetic(passes: (s: number) => boolean) {
  const calls: number[] = [];
  const probe = async (scale: number) => {
    calls.push(scale);
    return { status: (passes(scale) ? 'pass' : 'fail') as ProbeStatus, detail: null };
  };
  return { probe, calls };
}

const friction = (o: Partial<SearchOptions> = {}): SearchOptions => ({ direction: 'passAbove', nominal: 1, lower: 0.05, upper: 3, tolerance: 0.01, checks: 2, ...o });

describe('margin search on a synthetic pass/fail function', () => {
  it('converges in ⌈log₂(range/tol)⌉ bisection runs plus the monotonicity samples', async () => {
    for (const boundary of [0.1, 0.3333, 0.536, 0.77, 0.999]) {
      const { probe, calls } = synthetic((s) => s >= boundary);
      const result = await searchBoundary(probe, friction());
      const expected = Math.ceil(Math.log2((1 - 0.05) / 0.01)); // = 7
      expect(result.bisectionRuns).toBe(expected);
      // Monotonicity samples: the nominal end, the far end and 2 checks.
      expect(calls.length).toBe(expected + 2 + 2);
      expect(result.runs).toBe(calls.length);
      expect(result.outcome).toBe('found');
      expect(result.monotone).toBe(true);
      expect(result.critical! - boundary).toBeGreaterThanOrEqual(0);
      expect(result.critical! - boundary).toBeLessThanOrEqual(0.01);
      expect(result.bracket!.passing - result.bracket!.failing).toBeLessThanOrEqual(0.01 + 1e-12);
    }
  });

  it('counts bisection runs by the formula for other ranges and tolerances', async () => {
    for (const [tolerance, boundary] of [[0.05, 0.4], [0.002, 0.61], [0.2, 0.9]] as const) {
      const { probe } = synthetic((s) => s >= boundary);
      const result = await searchBoundary(probe, friction({ tolerance, checks: 0 }));
      expect(result.bisectionRuns).toBe(Math.ceil(Math.log2(0.95 / tolerance)));
      expect(result.runs).toBe(result.bisectionRuns + 2);
      expect(bisectionCount(0.95, tolerance)).toBe(result.bisectionRuns);
    }
  });

  it('searches above the written friction when the scenario fails as written', async () => {
    const { probe } = synthetic((s) => s >= 1.7);
    const result = await searchBoundary(probe, friction());
    expect(result.range).toEqual([1, 3]);
    expect(result.bisectionRuns).toBe(Math.ceil(Math.log2(2 / 0.01)));
    expect(result.critical!).toBeGreaterThanOrEqual(1.7);
    expect(result.critical!).toBeLessThanOrEqual(1.71);
  });

  it('reports a boundary outside the range as such', async () => {
    const always = await searchBoundary(synthetic(() => true).probe, friction());
    expect(always.outcome).toBe('passesWholeRange');
    expect(always.critical).toBe(0.05);
    const never = await searchBoundary(synthetic(() => false).probe, friction());
    expect(never.outcome).toBe('failsWholeRange');
    expect(never.critical).toBeNull();
  });

  it('finds the largest survived push scale (passes below the boundary)', async () => {
    const { probe } = synthetic((s) => s <= 1.42);
    const result = await searchBoundary(probe, { direction: 'passBelow', nominal: 1, lower: 0, upper: 3, tolerance: 0.01, checks: 2 });
    expect(result.range).toEqual([1, 3]);
    expect(result.critical!).toBeLessThanOrEqual(1.42);
    expect(result.critical!).toBeGreaterThanOrEqual(1.41);
    expect(result.runs).toBe(Math.ceil(Math.log2(2 / 0.01)) + 4);
  });

  it('reports a non-monotone boundary with its samples instead of one clean number', async () => {
    // Passes from 0.25 up, except a pocket [0.35, 0.40) — the issue's "passes at 0.3, fails at
    // 0.35, passes at 0.4". The check at 0.05 + 0.95/3 = 0.3667 falls in the pocket.
    const { probe } = synthetic((s) => s >= 0.25 && !(s >= 0.35 && s < 0.4));
    const result = await searchBoundary(probe, friction());
    expect(result.monotone).toBe(false);
    const pocket = result.samples.find((s) => s.role === 'check' && s.scale > 0.35 && s.scale < 0.4);
    expect(pocket?.status).toBe('fail');
    // The conservative critical scale: the smallest pass above every failure.
    expect(result.critical!).toBeGreaterThanOrEqual(0.4);
    expect(result.samples.map((s) => s.scale)).toEqual([...result.samples.map((s) => s.scale)].sort((a, b) => a - b));
  });

  it('refuses a range that does not hold the nominal scale', async () => {
    await expect(searchBoundary(synthetic(() => true).probe, friction({ lower: 1.2 }))).rejects.toThrow(/must contain the nominal scale 1/);
    await expect(searchBoundary(synthetic(() => true).probe, friction({ tolerance: 0 }))).rejects.toThrow(/tolerance 0/);
  });
});
