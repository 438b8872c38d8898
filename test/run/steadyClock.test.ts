import { afterEach, describe, expect, it, vi } from 'vitest';
import { createSteadyClock, READ_EVERY } from '../../harness/run/steadyClock.js';
import { createTickSample } from '../../harness/score/sample.js';
import { createAction } from '../../harness/contract/tick.js';

/** Ticks of `period_s` from `period_s` to `duration_s`; the wall clock advances `wallPerTick_ms` per tick. */
function drive(duration_s: number, period_s: number, wallPerTick_ms: number) {
  let wall_ms = 0;
  const now = vi.spyOn(performance, 'now').mockImplementation(() => wall_ms);
  const clock = createSteadyClock(duration_s);
  const sample = createTickSample(4);
  const action = createAction(4, 0);
  const ticks = Math.round(duration_s / period_s);
  for (let k = 1; k <= ticks; k++) {
    wall_ms += wallPerTick_ms;
    sample.time_s = k * period_s;
    clock.onTick(sample, action);
  }
  return { factor: clock.realTimeFactor(), reads: now.mock.calls.length };
}

afterEach(() => {
  vi.restoreAllMocks();
});

describe('steady real-time factor', () => {
  it('is simulated ÷ wall time over the later half, reading the clock every 64th tick there', () => {
    // 8 s at 1 kHz, 0.01 ms wall per 1 ms tick: 100× real time exactly (the fake clock is linear).
    const { factor, reads } = drive(8, 0.001, 0.01);
    expect(factor).toBeCloseTo(100, 9);
    // 4000 ticks after the mark: the mark, the first READ_EVERY ticks, then every READ_EVERY-th.
    expect(reads).toBe(1 + READ_EVERY + Math.floor(4000 / READ_EVERY) - 1);
  });

  it('still measures a later half shorter than READ_EVERY ticks, up to its last tick', () => {
    // 0.04 s at 1 kHz: 20 ticks after the mark, each read; 0.5 ms wall per 1 ms tick → 2×.
    const { factor, reads } = drive(0.04, 0.001, 0.5);
    expect(factor).toBeCloseTo(2, 9);
    expect(reads).toBe(21);
  });

  it('is null when the run never reached half-way', () => {
    const clock = createSteadyClock(10);
    const sample = createTickSample(4);
    sample.time_s = 1;
    clock.onTick(sample, createAction(4, 0));
    expect(clock.realTimeFactor()).toBeNull();
  });
});
