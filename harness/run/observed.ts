// What a build observed in the start of a suite run, kept for the gate's loop-time timing: the
// baseline's own runs record the same observations a separate recording run of the scenario's
// first seconds would (the same episode from the same start, RECORDED_DURATION_s in
// bench/pairedLoopTime.ts), so the timing needs no runs of its own. The observations travel
// beside the run's result (never inside it: results.json does not hold them).

import { withTickTap, type OpenedBuild } from '../builds/opened.js';
import { createPackedObservations, packObservation, type PackedObservations } from '../contract/packed.js';
import type { RunResult } from '../results/types.js';

/** Which ticks to keep: every `everyNth` of the first `tickCount`, at most `capacity`. */
export interface ObservationRequest {
  tickCount: number;
  everyNth: number;
  capacity: number;
}

const observedBy = new WeakMap<RunResult, PackedObservations>();

export function attachObservations(result: RunResult, observations: PackedObservations): void {
  observedBy.set(result, observations);
}

/** The observations recorded in the run of `result`, if it was asked to record. */
export function observationsOf(result: RunResult): PackedObservations | undefined {
  return observedBy.get(result);
}

/**
 * The build, seen by the episode, with its observations packed as requested (outside the build's
 * own tick timing, so its loop time is unchanged). The packed buffer is allocated before the
 * episode (the tick loop allocates nothing); `observations` holds the filled ones once it ends.
 */
export function observingBuild(build: OpenedBuild, request: ObservationRequest, footCount: number): { build: OpenedBuild; observations: () => PackedObservations } {
  const slots = Math.max(0, Math.min(request.capacity, Math.ceil(request.tickCount / request.everyNth)));
  const packed = createPackedObservations(footCount, slots);
  let tick = 0;
  const wrapped = withTickTap(build, (obs) => {
    if (tick < request.tickCount && tick % request.everyNth === 0) packObservation(packed, obs);
    tick++;
  });
  return { build: wrapped, observations: () => packed };
}
