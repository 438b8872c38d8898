// The run's steady-state real-time factor. `sim.realTimeFactor` (the scorer's) divides the whole
// episode's simulated time by its wall time, so it includes the warm-up: the first ticks run in
// the interpreter until the JIT has compiled the plant, the build and the scorer (a cold figure,
// several times below the bench's). This observer times the later half of the episode alone:
// simulated ÷ wall time from the first tick at or after half the scenario's duration to the
// last tick (null when the run ended before half-way).

import type { TickObserver, TickSample } from '../score/sample.js';

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
  return {
    onTick(sample: TickSample) {
      if (Number.isNaN(markWall_ms)) {
        if (sample.time_s < half_s) return;
        markWall_ms = performance.now();
        markSim_s = sample.time_s;
      }
      lastWall_ms = performance.now();
      lastSim_s = sample.time_s;
    },
    realTimeFactor() {
      const wall_s = (lastWall_ms - markWall_ms) / 1000;
      return wall_s > 0 ? (lastSim_s - markSim_s) / wall_s : null;
    },
  };
}
