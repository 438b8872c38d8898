// Observations packed into one Float64Array: a run thread hands the thousands it recorded for the
// gate's loop-time timing (run/observed.ts) to the main thread as one transferred buffer. As
// objects (a dozen typed arrays each) they cost the thread the allocation of all of them before
// the run, then a structured clone of ~36,000 objects and the garbage of both copies (profiled on
// `npm start`: 0.3 s of clone and 0.2 s of copying in a run thread, besides its GC).
// Layout of observation k at values[k·stride …]: time_s, trunk position (3), quaternion (4),
// velocity (3), angular velocity (3), foot positions (3N), foot velocities (3N), foot forces (3N),
// foot contact (N), friction estimates (N), the gait's index in GAIT_NAMES, commanded velocity
// (3), yaw rate. Doubles hold every value exactly (contact flags and the gait index are small
// integers), so unpacking gives back what was packed, bit for bit.

import { GAIT_NAMES, type Observation } from './tick.js';

export interface PackedObservations {
  footCount: number;
  /** Observations packed so far. */
  count: number;
  values: Float64Array;
}

export function observationStride(footCount: number): number {
  return 19 + 11 * footCount;
}

export function createPackedObservations(footCount: number, capacity: number): PackedObservations {
  return { footCount, count: 0, values: new Float64Array(Math.max(0, capacity) * observationStride(footCount)) };
}

function put(values: Float64Array, at: number, from: ArrayLike<number>): number {
  for (let j = 0; j < from.length; j++) values[at + j] = from[j];
  return at + from.length;
}

/** Appends obs (of packed.footCount feet); false when the capacity is used up. No allocation. */
export function packObservation(packed: PackedObservations, obs: Observation): boolean {
  const stride = observationStride(packed.footCount);
  const values = packed.values;
  if ((packed.count + 1) * stride > values.length) return false;
  let at = packed.count * stride;
  values[at++] = obs.time_s;
  at = put(values, at, obs.trunkPosition_m);
  at = put(values, at, obs.trunkQuaternion);
  at = put(values, at, obs.trunkVelocity_mps);
  at = put(values, at, obs.trunkAngularVelocity_radps);
  at = put(values, at, obs.footPosition_m);
  at = put(values, at, obs.footVelocity_mps);
  at = put(values, at, obs.footForce_N);
  at = put(values, at, obs.footContact);
  at = put(values, at, obs.frictionEstimate);
  const gait = GAIT_NAMES.indexOf(obs.command.gait);
  if (gait < 0) throw new RangeError(`packObservation: gait '${obs.command.gait}' is not one of ${GAIT_NAMES.join(', ')}`);
  values[at++] = gait;
  at = put(values, at, obs.command.velocity_mps);
  values[at] = obs.command.yawRate_radps;
  packed.count++;
  return true;
}

/**
 * The packed observations as Observation objects, in order. Their arrays are views into the
 * packed buffer (no copy: making 36,000 observations of fresh arrays took the main thread 0.3 s),
 * except the contact flags, which get bytes of their own; so they share its memory and a write
 * into one changes the packed copy too.
 */
export function unpackObservations(packed: PackedObservations): Observation[] {
  const n = packed.footCount;
  const stride = observationStride(n);
  const values = packed.values;
  const buffer = values.buffer;
  const base = values.byteOffset;
  const contacts = new Uint8Array(packed.count * n);
  const out: Observation[] = [];
  const view = (at: number, length: number) => new Float64Array(buffer, base + at * Float64Array.BYTES_PER_ELEMENT, length);
  for (let k = 0; k < packed.count; k++) {
    let at = k * stride;
    const time_s = values[at++];
    const trunkPosition_m = view(at, 3);
    const trunkQuaternion = view(at + 3, 4);
    const trunkVelocity_mps = view(at + 7, 3);
    const trunkAngularVelocity_radps = view(at + 10, 3);
    at += 13;
    const footPosition_m = view(at, 3 * n);
    const footVelocity_mps = view(at + 3 * n, 3 * n);
    const footForce_N = view(at + 6 * n, 3 * n);
    at += 9 * n;
    const footContact = contacts.subarray(k * n, (k + 1) * n);
    for (let i = 0; i < n; i++) footContact[i] = values[at + i];
    at += n;
    const frictionEstimate = view(at, n);
    at += n;
    const gait = GAIT_NAMES[values[at++]];
    const velocity_mps = view(at, 3);
    const yawRate_radps = values[at + 3];
    out.push({
      time_s,
      trunkPosition_m,
      trunkQuaternion,
      trunkVelocity_mps,
      trunkAngularVelocity_radps,
      footPosition_m,
      footVelocity_mps,
      footForce_N,
      footContact,
      frictionEstimate,
      command: { gait, velocity_mps, yawRate_radps },
    });
  }
  return out;
}
