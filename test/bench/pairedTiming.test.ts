import { describe, expect, it } from 'vitest';
import { createAction, createObservation, type Controller } from '../../harness/builds/interface.js';
import { guardController } from '../../harness/builds/loader.js';
import { DEFAULT_PAIRED_TIMING, judgeAgainstLimit, timePaired, type PairedStream } from '../../harness/bench/pairedTiming.js';
import { medianInterval } from '../../harness/score/medianInterval.js';

/** A controller whose tick spins for a fixed wall time: the quantity the measurement must see. */
function spinning(spin_us: number): Controller {
  return {
    telemetryNames: [],
    tick(obs, action) {
      const until = performance.now() + spin_us / 1000;
      while (performance.now() < until) action.groundForce_N[0] = obs.time_s;
    },
  };
}

function stream(baseline_us: number, candidate_us: number, budget_us = 1000): PairedStream {
  const observations = Array.from({ length: 50 }, (_, k) => {
    const obs = createObservation(4);
    obs.time_s = k * 0.002;
    return obs;
  });
  return {
    scenario: 'synthetic',
    budget_us,
    observations,
    baseline: guardController(spinning(baseline_us), 'base'),
    candidate: guardController(spinning(candidate_us), 'cand'),
    baselineAction: createAction(4, 0),
    candidateAction: createAction(4, 0),
  };
}

describe('interleaved A/B loop-time measurement', () => {
  it('reads two builds of equal cost as a ratio near 1 that does not exceed a 25 % allowance', async () => {
    const timing = await timePaired([stream(20, 20)]);
    expect(timing.rounds).toBe(DEFAULT_PAIRED_TIMING.rounds);
    expect(timing.ratio.median).toBeGreaterThan(0.8);
    expect(timing.ratio.median).toBeLessThan(1.25);
    expect(judgeAgainstLimit(timing.ratio, 1.25)).not.toBe('exceeds');
  });

  it('finds a build spending an extra 30 µs per tick significantly slower', async () => {
    // 20 µs → 50 µs is a ratio of 2.5; the spin loops set it, so the interval must exclude 1.25.
    const timing = await timePaired([stream(20, 50)]);
    expect(timing.ratio.median).toBeGreaterThan(1.8);
    expect(judgeAgainstLimit(timing.ratio, 1.25)).toBe('exceeds');
    expect(timing.candidateTick_us).toBeGreaterThan(timing.baselineTick_us);
  });

  it('judges the budget by the candidate tick time over the scenario budget', async () => {
    // 50 µs against a 10 µs budget is 5× over; against 1000 µs it is 0.05 of it.
    expect(judgeAgainstLimit((await timePaired([stream(5, 50, 10)])).budgetRatio, 1)).toBe('exceeds');
    expect(judgeAgainstLimit((await timePaired([stream(5, 50, 1000)])).budgetRatio, 1)).toBe('holds');
  });
});

describe('judging an interval against a limit', () => {
  const ci = (values: number[]) => medianInterval(values, 0.95);
  it('exceeds only when the whole interval is above the limit, holds when it is all below', () => {
    expect(judgeAgainstLimit(ci([1.5, 1.6, 1.7, 1.8, 1.9, 2.0, 2.1]), 1.25)).toBe('exceeds');
    expect(judgeAgainstLimit(ci([0.9, 0.95, 1.0, 1.05, 1.1, 1.15, 1.2]), 1.25)).toBe('holds');
    expect(judgeAgainstLimit(ci([1.0, 1.1, 1.2, 1.3, 1.4, 1.5, 1.6]), 1.25)).toBe('within-noise');
  });
  it('calls too few rounds within noise rather than guessing', () => {
    expect(judgeAgainstLimit(ci([3, 3, 3]), 1.25)).toBe('within-noise');
  });
});
