// The 'f64' encoding of the tick phase: fixed-size binary frames of little-endian IEEE-754
// doubles behind an 8-byte ASCII tag (layout in docs/protocol.md, "f64 frames"). Numbers cross
// the pipe as their bits, so nothing is formatted or parsed: on the test machine this cuts the
// per-tick overhead several-fold against JSON, where turning ~60 doubles into shortest
// round-trip decimal text (and back, on the build's side) dominates the round trip.
//
// Both frame sizes follow from the foot count (and telemetry count) agreed in the handshake, so no
// length prefix is needed; the tag catches a build that writes anything else to stdout.

import { endianness } from 'node:os';
import type { Writable } from 'node:stream';
import { GAIT_NAMES, type Action, type Observation } from '../interface.js';
import type { TickChannel } from './channel.js';
import type { MessageProblem } from './messages.js';

export const OBS_TAG = 'FOOTOBS1';
export const ACT_TAG = 'FOOTACT1';
export const BYE_TAG = 'FOOTBYE1';
const TAG_BYTES = 8;

/** Doubles in an obs frame after the tag: tick, time, trunk (3+4+3+3), feet (11 per foot), command (5). */
export function observationDoubles(footCount: number): number {
  return 20 + 11 * footCount;
}

/** Doubles in an act frame after the tag: tick, compute_us, then 12 per foot, then telemetry. */
export function actionDoubles(footCount: number, telemetryCount: number): number {
  return 2 + 12 * footCount + telemetryCount;
}

/** Float64Array reads the platform's byte order; the wire is little-endian. */
export const F64_AVAILABLE = endianness() === 'LE';

function tagged(tag: string, doubles: number): { bytes: Buffer; values: Float64Array } {
  // Buffer.alloc gives an ArrayBuffer of its own (offset 0), so the doubles at byte 8 are aligned.
  const bytes = Buffer.alloc(TAG_BYTES + 8 * doubles);
  bytes.write(tag, 0, 'latin1');
  return { bytes, values: new Float64Array(bytes.buffer, bytes.byteOffset + TAG_BYTES, doubles) };
}

const ACTION_FIELDS = ['groundForce_N', 'footTarget_m', 'footTargetVelocity_mps', 'stiffness_N_per_m', 'damping_Ns_per_m', 'telemetry'] as const;

/** Copies values[from, from + out.length) into out (no subarray view); returns the next index. */
function copyInto(out: Float64Array, values: Float64Array, from: number): number {
  for (let i = 0; i < out.length; i++) out[i] = values[from + i];
  return from + out.length;
}

export class F64TickChannel implements TickChannel {
  readonly encoding = 'f64' as const;
  reportedCompute_us = Number.NaN;

  private out: { bytes: Buffer; values: Float64Array };
  private readonly bye: Buffer;
  private readonly incoming: { bytes: Buffer; values: Float64Array };
  private filled = 0;
  private action: Action | null = null;
  private tick = 0;
  private readonly actTag = Buffer.from(ACT_TAG, 'latin1');

  constructor(
    private readonly footCount: number,
    private readonly telemetryCount: number,
  ) {
    this.out = tagged(OBS_TAG, observationDoubles(footCount));
    this.bye = tagged(BYE_TAG, observationDoubles(footCount)).bytes;
    this.incoming = tagged('', actionDoubles(footCount, telemetryCount));
  }

  send(stdin: Writable, obs: Observation, tick: number, action: Action): void {
    this.tick = tick;
    this.action = action;
    const v = this.out.values;
    const n = this.footCount;
    v[0] = tick;
    v[1] = obs.time_s;
    v.set(obs.trunkPosition_m, 2);
    v.set(obs.trunkQuaternion, 5);
    v.set(obs.trunkVelocity_mps, 9);
    v.set(obs.trunkAngularVelocity_radps, 12);
    v.set(obs.footPosition_m, 15);
    v.set(obs.footVelocity_mps, 15 + 3 * n);
    v.set(obs.footForce_N, 15 + 6 * n);
    let k = 15 + 9 * n;
    for (let i = 0; i < n; i++) v[k + i] = obs.footContact[i];
    k += n;
    v.set(obs.frictionEstimate, k);
    k += n;
    v[k] = GAIT_NAMES.indexOf(obs.command.gait);
    v.set(obs.command.velocity_mps, k + 1);
    v[k + 4] = obs.command.yawRate_radps;
    stdin.write(this.out.bytes);
    // A pipe write normally completes at once; if it was queued, the stream still holds this
    // buffer, so the next tick must not overwrite it.
    if (stdin.writableLength > 0) this.out = tagged(OBS_TAG, observationDoubles(n));
  }

  sendBye(stdin: Writable): void {
    stdin.write(this.bye);
  }

  push(chunk: Buffer, onAnswer: (problem: MessageProblem | null) => void): void {
    const frame = this.incoming.bytes;
    let offset = 0;
    while (offset < chunk.length) {
      const copied = chunk.copy(frame, this.filled, offset);
      offset += copied;
      this.filled += copied;
      if (this.filled < frame.length) return;
      this.filled = 0;
      onAnswer(this.readFrame());
    }
  }

  pendingBytes(): number {
    return this.filled;
  }

  private readFrame(): MessageProblem | null {
    const frame = this.incoming.bytes;
    if (frame.compare(this.actTag, 0, TAG_BYTES, 0, TAG_BYTES) !== 0) {
      return {
        reason: 'malformed',
        detail: `an f64 frame must start with ${ACT_TAG}, got ${JSON.stringify(frame.toString('latin1', 0, TAG_BYTES))} (is something else writing to stdout?)`,
      };
    }
    const action = this.action;
    if (action === null) return { reason: 'malformed', detail: `sent a frame when none was asked (after tick ${this.tick})` };
    this.action = null;
    const v = this.incoming.values;
    if (v[0] !== this.tick) return { reason: 'malformed', detail: `the build answered tick ${v[0]} when tick ${this.tick} was asked` };
    const compute_us = v[1];
    // NaN says "not reported"; anything else must be a finite, non-negative time.
    if (!Number.isNaN(compute_us) && !(compute_us >= 0 && compute_us < Number.POSITIVE_INFINITY)) {
      return { reason: 'malformed', detail: `compute_us = ${compute_us}: expected a time ≥ 0 µs, or NaN for none` };
    }
    const n = this.footCount;
    for (let i = 0; i < n; i++) {
      const mode = v[2 + i];
      if (mode !== 0 && mode !== 1) {
        return { reason: mode - mode === 0 ? 'malformed' : 'non-finite', detail: `mode[${i}] = ${mode}: expected 0 (swing) or 1 (stance)` };
      }
    }
    for (let i = 2 + n; i < v.length; i++) {
      if (v[i] - v[i] !== 0) return { reason: 'non-finite', detail: this.describeIndex(i) };
    }
    for (let i = 0; i < n; i++) action.mode[i] = v[2 + i];
    let k = 2 + n;
    k = copyInto(action.groundForce_N, v, k);
    k = copyInto(action.footTarget_m, v, k);
    k = copyInto(action.footTargetVelocity_mps, v, k);
    k = copyInto(action.stiffness_N_per_m, v, k);
    k = copyInto(action.damping_Ns_per_m, v, k);
    copyInto(action.telemetry, v, k);
    this.reportedCompute_us = compute_us;
    return null;
  }

  /** "groundForce_N[4] = NaN" for the value at position i of the act frame. */
  private describeIndex(i: number): string {
    const n = this.footCount;
    const lengths = [3 * n, 3 * n, 3 * n, n, n, this.telemetryCount];
    let start = 2 + n;
    for (let f = 0; f < ACTION_FIELDS.length; f++) {
      if (i < start + lengths[f]) return `${ACTION_FIELDS[f]}[${i - start}] = ${this.incoming.values[i]}`;
      start += lengths[f];
    }
    return `value ${i} = ${this.incoming.values[i]}`;
  }
}
