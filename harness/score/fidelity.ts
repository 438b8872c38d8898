// How closely a simulated run reproduces its recording: compared at the recording's sample times.
// Trunk path error (RMS and max of the 3-D distance), trunk yaw error, per-foot slip events
// matched (recorded slips the simulation reproduces, recorded ones it misses, extra ones), and the
// first time an error passes its tolerance, naming the quantity. A fidelity check of the simulator
// for that floor — not a verdict on the controller.

import type { TickSample } from './sample.js';
import type { Trajectory } from '../scenario/trajectory.js';

/**
 * Tolerances of a replay. 5 cm of trunk position and 5° of yaw are within what leg odometry
 * drifts over a few metres (common practice); a slip needs the foot loaded (20 N, the import's
 * default) and faster than 2 cm/s for two samples in a row (common practice, above log noise).
 * Two slips match when they overlap within 0.1 s (common practice: a fraction of a gait cycle).
 */
export const FIDELITY_TOLERANCES = {
  trunkPosition_m: 0.05,
  trunkYaw_deg: 5,
  slipNormalForce_N: 20,
  slipSpeed_mps: 0.02,
  slipMinSamples: 2,
  slipMatchWindow_s: 0.1,
} as const;

export interface SlipEvent {
  foot: number;
  start_s: number;
  end_s: number;
}

export interface FidelityBlock {
  note: string;
  tolerances: typeof FIDELITY_TOLERANCES;
  samplesCompared: number;
  trunkPositionError_m: { rms: number; max: number; maxAt_s: number };
  trunkYawError_deg: { max: number };
  firstExceeded: { time_s: number; quantity: string; error: number; tolerance: number } | null;
  slips: { recorded: number; reproduced: number; missed: number; extra: number; byFoot: { recorded: number; reproduced: number; extra: number }[] };
  reproduces: boolean;
  /** Decimated overlay of trunk x, y (recorded and simulated) for the report. */
  overlay: { t_s: number[]; recorded_m: [number, number][]; simulated_m: [number, number][] };
}

export const FIDELITY_NOTE = 'A fidelity check of the simulator for this floor, not a verdict on the controller. Simulation is not proof of safety.';

function yawOf(q: ArrayLike<number>, o: number): number {
  return Math.atan2(2 * (q[o] * q[o + 3] + q[o + 1] * q[o + 2]), 1 - 2 * (q[o + 2] * q[o + 2] + q[o + 3] * q[o + 3]));
}

/** Slip events from per-sample foot loads and speeds (flattened [sample][foot]). */
export function slipEvents(times: ArrayLike<number>, normal_N: Float64Array, speed_mps: Float64Array, footCount: number): SlipEvent[] {
  const T = FIDELITY_TOLERANCES;
  const events: SlipEvent[] = [];
  for (let f = 0; f < footCount; f++) {
    let start = -1;
    for (let k = 0; k <= times.length; k++) {
      const slipping = k < times.length && normal_N[k * footCount + f] >= T.slipNormalForce_N && speed_mps[k * footCount + f] > T.slipSpeed_mps;
      if (slipping && start < 0) start = k;
      if (!slipping && start >= 0) {
        if (k - start >= T.slipMinSamples) events.push({ foot: f, start_s: times[start], end_s: times[k - 1] });
        start = -1;
      }
    }
  }
  return events;
}

const overlaps = (a: SlipEvent, b: SlipEvent) => a.foot === b.foot && a.start_s <= b.end_s + FIDELITY_TOLERANCES.slipMatchWindow_s && b.start_s <= a.end_s + FIDELITY_TOLERANCES.slipMatchWindow_s;

/** Collects the simulated state at the recording's sample times, then compares. */
export class FidelityRecorder {
  private cursor = 0;
  private readonly n: number;
  readonly simPosition: Float64Array;
  readonly simYaw: Float64Array;
  readonly simNormal: Float64Array;
  readonly simSpeed: Float64Array;
  readonly matched: Uint8Array;

  constructor(private readonly recording: Trajectory) {
    this.n = recording.footCount;
    this.simPosition = new Float64Array(3 * recording.count);
    this.simYaw = new Float64Array(recording.count);
    this.simNormal = new Float64Array(this.n * recording.count);
    this.simSpeed = new Float64Array(this.n * recording.count);
    this.matched = new Uint8Array(recording.count);
  }

  /** Call every tick; `halfTick_s` is half the control period. */
  observe(s: TickSample, halfTick_s: number): void {
    const tr = this.recording;
    while (this.cursor < tr.count && tr.t_s[this.cursor] < s.time_s - halfTick_s) this.cursor++;
    const k = this.cursor;
    if (k >= tr.count || Math.abs(tr.t_s[k] - s.time_s) > halfTick_s) return;
    this.matched[k] = 1;
    for (let c = 0; c < 3; c++) this.simPosition[3 * k + c] = s.trunkPosition_m[c];
    this.simYaw[k] = yawOf(s.trunkQuaternion, 0);
    for (let f = 0; f < this.n; f++) {
      this.simNormal[k * this.n + f] = s.footForce_N[3 * f + 2];
      this.simSpeed[k * this.n + f] = Math.hypot(s.footVelocity_mps[3 * f], s.footVelocity_mps[3 * f + 1]);
    }
    this.cursor++;
  }

  finish(): FidelityBlock {
    const tr = this.recording;
    const n = this.n;
    const T = FIDELITY_TOLERANCES;
    const used: number[] = [];
    for (let k = 0; k < tr.count; k++) if (this.matched[k]) used.push(k);
    let sum = 0;
    let max = 0;
    let maxAt = 0;
    let yawMax = 0;
    let firstExceeded: FidelityBlock['firstExceeded'] = null;
    for (const k of used) {
      const e = Math.hypot(this.simPosition[3 * k] - tr.trunkPosition_m[3 * k], this.simPosition[3 * k + 1] - tr.trunkPosition_m[3 * k + 1], this.simPosition[3 * k + 2] - tr.trunkPosition_m[3 * k + 2]);
      let dy = Math.abs(this.simYaw[k] - yawOf(tr.trunkQuaternion, 4 * k));
      if (dy > Math.PI) dy = 2 * Math.PI - dy;
      const yaw_deg = (dy * 180) / Math.PI;
      sum += e * e;
      if (e > max) {
        max = e;
        maxAt = tr.t_s[k];
      }
      yawMax = Math.max(yawMax, yaw_deg);
      if (!firstExceeded && e > T.trunkPosition_m) firstExceeded = { time_s: tr.t_s[k], quantity: 'trunk position', error: e, tolerance: T.trunkPosition_m };
      if (!firstExceeded && yaw_deg > T.trunkYaw_deg) firstExceeded = { time_s: tr.t_s[k], quantity: 'trunk yaw', error: yaw_deg, tolerance: T.trunkYaw_deg };
    }
    const times = used.map((k) => tr.t_s[k]);
    const recNormal = new Float64Array(used.length * n);
    const recSpeed = new Float64Array(used.length * n);
    const simNormal = new Float64Array(used.length * n);
    const simSpeed = new Float64Array(used.length * n);
    used.forEach((k, m) => {
      for (let f = 0; f < n; f++) {
        const j = 3 * (n * k + f);
        recNormal[m * n + f] = tr.footForce_N[j + 2];
        recSpeed[m * n + f] = Math.hypot(tr.footVelocity_mps[j], tr.footVelocity_mps[j + 1]);
        simNormal[m * n + f] = this.simNormal[k * n + f];
        simSpeed[m * n + f] = this.simSpeed[k * n + f];
      }
    });
    const recorded = slipEvents(times, recNormal, recSpeed, n);
    const simulated = slipEvents(times, simNormal, simSpeed, n);
    const reproducedEvents = recorded.filter((r) => simulated.some((s) => overlaps(r, s)));
    const extraEvents = simulated.filter((s) => !recorded.some((r) => overlaps(r, s)));
    const byFoot = Array.from({ length: n }, (_, f) => ({
      recorded: recorded.filter((e) => e.foot === f).length,
      reproduced: reproducedEvents.filter((e) => e.foot === f).length,
      extra: extraEvents.filter((e) => e.foot === f).length,
    }));
    const step = Math.max(1, Math.floor(used.length / 400));
    const overlay: FidelityBlock['overlay'] = { t_s: [], recorded_m: [], simulated_m: [] };
    for (let m = 0; m < used.length; m += step) {
      const k = used[m];
      overlay.t_s.push(tr.t_s[k]);
      overlay.recorded_m.push([tr.trunkPosition_m[3 * k], tr.trunkPosition_m[3 * k + 1]]);
      overlay.simulated_m.push([this.simPosition[3 * k], this.simPosition[3 * k + 1]]);
    }
    return {
      note: FIDELITY_NOTE,
      tolerances: T,
      samplesCompared: used.length,
      trunkPositionError_m: { rms: used.length ? Math.sqrt(sum / used.length) : 0, max, maxAt_s: maxAt },
      trunkYawError_deg: { max: yawMax },
      firstExceeded,
      slips: { recorded: recorded.length, reproduced: reproducedEvents.length, missed: recorded.length - reproducedEvents.length, extra: extraEvents.length, byFoot },
      reproduces: firstExceeded === null,
      overlay,
    };
  }
}
