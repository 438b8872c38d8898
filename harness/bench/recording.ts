// Observations recorded from a real run of the scenario, replayed to a build by the bench: the
// governor and the tick are timed on the states they meet in closed loop (stand, trot, the stop),
// not on constants. The ring is preallocated; recording copies into it, replay hands out its
// entries in order and wraps.

import { copyObservation, createObservation, type Observation } from '../contract/tick.js';
import type { OpenedBuild } from '../builds/loader.js';
import { withTickTap } from '../builds/opened.js';

export class ObservationRing {
  readonly entries: Observation[];
  /** Entries filled so far (≤ capacity). */
  size = 0;
  private cursor = 0;

  constructor(capacity: number, footCount: number) {
    if (!(capacity >= 1)) throw new Error(`observation ring: capacity ${capacity}, expected at least 1`);
    this.entries = [];
    for (let k = 0; k < capacity; k++) this.entries.push(createObservation(footCount));
  }

  get capacity(): number {
    return this.entries.length;
  }

  /** Copies obs into the next free entry; false when the ring is full. */
  record(obs: Observation): boolean {
    if (this.size >= this.entries.length) return false;
    copyObservation(this.entries[this.size], obs);
    this.size++;
    return true;
  }

  /** The next recorded observation, cycling through the recording. */
  next(): Observation {
    const obs = this.entries[this.cursor];
    this.cursor++;
    if (this.cursor >= this.size) this.cursor = 0;
    return obs;
  }
}


/**
 * Wraps an opened build so that every `everyNth` tick's observation is copied into the ring before
 * the build sees it; everything else passes through. Used for the one recording run per build.
 */
export function recordingBuild(build: OpenedBuild, ring: ObservationRing, everyNth: number): OpenedBuild {
  let tick = 0;
  return withTickTap(build, (obs) => {
    if (tick % everyNth === 0) ring.record(obs);
    tick++;
  });
}
