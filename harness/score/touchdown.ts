// Touchdown and stance, measured apart. Every loaded physics step of a foot belongs either to a
// touchdown's transient or to its stance:
// - a touchdown starts at the first loaded step after the foot was out of contact; its transient
//   lasts TOUCHDOWN_TRANSIENT_s from that step (samples with elapsed time < the transient). A
//   bounce that leaves the ground inside the transient is part of the same touchdown, and its
//   transient is timed again from the load after the bounce (the second impact is still the
//   landing's). A load that dips below the threshold while the foot stays on the ground is not a
//   new touchdown;
// - stance is every other loaded step. The stance margin (min, p05) is the friction margin
//   1 − |f_t|/(μs·f_n) over those samples only, so it judges how the controller holds a foot, not
//   the impact the contact law and the landing speed make.
// Per touchdown: its slip ∫|v_t| dt over its loaded transient steps (the part of slipDistance_m it
// causes), the landing speeds at its first step in contact (tangential |v_t|, vertical −v_z,
// downward positive), and its impact peak: the largest normal force in the transient.
// With a settled start, a foot loaded at t = 0 is in stance (it did not land); with a released
// start the first load is a touchdown. Memory is fixed at construction: touchdowns are at least
// one transient apart, so a foot has at most duration / transient + 1 of them.

import { FrictionMarginTracker, marginStats } from './frictionMargin.js';
import type { Histogram } from './histogram.js';
import type { FrictionMarginMetrics, Spread, TouchdownMetrics, TouchdownStats } from './types.js';

/** The four values kept per touchdown, in this order. */
export const SLIP = 0;
const TANGENTIAL = 1;
const VERTICAL = 2;
export const PEAK = 3;
export const VALUES = 4;

/** Touchdown and stance state per foot, written by the step pass (stepPass.ts), and their metrics. */
export class TouchdownTracker {
  /** Per foot, the stance margin's histogram (the margin histograms' bins). */
  readonly stance: Histogram[] = [];
  /** 1 after a step out of contact, until the next load. */
  readonly airborne: Uint8Array;
  readonly wasInContact: Uint8Array;
  readonly inTransient: Uint8Array;
  readonly transientStart_s: Float64Array;
  /** Per foot: landing speeds at the last contact onset (tangential, vertical). */
  readonly landing: Float64Array;
  /**
   * Per foot, the open touchdown's VALUES (slip, landing speeds, peak): the landing speeds are
   * latched at its first load, so a bounce inside the transient does not replace them.
   */
  readonly current: Float64Array;
  private readonly events: Float64Array;
  private readonly eventCount: Int32Array;
  private readonly capacity: number;

  constructor(
    private readonly footCount: number,
    readonly transient_s: number,
    duration_s: number,
    settledStart: boolean,
  ) {
    if (!(transient_s > 0)) throw new RangeError(`touchdown: transient ${transient_s} s must be > 0`);
    this.capacity = Math.ceil(duration_s / transient_s) + 2;
    for (let i = 0; i < footCount; i++) this.stance.push(FrictionMarginTracker.marginHistogram());
    this.airborne = new Uint8Array(footCount).fill(settledStart ? 0 : 1);
    this.wasInContact = new Uint8Array(footCount);
    this.inTransient = new Uint8Array(footCount);
    this.transientStart_s = new Float64Array(footCount);
    this.landing = new Float64Array(2 * footCount);
    this.current = new Float64Array(VALUES * footCount);
    this.events = new Float64Array(VALUES * this.capacity * footCount);
    this.eventCount = new Int32Array(footCount);
  }

  /** A load after time in the air, outside a transient: foot i's touchdown opens. */
  open(i: number): void {
    this.inTransient[i] = 1;
    const o = VALUES * i;
    this.current[o + SLIP] = 0;
    this.current[o + PEAK] = 0;
    this.current[o + TANGENTIAL] = this.landing[2 * i];
    this.current[o + VERTICAL] = this.landing[2 * i + 1];
  }

  stanceMargin(): FrictionMarginMetrics {
    const all = FrictionMarginTracker.marginHistogram();
    for (const foot of this.stance) all.addAll(foot);
    return { ...marginStats(all), perFoot: this.stance.map(marginStats) };
  }

  /** Closes open touchdowns (the run ended inside a transient) and summarises; call once. */
  result(): TouchdownMetrics {
    for (let i = 0; i < this.footCount; i++) if (this.inTransient[i] === 1) this.closeTouchdown(i);
    const perFoot: TouchdownStats[] = [];
    const all: number[][] = [[], [], [], []];
    for (let i = 0; i < this.footCount; i++) {
      const columns: number[][] = [[], [], [], []];
      for (let k = 0; k < this.eventCount[i]; k++) {
        const base = VALUES * (i * this.capacity + k);
        for (let v = 0; v < VALUES; v++) {
          columns[v].push(this.events[base + v]);
          all[v].push(this.events[base + v]);
        }
      }
      perFoot.push(touchdownStats(columns));
    }
    return { transient_s: this.transient_s, ...touchdownStats(all), perFoot };
  }

  /** Foot i's transient is over: its touchdown is kept. */
  closeTouchdown(i: number): void {
    this.inTransient[i] = 0;
    const k = this.eventCount[i];
    if (k >= this.capacity) return; // cannot happen: touchdowns are a transient apart
    const base = VALUES * (i * this.capacity + k);
    for (let v = 0; v < VALUES; v++) this.events[base + v] = this.current[VALUES * i + v];
    this.eventCount[i] = k + 1;
  }
}

function touchdownStats(columns: number[][]): TouchdownStats {
  return {
    count: columns[SLIP].length,
    slip_m: spread(columns[SLIP]),
    landingTangentialSpeed_mps: spread(columns[TANGENTIAL]),
    landingVerticalSpeed_mps: spread(columns[VERTICAL]),
    impactPeakForce_N: spread(columns[PEAK]),
  };
}

/** Mean, p95 and max; p95 exact, by simple-statistics' `quantile` convention (type 7). */
export function spread(values: readonly number[]): Spread {
  if (values.length === 0) return { mean: null, p95: null, max: null };
  const sorted = [...values].sort((x, y) => x - y);
  let sum = 0;
  for (const value of sorted) sum += value;
  const index = (sorted.length - 1) * 0.95;
  const lower = Math.floor(index);
  const upper = Math.min(sorted.length - 1, lower + 1);
  const p95 = sorted[lower] + (index - lower) * (sorted[upper] - sorted[lower]);
  return { mean: sum / sorted.length, p95, max: sorted[sorted.length - 1] };
}
