// External pushes on the trunk: pulses (rect, half-sine) and recorded series (piecewise linear).
// Force vectors are in the world frame (a shove keeps its direction while the trunk turns); the
// point of application is fixed in the trunk frame, so an off-centre push also twists the trunk.

import type { Push } from './types.js';

const KIND_RECT = 0;
const KIND_HALF_SINE = 1;
const KIND_SERIES = 2;

export class PushSchedule {
  private readonly count: number;
  private readonly kind: Uint8Array;
  private readonly start_s: Float64Array;
  private readonly end_s: Float64Array;
  private readonly force_N: Float64Array; // 3 per push (pulses)
  private readonly point_m: Float64Array; // 3 per push, trunk frame
  private readonly seriesT: Float64Array[];
  private readonly seriesF: Float64Array[];
  /** Per series, the index of the segment used last: time only moves forward, so lookups are O(1). */
  private readonly cursor: Int32Array;
  private readonly scratch = new Float64Array(3);

  constructor(pushes: Push[]) {
    const n = pushes.length;
    this.count = n;
    this.kind = new Uint8Array(n);
    this.start_s = new Float64Array(n);
    this.end_s = new Float64Array(n);
    this.force_N = new Float64Array(3 * n);
    this.point_m = new Float64Array(3 * n);
    this.seriesT = [];
    this.seriesF = [];
    this.cursor = new Int32Array(n);
    pushes.forEach((push, i) => {
      this.point_m.set(push.point_m, 3 * i);
      if (push.kind === 'pulse') {
        this.kind[i] = push.shape === 'rect' ? KIND_RECT : KIND_HALF_SINE;
        this.start_s[i] = push.at_s;
        this.end_s[i] = push.at_s + push.duration_s;
        this.force_N.set(push.force_N, 3 * i);
        this.seriesT.push(new Float64Array(0));
        this.seriesF.push(new Float64Array(0));
      } else {
        this.kind[i] = KIND_SERIES;
        this.start_s[i] = push.t_s[0];
        this.end_s[i] = push.t_s[push.t_s.length - 1];
        this.seriesT.push(Float64Array.from(push.t_s));
        this.seriesF.push(Float64Array.from(push.force_N.flat()));
      }
    });
  }

  get size(): number {
    return this.count;
  }

  /**
   * Total push force (world) into out[0..2] and its torque about the trunk centre (world) into
   * out[3..5], at the time in time_s[0], with R the trunk's rotation matrix. Time comes in an array
   * because a double passed to a call V8 does not inline is boxed (an allocation per step).
   */
  wrenchAt(out: Float64Array, time_s: Float64Array, R: Float64Array): void {
    out.fill(0);
    const t = time_s[0];
    const force = this.scratch;
    for (let i = 0; i < this.count; i++) {
      if (!this.forceAt(i, t, force)) continue;
      const bx = this.point_m[3 * i];
      const by = this.point_m[3 * i + 1];
      const bz = this.point_m[3 * i + 2];
      const ax = R[0] * bx + R[1] * by + R[2] * bz;
      const ay = R[3] * bx + R[4] * by + R[5] * bz;
      const az = R[6] * bx + R[7] * by + R[8] * bz;
      out[0] += force[0];
      out[1] += force[1];
      out[2] += force[2];
      out[3] += ay * force[2] - az * force[1];
      out[4] += az * force[0] - ax * force[2];
      out[5] += ax * force[1] - ay * force[0];
    }
  }

  /** Push i's world force at time t into force (3); false when it is not acting. */
  forceAt(i: number, t_s: number, force: Float64Array): boolean {
    if (t_s < this.start_s[i] || t_s >= this.end_s[i]) return false;
    const kind = this.kind[i];
    if (kind === KIND_RECT || kind === KIND_HALF_SINE) {
      const s = kind === KIND_RECT ? 1 : Math.sin((Math.PI * (t_s - this.start_s[i])) / (this.end_s[i] - this.start_s[i]));
      force[0] = s * this.force_N[3 * i];
      force[1] = s * this.force_N[3 * i + 1];
      force[2] = s * this.force_N[3 * i + 2];
      return true;
    }
    const t = this.seriesT[i];
    const f = this.seriesF[i];
    let k = this.cursor[i];
    if (t[k] > t_s) k = 0;
    while (k < t.length - 2 && t[k + 1] <= t_s) k++;
    this.cursor[i] = k;
    const w = (t_s - t[k]) / (t[k + 1] - t[k]);
    for (let a = 0; a < 3; a++) force[a] = (1 - w) * f[3 * k + a] + w * f[3 * (k + 1) + a];
    return true;
  }
}
