// The run's steady-state real-time factor. `sim.realTimeFactor` (the scorer's) divides the whole
// episode's simulated time by its wall time, so it includes the warm-up: the first ticks run in
// the interpreter until the JIT has compiled the plant, the build and the scorer (a cold figure,
// several times below the bench's). This observer times the later half of the episode alone:
// simulated ÷ wall time from the first tick at or after half the scenario's duration to the
// last tick read (null when the run ended before half-way). The clock is read at every tick of the
// first READ_EVERY after the mark and then at every READ_EVERY-th only (one performance.now() costs
// ~45 ns here, a few per cent of the harness's own tick): a long span ends at most READ_EVERY − 1
// ticks before the run's end, a short one at its last tick.

import type { TickObserver, TickSample } from '../score/sample.js';

/** Ticks between clock reads after the mark (64 ms of simulated time at 1 kHz). */
export const READ_EVERY = 64;

export interface SteadyClock extends TickObserver {
  /** Simulated seconds per wall second over the later half; null if it was never reached. */
  realTimeFactor(): number | null;
}

export function createSteadyClock(duration_s: number): SteadyClock {
  const half_s = duration_s / 2;
  let markWall_ms = Number.NaN;
  let markSim_s = Number.NaN;
  let lastWall_ms = Number.NaN;
  let lastSim_s = Number.NaN;
  let sinceMark = 0;
  return {
    onTick(sample: TickSample) {
      if (Number.isNaN(markWall_ms)) {
        if (sample.time_s < half_s) return;
        markWall_ms = performance.now();
        markSim_s = sample.time_s;
        return;
      }
      sinceMark++;
      if (sinceMark > READ_EVERY && sinceMark % READ_EVERY !== 0) return;
      lastWall_ms = performance.now();
      lastSim_s = sample.time_s;
    },
    realTimeFactor() {
      const wall_s = (lastWall_ms - markWall_ms) / 1000;
      return wall_s > 0 ? (lastSim_s - markSim_s) / wall_s : null;
    },
  };
}
