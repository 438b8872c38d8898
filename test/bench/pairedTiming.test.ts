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

describe('round order per stream', () => {
  it('alternates which side runs first within every stream, for an even number of streams too', async () => {
    // Each batch's first tick is logged as (stream, side). With two streams the old global parity
    // gave stream 0 always "baseline first" and stream 1 always "candidate first", so an effect of
    // running second (warm caches) never cancelled and read as a 1.4–3.8× slower twin.
    const log: string[] = [];
    let last = '';
    const logging = (stream: number, side: 'A' | 'B'): Controller => ({
      telemetryNames: [],
      tick(obs, action) {
        const key = `${stream}${side}`;
        if (key !== last) log.push(key);
        last = key;
        const until = performance.now() + 0.002;
        while (performance.now() < until) action.groundForce_N[0] = obs.time_s;
      },
    });
    const streams = [0, 1].map((k): PairedStream => ({
      ...stream(1, 1),
      scenario: `s${k}`,
      baseline: guardController(logging(k, 'A'), 'base'),
      candidate: guardController(logging(k, 'B'), 'cand'),
    }));
    const options = { rounds: 12, warmupRounds: 4, roundTime_ms: 0.2, confidence: 0.95 };
    await timePaired(streams, options);
    // The main loop's batches end the log: two per round, the streams taking turns.
    const batches = log.slice(-2 * (options.rounds + options.warmupRounds));
    const firstSides: Record<string, string[]> = { '0': [], '1': [] };
    for (let r = 0; r < batches.length; r += 2) {
      expect(batches[r][0]).toBe(batches[r + 1][0]); // one round, one stream
      firstSides[batches[r][0]].push(batches[r][1]);
    }
    for (const sides of Object.values(firstSides)) {
      expect(sides.length).toBe((options.rounds + options.warmupRounds) / 2);
      for (let k = 1; k < sides.length; k++) expect(sides[k]).not.toBe(sides[k - 1]);
    }
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
