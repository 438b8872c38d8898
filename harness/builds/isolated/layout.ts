// The shared memory between a run's thread (plant, scorer) and its module build's own thread
// (thread.ts): a few control words, then the observation, the action and an error text, all at
// fixed offsets agreed from the foot and telemetry counts. Numbers cross as their bits; nothing is
// allocated per tick on either side.

import { GAIT_NAMES, type Action, type Observation } from '../interface.js';

/** Control words (Int32): what the shared memory holds now. */
export const STATE = 0;
export const FAILURE = 1;
export const ERROR_BYTES = 2;
export const CONTROL_WORDS = 4;

export const IDLE = 0;
export const TICK = 1;
export const DONE = 2;
export const FAILED = 3;
export const CLOSE = 4;

const ERROR_CAPACITY_bytes = 8192;

export function observationDoubles(footCount: number): number {
  return 15 + 11 * footCount + 4;
}

export function actionDoubles(footCount: number, telemetryCount: number): number {
  // mode, groundForce, footTarget, footTargetVelocity, stiffness, damping, telemetry, loop time
  return footCount + 9 * footCount + 2 * footCount + telemetryCount + 1;
}

export interface SharedTick {
  buffer: SharedArrayBuffer;
  control: Int32Array;
  obs: Float64Array;
  action: Float64Array;
  error: Uint8Array;
}

export function createSharedTick(footCount: number, telemetryCount: number): SharedTick {
  const controlBytes = CONTROL_WORDS * 4;
  const obsBytes = observationDoubles(footCount) * 8;
  const actionBytes = actionDoubles(footCount, telemetryCount) * 8;
  const buffer = new SharedArrayBuffer(controlBytes + obsBytes + actionBytes + ERROR_CAPACITY_bytes);
  return viewSharedTick(buffer, footCount, telemetryCount);
}

export function viewSharedTick(buffer: SharedArrayBuffer, footCount: number, telemetryCount: number): SharedTick {
  const controlBytes = CONTROL_WORDS * 4;
  const obsLength = observationDoubles(footCount);
  const actionLength = actionDoubles(footCount, telemetryCount);
  const obs = new Float64Array(buffer, controlBytes, obsLength);
  const action = new Float64Array(buffer, controlBytes + obsLength * 8, actionLength);
  const errorStart = controlBytes + (obsLength + actionLength) * 8;
  return { buffer, control: new Int32Array(buffer, 0, CONTROL_WORDS), obs, action, error: new Uint8Array(buffer, errorStart, buffer.byteLength - errorStart) };
}

export function writeObservation(v: Float64Array, obs: Observation, n: number): void {
  v[0] = obs.time_s;
  v.set(obs.trunkPosition_m, 1);
  v.set(obs.trunkQuaternion, 4);
  v.set(obs.trunkVelocity_mps, 8);
  v.set(obs.trunkAngularVelocity_radps, 11);
  v.set(obs.footPosition_m, 14);
  v.set(obs.footVelocity_mps, 14 + 3 * n);
  v.set(obs.footForce_N, 14 + 6 * n);
  let k = 14 + 9 * n;
  for (let i = 0; i < n; i++) v[k + i] = obs.footContact[i];
  k += n;
  v.set(obs.frictionEstimate, k);
  k += n;
  v[k] = GAIT_NAMES.indexOf(obs.command.gait);
  v[k + 1] = obs.command.velocity_mps[0];
  v[k + 2] = obs.command.velocity_mps[1];
  v[k + 3] = obs.command.velocity_mps[2];
  v[k + 4] = obs.command.yawRate_radps;
}

function copyFrom(out: Float64Array, v: Float64Array, from: number): number {
  for (let i = 0; i < out.length; i++) out[i] = v[from + i];
  return from + out.length;
}

function copyTo(v: Float64Array, from: Float64Array, at: number): number {
  for (let i = 0; i < from.length; i++) v[at + i] = from[i];
  return at + from.length;
}

export function readObservation(obs: Observation, v: Float64Array, n: number): void {
  obs.time_s = v[0];
  copyFrom(obs.trunkPosition_m, v, 1);
  copyFrom(obs.trunkQuaternion, v, 4);
  copyFrom(obs.trunkVelocity_mps, v, 8);
  copyFrom(obs.trunkAngularVelocity_radps, v, 11);
  copyFrom(obs.footPosition_m, v, 14);
  copyFrom(obs.footVelocity_mps, v, 14 + 3 * n);
  copyFrom(obs.footForce_N, v, 14 + 6 * n);
  let k = 14 + 9 * n;
  for (let i = 0; i < n; i++) obs.footContact[i] = v[k + i];
  k += n;
  copyFrom(obs.frictionEstimate, v, k);
  k += n;
  obs.command.gait = GAIT_NAMES[v[k]] ?? 'stand';
  obs.command.velocity_mps[0] = v[k + 1];
  obs.command.velocity_mps[1] = v[k + 2];
  obs.command.velocity_mps[2] = v[k + 3];
  obs.command.yawRate_radps = v[k + 4];
}

/** Writes the action and the tick's wall time (µs, last slot). */
export function writeAction(v: Float64Array, action: Action, loopTime_us: number): void {
  const n = action.mode.length;
  for (let i = 0; i < n; i++) v[i] = action.mode[i];
  let k = copyTo(v, action.groundForce_N, n);
  k = copyTo(v, action.footTarget_m, k);
  k = copyTo(v, action.footTargetVelocity_mps, k);
  k = copyTo(v, action.stiffness_N_per_m, k);
  k = copyTo(v, action.damping_Ns_per_m, k);
  k = copyTo(v, action.telemetry, k);
  v[k] = loopTime_us;
}

/** The first leg whose mode in the shared action is not 0 or 1, or -1 (check before readAction). */
export function badModeIndex(v: Float64Array, footCount: number): number {
  for (let i = 0; i < footCount; i++) if (v[i] !== 0 && v[i] !== 1) return i;
  return -1;
}

/** Reads the action (modes already checked); returns the tick's wall time. */
export function readAction(action: Action, v: Float64Array): number {
  const n = action.mode.length;
  for (let i = 0; i < n; i++) action.mode[i] = v[i];
  let k = copyFrom(action.groundForce_N, v, n);
  k = copyFrom(action.footTarget_m, v, k);
  k = copyFrom(action.footTargetVelocity_mps, v, k);
  k = copyFrom(action.stiffness_N_per_m, v, k);
  k = copyFrom(action.damping_Ns_per_m, v, k);
  k = copyFrom(action.telemetry, v, k);
  return v[k];
}

export function writeError(shared: SharedTick, reasonCode: number, message: string): void {
  const bytes = Buffer.from(message, 'utf8').subarray(0, shared.error.length);
  shared.error.set(bytes);
  Atomics.store(shared.control, FAILURE, reasonCode);
  Atomics.store(shared.control, ERROR_BYTES, bytes.length);
}

export function readError(shared: SharedTick): { reasonCode: number; message: string } {
  const length = Math.min(Atomics.load(shared.control, ERROR_BYTES), shared.error.length);
  return { reasonCode: Atomics.load(shared.control, FAILURE), message: Buffer.from(shared.error.slice(0, length)).toString('utf8') };
}

/** What the build's thread tells its opener once, after trying to open the build. */
export type BuildThreadMessage =
  | { kind: 'ready'; telemetryNames: string[] }
  | { kind: 'failed'; reason: string; message: string; stderrTail: string };

